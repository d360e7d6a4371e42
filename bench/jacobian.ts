// Jacobians: false alarms on the Jacobians of the least-squares problems of Moré, Garbow &
// Hillstrom ("Testing Unconstrained Optimization Software", ACM TOMS 7(1), 1981) and the share
// of their mutants caught, for the engine's Jacobian check and the textbook forward-difference
// check (bench/baseline.ts) side by side, at each standard start and seeded points around it;
// and the calls of a Jacobian verdict against n and m on a residual problem of any size.
import { checkByKind } from '../server/src/engine/kinds';
import { defaultCheckOptions, type MatrixDiagnosis, type PairReport } from '../server/src/engine/types';
import { makeArray, moreGarbowHillstromSet } from '../test/support/problems';
import { outsideBound } from './accuracy';
import { forwardDifferenceJacobianCheck, type JacobianBaselineResult } from './baseline';
import { verdictCallsTarget } from './budget';
import { around } from './corpus';
import { jacobianMutantKinds, jacobianMutantsAt, type JacobianMutantKind } from './mutants';

type Matrix = number[][];
type Residuals = (x: ArrayLike<number>) => { r: number[]; J: Matrix };

/** Seeded points around each standard start, besides the start itself. */
const pointsAroundStart = 2;

/** What a checker said of one case; 'shape' is an error that names the matrix's wrong shape. */
export type Outcome = 'fail' | 'inconclusive' | 'pass' | 'shape' | 'error';
export type OutcomeCounts = Record<Outcome, number>;

export interface JacobianKindRow {
  kind: JacobianMutantKind | 'unmutated';
  cases: number;
  engine: OutcomeCounts;
  baseline: OutcomeCounts;
  /**
   * Of the engine's 'fail' verdicts: the diagnosis has the mutant's kind; another kind that is as
   * true (Beale at x0 has a zero column, so a column × 2 is also the whole matrix × 2); or it is
   * untrue, or names no shape.
   */
  diagnosisKind: number;
  diagnosisOtherTrue: number;
  diagnosisWrong: number;
  /** Mutants the engine did not catch whose every wrong entry lies within its own error bound at the probe. */
  withinEstimate: number;
}

/** One case worth a look by whoever works on the engine. */
export interface JacobianNote {
  label: string;
  kind: JacobianMutantKind | 'unmutated';
  where: string;
  status: PairReport['status'];
  diagnosis: string;
  why: string;
}

export interface JacobianCallsRow {
  n: number;
  m: number;
  status: PairReport['status'];
  mode: string;
  residualCalls: number;
  jacobianCalls: number;
  /** The textbook forward-difference check: n + 1 calls of r and one of J. */
  textbook: number;
  /** For reference only (no Jacobian target is set): the gradient verdict's target at this n. */
  gradientTarget: number;
}

export interface JacobianResult {
  problems: number;
  pointsAroundStart: number;
  points: number;
  rows: JacobianKindRow[];
  falseAlarms: JacobianNote[];
  undecidedCorrect: JacobianNote[];
  notCaught: JacobianNote[];
  wrongDiagnosis: JacobianNote[];
  baselineFalseAlarms: string[];
  calls: JacobianCallsRow[];
  seconds: number;
}

function runEngine(residuals: Residuals, jacobian: (x: ArrayLike<number>) => unknown, point: number[]): PairReport {
  return checkByKind.jacobian(
    { objective: (x) => residuals(x).r, gradient: (x) => jacobian(x), makeVector: makeArray },
    [point],
    { dimension: null, learningRate: null, options: { ...defaultCheckOptions } },
  );
}

function engineOutcome(report: PairReport): Outcome {
  if (report.status !== 'error') return report.status;
  return report.findings.some((f) => f.code === 'matrix-wrong-shape') ? 'shape' : 'error';
}

const baselineOutcome = (result: JacobianBaselineResult): Outcome => (result.shapeWrong ? 'shape' : result.verdict);

const noOutcomes = (): OutcomeCounts => ({ fail: 0, inconclusive: 0, pass: 0, shape: 0, error: 0 });

const describeDiagnosis = (d: MatrixDiagnosis | null | undefined) => (d ? JSON.stringify(d) : '–');

const findingsOf = (report: PairReport) => report.findings.map((f) => `${f.code}: ${f.message}`).join(' / ').slice(0, 300);

/**
 * Whether the diagnosis, taken literally, turns the true matrix J into the wrong one W, every
 * entry to 1e-9 relative; an entry, a region, columns or rows are true when every changed entry
 * lies in them. Exhaustive on purpose: a new kind of diagnosis must be judged here.
 */
