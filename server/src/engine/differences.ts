// Derivative of a one-dimensional slice φ(t) = f(x + t·v) at t = 0 by central
// differences with Richardson extrapolation, with an error estimate and a test
// for a kink (one-sided differences that keep disagreeing as the step shrinks).

export interface DerivativeEstimate {
  /** Best estimate of φ'(0). */
  value: number;
  /** Bound on |value − φ'(0)|: extrapolation error plus noise. Infinity when unknown. */
  errorBound: number;
  /** Finest step the best estimate used. */
  step: number;
  /** One-sided differences disagree and do not converge: φ looks non-smooth at 0. */
  kink: boolean;
  /**
   * The steps resolve φ: its second differences shrink with h as they must for a
   * smooth function (or sit at noise level). Unresolved slices never count as mismatches.
   */
  resolved: boolean;
  /** φ equalled φ(0) exactly at every step: the slice is constant as far as the check can see. */
  flat: boolean;
  /**
   * A lower bound on |φ''(0)| from the same evaluations (0 when they bound nothing): the check
   * hands it to the curvature estimate, which so gets a Rayleigh quotient of the Hessian for free.
   */
  curvatureFloor: number;
}

export interface DifferenceSettings {
  /** Absolute noise level of φ (Moré–Wild estimate). */
  noise: number;
  /**
   * The size of φ the noise is taken to be relative to, so that it grows where |φ(±h)| exceeds it;
   * |φ(0)| unless given (a residual that is 0 at the probe has noise from its terms, not from φ(0)).
   */
  valueScale?: number;
  /** Tableau rows computed before early stopping is allowed. */
  minLevels: number;
  maxLevels: number;
}

export const defaultDifferenceSettings: Omit<DifferenceSettings, 'noise'> = { minLevels: 4, maxLevels: 12 };

/** Central difference (φ(h) − φ(−h)) / 2h; error O(h²) (Nocedal & Wright 2006, eq. 8.7). */
export function centralDifference(phi: (t: number) => number, h: number): number {
  return (phi(h) - phi(-h)) / (2 * h);
}

/** Forward difference (φ(h) − φ(0)) / h; error O(h) (Nocedal & Wright 2006, eq. 8.2). */
export function forwardDifference(phi: (t: number) => number, phi0: number, h: number): number {
  return (phi(h) - phi0) / h;
}

/** Richardson step: combines D(h) and D(h/2) of an O(h^p) method into an O(h^(p+2)) one. */
export function richardson(coarse: number, fine: number, order = 2): number {
  const factor = 2 ** order;
  return (factor * fine - coarse) / (factor - 1);
}

// Noise in an extrapolated difference: D(h) carries ≤ 3σ·√2/(2h) at three standard
// deviations and extrapolation roughly doubles it (sum of |weights| → 2).
const noiseMultiplier = 6;
// A first step where f is not finite is shrunk this much, this many times (to 16⁻⁴ of it) before giving up.
const domainShrink = 16;
const domainRetries = 4;
// Ridders' stopping factor: quit once the diagonal grows this much past the best error.
const growthStop = 2;
// The error estimate of a tableau is itself an estimate; this margin makes it a bound.
const estimateMargin = 3;

/**
 * Neville tableau of central differences at steps h0, h0/2, h0/4, … with
 * repeated Richardson extrapolation, keeping the entry whose neighbours agree
 * best (Ridders, "Accurate computation of F'(x) and F''(x)", Adv. Eng. Software
 * 4(2), 1982; as in Press et al., Numerical Recipes, 3rd ed., 2007, §5.7).
 */
