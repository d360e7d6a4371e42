// Turns the measured figures into the console table, bench/results/latest.json,
// bench/results/latest.md (the README's "Measured" tables) and docs/scale.svg.
import type { AccuracyResult, CheckerTally } from './accuracy';
import type { AdversarialRow } from './adversarial';
import { baselineTolerance } from './baseline';
import type { BudgetResult } from './budget';
import type { JacobianKindRow, JacobianResult } from './jacobian';
import type { LatencyResult } from './latency';
import { jacobianShapeKinds } from './mutants';
import type { RealCodeResult, RealCodeRow } from './realCode';
import type { ScaleRow } from './scale';
import type { SmoothnessResult } from './smoothness';

export interface Machine {
  cpus: number;
  cpuModel: string;
  node: string;
  date: string;
}

export interface BenchResults {
  machine: Machine;
  accuracy: (Pick<AccuracyResult, 'slopecheck' | 'baseline'> & { details: Omit<AccuracyResult, 'slopecheck' | 'baseline'> }) | null;
  smoothness: SmoothnessResult | null;
  realCode: RealCodeResult | null;
  budget: BudgetResult | null;
  adversarial: AdversarialRow[] | null;
  jacobian: JacobianResult | null;
  scale: ScaleRow[] | null;
  latency: (Omit<Partial<LatencyResult>, 'medianMs' | 'p95Ms' | 'firstCheckMs' | 'rssMb'> & { medianMs: number | null; p95Ms: number | null; firstCheckMs: number | null; rssMb: number | null; note?: string }) | null;
}

const fmt = (x: number, digits = 2) => (x === 0 ? '0' : Math.abs(x) < 1e-2 || Math.abs(x) >= 1e5 ? x.toExponential(digits - 1) : x.toPrecision(digits + 1));
const pct = (part: number, whole: number) => (whole === 0 ? '–' : `${((100 * part) / whole).toFixed(1)} %`);

function table(header: string[], rows: Array<Array<string | number>>): string {
  return [`| ${header.join(' | ')} |`, `| ${header.map(() => '---').join(' | ')} |`, ...rows.map((r) => `| ${r.join(' | ')} |`)].join('\n');
}

function accuracyTable(s: CheckerTally, b: CheckerTally): string {
  const rows: Array<Array<string | number>> = [
    ['correct cases', s.correctCases, b.correctCases],
    ['false alarms', `${s.falseAlarms} (${pct(s.falseAlarms, s.correctCases)})`, `${b.falseAlarms} (${pct(b.falseAlarms, b.correctCases)})`],
    ['inconclusive on correct cases', `${s.inconclusiveOnCorrect} (${pct(s.inconclusiveOnCorrect, s.correctCases)})`, `${b.inconclusiveOnCorrect}`],
    ['bug cases', s.bugCases, b.bugCases],
    ['bugs caught', `${s.bugsCaught} (${pct(s.bugsCaught, s.bugCases)})`, `${b.bugsCaught} (${pct(b.bugsCaught, b.bugCases)})`],
    ...Object.keys(s.byKind).map((kind) => [`— ${kind}`, `${s.byKind[kind].caught} / ${s.byKind[kind].cases}`, `${b.byKind[kind].caught} / ${b.byKind[kind].cases}`]),
    ['inconclusive (all cases)', s.inconclusive, b.inconclusive],
    ['evaluations per case (f + ∇f, mean)', fmt(s.evaluationsPerCase, 3), fmt(b.evaluationsPerCase, 3)],
  ];
  return table(['', 'Slopecheck', 'forward differences, tol 1e-4'], rows);
}

const cell = (text: string) => text.replace(/\|/g, '/');
const tolerance = baselineTolerance.toExponential();

/** Mutants of a kind that keeps the matrix's shape: a mismatch, not a shape error, is the answer. */
const mismatchRows = (j: JacobianResult) => j.rows.filter((r) => r.kind !== 'unmutated' && !jacobianShapeKinds.includes(r.kind));
/** Of a row's mutants, those the engine's own error estimate could tell from the truth. */
const resolvableCases = (r: JacobianKindRow) => r.cases - r.withinEstimate;