function isTrueOf(d: MatrixDiagnosis, J: Matrix, W: Matrix): boolean {
  const close = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b));
  // `expected(i, j)` is what W[i][j] must be; null where the diagnosis leaves it open.
  const everyEntry = (expected: (i: number, j: number) => number | null) => W.every((row, i) => row.every((w, j) => { const e = expected(i, j); return e === null || close(w, e); }));
  const factorOf = (lines: Array<{ index: number; factor: number }>, k: number) => lines.find((c) => c.index === k)?.factor ?? 1;
  switch (d.kind) {
    case 'transposed': return J.length === J[0].length && everyEntry((i, j) => J[j][i]);
    case 'rowShift': return everyEntry((i, j) => (J[i + d.shift] ? J[i + d.shift][j] : null));
    case 'rowSwap': {
      const partner = new Map(d.pairs.flatMap(([a, b]) => [[a, b], [b, a]]));
      return everyEntry((i, j) => J[partner.get(i) ?? i][j]);
    }
    case 'columnSwap': {
      const partner = new Map(d.pairs.flatMap(([a, b]) => [[a, b], [b, a]]));
      return everyEntry((i, j) => J[i][partner.get(j) ?? j]);
    }
    case 'matrixFactor': return everyEntry((i, j) => d.factor * J[i][j]);
    case 'columnFactor': return everyEntry((i, j) => factorOf(d.columns, j) * J[i][j]);
    case 'rowFactor': return everyEntry((i, j) => factorOf(d.rows, i) * J[i][j]);
    case 'diagonalFactor': return everyEntry((i, j) => (i === j ? d.factor : 1) * J[i][j]);
    case 'diagonalOffset': return everyEntry((i, j) => J[i][j] + (i === j ? d.offset : 0));
    case 'oneSided': return everyEntry((i, j) => (i !== j && (d.side === null || (d.side === 'lower' ? i > j : i < j)) && close(W[j][i], J[j][i]) ? null : J[i][j]));
    case 'entry': return everyEntry((i, j) => (i === d.row && j === d.column ? null : J[i][j]));
    case 'columns': return everyEntry((i, j) => (d.columns.includes(j) ? null : J[i][j]));
    case 'rows': return everyEntry((i, j) => (d.rows.includes(i) ? null : J[i][j]));
    case 'region': return everyEntry((i, j) => (i >= d.rows[0] && i <= d.rows[1] && j >= d.columns[0] && j <= d.columns[1] ? null : J[i][j]));
    case 'unknown': return false;
  }
}

/** Whether every entry the mutant changed lies within the engine's error bound for it at the probe. */
function errorEstimateOf(report: PairReport, trueJ: Matrix): { within: boolean; why: string } {
  const entries = report.probes[0]?.entries ?? [];
  const changed = entries.filter((e) => e.analytic !== trueJ[e.row][e.column]);
  if (changed.length === 0) return { within: false, why: `no changed entry in the report (${findingsOf(report)})` };
  const resolvable = changed.filter((e) => outsideBound(e.analytic, trueJ[e.row][e.column], e.errorBound));
  const shown = (resolvable.length > 0 ? resolvable : changed).slice(0, 3).map((e) => `(${e.row}, ${e.column}) off by ${(e.analytic - trueJ[e.row][e.column]).toExponential(2)}, bound ${e.errorBound.toExponential(2)}${e.undecided ? `, ${e.undecided}` : ''}`);
  return resolvable.length === 0
    ? { within: true, why: `within the error estimate: ${shown.join('; ')}` }
    : { within: false, why: `resolvable: ${shown.join('; ')}${resolvable.length > 3 ? ' …' : ''}` };
}

/** The least-squares problems of the set, at their starts and seeded points around them. */
function leastSquaresCases() {
  return moreGarbowHillstromSet.flatMap((problem, k) => {
    const residuals = problem.residuals;
    // The seeds of the accuracy corpus, so these are the first points of the gradient section too.
    return residuals ? around(problem, pointsAroundStart, 100 + k).map((c) => ({ ...c, residuals })) : [];
  });
}

