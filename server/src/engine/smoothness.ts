// Local curvature near a probe: Hessian-vector products by central differences
// of the gradient, Lanczos for the extreme eigenvalues, and secant slopes.
import { lanczosExtremes } from './lanczos';
import type { ProbeContext } from './probeContext';
import { normalVector, type Random } from './random';
import type { ProbeReport, SmoothnessEstimate } from './types';
import type { CallSite } from './userCalls';
import { allFinite, dot, norm2, offset } from './vectors';

export type ProbeSmoothness = NonNullable<ProbeReport['smoothness']>;

// Secant points sit this far from the probe in each coordinate, relative to max(|xᵢ|, 1).
const secantDistance = 1e-3;
const secantCount = 2;

/**
 * Hv ≈ (∇f(x + t·v) − ∇f(x − t·v)) / 2t for unit v (Nocedal & Wright 2006, eq. 8.18
 * in central form). Each coordinate moves by at most u^(1/3)·max(|xᵢ|, 1), which
 * balances O(t²) truncation against roundoff u in the gradient (common practice): one
 * step scaled by ‖x‖ would move a coordinate near 0 as far as one near 10⁶.
 */
export function hessianVectorProduct(context: ProbeContext, stretch = 1): (v: Float64Array) => Float64Array | null {
  const site: CallSite = { probeIndex: context.probeIndex, point: 'a Hessian-vector product point' };
  const reach = stretch * Math.cbrt(context.gradientUnit);
  return (v) => {
    let t = Number.POSITIVE_INFINITY;
    for (let i = 0; i < v.length; i++) if (v[i] !== 0) t = Math.min(t, (reach * Math.max(Math.abs(context.x[i]), 1)) / Math.abs(v[i]));
    if (!Number.isFinite(t)) return new Float64Array(v.length);
    const plus = context.calls.gradient(offset(context.x, t, v), site);
    const minus = context.calls.gradient(offset(context.x, -t, v), site);
    if (!allFinite(plus) || !allFinite(minus)) return null;
    const product = new Float64Array(v.length);
    for (let i = 0; i < v.length; i++) product[i] = (plus[i] - minus[i]) / (2 * t);
    return product;
  };
}

/**
 * ‖∇f(y) − ∇f(x)‖ / ‖y − x‖ for seeded y near x: a lower bound on the local Lipschitz constant.
 * Each coordinate of y − x is at most `secantDistance`·max(|xᵢ|, 1), as for the products above.
 */
export function secantSlopes(context: ProbeContext, random: Random): number {
  const site: CallSite = { probeIndex: context.probeIndex, point: 'a secant point' };
  let largest = 0;
  for (let k = 0; k < secantCount; k++) {
    const u = normalVector(random, context.x.length);
    const biggest = Math.max(...u.map(Math.abs)) || 1;
    const move = u.map((ui, i) => (secantDistance * Math.max(Math.abs(context.x[i]), 1) * ui) / biggest);
    const distance = norm2(move);
    if (!(distance > 0)) continue;
    const gradient = context.calls.gradient(offset(context.x, 1, move), site);
    if (!allFinite(gradient)) continue;
    let squared = 0;
    for (let i = 0; i < gradient.length; i++) squared += (gradient[i] - context.gradient[i]) ** 2;
    largest = Math.max(largest, Math.sqrt(squared) / distance);
  }
  return largest;
}

/**
 * The products' own error, from two step sizes: the Rayleigh quotient yᵀHy of the dominant Ritz
 * vector y with steps t and 2t. The O(t²) truncation error of the coarser step is about four
 * times that of the finer, and rounding differs between them, so the gap bounds both at t
 * (common practice, as in Richardson's error estimate).
 */
const errorStepRatio = 2;

function productError(context: ProbeContext, y: Float64Array): number | null {
  const fine = hessianVectorProduct(context)(y);
  const coarse = hessianVectorProduct(context, errorStepRatio)(y);
  return fine && coarse ? Math.abs(dot(y, fine) - dot(y, coarse)) : null;
}

