// Computational noise of f by the difference-table method of Moré & Wild,
// "Estimating computational noise", SIAM J. Sci. Comput. 33(3), 2011 (ECnoise, §2–3).

export type NoiseVerdict = 'found' | 'step-too-small' | 'step-too-large';

export interface NoiseTableResult {
  verdict: NoiseVerdict;
  /** Standard deviation of the noise (absolute), when found. */
  noise: number;
  /** σ_k estimate at each difference level k = 1.. */
  levels: number[];
}

/**
 * Noise from f at equally spaced points x + i·h·p. The k-th differences of
 * noise have variance γ_k⁻¹σ² with γ_k = (k!)²/(2k)!; the noise level is taken
 * where three consecutive σ_k agree within a factor 4 and the differences
 * change sign (the smooth part no longer dominates).
 */
// Moré & Wild: a spread over 10% of |f| means the points sample f's shape, not its noise.
const shapeSpread = 0.1;
// Three consecutive noise levels within this factor of each other are taken to agree (Moré & Wild).
const levelAgreement = 4;
// When no table settles, the noise is taken as this share of |f|: a cautious guess that only
// widens the error bounds (common practice).
const unknownRelativeNoise = 1e-8;

export function noiseFromTable(values: ArrayLike<number>): NoiseTableResult {
  const count = values.length;
  let diffs = Array.from(values);
  const fMin = Math.min(...diffs);
  const fMax = Math.max(...diffs);
  if ((fMax - fMin) > shapeSpread * Math.max(Math.abs(fMax), Math.abs(fMin))) return { verdict: 'step-too-large', noise: 0, levels: [] };
  const levels: number[] = [];
  const signChanges: boolean[] = [];
  let gamma = 1;
  for (let k = 1; k < count; k++) {
    diffs = diffs.slice(1).map((value, i) => value - diffs[i]);
    if (k === 1 && diffs.filter((d) => d === 0).length > count / 2) return { verdict: 'step-too-small', noise: 0, levels };
    // A level of exact zeros means f moves on a coarse lattice (e.g. float32 rounding): spacing too small.
    if (diffs.every((d) => d === 0)) return { verdict: 'step-too-small', noise: 0, levels };
    gamma *= 0.5 * (k / (2 * k - 1));
    const meanSquare = diffs.reduce((sum, d) => sum + d * d, 0) / diffs.length;
    levels.push(Math.sqrt(gamma * meanSquare));
    signChanges.push(Math.min(...diffs) * Math.max(...diffs) < 0);
  }
  for (let k = 0; k + 2 < levels.length; k++) {
    const window = levels.slice(k, k + 3);
    if (Math.max(...window) <= levelAgreement * Math.min(...window) && signChanges[k]) return { verdict: 'found', noise: levels[k], levels };
  }
  return { verdict: 'step-too-large', noise: 0, levels };
}

/**
 * Absolute noise level of φ(t) = f(x + t·p) near t = 0, adapting the spacing as
 * Moré & Wild advise (too small → ×100, too large → ÷100). The points lie on one
 * side, t = 0, h, …, 8h, so a kink exactly at the probe does not pass for noise.
 * `phi` may return non-finite values; they count as "too large". Never below
 * half an ulp of f(x).
 */
export function estimateNoise(phi: (t: number) => number, f0: number, spacing = 1e-6, attempts = 4, points = 9): number {
  // Half an ulp of f(x): of float32 when f(x) looks computed in float32, else of float64.
  const floor = Math.abs(f0) * (looksFloat32(f0) ? 2 ** -25 : 2 ** -53);
  let h = spacing;
  let fallback = Number.POSITIVE_INFINITY;
  let tooSmall = false;
  for (let attempt = 0; attempt < attempts; attempt++) {
    const values: number[] = [];
    for (let i = 0; i < points; i++) values.push(i === 0 ? f0 : phi(i * h));
    if (!values.every(Number.isFinite)) {
      h /= 100;
      continue;
    }
    const result = noiseFromTable(values);
    if (result.verdict === 'found') return Math.max(result.noise, floor);
    const positive = result.levels.filter((level) => level > 0);
    if (positive.length > 0) fallback = Math.min(fallback, Math.min(...positive));
    // Up by 100, down by 10: the two never cycle back to a spacing already tried.
    // Never below spacing/100: much finer, a rough objective looks smooth and its noise vanishes.
    if (result.verdict === 'step-too-small') {
      tooSmall = true;
      h *= 100;
    } else if (h / 10 >= spacing / 100) {
      h /= 10;
    } else {
      break;
    }
  }
  // Undetected: too-small tables mean f is flat at rounding level; otherwise the
  // smallest σ_k is an overestimate, which only makes the check more cautious.
  if (Number.isFinite(fallback)) return Math.max(fallback, floor);
  return tooSmall ? floor : Math.max(floor, Math.abs(f0) * unknownRelativeNoise);
}

/** Exactly representable in float32 yet not a short binary fraction: almost surely a float32 result. */
function looksFloat32(value: number): boolean {
  return value !== 0 && Math.fround(value) === value && !Number.isInteger(value * 1024);
}