/** The Jacobian check's targets against what was measured: rows of the targets table and the section's heading. */
function jacobianTargets(j: JacobianResult): Array<[string, string, boolean]> {
  const unmutated = j.rows.find((r) => r.kind === 'unmutated')!;
  const mutants = mismatchRows(j);
  const total = (of: (r: JacobianKindRow) => number) => mutants.reduce((sum, r) => sum + of(r), 0);
  const [caught, resolvable, within, undecided] = [total((r) => r.engine.fail), total(resolvableCases), total((r) => r.withinEstimate), total((r) => r.engine.inconclusive)];
  return [
    ['Jacobian check: zero false alarms on the unmutated Moré–Garbow–Hillstrom Jacobians', `${unmutated.engine.fail} of ${unmutated.cases} (forward differences, tol ${tolerance}: ${unmutated.baseline.fail})`, unmutated.engine.fail === 0],
    [
      'Jacobian check: ≥ 99 % of mutants (relative size ≥ 1e-6) caught where the error estimate allows',
      `${caught} of ${resolvable} (${pct(caught, resolvable)}); ${within} more within the error estimate; ${undecided} of all ${total((r) => r.cases)} inconclusive`,
      caught >= 0.99 * resolvable,
    ],
  ];
}

function jacobianSection(j: JacobianResult): string[] {
  const targets = jacobianTargets(j).map(([target, measured, met]) => `${target}: ${met ? 'met' : '**not met**'} (${measured})`);
  const shape = new Set<string>(jacobianShapeKinds);
  const rows = j.rows.map((r) => {
    const mutant = r.kind !== 'unmutated' && !shape.has(r.kind);
    return [
      r.kind === 'unmutated' ? 'unmutated (fail = false alarm)' : r.kind, r.cases,
      r.engine.fail, r.engine.inconclusive, r.engine.pass, r.engine.shape, r.engine.error,
      mutant ? `${r.engine.fail} of ${resolvableCases(r)} (${pct(r.engine.fail, resolvableCases(r))})` : '–',
      mutant ? `${r.diagnosisKind} / ${r.diagnosisOtherTrue} / ${r.diagnosisWrong}` : '–',
      r.baseline.fail, r.baseline.inconclusive, r.baseline.pass, r.baseline.shape,
    ];
  });
  const parts = [
    '### Jacobians (Moré–Garbow–Hillstrom residuals)',
    `${j.problems} least-squares problems, each at its standard start and ${j.pointsAroundStart} seeded points around it (${j.points} points), unmutated and mutated; ` +
      `Slopecheck's Jacobian check beside forward differences with h = √ε·max(1, |xⱼ|), an entry flagged when |J − J_num| > ${tolerance}·max(|J|, |J_num|, 1). ` +
      `A transposed matrix that is not square has the wrong shape: there a shape finding is the answer. Targets — ${targets.join('; ')}.`,
    table(['case', 'cases', 'Slopecheck: fail', 'inconclusive', 'pass', 'shape finding', 'other error', 'caught where the error estimate allows', 'diagnosis of caught: right kind / another true / wrong or none', `forward differences, tol ${tolerance}: fail`, 'inconclusive', 'pass', 'shape finding'], rows),
  ];
  const notes = (title: string, header: string[], list: Array<Array<string | number>>) => (list.length > 0 ? [title, table(header, list.map((row) => row.map((c) => cell(String(c)))))] : []);
  parts.push(
    ...notes('Slopecheck false alarms:', ['case', 'finding'], j.falseAlarms.map((n) => [n.label, n.why])),
    ...notes('Slopecheck without a verdict on unmutated Jacobians:', ['case', 'verdict', 'finding'], j.undecidedCorrect.map((n) => [n.label, n.status, n.why])),
    ...notes('Mutants Slopecheck did not catch:', ['case', 'mutant', 'where', 'verdict', 'why'], j.notCaught.map((n) => [n.label, n.kind, n.where, n.status, n.why])),
    ...notes('Mutants caught with a diagnosis other than the one planted:', ['case', 'mutant', 'where', 'diagnosis', 'judged'], j.wrongDiagnosis.map((n) => [n.label, n.kind, n.where, n.diagnosis, n.why])),
  );
  if (j.baselineFalseAlarms.length > 0) parts.push(`Forward differences flagged ${j.baselineFalseAlarms.length} unmutated Jacobians: ${j.baselineFalseAlarms.join('; ')}.`);
  parts.push(
    'Calls for the verdict on a correct Jacobian at one probe (the residuals rᵢ = wᵢ·sinh(0.3·xⱼ) + ½·xⱼ·xₖ of bench/jacobian.ts), beside the textbook forward-difference check (n + 1 residual calls, one Jacobian) and, for reference only, the gradient verdict\'s target at the same n (no Jacobian target is set):',
    table(['n', 'm', 'verdict', 'mode', 'residual calls', 'Jacobian calls', 'total', 'forward differences', 'gradient verdict\'s target'], j.calls.map((r) => [r.n, r.m, r.status, r.mode, r.residualCalls, r.jacobianCalls, r.residualCalls + r.jacobianCalls, r.textbook, r.gradientTarget])),
    `The section ran in ${fmt(j.seconds, 3)} s.`,
  );
  return parts;
}

