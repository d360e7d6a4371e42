// The whole check of a target whose derivative is a matrix (a Jacobian, a Hessian, a
// Hessian-vector product): probe 1 whole, the other probes as spot checks of what is still
// open, stopping at the first mismatch, as for a gradient (checkPair.ts). What differs by kind
// (how the analytic matrix is read, what is added once it holds) comes from a MatrixKind.
import type { PairFunctions, PairPlan } from './checkPair';
import { isDecided, undecidedWording } from './decision';
import { kindWording } from './kindWording';
import { checkMatrixProbe, largestWholeMatrix, type AnalyticMatrix, type MatrixProbeContext, type MatrixProbeOutcome, type MatrixWork } from './matrixProbe';
import { createRandom } from './random';
import { callsPerDerivative, firstProbeWork, probeTimeMargin, probesCutFinding, runTarget } from './targetRun';
import type { CheckOptions, Finding, PairReport, TargetKind } from './types';
import { BudgetSpent, makeFinding, type CallSite, type UserCalls } from './userCalls';
import { largest } from './vectors';
import { matrixMismatchMessage } from './wording';

/** What one matrix kind adds to the shared check. */
export interface MatrixKind {
  kind: TargetKind;
  /**
   * The analytic matrix at x, given how many outputs F has: the user's matrix read and its shape
   * checked, or products of the user's product function.
   */
  analyticAt(calls: UserCalls, x: Float64Array, outputs: number, site: CallSite, options: CheckOptions): AnalyticMatrix;
  /** Findings and figures once the derivative is known to be right (or at least not wrong) at the probes. */
  afterCheck?(outcomes: MatrixProbeOutcome[], report: PairReport, plan: PairPlan, options: CheckOptions): void;
}

// The seeded stream of each probe's random directions, apart from the drawn probes' (targetRun.ts).
const directionStream = 2000;

/** Never throws: what the user's code does wrong becomes findings. */
export function checkMatrixTarget(kind: MatrixKind, fns: PairFunctions, probes: number[][], plan: PairPlan, clock: () => number = Date.now): PairReport {
  const wording = kindWording[kind.kind];
  return runTarget(kind.kind, fns, probes, plan, clock, { objective: wording.value, gradient: wording.derivative }, (calls, points, options, report) => runProbes(kind, calls, points, plan, options, report));
}

function runProbes(kind: MatrixKind, calls: UserCalls, points: Float64Array[], plan: PairPlan, options: CheckOptions, report: PairReport): void {
  const wording = kindWording[kind.kind];
  const n = points[0].length;
  const analyticAt = (x: Float64Array, outputs: number, site: CallSite) => kind.analyticAt(calls, x, outputs, site, options);
  // Probe 1 whole: column by column where the user gives the whole matrix, its size allows and
  // the time left does (firstProbeWork, as for a gradient); else random directions.
  const firstWork = (context: MatrixProbeContext): MatrixWork =>
    context.analytic.dense && context.values.length * n <= largestWholeMatrix ? firstProbeWork(calls, n, options) : { mode: 'directional', directions: options.directionCount };
  const outcomes: MatrixProbeOutcome[] = [];
  let cutShort = false;
  try {
    const first = checkMatrixProbe(calls, points[0], 0, analyticAt, firstWork, createRandom(options.seed, directionStream));
    outcomes.push(first);
    const firstProbeCalls = calls.made();
    const whole: MatrixWork = first.report.mode === 'full' ? { mode: 'full' } : { mode: 'directional', directions: first.report.directions.length || options.directionCount };
    for (let p = 1; p < points.length && !outcomes.some((o) => o.mismatch || o.cut); p++) {
      const random = () => createRandom(options.seed, directionStream + p);
      const work = laterWork(outcomes, whole, n);
      // What probe 1 spent before its slices (F, A, the repeat, the noise table), then a slice per column and direction.
      const expectedCalls = work.mode === 'spot' ? first.setupCalls + callsPerDerivative * (1 + work.columns.length) : firstProbeCalls;
      if (calls.remainingMs() < probeTimeMargin * expectedCalls * calls.meanCallMs()) {
        cutShort = true;
        break;
      }
      let outcome = checkMatrixProbe(calls, points[p], p, analyticAt, () => work, random());
      if ((outcome.mismatch || outcome.kink) && work.mode === 'spot') outcome = checkMatrixProbe(calls, points[p], p, analyticAt, () => whole, random());
      outcomes.push(outcome);
    }
    if (outcomes.some((o) => o.cut)) cutShort = true;
  } catch (err) {
    if (!(err instanceof BudgetSpent)) throw err;
    cutShort = true;
  }
  report.dimension = n;
  report.matrix = { rows: outcomes[0]?.context.values.length ?? 0, columns: n, diagnosis: null };
  if (outcomes.length === 0) {
    report.status = 'inconclusive';
    report.findings.push(probesCutFinding(calls, 0, points.length));
    return;
  }
  for (const outcome of outcomes) report.probes.push(outcome.report);
  if (cutShort) report.findings.push(probesCutFinding(calls, outcomes.length, points.length));
  report.maxRelError = largest(outcomes.map((o) => o.report.maxRelError));
  const failing = outcomes.find((o) => o.mismatch);
  const kinked = outcomes.filter((o) => o.kink);
  for (const outcome of kinked) report.findings.push(nonSmoothFinding(outcome));
  const unrepeatable = outcomes.find((o) => o.unrepeatable);
  if (unrepeatable) {
    report.findings.push({ code: 'unrepeatable-objective', severity: 'warning', subject: 'objective', probeIndex: unrepeatable.context.probeIndex, message: `the ${wording.value} returns different values for the same point (probe ${unrepeatable.context.probeIndex + 1}); randomness or hidden state makes finite differences unreliable` });
  }
  if (failing) {
    report.status = 'fail';
    report.matrix.diagnosis = failing.diagnosis;
    report.findings.push(mismatchFinding(kind, failing));
  } else {
    const undecided = unconfirmedEntries(outcomes, kind);
    if (undecided) report.findings.push(undecided);
    if (undecided || kinked.length > 0 || unrepeatable) report.status = 'inconclusive';
  }
  kind.afterCheck?.(outcomes, report, plan, options);
}

