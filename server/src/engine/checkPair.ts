// Entry point of the numeric engine: the whole check plan for one pair.
import { undecidedWording } from './decision';
import { formatBound, formatList } from './format';
import { buildStepStudy, carriedNoise, checkProbe, type ProbeOutcome, type ProbeWork } from './probeCheck';
import type { ProbeContext } from './probeContext';
import { createRandom } from './random';
import { compareWithResiduals } from './leastSquaresForm';
import { probeSmoothness, smoothnessOf } from './smoothness';
import { descend, reviewLearningRate } from './stepSize';
import { budgetFinding, callsPerDerivative, firstProbeWork, probeTimeMargin, probesCutFinding, runTarget } from './targetRun';
import type { CheckOptions, CheckPlan, Finding, PairReport, ProbeReport, UndecidedReason, Vector } from './types';
import { BudgetSpent, type UserCalls } from './userCalls';

/** The user's functions as the engine sees them; the sandbox builds these. */
export interface PairFunctions {
  objective(x: Vector): unknown;
  /** The derivative function; a product (a Hessian-vector product) also takes the direction. */
  gradient(x: Vector, direction?: Vector): unknown;
  /** A fresh vector of the kind (number[] or Float64Array) and realm the user's code expects. */
  makeVector(values: ArrayLike<number>): Vector;
  /** The residual function and Jacobian the objective is built from, when discovery found them: ∇f is compared with Jᵀr. */
  residuals?: PairFunctions;
}

export type PairPlan = Pick<CheckPlan, 'dimension' | 'learningRate' | 'options'> & {
  /** The user's starting point, read from their module: probe 1 when no probes are given. */
  startPoint?: number[] | null;
  /** Clock time by which the check must be done (the sandbox's budget); it then reports what it decided. */
  endsAt?: number | null;
};

// Independent seeded streams, so one probe's choices do not shift another's.
const streams = { noise: 1000, directions: 2000, smoothness: 3000 };

/**
 * Runs the full check of one pair: gradient check at each probe, smoothness
 * probes, learning-rate verdict. Catches everything the user's code throws and
 * turns it into findings; never throws itself.
 * `probes` may be empty when `plan.dimension` is known: seeded random probes are drawn.
 */
export function checkPair(fns: PairFunctions, probes: number[][], plan: PairPlan, clock: () => number = Date.now): PairReport {
  return runTarget('gradient', fns, probes, plan, clock, null, (calls, points, options, report, budget) => {
    const first = runChecks(calls, points, plan, options, report);
    if (first && fns.residuals) compareWithResiduals(fns.residuals, first, budget, report);
  });
}



/** f and ∇f at the probe, then its derivatives. */
function expectedSpotCalls(work: Extract<ProbeWork, { mode: 'spot' }>): number {
  return 2 + callsPerDerivative * (1 + work.components.length);
}