/**
 * Save-to-diagnostics median with one sandbox process reused for every file, measured with this
 * bench's paced saves on the 2-core bench machine (2026-12-02) at the last commit before each
 * check got a fresh process (e8f5172). The containment work may add at most 20 ms to it.
 */
const reusedProcessMedianMs = 43.5;

/** Each target of the product against what this run measured; a section not run is left out. */

export function targetsTable(results: BenchResults): string {
  const rows: Array<[string, string, boolean]> = [];
  const a = results.accuracy;
  if (a) {
    const s = a.slopecheck;
    const missedOutsideEstimate = a.details.slopecheckMissed.filter((c) => !(c.why ?? '').startsWith('within the error estimate'));
    rows.push(['zero false alarms on correct cases', `${s.falseAlarms} of ${s.correctCases}`, s.falseAlarms === 0]);
    rows.push([
      'every bug of relative size ≥ 1e-6 caught where the error estimate allows it',
      `${s.bugsCaught} of ${s.bugCases} caught; ${a.details.slopecheckMissed.length} missed, ${missedOutsideEstimate.length} of them outside the error estimate`,
      missedOutsideEstimate.length === 0,
    ]);
    // A component whose exact derivative is inside its error bound (zero by symmetry, or below what
    // f's rounding resolves) cannot be confirmed; such cases are inconclusive by rule, not by fault.
    const unforced = a.details.slopecheckInconclusiveOnCorrect.filter((c) => !c.forced);
    rows.push([
      'inconclusive on smooth correct cases under 1 %, besides components whose exact derivative lies within its error bound',
      `${pct(unforced.length, s.correctCases)} (${s.inconclusiveOnCorrect - unforced.length} more with such components)`,
      unforced.length < 0.01 * s.correctCases,
    ]);
  }
  const bu = results.budget;
  if (bu) {
    rows.push(['calls for the gradient verdict of a correct pair ≤ 4(2n + 1) + 40, flat above n = 64', bu.calls.map((r) => `${r.verdictCalls} of ${r.verdictTarget} at n = ${r.n}`).join(', '), bu.calls.every((r) => r.verdictCalls <= r.verdictTarget)]);
    rows.push(['calls of a whole check (with L̂ at one probe) ≤ twice that', bu.calls.map((r) => `${r.calls} of ${r.target} at n = ${r.n}`).join(', '), bu.calls.every((r) => r.calls <= r.target)]);
    const fifty = bu.budget.filter((r) => r.n === 20 && r.costMs === 50);
    rows.push([
      'gradient verdict of a 50 ms objective at n = 20 within the default budget',
      fifty.map((r) => `${r.gradient}: ${r.status} in ${r.verdictMs} ms`).join('; '),
      fifty.every((r) => (r.gradient === 'correct' ? r.status === 'pass' : r.status === 'fail')),
    ]);
  }
  const adv = results.adversarial;
  if (adv) rows.push(['adversarial cases: no false pass, no false rate alarm, no verdict lost to the budget', `${adv.filter((r) => r.held).length} of ${adv.length} held`, adv.every((r) => r.held)]);
  if (results.jacobian) rows.push(...jacobianTargets(results.jacobian));
  const sm = results.smoothness;
  if (sm) {
    rows.push(['λmax estimate (Lanczos) relative error ≤ 1e-3 on quadratics up to n = 1000, within 40 products', `${fmt(sm.quadraticMaxRelErrRitz)}, at most ${sm.maxHessianVectorProducts} products`, sm.quadraticMaxRelErrRitz <= 1e-3 && sm.maxHessianVectorProducts <= 40]);
    // L̂ is widened upward by an unconverged residual on purpose: it may exceed λmax, not fall below it.
    rows.push(['L̂ never more than 1e-3 below λmax on quadratics (widened upward when unconverged)', `largest shortfall ${fmt(sm.quadraticMaxShortfallL)}; largest relative error ${fmt(sm.quadraticMaxRelErrL)}`, sm.quadraticMaxShortfallL <= 1e-3]);
    rows.push(['μ̂ relative error ≤ 1e-3 on quadratics up to n = 1000', fmt(sm.quadraticMaxRelErrMu), sm.quadraticMaxRelErrMu <= 1e-3]);
    const testSetMu = Math.max(...sm.testSet.map((r) => r.relErrMu));
    rows.push(['L̂ and μ̂ relative error ≤ 1e-2 on the test-set functions', `L̂ ${fmt(sm.testSetMaxRelErrL)}, μ̂ ${fmt(testSetMu)}`, sm.testSetMaxRelErrL <= 1e-2 && testSetMu <= 1e-2]);
    rows.push(['learning-rate verdicts at 0.99 and 1.01 × 2/λmax agree with a real run', `${sm.ratesAgree} of ${sm.rates.length}`, sm.ratesAgree === sm.rates.length]);
  }
  const r = results.realCode;
  if (r) {
    const u = r.untagged;
    rows.push(['without tags, every intended pair found in ≥ 95 % of files', `${u.filesFullyFound} of ${u.files} files (${pct(u.filesFullyFound, u.files)})`, u.filesFullyFound >= 0.95 * u.files]);
    const both = [r.untagged, r.tagged];
    const found = both.reduce((t, row) => t + row.found, 0);
    const right = both.reduce((t, row) => t + row.judgedRight, 0);
    rows.push(['every found pair of the realistic corpus judged right', `${right} of ${found}`, right === found]);
    const alarms = both.reduce((t, row) => t + row.falseAlarms, 0);
    rows.push(['zero false alarms on the realistic corpus', String(alarms), alarms === 0]);
    const rates = both.reduce((t, row) => t + row.rates, 0);
    const ratesRight = both.reduce((t, row) => t + row.ratesRight, 0);
    const spurious = both.reduce((t, row) => t + row.spuriousRates, 0);
    rows.push(['every learning-rate verdict right at the start point', `${ratesRight} of ${rates}; ${spurious} rates reported where none is declared`, ratesRight === rates && spurious === 0]);
  }
  if (results.scale) {
    // n = 10 is below the directional threshold: every component is differenced there.
    const directional = results.scale.filter((r) => r.n > 64);
    const counts = directional.map((r) => r.evaluations);
    const spread = Math.max(...counts) / Math.min(...counts);
    rows.push(['evaluations flat in n (directional check, n ≥ 100)', `${Math.min(...counts)} to ${Math.max(...counts)} (max/min ${spread.toFixed(2)})`, spread <= 1.1]);
    const large = results.scale.filter((r) => r.n >= 1e4);
    rows.push(['overhead ratio ≤ 1.5 at n ≥ 1e4', large.map((r) => `${fmt(r.overheadRatio, 3)} at n = ${r.n}`).join(', '), large.every((r) => r.overheadRatio <= 1.5)]);
  }
  const l = results.latency;
  if (l && l.medianMs !== null) {
    rows.push(['save → diagnostics: median ≤ 150 ms', `${fmt(l.medianMs, 3)} ms`, l.medianMs <= 150]);
    rows.push([
      `save → diagnostics: median at most 20 ms above one reused sandbox process (${reusedProcessMedianMs} ms)`,
      `${fmt(l.medianMs, 3)} ms (+${fmt(l.medianMs - reusedProcessMedianMs, 3)} ms)`,
      l.medianMs <= reusedProcessMedianMs + 20,
    ]);
    rows.push(['save → diagnostics: 95th percentile ≤ 400 ms', `${fmt(l.p95Ms!, 3)} ms`, l.p95Ms! <= 400]);
    const fixtures = l.fixtures ?? [];
    const slowest = fixtures.reduce((worst, f) => (f.medianMs > worst.medianMs ? f : worst), fixtures[0]);
    if (slowest) {
      rows.push([
        'the same for each demo fixture on its own',
        `slowest ${slowest.file}: median ${fmt(slowest.medianMs, 3)} ms, p95 ${fmt(slowest.p95Ms, 3)} ms`,
        fixtures.every((f) => f.medianMs <= 150 && f.p95Ms <= 400),
      ]);
    }
    rows.push(['server + sandbox RSS at rest after 1000 checks ≤ 200 MB', `${fmt(l.rssMb!, 3)} MB (server ${fmt(l.serverRssMb ?? NaN, 3)}, sandbox ${fmt(l.sandboxRssMb ?? NaN, 3)})`, l.rssMb! <= 200]);
    // "No growth": within 2 % of the total, the noise of RSS readings between samples.
    rows.push(['no memory growth over the last 500 checks', `${fmt(l.growthOverLast500Mb ?? NaN, 3)} MB`, (l.growthOverLast500Mb ?? Infinity) <= 0.02 * l.rssMb!]);
  }
  return table(['target', 'measured', 'met'], rows.map(([target, measured, met]) => [target, measured, met ? 'yes' : '**no**']));
}