export function runJacobian(log: (line: string) => void): JacobianResult {
  const started = Date.now();
  const kinds = ['unmutated', ...jacobianMutantKinds] as const;
  const rows = new Map(kinds.map((kind) => [kind, { kind, cases: 0, engine: noOutcomes(), baseline: noOutcomes(), diagnosisKind: 0, diagnosisOtherTrue: 0, diagnosisWrong: 0, withinEstimate: 0 } as JacobianKindRow]));
  const result: JacobianResult = { problems: 0, pointsAroundStart, points: 0, rows: [...rows.values()], falseAlarms: [], undecidedCorrect: [], notCaught: [], wrongDiagnosis: [], baselineFalseAlarms: [], calls: [], seconds: 0 };
  const cases = leastSquaresCases();
  result.points = cases.length;
  result.problems = new Set(cases.map((c) => c.problem.name)).size;
  cases.forEach((c, index) => {
    const r = (x: ArrayLike<number>) => c.residuals(x).r;
    const trueJacobian = (x: ArrayLike<number>) => c.residuals(x).J;
    const trueJ = trueJacobian(c.point);
    const note = (kind: JacobianNote['kind'], where: string, report: PairReport, why: string): JacobianNote => ({ label: c.label, kind, where, status: report.status, diagnosis: describeDiagnosis(report.matrix?.diagnosis), why });

    const unmutated = rows.get('unmutated')!;
    const report = runEngine(c.residuals, trueJacobian, c.point);
    const base = forwardDifferenceJacobianCheck(r, trueJacobian, c.point);
    unmutated.cases++;
    unmutated.engine[engineOutcome(report)]++;
    unmutated.baseline[baselineOutcome(base)]++;
    if (report.status === 'fail') result.falseAlarms.push(note('unmutated', '', report, findingsOf(report)));
    else if (report.status !== 'pass') result.undecidedCorrect.push(note('unmutated', '', report, findingsOf(report)));
    if (base.verdict !== 'pass') result.baselineFalseAlarms.push(`${c.label} (${base.flagged} entries flagged)`);

    for (const mutant of jacobianMutantsAt(trueJacobian, c.point, 9000 + index)) {
      const row = rows.get(mutant.kind)!;
      const mutated = runEngine(c.residuals, mutant.J, c.point);
      const outcome = engineOutcome(mutated);
      row.cases++;
      row.engine[outcome]++;
      row.baseline[baselineOutcome(forwardDifferenceJacobianCheck(r, mutant.J, c.point))]++;
      if (mutant.expected === null) {
        if (outcome !== 'shape') result.notCaught.push(note(mutant.kind, mutant.where, mutated, `no shape finding: ${findingsOf(mutated)}`));
        continue;
      }
      if (outcome === 'fail') {
        const given = mutated.matrix?.diagnosis ?? { kind: 'unknown' };
        const isTrue = isTrueOf(given, trueJ, mutant.J(c.point));
        if (given.kind === mutant.expected.kind) row.diagnosisKind++;
        else if (isTrue) row.diagnosisOtherTrue++;
        else row.diagnosisWrong++;
        // Right kind in the wrong place is listed too.
        if (given.kind !== mutant.expected.kind || !isTrue) {
          result.wrongDiagnosis.push(note(mutant.kind, mutant.where, mutated, `${given.kind === 'unknown' ? 'no shape named' : isTrue ? 'another true description' : 'untrue'}; planted ${describeDiagnosis(mutant.expected)}`));
        }
        continue;
      }
      const estimate = errorEstimateOf(mutated, trueJ);
      if (estimate.within) row.withinEstimate++;
      result.notCaught.push(note(mutant.kind, mutant.where, mutated, estimate.why));
    }
    if (index % 10 === 9) log(`  jacobian: ${index + 1}/${cases.length} points and their mutants`);
  });
  result.calls = callsAgainstSize();
  log(`  jacobian: calls per verdict ${result.calls.map((r) => `${r.m} × ${r.n}: ${r.residualCalls} + ${r.jacobianCalls}`).join(', ')}`);
  result.seconds = (Date.now() - started) / 1000;
  return result;
}

/**
 * Residuals of any size, m a multiple of n: rᵢ = wᵢ·sinh(0.3·xⱼ) + ½·xⱼ·xₖ with j = i mod n,
 * k = (i + 1 + ⌊i/n⌋) mod n and wᵢ = 1 + i/m; J by elementary calculus (two entries a row, so
 * m = 4n = 512 stays cheap).
 */
function scalableResiduals(n: number, m: number): Residuals {
  return (x) => {
    const r = new Array<number>(m).fill(0);
    const J = Array.from({ length: m }, () => new Array<number>(n).fill(0));
    for (let i = 0; i < m; i++) {
      const [j, k, w] = [i % n, (i + 1 + Math.floor(i / n)) % n, 1 + i / m];
      r[i] = w * Math.sinh(0.3 * x[j]) + 0.5 * x[j] * x[k];
      // Added, not assigned: j = k leaves ½xⱼ², whose derivative xⱼ is the two halves together.
      J[i][j] += 0.3 * w * Math.cosh(0.3 * x[j]) + 0.5 * x[k];
      J[i][k] += 0.5 * x[j];
    }
    return { r, J };
  };
}

/** Calls of the residuals and the Jacobian for the verdict on a correct Jacobian, at one probe. */
function callsAgainstSize(): JacobianCallsRow[] {
  return [2, 8, 32, 64, 128].flatMap((n) =>
    [n, 4 * n].map((m) => {
      const residuals = scalableResiduals(n, m);
      const point = Array.from({ length: n }, (_, j) => Math.sin(j + 1));
      const report = runEngine(residuals, (x) => residuals(x).J, point);
      return { n, m, status: report.status, mode: report.probes[0]?.mode ?? '–', residualCalls: report.evaluations.objective, jacobianCalls: report.evaluations.gradient, textbook: n + 2, gradientTarget: verdictCallsTarget(n) };
    }),
  );
}
