// What every check at one probe needs: the point, f and ∇f there, the noise
// level, and the rules that turn a numerical derivative into a verdict.
import { confirmDerivative, defaultDifferenceSettings, differentiate, type DerivativeEstimate, type DifferenceSettings } from './differences';
import { isDecided, judge, type Judgement } from './decision';
import type { CallSite, UserCalls } from './userCalls';
import { offset } from './vectors';

export interface ProbeContext {
  calls: UserCalls;
  probeIndex: number;
  x: Float64Array;
  value: number;
  gradient: Float64Array;
  /** Absolute noise of f near x (Moré–Wild). */
  noise: number;
  /** Unit roundoff the gradient seems to be computed in (float32 or float64). */
  gradientUnit: number;
  /**
   * Largest |vᵀHv|/‖v‖² the gradient check's own differences bound from below (noteCurvature):
   * the curvature estimate takes it as a lower bound on L̂ without a further call.
   */
  curvatureSeen: number;
}

/** Keeps the Rayleigh quotient a slice along `direction` (of squared length `lengthSquared`) bounded from below. */
export function noteCurvature(context: ProbeContext, estimate: DerivativeEstimate, lengthSquared: number): void {
  if (lengthSquared > 0) context.curvatureSeen = Math.max(context.curvatureSeen, estimate.curvatureFloor / lengthSquared);
}

const float32Unit = 2 ** -23;
const float64Unit = 2 ** -52;
// Rounding in the user's own gradient arithmetic: a few units of roundoff (common practice).
const roundoffUlps = 16;

/** float32 when every gradient component is exactly representable in float32 and some need the precision. */
export function gradientUnitOf(gradient: Float64Array): number {
  let needsBits = false;
  for (let i = 0; i < gradient.length; i++) {
    const g = gradient[i];
    if (Math.fround(g) !== g) return float64Unit;
    if (!Number.isInteger(g * 1024)) needsBits = true;
  }
  return needsBits ? float32Unit : float64Unit;
}

/** Rounding the analytic value may carry: a few units of roundoff of its largest term sum. */
export function roundoffFloor(roundoffScale: number, size: number, unit: number): number {
  return roundoffUlps * unit * Math.max(roundoffScale, size);
}

/**
 * The first step of a difference tableau, relative to the coordinate scale: 4·ε_r^(1/5) from the
 * relative noise ε_r, the optimum order for an O(h⁴) extrapolated difference (the tableau then
 * halves it), kept within [10⁻³, 0.05] so neither rounding nor curvature dominates the first
 * rows (common practice).
 */
const initialStepFactor = 4;
const extrapolatedOrder = 4;
const smallestInitialStep = 1e-3;
const largestInitialStep = 0.05;

export function initialRelativeStep(context: ProbeContext): number {
  return relativeStepFor(context.noise / Math.max(Math.abs(context.value), context.noise, Number.MIN_VALUE));
}

/** The first relative step for a function of relative noise `relativeNoise` (see above). */
export function relativeStepFor(relativeNoise: number): number {
  return Math.min(largestInitialStep, Math.max(smallestInitialStep, initialStepFactor * Math.pow(relativeNoise, 1 / (extrapolatedOrder + 1))));
}

/** What a derivative is judged against: the rounding its analytic value may carry, and its size (decision.ts). */
export interface AnalyticScales {
  /** Size of the terms summed into the analytic value (|g_i|, or Σ|g_i v_i|). */
  roundoffScale: number;
  /** Unit roundoff the analytic value was computed in. */
  unit: number;
  /** What the error bound is compared with besides the derivative's own size; 0 for none. */
  size: number;
}

/**
 * φ'(0) for φ(t) = f(x + t·v), judged against `analytic`; a mismatch is only
 * kept when an independent step sequence confirms it (`confirm`).
 */
export function checkDirection(context: ProbeContext, direction: Float64Array, step: number, analytic: number, scales: AnalyticScales, options: { minLevels?: number; confirm?: boolean } = {}): { numerical: DerivativeEstimate; verdict: Judgement } {
  const site: CallSite = { probeIndex: context.probeIndex, point: 'a finite-difference point' };
  const phi = (t: number) => context.calls.objective(offset(context.x, t, direction), site);
  return checkSlice(phi, context.value, step, analytic, scales, { ...defaultDifferenceSettings, minLevels: options.minLevels ?? defaultDifferenceSettings.minLevels, noise: context.noise }, options.confirm ?? true);
}

/**
 * An undecided estimate is tried again from this much smaller a first step: a pole or a feature
 * inside the first step (1/x at x = 10⁻⁴ with a step of 10⁻³) is then left outside it. Two
 * retries bring the first step to 1/256 of the first try. A retry is kept only when it decides;
 * where noise made the bound wide, smaller steps only widen it.
 */
const retryShrink = 16;
const undecidedRetries = 2;

/** Undecided for a reason a smaller step may remove (not a kink, which smaller steps only confirm). */
function retryable(verdict: Judgement): boolean {
  return verdict.undecided === 'bound-too-wide' || verdict.undecided === 'singular-within-step';
}

export function checkSlice(phi: (t: number) => number, phi0: number, step: number, analytic: number, scales: AnalyticScales, settings: DifferenceSettings, confirm = true): { numerical: DerivativeEstimate; verdict: Judgement } {
  const judged = (estimate: DerivativeEstimate) =>
    judge(analytic, estimate, roundoffFloor(scales.roundoffScale, Math.max(Math.abs(analytic), Math.abs(estimate.value)), scales.unit), scales.size);
  let numerical = differentiate(phi, phi0, step, settings);
  let verdict = judged(numerical);
  for (let retry = 0, smaller = step; retry < undecidedRetries && retryable(verdict); retry++) {
    smaller /= retryShrink;
    const again = differentiate(phi, phi0, smaller, settings);
    const againVerdict = judged(again);
    if (isDecided(againVerdict) || (verdict.undecided === 'singular-within-step' && againVerdict.undecided !== 'singular-within-step')) {
      [numerical, verdict, step] = [again, againVerdict, smaller];
    }
  }
  if (verdict.mismatch && confirm) {
    numerical = confirmDerivative(phi, phi0, numerical, step, settings);
    verdict = judged(numerical);
  }
  return { numerical, verdict };
}