export function markdown(results: BenchResults): string {
  const parts: string[] = [];
  const m = results.machine;
  parts.push(`Machine: ${m.cpus} × ${m.cpuModel}, Node ${m.node}, ${m.date}.`);
  parts.push('### Targets', targetsTable(results));
  if (results.accuracy) {
    const a = results.accuracy;
    parts.push('### Accuracy', accuracyTable(a.slopecheck, a.baseline));
    const missed = a.details.slopecheckMissed;
    if (missed.length > 0) {
      parts.push('Bugs Slopecheck did not flag:', table(['case', 'bug', 'relative size', 'verdict', 'why'], missed.map((c) => [c.label, c.kind ?? '', fmt(c.relativeSize ?? NaN), c.verdict, c.why ?? ''])));
    }
    for (const [title, notes] of [['False alarms', a.details.slopecheckFalseAlarms], ['Inconclusive on correct cases', a.details.slopecheckInconclusiveOnCorrect]] as const) {
      if (notes.length > 0) parts.push(`${title}:`, table(['case', 'finding', 'why'], notes.map((c) => [c.label, c.detail.replace(/\|/g, '/'), c.why ?? ''])));
    }
  }
  if (results.smoothness) {
    const s = results.smoothness;
    const rows = [...s.quadratics, ...s.testSet];
    parts.push('### Smoothness', table(['problem @ point', 'n', 'λmax (ml-matrix)', 'λmax (Lanczos)', 'L̂', 'rel. error L̂', 'λmin (ml-matrix)', 'μ̂', 'rel. error μ̂', 'Hessian-vector products'],
      rows.map((r) => [r.label, r.n, fmt(r.lambdaMax, 6), fmt(r.ritzMax, 6), fmt(r.lipschitz, 6), fmt(r.relErrL), fmt(r.lambdaMin, 6), fmt(r.mu, 6), fmt(r.relErrMu), r.hessianVectorProducts])));
    parts.push('Learning-rate verdicts on quadratics against a real run of 3000 gradient steps:', table(['quadratic', 'rate', 'verdict', 'real run', 'agree'],
      s.rates.map((r) => [r.label, `${r.multiple} × 2/λmax`, r.verdict ?? '–', r.runDiverged ? 'diverged' : 'did not diverge', r.agrees ? 'yes' : '**no**'])));
  }
  if (results.realCode) {
    const r = results.realCode;
    const row = (label: string, x: RealCodeRow) => [label, x.files, `${x.filesFullyFound} (${pct(x.filesFullyFound, x.files)})`, x.intended, x.found, x.judgedRight, x.falseAlarms, x.misses, `${x.ratesRight} of ${x.rates}`, x.spuriousRates];
    parts.push('### Real code (fixtures/realistic, through the CLI)', table(['files', 'count', 'all intended pairs found', 'pairs intended', 'found', 'judged right', 'false alarms', 'misses', 'learning-rate verdicts right at the start', 'rates where none declared'],
      [row('without tags', r.untagged), row('with tags', r.tagged)]));
    if (r.problems.length > 0) parts.push('Disagreements with the truth:', table(['file', 'what'], r.problems.map((p) => [p.file, p.problem.replace(/\|/g, '/')])));
    parts.push(`The CLI checked the ${r.untagged.files + r.tagged.files} files in ${fmt(r.seconds, 3)} s.`);
  }
  if (results.budget) {
    const b = results.budget;
    parts.push('### Calls and time budget', 'Calls (f + ∇f) of a correct pair with a cheap objective: for the gradient verdict, and for a whole check with L̂ at one probe (no learning rate, no plots), beside the textbook central-difference check (2n + 1) and the targets, 4(2n + 1) + 40 for the verdict and twice that for the whole check, flat above n = 64:',
      table(['n', 'gradient verdict', 'target', 'whole check', 'target', 'textbook 2n + 1'], b.calls.map((r) => [r.n, r.verdictCalls, r.verdictTarget, r.calls, r.target, r.textbook])));
    parts.push(`Time to a verdict under the default budget of ${b.budgetMs} ms, modelled as calls × cost per call (in-process, module loading and sandbox overhead left out):`,
      table(['n', 'ms per call', 'gradient', 'verdict', 'calls', 'time (ms)', 'probes checked', 'cut short by the budget'],
        b.budget.map((r) => [r.n, r.costMs, r.gradient, r.status, r.calls, r.verdictMs, r.probesChecked, r.cutShort ? 'yes' : 'no'])));
  }
  if (results.adversarial) {
    parts.push('### Adversarial cases', 'Each case is built to provoke one trap; it holds when the verdict is the one it must be (test/support/adversarial.ts, asserted in test/engine/adversarial.test.ts):',
      table(['case', 'trap', 'must give', 'gave', 'calls', 'held'], results.adversarial.map((r) => [r.name, r.trap, r.expected, r.got, r.calls, r.held ? 'yes' : 'no'])));
  }
  if (results.jacobian) parts.push(...jacobianSection(results.jacobian));
  if (results.scale) {
    parts.push('### Scale (real sandbox, one wrong component)', table(['n', 'evaluations (f + ∇f)', 'wall time (s)', 'one f (ms)', 'one ∇f (ms)', 'overhead ratio', 'verdict', 'components named'],
      results.scale.map((r) => [r.n, `${r.evaluations} (${r.objectiveEvaluations} + ${r.gradientEvaluations})`, fmt(r.seconds, 3), fmt(r.objectiveMs, 3), fmt(r.gradientMs, 3), fmt(r.overheadRatio, 3), r.status, r.wrongComponents.join(', ')])));
    parts.push('![Evaluations against n](docs/scale.svg)');
  }
  if (results.latency) {
    const l = results.latency;
    if (l.medianMs === null) parts.push('### Editor latency', `Not measured: ${l.note}`);
    else {
      parts.push('### Editor latency (dist/server.js over stdio, save → diagnostics)', table(['fixture', 'median (ms)', 'p95 (ms)'], (l.fixtures ?? []).map((f) => [f.file, fmt(f.medianMs, 3), fmt(f.p95Ms, 3)])));
      parts.push(`All saves, each ${l.editPauseMs ?? '?'} ms after the previous diagnostics: median ${fmt(l.medianMs, 3)} ms, p95 ${fmt(l.p95Ms!, 3)} ms. ` +
        `Back to back (each save the moment the previous diagnostics arrive, so every check waits for a process to boot): median ${fmt(l.backToBackMedianMs ?? NaN, 3)} ms, p95 ${fmt(l.backToBackP95Ms ?? NaN, 3)} ms. ` +
        `First check after start ${fmt(l.firstCheckMs!, 3)} ms (${fmt(l.startToFirstDiagnosticsMs ?? NaN, 3)} ms from process start). ` +
        `Memory at rest after ${l.checks} checks: server ${fmt(l.serverRssMb ?? NaN, 3)} MB + sandbox ${fmt(l.sandboxRssMb ?? NaN, 3)} MB = ${fmt(l.rssMb!, 3)} MB RSS (at most ${fmt(l.peakRssMb ?? NaN, 3)} MB while checks ran back to back); growth over the last 500 checks ${fmt(l.growthOverLast500Mb ?? NaN, 3)} MB.`);
    }
  }
  return parts.join('\n\n') + '\n';
}