/** Returns the first probe's context (f and ∇f there), or null when no probe was decided. */
function runChecks(calls: UserCalls, points: Float64Array[], plan: PairPlan, options: CheckOptions, report: PairReport): ProbeContext | null {
  // The gradient verdict first, probe by probe while it keeps passing: a mismatch decides it.
  // Probe 1 is checked whole; the others are spot checks where probe 1 settled the gradient,
  // and a spot check that finds a mismatch or a kink is checked again whole, with the noise measured there.
  const outcomes: ProbeOutcome[] = [];
  let cutShort = false;
  const randomsOf = (p: number) => [createRandom(options.seed, streams.noise + p), createRandom(options.seed, streams.directions + p)] as const;
  try {
    const first = checkProbe(calls, points[0], 0, null, (context) => firstProbeWork(context.calls, context.x.length, options), ...randomsOf(0));
    outcomes.push(first);
    const firstProbeCalls = calls.made();
    const { mode } = first.report;
    const trimmed = first.directional && mode === 'directional' ? first.directional.directions.length : options.directionCount;
    if (trimmed < options.directionCount && !first.cut) report.findings.push(budgetFinding(calls, `the time budget allowed ${trimmed} of ${options.directionCount} random directions at probe 1`));
    const whole: ProbeWork = mode === 'full' ? { mode: 'full' } : { mode: 'directional', directions: trimmed };
    for (let p = 1; p < points.length && !outcomes.some((o) => o.mismatch || o.cut); p++) {
      const work = laterProbeWork(outcomes, whole);
      const expectedMs = (work.mode === 'spot' ? expectedSpotCalls(work) : firstProbeCalls) * calls.meanCallMs();
      if (calls.remainingMs() < probeTimeMargin * expectedMs) {
        cutShort = true;
        break;
      }
      let outcome = checkProbe(calls, points[p], p, work.mode === 'spot' ? carriedNoise(first.context) : null, () => work, ...randomsOf(p));
      // The spot check assumed probe 1's noise: what it saw is only believed once measured here.
      if ((outcome.mismatch || outcome.kink) && work.mode === 'spot') outcome = checkProbe(calls, points[p], p, null, () => whole, ...randomsOf(p));
      outcomes.push(outcome);
    }
    if (outcomes.some((o) => o.cut)) cutShort = true;
  } catch (err) {
    if (!(err instanceof BudgetSpent)) throw err;
    cutShort = true;
  }
  for (const outcome of outcomes) {
    report.probes.push(outcome.report);
    report.findings.push(...outcome.findings);
  }
  if (outcomes.length === 0) {
    report.status = 'inconclusive';
    report.findings.push(probesCutFinding(calls, 0, points.length));
    return null;
  }
  if (cutShort) report.findings.push(probesCutFinding(calls, outcomes.length, points.length));
  report.maxRelError = Math.max(...outcomes.map((o) => o.report.maxRelError));
  const failing = outcomes.find((o) => o.mismatch);
  report.diagnosis = failing ? failing.diagnosis : null;
  const studied = failing ?? outcomes[0];
  try {
    if (options.plots) studied.report.stepStudy = buildStepStudy(studied);
  } catch (err) {
    // The plot is left out; the verdict does not depend on it.
    if (!(err instanceof BudgetSpent)) throw err;
  }

  const unrepeatable = outcomes.filter((o) => o.unrepeatable);
  if (unrepeatable.length > 0) {
    report.findings.push({
      code: 'unrepeatable-objective',
      severity: 'warning',
      subject: 'objective',
      probeIndex: unrepeatable[0].context.probeIndex,
      message: `the objective returns different values for the same point (probe ${unrepeatable[0].context.probeIndex + 1}: ${unrepeatable[0].report.value}, then ${unrepeatable[0].repeatedValue}); randomness or hidden state makes finite differences unreliable`,
    });
  }
  const noisy = outcomes.filter((o) => o.noisy);
  if (noisy.length > 0) {
    report.findings.push({
      code: 'noisy-objective',
      severity: 'info',
      subject: 'objective',
      probeIndex: noisy[0].context.probeIndex,
      message: `the objective is too noisy to check the gradient at ${noisy.length === 1 ? 'probe' : 'probes'} ${noisy.map((o) => o.context.probeIndex + 1).join(', ')} (relative noise ≈ ${formatBound(noisy[0].report.noise)}): the numerical error bounds are as large as the gradient`,
    });
  }
  const stationary = outcomes.filter((o) => o.stationary);
  if (stationary.length > 0) report.findings.push(stationaryFinding(stationary, stationary.length === outcomes.length));
  const unconfirmed = failing ? null : unconfirmedDerivatives(outcomes);
  if (unconfirmed) report.findings.push(unconfirmed);
  if (failing) report.status = 'fail';
  else if (unrepeatable.length > 0 || outcomes.some((o) => o.kink) || unconfirmed || stationary.length === outcomes.length) report.status = 'inconclusive';

  // A wrong gradient gives wrong curvature, so smoothness and rates are only
  // estimated when no mismatch was found, and only at probes where f is smooth.
  if (failing) return outcomes[0].context;
  const smooth = outcomes.find((o) => !o.kink);
  if (smooth) estimateSmoothness(calls, smooth.context, smooth.report, plan, options, report);
  return outcomes[0].context;
}

/**
 * L̂ and the learning-rate verdict of gradient descent on f, once its gradient is known to be
 * right, at one probe (`context`, whose report is `probe`): for a gradient pair the first where f
 * is smooth, which is the user's start when there is one (where their descent begins); for a
 * Jacobian, f = ½‖r‖² with gradient Jᵀr. The curvature costs two gradient calls per Lanczos step,
 * so it is measured at one probe only, and only when a learning rate is declared or the caller
 * asks for it (`options.smoothness`). A budget that runs out leaves no verdict, and says so.
 */
export function estimateSmoothness(calls: UserCalls, context: ProbeContext, probe: ProbeReport, plan: PairPlan, options: CheckOptions, report: PairReport): void {
  if (!(plan.learningRate || options.smoothness || options.plots)) return;
  try {
    const estimate = probeSmoothness(context, createRandom(options.seed, streams.smoothness + context.probeIndex), options.lanczosSteps);
    probe.smoothness = estimate;
    report.smoothness = estimate ? smoothnessOf(estimate) : null;
    if (!report.smoothness) return;
    const declared = plan.learningRate;
    const { x, value, probeIndex } = context;
    const run = (rate: number, label: 'declared' | 'safe' | 'limit') => descend(calls, x, value, rate, options.descentSteps, label, probeIndex);
    const declaredRuns = declared ? [run(declared.value, 'declared')] : [];
    probe.descent.push(...declaredRuns);
    if (options.plots) {
      probe.descent.push(run(report.smoothness.safeStep, 'safe'));
      if (report.smoothness.divergenceStep !== null) probe.descent.push(run(report.smoothness.divergenceStep, 'limit'));
    }
    if (declared) {
      const review = reviewLearningRate(declared, report.smoothness, declaredRuns);
      report.learningRate = review.verdict;
      report.findings.push(...review.findings);
    }
  } catch (err) {
    if (!(err instanceof BudgetSpent)) throw err;
    report.smoothness = null;
    report.learningRate = null;
    report.findings.push(budgetFinding(calls, 'the time budget ran out before the smoothness estimate was done; no learning-rate verdict'));
  }
}

