// What the check of every kind of target shares: the points it probes (given, around the
// user's start, or drawn), the calls into the user's code, the report around them, and the
// guarantee that nothing the user's code does escapes as a throw.
import type { PairFunctions, PairPlan } from './checkPair';
import { emptyReport } from './emptyReport';
import { formatBound } from './format';
import { defaultDifferenceSettings } from './differences';
import { createRandom } from './random';
import { probesAroundStart } from './startProbes';
import { defaultCheckOptions, type CheckOptions, type Finding, type PairReport, type TargetKind } from './types';
import { CheckStopped, createUserCalls, describeThrown, makeFinding, type CallBudget, type CallRoles, type UserCalls } from './userCalls';

// The seeded stream of the drawn probes, apart from every other random choice.
const probeStream = 1;

/** Another probe is started only when this many times its expected time is left in the budget. */
export const probeTimeMargin = 1.2;

/**
 * Calls a smooth slice's difference takes: the tableau's least rows, two calls each. Plans are
 * sized from it and the measured cost of a call.
 */
export const callsPerDerivative = 2 * defaultDifferenceSettings.minLevels;
/** The first probe's comparison may take this share of the time left; the rest is for the other probes and the curvature. */
const firstProbeShare = 0.5;

/**
 * The first probe's comparison, from what a call of the value function cost there: every
 * component (or column) when the dimension allows it (a cap on calls) and the time left does, or
 * when it costs no more than the random directions would; else random directions, as many as fit
 * in the time left.
 */
export function firstProbeWork(calls: UserCalls, n: number, options: CheckOptions): { mode: 'full' } | { mode: 'directional'; directions: number } {
  const available = firstProbeShare * calls.remainingMs();
  const derivativeMs = callsPerDerivative * calls.meanCallMs('objective');
  const affordable = derivativeMs > 0 ? Math.floor(available / derivativeMs) : Number.POSITIVE_INFINITY;
  if (n <= options.fullCheckMaxDimension && (n <= options.directionCount || n <= affordable)) return { mode: 'full' };
  return { mode: 'directional', directions: Math.max(1, Math.min(options.directionCount, affordable)) };
}

/**
 * Runs `body` on the target's probe points with its calls counted and budgeted, and turns
 * whatever it throws into a finding: the report is always returned, never a throw. `roles`
 * names the two functions in messages (null: objective and gradient).
 */
export function runTarget(
  kind: TargetKind,
  fns: PairFunctions,
  probes: number[][],
  plan: PairPlan,
  clock: () => number,
  roles: CallRoles | null,
  body: (calls: UserCalls, points: Float64Array[], options: CheckOptions, report: PairReport, budget: CallBudget) => void,
): PairReport {
  const started = readClock(clock);
  const report: PairReport = emptyReport('pass', [], null, kind);
  let calls: UserCalls | null = null;
  try {
    const options: CheckOptions = { ...defaultCheckOptions, ...(plan && plan.options) };
    const points = probePoints(probes, plan, options, report);
    if (points !== null) {
      const budget: CallBudget = { clock: () => readClock(clock), endsAt: plan.endsAt ?? null };
      calls = createUserCalls(fns, points[0].length, budget, roles ?? undefined);
      body(calls, points, options, report, budget);
    }
  } catch (err) {
    report.status = 'error';
    if (err instanceof CheckStopped) report.findings.push(err.finding);
    else report.findings.push(makeFinding('runtime-error', 'objective', `the check itself failed unexpectedly: ${describeThrown(err).text}`));
  }
  if (calls !== null) {
    report.findings.push(...calls.warnings);
    report.evaluations = { objective: calls.counts.objective, gradient: calls.counts.gradient };
  }
  report.elapsedMs = Math.max(0, readClock(clock) - started);
  return report;
}

/**
 * Given probes; else the user's start with perturbations around it; else seeded
 * standard-normal points when only the dimension is known.
 */
export function probePoints(probes: number[][], plan: PairPlan, options: CheckOptions, report: PairReport): Float64Array[] | null {
  const bad = (message: string) => {
    report.status = 'error';
    report.findings.push({ code: 'bad-probe', severity: 'error', subject: 'probe', message });
    return null;
  };
  if (Array.isArray(probes) && probes.length > 0) {
    const n = probes[0].length;
    if (!(n > 0)) return bad('probe 1 has no coordinates');
    for (let p = 0; p < probes.length; p++) {
      if (probes[p].length !== n) return bad(`probe ${p + 1} has ${probes[p].length} coordinates but probe 1 has ${n}`);
      if (!probes[p].every((v) => typeof v === 'number' && Number.isFinite(v))) return bad(`probe ${p + 1} has a coordinate that is not a finite number`);
    }
    report.dimension = n;
    return probes.map((probe) => Float64Array.from(probe));
  }
  const random = createRandom(options.seed, probeStream);
  const start = plan && plan.startPoint;
  if (Array.isArray(start) && start.length > 0) {
    if (typeof plan.dimension === 'number' && start.length !== plan.dimension) {
      return bad(`the starting point has ${start.length} coordinates but the objective takes ${plan.dimension}`);
    }
    report.dimension = start.length;
    return probesAroundStart(Float64Array.from(start), options.probeCount, random);
  }
  const n = plan ? plan.dimension : null;
  if (typeof n !== 'number' || !Number.isInteger(n) || n <= 0) {
    report.status = 'error';
    report.findings.push({ code: 'unknown-dimension', severity: 'error', subject: 'objective', message: 'no probe points are given and the dimension is unknown; add a probe point or a fixed-length parameter type' });
    return null;
  }
  report.dimension = n;
  const points: Float64Array[] = [];
  for (let p = 0; p < Math.max(1, options.probeCount); p++) {
    const point = new Float64Array(n);
    for (let i = 0; i < n; i++) point[i] = random.normal();
    points.push(point);
  }
  return points;
}

/** The budget stopped the probes after `checked` of `total`: the verdict rests on those (none: no verdict). */
export function probesCutFinding(calls: UserCalls, checked: number, total: number): Finding {
  if (checked === 0) return budgetFinding(calls, 'the time budget ran out before probe 1 was decided; no verdict');
  return budgetFinding(calls, `the time budget ran out after ${checked === 1 ? 'probe 1' : `probes 1–${checked}`} of ${total}; the verdict rests on ${checked === 1 ? 'it' : 'them'}`);
}

/** The time budget ran out: what was decided, and how many calls it took. */
export function budgetFinding(calls: UserCalls, what: string): Finding {
  const made = calls.made();
  return {
    code: 'budget-spent',
    severity: 'info',
    subject: 'objective',
    message: `${what} (${made} calls of the ${calls.roles.objective} and ${calls.roles.gradient}, about ${formatBound(calls.meanCallMs())} ms each); a larger time limit would let the check finish`,
  };
}

export function readClock(clock: () => number): number {
  try {
    const now = clock();
    return typeof now === 'number' && Number.isFinite(now) ? now : 0;
  } catch {
    return 0;
  }
}