/** Evaluations (and wall time) against n, log scale on x; written from the measured rows. */
export function scaleSvg(rows: ScaleRow[]): string {
  const [width, height, left, right, top, bottom] = [640, 360, 70, 70, 30, 50];
  const xs = rows.map((r) => Math.log10(r.n));
  const [xMin, xMax] = [Math.min(...xs), Math.max(...xs)];
  const yMax = Math.max(...rows.map((r) => r.evaluations)) * 1.2;
  const tMax = Math.max(...rows.map((r) => r.seconds)) * 1.2;
  const px = (x: number) => left + ((x - xMin) / (xMax - xMin || 1)) * (width - left - right);
  const py = (y: number, max: number) => height - bottom - (y / max) * (height - top - bottom);
  const evalPoints = rows.map((r, k) => `${px(xs[k]).toFixed(1)},${py(r.evaluations, yMax).toFixed(1)}`);
  const timePoints = rows.map((r, k) => `${px(xs[k]).toFixed(1)},${py(r.seconds, tMax).toFixed(1)}`);
  const xTicks = rows.map((r, k) => `<text x="${px(xs[k]).toFixed(1)}" y="${height - bottom + 18}" text-anchor="middle">${r.n.toLocaleString('en-US')}</text>`);
  const yTicks = [0, 0.25, 0.5, 0.75, 1].map((f) => `<text x="${left - 8}" y="${(py(f * yMax, yMax) + 4).toFixed(1)}" text-anchor="end">${Math.round(f * yMax)}</text><line x1="${left}" x2="${width - right}" y1="${py(f * yMax, yMax).toFixed(1)}" y2="${py(f * yMax, yMax).toFixed(1)}" stroke="#ddd"/>`);
  const tTicks = [0, 0.5, 1].map((f) => `<text x="${width - right + 8}" y="${(py(f * tMax, tMax) + 4).toFixed(1)}" fill="#c0392b">${fmt(f * tMax, 2)}</text>`);
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" font-family="sans-serif" font-size="12">
<rect width="100%" height="100%" fill="white"/>
<text x="${width / 2}" y="18" text-anchor="middle" font-size="14">Evaluations per check against dimension n (written by npm run bench)</text>
${yTicks.join('\n')}
${xTicks.join('\n')}
${tTicks.join('\n')}
<line x1="${left}" y1="${height - bottom}" x2="${width - right}" y2="${height - bottom}" stroke="black"/>
<line x1="${left}" y1="${top}" x2="${left}" y2="${height - bottom}" stroke="black"/>
<polyline points="${evalPoints.join(' ')}" fill="none" stroke="#2c6fbb" stroke-width="2"/>
${evalPoints.map((p) => `<circle cx="${p.split(',')[0]}" cy="${p.split(',')[1]}" r="4" fill="#2c6fbb"/>`).join('\n')}
<polyline points="${timePoints.join(' ')}" fill="none" stroke="#c0392b" stroke-width="1.5" stroke-dasharray="5,4"/>
<text x="${width / 2}" y="${height - 12}" text-anchor="middle">n (log scale)</text>
<text x="16" y="${height / 2}" text-anchor="middle" transform="rotate(-90 16 ${height / 2})" fill="#2c6fbb">evaluations (f + ∇f)</text>
<text x="${width - 14}" y="${height / 2}" text-anchor="middle" transform="rotate(90 ${width - 14} ${height / 2})" fill="#c0392b">wall time (s), dashed</text>
</svg>
`;
}

/** The figures other tools read, under the names the product promises, plus the details. */
export function latestJson(results: BenchResults): object {
  const strip = (t: CheckerTally) => ({ correctCases: t.correctCases, falseAlarms: t.falseAlarms, bugCases: t.bugCases, bugsCaught: t.bugsCaught, inconclusive: t.inconclusive, inconclusiveOnCorrect: t.inconclusiveOnCorrect, evaluationsPerCase: t.evaluationsPerCase, byKind: t.byKind });
  return {
    machine: results.machine,
    accuracy: results.accuracy && { slopecheck: strip(results.accuracy.slopecheck), baseline: strip(results.accuracy.baseline), details: results.accuracy.details },
    smoothness: results.smoothness,
    realCode: results.realCode,
    budget: results.budget,
    adversarial: results.adversarial,
    jacobian: results.jacobian,
    scale: results.scale,
    latency: results.latency,
  };
}