export function differentiate(phi: (t: number) => number, phi0: number, h0: number, settings: DifferenceSettings): DerivativeEstimate {
  const noise = settings.noise;
  let firstStep = h0;
  // A first step outside f's domain (NaN, ±Infinity) is shrunk, not reported.
  let plus = phi(firstStep);
  let minus = phi(-firstStep);
  for (let tries = 0; tries < domainRetries && !(Number.isFinite(plus) && Number.isFinite(minus)); tries++) {
    firstStep /= domainShrink;
    plus = phi(firstStep);
    minus = phi(-firstStep);
  }
  if (!(Number.isFinite(plus) && Number.isFinite(minus))) return { value: Number.NaN, errorBound: Number.POSITIVE_INFINITY, step: firstStep, kink: false, resolved: false, flat: false, curvatureFloor: 0 };
  let flat = plus === phi0 && minus === phi0;

  // Noise relative to f grows where |φ(±h)| ≫ |φ(0)|; rounding alone is at least 2^-52·|φ(±h)|.
  const valueScale = settings.valueScale ?? Math.abs(phi0);
  const noiseAt = (a: number, b: number) => {
    const size = Math.max(Math.abs(a), Math.abs(b));
    const relativeGrowth = valueScale > 0 ? Math.max(1, size / valueScale) : 1;
    return Math.max(noise * relativeGrowth, 2 ** -52 * size);
  };
  const rows: number[][] = [[(plus - minus) / (2 * firstStep)]];
  const steps = [firstStep];
  const gaps = [Math.abs(plus + minus - 2 * phi0)];
  // The noise each level's values carry: what its gap must stand above to be signal (a φ that is
  // exactly 0 at the probe has no measurable noise, yet its values at ±h still carry rounding).
  const noises = [noiseAt(plus, minus)];
  let best = rows[0][0];
  let bestError = Number.POSITIVE_INFINITY;
  let bestStep = firstStep;
  // Largest noise among the rows the best entry combines.
  let levelNoise = noiseAt(plus, minus);
  let bestNoise = levelNoise;
  for (let i = 1; i < settings.maxLevels; i++) {
    const h = steps[i - 1] / 2;
    plus = phi(h);
    minus = phi(-h);
    if (!(Number.isFinite(plus) && Number.isFinite(minus))) break;
    flat &&= plus === phi0 && minus === phi0;
    steps.push(h);
    gaps.push(Math.abs(plus + minus - 2 * phi0));
    const previousNoise = levelNoise;
    levelNoise = noiseAt(plus, minus);
    noises.push(levelNoise);
    const row = [(plus - minus) / (2 * h)];
    for (let j = 1; j <= i; j++) {
      row.push(richardson(rows[i - 1][j - 1], row[j - 1], 2 * j));
      const error = Math.max(Math.abs(row[j] - row[j - 1]), Math.abs(row[j] - rows[i - 1][j - 1]));
      if (error <= bestError) {
        bestError = error;
        best = row[j];
        bestStep = h;
        bestNoise = Math.max(levelNoise, previousNoise);
      }
    }
    rows.push(row);
    if (i + 1 < settings.minLevels) continue;
    const diagonalChange = Math.abs(row[i] - rows[i - 1][i - 1]);
    if (diagonalChange >= growthStop * bestError) break;
    // Smaller steps would only add noise once it dominates the truncation error.
    if (noiseMultiplier * levelNoise / h > bestError) break;
  }
  const errorBound = estimateMargin * bestError + noiseMultiplier * bestNoise / bestStep;
  const resolved = isResolved(steps, gaps, noises);
  const kink = !resolved && looksKinked(phi, phi0, steps, gaps, noiseAt);
  return { value: best, errorBound, step: bestStep, kink, resolved, flat, curvatureFloor: resolved && !kink ? curvatureFloorOf(steps, gaps, noises) : 0 };
}

/**
 * |φ''(0)| from below, by the second differences S(h) = |φ(h) + φ(−h) − 2φ(0)| / h² = |φ''(0)| + O(h²)
 * of the two finest levels whose gaps stand well above noise (so their sign cannot flip):
 * Richardson's (4S(h/2) − S(h))/3, less a margin times the change between the levels and the
 * noise both can carry (4σ/h² at most, σ the noise of one value). 0 when no two levels qualify.
 */
