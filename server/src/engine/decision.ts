// The one rule that turns a numerical derivative into a verdict on an analytic one: it agrees,
// it differs, or it is undecided, and then why. Every check (components, directions, pools,
// single coordinates) and every verdict built on them (a probe's, a pair's) asks here.
import type { DerivativeEstimate } from './differences';
import type { ComponentCheck, DirectionalCheck, UndecidedReason } from './types';

export interface Judgement {
  errorBound: number;
  relError: number;
  mismatch: boolean;
  /** Why no verdict is possible for this derivative; null when it agrees or differs. */
  undecided: UndecidedReason | null;
}

/**
 * Share of a derivative's size its error bound may reach for "agrees" to mean something: a bound
 * of a tenth of the derivative still tells a sign flip, a factor of 2 and a tenth-sized slip
 * apart from the truth (common practice for relative tolerances of derivative checks).
 */
export const decisiveBoundShare = 0.1;

/**
 * A derivative is wrong only when analytic and numerical differ by more than the numerical error
 * bound plus `roundoff`, the rounding the analytic value may carry. It agrees only when the bound
 * is at most a tenth of `size`: the derivative's own size, or, for a random direction, what a
 * direction is expected to see (see directionalSize). A slice that is constant at every step
 * agrees with an analytic zero exactly.
 */
export function judge(analytic: number, numerical: DerivativeEstimate, roundoff: number, size: number): Judgement {
  const difference = Math.abs(analytic - numerical.value);
  const ownSize = Math.max(Math.abs(analytic), Math.abs(numerical.value));
  const relError = ownSize > 0 ? difference / ownSize : 0;
  const base = { errorBound: numerical.errorBound, relError };
  if (numerical.kink) return { ...base, mismatch: false, undecided: 'not-smooth' };
  if (!numerical.resolved || !Number.isFinite(numerical.value) || !Number.isFinite(numerical.errorBound)) {
    return { ...base, mismatch: false, undecided: 'singular-within-step' };
  }
  if (difference > numerical.errorBound + roundoff) return { ...base, mismatch: true, undecided: null };
  if (numerical.flat && Math.abs(analytic) <= roundoff) return { ...base, mismatch: false, undecided: null };
  if (numerical.errorBound <= decisiveBoundShare * Math.max(size, ownSize)) return { ...base, mismatch: false, undecided: null };
  return { ...base, mismatch: false, undecided: 'bound-too-wide' };
}

/** A direction's row in the report, carrying the reason when it got no verdict. */
export function directionalCheckOf(analytic: number, numerical: number, verdict: Judgement): DirectionalCheck {
  const check: DirectionalCheck = { analytic, numerical, errorBound: verdict.errorBound, mismatch: verdict.mismatch };
  if (verdict.undecided) check.undecided = verdict.undecided;
  return check;
}

/** A component's row in the report: a direction's row with its index and relative error. */
export function componentCheckOf(index: number, analytic: number, numerical: number, verdict: Judgement): ComponentCheck {
  return { index, ...directionalCheckOf(analytic, numerical, verdict), relError: verdict.relError };
}

/** True when the estimate can bound anything: finite, settled as the step shrank, and smooth. */
export function isUsable(verdict: Judgement): boolean {
  return verdict.undecided !== 'singular-within-step' && verdict.undecided !== 'not-smooth';
}

/** True when the judgement says something: the derivative agrees or differs. */
export function isDecided(judgement: { mismatch: boolean; undecided?: UndecidedReason | null }): boolean {
  return judgement.mismatch || !judgement.undecided;
}

/**
 * The size a random direction is expected to see over indices [from, to). Directions are
 * v_i = z_i·s_i/‖z‖ with z standard normal and s_i = max(|x_i|, 1), so g·v has a spread of
 * √(Σ (g_i s_i)²/m) over m indices, and an error e in the gradient shows the same way. A
 * direction thus decides the gradient against that spread, whatever ∇f·v happens to be: a
 * direction nearly orthogonal to ∇f is not undecided for it.
 */
export function directionalSize(gradient: ArrayLike<number>, x: ArrayLike<number>, from: number, to: number): number {
  let sum = 0;
  for (let i = from; i < to; i++) sum += (gradient[i] * Math.max(Math.abs(x[i]), 1)) ** 2;
  return Math.sqrt(sum / Math.max(1, to - from));
}

/** How an undecided derivative is explained to the user. */
export const undecidedWording: Readonly<Record<UndecidedReason, string>> = {
  'bound-too-wide': 'the error bound is as large as the derivative',
  'singular-within-step': 'the differences do not settle as the step shrinks (a pole or singularity lies within the step)',
  'not-smooth': 'the objective has a kink there',
  stationary: 'the probe is a stationary point, where the gradient is zero within the error bounds',
  'out-of-time': 'the time budget ran out before it was checked',
};
