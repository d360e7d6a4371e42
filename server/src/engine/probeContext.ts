// What every check at one probe needs: the point, f and ∇f there, the noise
// level, and the rules that turn a numerical derivative into a verdict.
import { confirmDerivative, defaultDifferenceSettings, differentiate, type DerivativeEstimate, type DifferenceSettings } from './differences';
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
}

export interface Judgement {
  errorBound: number;
  relError: number;
  mismatch: boolean;
  /** The error bound is small enough to say something about this derivative. */
  decidable: boolean;
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

/**
 * A derivative is wrong only when analytic and numerical differ by more than the
 * numerical error bound plus the roundoff of the analytic value. `roundoffScale`
 * is the size of the terms summed into the analytic value (|g_i|, or Σ|g_i v_i|).
 */
export function judge(analytic: number, numerical: DerivativeEstimate, roundoffScale: number, unit: number): Judgement {
  const difference = Math.abs(analytic - numerical.value);
  const size = Math.max(Math.abs(analytic), Math.abs(numerical.value));
  const relError = size > 0 ? difference / size : 0;
  const floor = roundoffFloor(roundoffScale, size, unit);
  const usable = numerical.resolved && Number.isFinite(numerical.value) && Number.isFinite(numerical.errorBound);
  const mismatch = usable && !numerical.kink && difference > numerical.errorBound + floor;
  const decidable = mismatch || (usable && !numerical.kink && numerical.errorBound <= 0.1 * size);
  return { errorBound: numerical.errorBound, relError, mismatch, decidable };
}

/** Rounding the analytic value may carry: a few units of roundoff of its largest term sum. */
export function roundoffFloor(roundoffScale: number, size: number, unit: number): number {
  return roundoffUlps * unit * Math.max(roundoffScale, size);
}

/** Initial difference step relative to the coordinate scale, from the relative noise ε_r: ~ε_r^(1/5), the optimum for an O(h⁴) extrapolated difference. */
export function initialRelativeStep(context: ProbeContext): number {
  const relativeNoise = context.noise / Math.max(Math.abs(context.value), context.noise, Number.MIN_VALUE);
  return Math.min(0.05, Math.max(1e-3, 4 * Math.pow(relativeNoise, 0.2)));
}

/**
 * φ'(0) for φ(t) = f(x + t·v), judged against `analytic`; a mismatch is only
 * kept when an independent step sequence confirms it (`confirm`).
 */
export function checkDirection(context: ProbeContext, direction: Float64Array, step: number, analytic: number, roundoffScale: number, unit: number, options: { minLevels?: number; confirm?: boolean } = {}): { numerical: DerivativeEstimate; verdict: Judgement } {
  const site: CallSite = { probeIndex: context.probeIndex, point: 'a finite-difference point' };
  const phi = (t: number) => context.calls.objective(offset(context.x, t, direction), site);
  return checkSlice(phi, context.value, step, analytic, roundoffScale, unit, { ...defaultDifferenceSettings, minLevels: options.minLevels ?? defaultDifferenceSettings.minLevels, noise: context.noise }, options.confirm ?? true);
}

export function checkSlice(phi: (t: number) => number, phi0: number, step: number, analytic: number, roundoffScale: number, unit: number, settings: DifferenceSettings, confirm = true): { numerical: DerivativeEstimate; verdict: Judgement } {
  // No retry at much smaller steps: below the scale where noise was measured, a
  // rough objective (simulation noise) would show derivatives of its roughness.
  let numerical = differentiate(phi, phi0, step, settings);
  let verdict = judge(analytic, numerical, roundoffScale, unit);
  if (verdict.mismatch && confirm) {
    numerical = confirmDerivative(phi, phi0, numerical, step, settings);
    verdict = judge(analytic, numerical, roundoffScale, unit);
  }
  return { numerical, verdict };
}