export function probeSmoothness(context: ProbeContext, random: Random, lanczosSteps: number): ProbeSmoothness | null {
  const before = context.calls.counts.gradient;
  const lanczos = lanczosExtremes(hessianVectorProduct(context), normalVector(random, context.x.length), Math.max(1, Math.min(lanczosSteps, context.x.length)));
  const products = (context.calls.counts.gradient - before) / 2;
  if (lanczos === null) return null;
  const error = productError(context, lanczos.dominantVector);
  const secantMax = secantSlopes(context, random);
  const estimate: ProbeSmoothness = { lambdaMax: lanczos.lambdaMax, lambdaMin: lanczos.lambdaMin, ritzValues: lanczos.ritzValues, secantMax, hessianVectorProducts: Math.ceil(products) };
  if (error !== null) estimate.productError = error;
  if (context.curvatureSeen > 0) estimate.checkCurvature = context.curvatureSeen;
  // Unknown (a product failed at the first step) stays absent rather than Infinity, which JSON cannot carry.
  if (Number.isFinite(lanczos.lambdaMaxResidual)) estimate.lambdaMaxResidual = lanczos.lambdaMaxResidual;
  if (Number.isFinite(lanczos.lambdaMinResidual)) estimate.lambdaMinResidual = lanczos.lambdaMinResidual;
  return estimate;
}

/**
 * Residuals and product errors below this share of a Ritz value are not added to L̂: far smaller
 * than any rate verdict can feel (common practice).
 */
const unconvergedShare = 1e-6;

/**
 * The figures of one probe's curvature. L̂ = largest of |λmax|, |λmin| (each widened by its
 * Lanczos residual when unconverged: the Ritz value then lies below the extreme eigenvalue by up
 * to about that much), the secant slope and the curvature the gradient check's differences bound
 * from below: the safe step 1/L̂ comes from it. The divergence
 * threshold 2/λ⁺ comes from the largest positive curvature alone, unwidened: a Ritz value lies
 * inside the spectrum, so a rate at or above 2/λ⁺ diverges on the quadratic model, while negative
 * curvature never makes it diverge. μ̂ = λmin.
 */
export function smoothnessOf(s: ProbeSmoothness): SmoothnessEstimate | null {
  let lipschitz = 0;
  let lipschitzResidual: number | undefined;
  let widened = false;
  let productError: number | undefined;
  const beyondShare = (amount: number | undefined, value: number) => (amount !== undefined && amount > unconvergedShare * value ? amount : 0);
  // Each Lanczos candidate for L̂ carries the residual of its Ritz value and the products' error; a
  // secant slope and the gradient check's own curvature are lower bounds with neither.
  const candidates = [[Math.abs(s.lambdaMax), s.lambdaMaxResidual, s.productError], [Math.abs(s.lambdaMin), s.lambdaMinResidual, s.productError], [s.secantMax, undefined, undefined], [s.checkCurvature ?? 0, undefined, undefined]] as const;
  for (const [value, residual, products] of candidates) {
    const open = beyondShare(residual, value);
    const inexact = beyondShare(products, value);
    if (value + open + inexact > lipschitz) {
      lipschitz = value + open + inexact;
      lipschitzResidual = residual;
      widened = open > 0;
      productError = inexact > 0 ? inexact : undefined;
    }
  }
  // No curvature at all (e.g. a linear f): no step size follows from it.
  if (!(lipschitz > 0) || !Number.isFinite(lipschitz)) return null;
  const mu = s.lambdaMin;
  const estimate: SmoothnessEstimate = {
    lipschitz,
    mu,
    kappa: mu > 0 ? lipschitz / mu : null,
    safeStep: 1 / lipschitz,
    divergenceStep: s.lambdaMax > 0 ? 2 / s.lambdaMax : null,
  };
  if (lipschitzResidual !== undefined) estimate.lipschitzResidual = lipschitzResidual;
  if (s.lambdaMinResidual !== undefined) estimate.muResidual = s.lambdaMinResidual;
  if (widened) estimate.widened = true;
  if (productError !== undefined) estimate.productError = productError;
  return estimate;
}