function curvatureFloorOf(steps: number[], gaps: number[], noises: number[]): number {
  const signal = steps.flatMap((_, i) => (gaps[i] > signalOverNoise * noises[i] ? [i] : []));
  if (signal.length < 2) return 0;
  const [coarse, fine] = signal.slice(-2);
  if (fine !== coarse + 1) return 0;
  const second = (i: number) => gaps[i] / steps[i] ** 2;
  const extrapolated = richardson(second(coarse), second(fine));
  const uncertainty = estimateMargin * Math.abs(second(fine) - second(coarse)) + (4 * noises[fine]) / steps[fine] ** 2;
  return Math.max(0, extrapolated - uncertainty);
}

/**
 * A second estimate from an unrelated step sequence (h0/3, h0/6, …). Where the
 * two disagree beyond their bounds, neither is trusted and the bound widens to
 * cover both: a lucky agreement inside one tableau must not raise a false alarm.
 */
export function confirmDerivative(phi: (t: number) => number, phi0: number, first: DerivativeEstimate, h0: number, settings: DifferenceSettings): DerivativeEstimate {
  const second = differentiate(phi, phi0, h0 / 3, settings);
  if (!Number.isFinite(second.value)) return { ...first, errorBound: Number.POSITIVE_INFINITY };
  const gap = Math.abs(first.value - second.value);
  const kink = first.kink || second.kink;
  const resolved = first.resolved && second.resolved;
  const flat = first.flat && second.flat;
  if (gap <= first.errorBound + second.errorBound) return second.errorBound < first.errorBound ? { ...second, kink, resolved, flat } : { ...first, kink, resolved, flat };
  return { ...first, errorBound: Math.max(first.errorBound, second.errorBound) + gap, kink, resolved, flat };
}

// A suspected kink is confirmed at steps this many times below the finest of the tableau.
const kinkConfirmingShrinks = [64, 512];
// Second differences above this many noise levels are signal, not noise.
const signalOverNoise = 100;

/**
 * For smooth φ the gap |φ(h) + φ(−h) − 2φ(0)| / h ≈ h·|φ''| falls 8× over three
 * halvings; a gap that falls less than 2× there, while above noise, means the
 * steps do not resolve φ (a kink, or features finer than the steps).
 */
function isResolved(steps: number[], gaps: number[], noises: number[]): boolean {
  const last = steps.length - 1;
  if (last < 3) return last >= 1;
  if (!(gaps[last] > signalOverNoise * noises[last])) return true;
  return gaps[last] / steps[last] < 0.5 * (gaps[last - 3] / steps[last - 3]);
}

/**
 * |φ(h) + φ(−h) − 2φ(0)| / h = |forward − backward| difference. For smooth φ it
 * shrinks like h·|φ''|; at a kink it stays at the jump of φ'. Suspicion from the
 * tableau is confirmed at two much smaller steps before we say so.
 */
function looksKinked(phi: (t: number) => number, phi0: number, steps: number[], gaps: number[], noiseAt: (plus: number, minus: number) => number): boolean {
  const last = steps.length - 1;
  if (last < 3) return false;
  const slopeGap = (i: number) => gaps[i] / steps[i];
  for (const shrink of kinkConfirmingShrinks) {
    const h = steps[last] / shrink;
    const plus = phi(h);
    const minus = phi(-h);
    const gap = Math.abs(plus + minus - 2 * phi0);
    if (!Number.isFinite(gap) || !(gap > signalOverNoise * noiseAt(plus, minus)) || gap / h < 0.5 * slopeGap(last)) return false;
  }
  return true;
}

/** Error of the plain central difference against step size, for the step-study plot. */
export function studySteps(phi: (t: number) => number, reference: number, largest: number, count = 17, ratio = 10 ** -0.75): { steps: number[]; errors: number[] } {
  const steps: number[] = [];
  const errors: number[] = [];
  for (let k = 0, h = largest; k < count; k++, h *= ratio) {
    const error = Math.abs(centralDifference(phi, h) - reference);
    if (!Number.isFinite(error)) continue;
    steps.push(h);
    errors.push(error);
  }
  return { steps, errors };
}
