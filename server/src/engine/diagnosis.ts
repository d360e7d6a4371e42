// The shape of a gradient error: sign flip, constant factor, permuted
// components, or a subset of wrong components.
import type { ComponentCheck, Diagnosis, DirectionalCheck } from './types';

// Shapes must hold to this relative accuracy on top of the numerical error bound.
const shapeTolerance = 1e-6;

interface Pair {
  analytic: number;
  numerical: number;
  errorBound: number;
}

function agrees(analytic: number, expected: number, errorBound: number, weight: number): boolean {
  return Math.abs(analytic - expected) <= 2 * errorBound * weight + shapeTolerance * Math.max(Math.abs(analytic), Math.abs(expected));
}

/** Factors are shown as p/q with q up to this: ½, ⅓, ¾ are the slips people make (common practice). */
const largestDenominator = 4;
/** A ratio within this share of p/q reads as p/q, and a ratio this close to 1 is no factor at all. */
const ratioTolerance = 1e-3;
/** Permutations are searched among at most this many wrong components: the assignment search is exponential. */
const largestPermutation = 8;

/** Nearest p/q with q ≤ 4 when within 0.1%, so 1.9999 reads as 2 and 0.3334 as 1/3. */
export function roundFactor(factor: number): number {
  let best = Number(factor.toPrecision(4));
  let bestDistance = Number.POSITIVE_INFINITY;
  for (let q = 1; q <= largestDenominator; q++) {
    const p = Math.round(factor * q);
    if (p === 0) continue;
    const distance = Math.abs(p / q - factor);
    if (distance <= ratioTolerance * Math.abs(factor) && distance < bestDistance) {
      best = p / q;
      bestDistance = distance;
    }
  }
  return best;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = sorted.length >> 1;
  return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}

/** analytic ≈ c·numerical for every pair that says anything, with c ≠ 1: sign (c = −1) or factor. */
function constantRatio(mismatched: Pair[], others: Pair[]): Diagnosis | null {
  const ratios = mismatched.filter((p) => p.numerical !== 0).map((p) => p.analytic / p.numerical);
  if (ratios.length === 0 || ratios.length < mismatched.length) return null;
  const ratio = median(ratios);
  if (!Number.isFinite(ratio) || Math.abs(ratio - 1) < ratioTolerance) return null;
  const all = [...mismatched, ...others];
  if (!all.every((p) => agrees(p.analytic, ratio * p.numerical, p.errorBound, Math.abs(ratio)))) return null;
  const rounded = roundFactor(ratio);
  return rounded === -1 ? { kind: 'sign' } : { kind: 'factor', factor: rounded };
}

/** A permutation π of the mismatched components with analytic_i ≈ numerical_π(i). */
function findPermutation(mismatched: ComponentCheck[]): Array<[number, number]> | null {
  if (mismatched.length < 2 || mismatched.length > largestPermutation) return null;
  const candidates = mismatched.map((c) => mismatched.filter((d) => d !== c && agrees(c.analytic, d.numerical, d.errorBound, 1)).map((d) => d.index));
  const image = new Map<number, number>();
  const used = new Set<number>();
  const assign = (k: number): boolean => {
    if (k === mismatched.length) return true;
    for (const target of candidates[k]) {
      if (used.has(target)) continue;
      used.add(target);
      image.set(mismatched[k].index, target);
      if (assign(k + 1)) return true;
      used.delete(target);
    }
    return false;
  };
  if (!assign(0)) return null;
  const pairs: Array<[number, number]> = [];
  for (const [from, to] of image) {
    // A swap is reported once; longer cycles as each i → π(i).
    if (image.get(to) === from && to < from) continue;
    pairs.push([from, to]);
  }
  return pairs;
}

/**
 * Diagnosis from component checks. `complete` says every component was checked
 * (full mode); only then can a sign flip or factor of the whole gradient be claimed.
 * Components without a verdict (`undecided`) neither support nor refute a ratio.
 */
export function diagnoseComponents(components: ComponentCheck[], complete: boolean): Diagnosis | null {
  const mismatched = components.filter((c) => c.mismatch);
  if (mismatched.length === 0) return null;
  if (complete) {
    const others = components.filter((c) => !c.mismatch && !c.undecided);
    const ratio = constantRatio(mismatched, others);
    if (ratio) return ratio;
  }
  const pairs = findPermutation(mismatched);
  if (pairs) return { kind: 'permutation', pairs };
  return { kind: 'subset', components: mismatched.map((c) => c.index) };
}

/** Diagnosis from random directions alone: only a whole-gradient sign or factor shows there. */
export function diagnoseDirections(directions: DirectionalCheck[]): Diagnosis | null {
  const mismatched = directions.filter((d) => d.mismatch);
  // A wrong sign or factor on the whole gradient shows along every random direction; a ratio seen
  // along fewer is one wrong component seen through a direction, which localisation must find.
  if (mismatched.length < 2 || mismatched.length < directions.length) return null;
  const others = directions.filter((d) => !d.mismatch && !d.undecided);
  return constantRatio(mismatched, others);
}