/** The later probes' work: one random direction, and the columns holding an entry no probe has confirmed yet. */
function laterWork(outcomes: MatrixProbeOutcome[], whole: MatrixWork, n: number): MatrixWork {
  if (whole.mode === 'directional') return outcomes.some((o) => o.complete) ? { mode: 'spot', columns: [] } : whole;
  const confirmed = confirmedEntries(outcomes);
  const rows = outcomes[0].context.values.length;
  const open = [...Array(n).keys()].filter((j) => [...Array(rows).keys()].some((i) => !confirmed.has(i * n + j)));
  return { mode: 'spot', columns: open };
}

/** Entries (as row·n + column) that agreed at some probe. */
function confirmedEntries(outcomes: MatrixProbeOutcome[]): Set<number> {
  const confirmed = new Set<number>();
  for (const o of outcomes) for (const e of o.entries) if (isDecided(e) && !e.mismatch) confirmed.add(e.row * o.context.x.length + e.column);
  return confirmed;
}

/**
 * The target-level rule, as for a gradient: it passes only when every entry agreed at some probe
 * (full work), or some probe decided every random direction (directional work).
 */
function unconfirmedEntries(outcomes: MatrixProbeOutcome[], kind: MatrixKind): Finding | null {
  const wording = kindWording[kind.kind];
  const first = outcomes[0];
  if (first.report.mode === 'directional') {
    if (outcomes.some((o) => o.complete)) return null;
    const reasons = [...new Set(first.report.directions.flatMap((d) => (d.undecided ? [d.undecided] : [])))];
    return { code: 'matrix-undecided', severity: 'info', subject: 'gradient', probeIndex: 0, message: `no probe decided every random direction of the ${wording.derivative} (at probe 1: ${reasons.map((r) => undecidedWording[r]).join('; ') || 'the check was cut short'})` };
  }
  const n = first.context.x.length;
  const confirmed = confirmedEntries(outcomes);
  const open = first.entries.filter((e) => !confirmed.has(e.row * n + e.column));
  const total = first.context.values.length * n;
  if (open.length === 0 && first.entries.length === total) return null;
  const shown = open.slice(0, 6).map((e) => `${wording.entry(e.row, e.column)} (${undecidedWording[e.undecided ?? 'out-of-time']})`);
  const finding: Finding = {
    code: 'matrix-undecided',
    severity: 'info',
    subject: 'gradient',
    probeIndex: 0,
    message: `${open.length + (total - first.entries.length)} of ${total} entries of the ${wording.derivative} got no verdict at any probe: ${shown.join(', ')}${open.length > 6 ? ', …' : ''}`,
  };
  if (open.length > 0) finding.entries = open.slice(0, 64).map((e) => [e.row, e.column]);
  return finding;
}

function mismatchFinding(kind: MatrixKind, outcome: MatrixProbeOutcome): Finding {
  const wording = kindWording[kind.kind];
  const { probeIndex } = outcome.context;
  const finding = makeFinding(wording.mismatchCode, 'gradient', matrixMismatchMessage(outcome.report, probeIndex, outcome.diagnosis, wording), { probeIndex, point: 'the probe' });
  const wrong = outcome.entries.filter((e) => e.mismatch);
  if (wrong.length > 0) finding.entries = wrong.slice(0, 64).map((e) => [e.row, e.column]);
  return finding;
}

function nonSmoothFinding(outcome: MatrixProbeOutcome): Finding {
  const kinks = outcome.entries.filter((e) => e.undecided === 'not-smooth');
  const columns = [...new Set(kinks.map((e) => e.column))];
  const where = columns.length > 0 ? `along coordinate ${columns.slice(0, 6).join(', ')}` : 'along a random direction';
  return {
    code: 'non-smooth-probe',
    severity: 'info',
    subject: 'objective',
    probeIndex: outcome.context.probeIndex,
    message: `the ${outcome.context.calls.roles.objective} looks non-smooth at probe ${outcome.context.probeIndex + 1} ${where}: forward and backward differences disagree and do not converge as the step shrinks, so the entries there cannot be checked`,
  };
}