/**
 * The pair-level rule: a pair passes only when every component (full mode) agreed at some probe,
 * or, in directional mode, some probe decided every direction. Otherwise the finding names what
 * stayed undecided and why (the reason seen at the first probe where it was).
 */
function unconfirmedDerivatives(outcomes: ProbeOutcome[]): Finding | null {
  if (outcomes[0].report.mode === 'directional') {
    if (decidedEveryDirection(outcomes)) return null;
    const first = outcomes.find((o) => !o.stationary);
    if (!first) return null;
    const reasons = [...new Set(first.directional?.directions.flatMap((d) => (d.undecided ? [d.undecided] : [])) ?? [])];
    return undecidedFinding(`no probe decided every random direction (at probe ${first.context.probeIndex + 1}: ${reasons.map((r) => undecidedWording[r]).join('; ')})`, [], first.context.probeIndex);
  }
  const reasonOf = new Map<number, UndecidedReason>();
  const confirmed = confirmedComponents(outcomes);
  for (const outcome of outcomes) {
    for (const c of outcome.full?.components ?? []) if (c.undecided && !reasonOf.has(c.index)) reasonOf.set(c.index, c.undecided);
  }
  // Components no probe reached before the time budget ran out.
  for (let index = 0; index < outcomes[0].context.x.length; index++) {
    if (!confirmed.has(index) && !reasonOf.has(index)) reasonOf.set(index, 'out-of-time');
  }
  // Stationary probes and kinks have findings of their own.
  const open = [...reasonOf].filter(([index, reason]) => !confirmed.has(index) && reason !== 'stationary' && reason !== 'not-smooth');
  if (open.length === 0) return null;
  const byReason = new Map<UndecidedReason, number[]>();
  for (const [index, reason] of open) byReason.set(reason, [...(byReason.get(reason) ?? []), index]);
  const parts = [...byReason].map(([reason, indices]) => `${indices.length === 1 ? 'component' : 'components'} ${formatList(indices)}: ${undecidedWording[reason]}`);
  return undecidedFinding(`the gradient could not be confirmed at any probe for ${parts.join('; ')}`, open.map(([index]) => index).sort((a, b) => a - b), undefined);
}

function undecidedFinding(message: string, components: number[], probeIndex: number | undefined): Finding {
  const finding: Finding = { code: 'gradient-undecided', severity: 'info', subject: 'gradient', message };
  if (components.length > 0) finding.components = components;
  if (probeIndex !== undefined) finding.probeIndex = probeIndex;
  return finding;
}

function stationaryFinding(stationary: ProbeOutcome[], all: boolean): Finding {
  const which = `${stationary.length === 1 ? 'probe' : 'probes'} ${stationary.map((o) => o.context.probeIndex + 1).join(', ')}`;
  const consequence = all
    ? 'no probe could decide the verdict; give a probe point away from it'
    : 'the other probes decide the verdict';
  return {
    code: 'stationary-probe',
    severity: 'info',
    subject: 'probe',
    probeIndex: stationary[0].context.probeIndex,
    message: `${which} ${stationary.length === 1 ? 'is a stationary point' : 'are stationary points'}: the gradient is zero there within the error bounds, so a wrong sign or factor cannot show; ${consequence}`,
  };
}

/** The time budget cut the check: what was left undone, with the figures to size the budget. */

/**
 * A later probe's work: a spot check of what is still open once an earlier probe settled the
 * gradient (full mode: the components no probe confirmed; directional mode: a probe that decided
 * every direction); else the whole check again.
 */
function laterProbeWork(outcomes: ProbeOutcome[], whole: ProbeWork): ProbeWork {
  if (whole.mode === 'directional') return decidedEveryDirection(outcomes) ? { mode: 'spot', components: [] } : whole;
  const n = outcomes[0].context.x.length;
  const confirmed = confirmedComponents(outcomes);
  if (confirmed.size === 0) return whole;
  return { mode: 'spot', components: Array.from({ length: n }, (_, i) => i).filter((i) => !confirmed.has(i)) };
}

/** Some probe checked by random directions decided every one of them (and is not stationary). */
function decidedEveryDirection(outcomes: ProbeOutcome[]): boolean {
  return outcomes.some((o) => o.report.mode === 'directional' && o.complete && !o.stationary);
}

/** Components that agreed at some probe. */
function confirmedComponents(outcomes: ProbeOutcome[]): Set<number> {
  const confirmed = new Set<number>();
  for (const outcome of outcomes) for (const c of outcome.full?.components ?? []) if (!c.undecided && !c.mismatch) confirmed.add(c.index);
  return confirmed;
}


