// Finding the wrong components of a gradient in large dimensions by weighted
// pooling, at a cost in evaluations that does not grow with n.
//
// With e = g − ∇f the error of the analytic gradient, a directional check along v
// sees the discrepancy D(v) = g·v − ∇f·v = Σ e_i v_i. Inside a pool of m indices,
// take w_i = v_i·(r_i + 1)/m with r_i the rank of i in the pool: when a single
// component k is wrong, D(w)/D(v) = (r_k + 1)/m, so two directional differences
// place it whatever n is, to within their error bounds (a further round narrows a
// range that is still too wide). Each placed component is confirmed by its own
// coordinate difference, and a pool is explained once the discrepancy left after
// subtracting the confirmed errors lies within the bounds. A pool that does not
// decode (two or more wrong components, or bounds too wide) is split into random
// sub-pools measured on their own: adaptive group testing, with a decode at every
// node, so a few wrong components cost a few splits.
import { componentCheckOf, isUsable } from './decision';
import { checkDirection, initialRelativeStep, roundoffFloor, type ProbeContext } from './probeContext';
import type { Random } from './random';
import type { ComponentCheck } from './types';
import { BudgetSpent } from './userCalls';

export interface Localisation {
  /** Confirmed wrong components, by index. */
  components: ComponentCheck[];
  /** Directional differences along weighted pools. */
  pooledDifferences: number;
  /** Single components checked by their own central difference. */
  coordinateDifferences: number;
  /** The search stopped (budget, or differences that said nothing) before every discrepancy was explained. */
  incomplete: boolean;
}

/** D = g·u − ∇f·u along a pool direction u (zero outside the pool), with |error| ≤ bound. */
interface PoolDifference {
  direction: Float64Array;
  discrepancy: number;
  bound: number;
}

interface Interval {
  value: number;
  bound: number;
}

interface Search {
  context: ProbeContext;
  random: Random;
  /** v_i: a random sign times a magnitude in [1, 2), times max(|x_i|, 1) so steps are relative to x. */
  weights: Float64Array;
  /** Every coordinate check made, and the error e_k = g_k − ∂_k f each one measured. */
  checked: Map<number, ComponentCheck>;
  errors: Map<number, Interval>;
  budget: number;
  pooled: number;
  coordinate: number;
  incomplete: boolean;
}

// Sub-pools per split: each split costs this many differences and shrinks the pools as much.
const subPools = 4;
// Pools this small are cheaper to check member by member than to decode.
export const directCheckSize = 3;
// Candidates left after decoding that are checked one by one rather than narrowed further.
const maxCandidates = 2;
const narrowingRounds = 3;

/** `budget` caps pooled plus coordinate differences. */
export function localiseWrongComponents(context: ProbeContext, random: Random, budget: number): Localisation {
  const n = context.x.length;
  const weights = new Float64Array(n);
  // Magnitudes vary so that two errors of opposite sign (a swap) never cancel in a pool.
  for (let i = 0; i < n; i++) weights[i] = (random.uniform() < 0.5 ? -1 : 1) * (1 + random.uniform()) * Math.max(Math.abs(context.x[i]), 1);
  const search: Search = { context, random, weights, checked: new Map(), errors: new Map(), budget, pooled: 0, coordinate: 0, incomplete: false };
  const everything = Array.from({ length: n }, (_, i) => i);
  try {
    const whole = measurePool(search, everything, () => 1);
    if (whole !== null) locate(search, everything, whole);
  } catch (err) {
    // Out of time: the components confirmed so far are still reported.
    if (!(err instanceof BudgetSpent)) throw err;
    search.incomplete = true;
  }
  const components = [...search.checked.values()].filter((c) => c.mismatch).sort((a, b) => a.index - b.index);
  return { components, pooledDifferences: search.pooled, coordinateDifferences: search.coordinate, incomplete: search.incomplete };
}

function locate(search: Search, pool: number[], base: PoolDifference): void {
  const rest = unexplained(search, base);
  if (isExplained(rest)) return;
  if (!Number.isFinite(rest.bound)) {
    search.incomplete = true;
    return;
  }
  if (pool.length <= directCheckSize) {
    for (const index of pool) checkComponent(search, index);
    return;
  }
  for (const index of decodeOne(search, pool, base) ?? []) {
    checkComponent(search, index);
    if (isExplained(unexplained(search, base))) return;
  }
  for (const part of splitPool(pool, search.random)) {
    const difference = measurePool(search, part, () => 1);
    if (difference === null) return;
    locate(search, part, difference);
  }
}

/**
 * Candidates for a single unexplained component of the pool, nearest first, or
 * null when the ratios place none (the pool holds more than one).
 */
function decodeOne(search: Search, pool: number[], base: PoolDifference): number[] | null {
  let low = 0;
  let high = pool.length - 1;
  let estimate = 0;
  for (let round = 0; round < narrowingRounds && high - low + 1 > maxCandidates; round++) {
    const from = low;
    const span = high - low + 1;
    const weighted = measurePool(search, pool, (rank) => (rank >= from && rank < from + span ? (rank - from + 1) / span : 0));
    if (weighted === null) return null;
    const ratio = ratioRange(unexplained(search, weighted), unexplained(search, base));
    if (ratio === null) return null;
    // One component at rank q gives ratio (q − from + 1)/span.
    low = Math.max(from, from + Math.ceil(ratio.low * span - 1));
    high = Math.min(from + span - 1, from + Math.floor(ratio.high * span - 1));
    estimate = from + ratio.value * span - 1;
    if (low > high) return null;
  }
  if (high - low + 1 > maxCandidates) return null;
  const ranks: number[] = [];
  for (let rank = low; rank <= high; rank++) ranks.push(rank);
  ranks.sort((a, b) => Math.abs(a - estimate) - Math.abs(b - estimate));
  return ranks.map((rank) => pool[rank]);
}

/** Range of num/den over both intervals; null when den may be zero. */
function ratioRange(num: Interval, den: Interval): { low: number; high: number; value: number } | null {
  if (!(Math.abs(den.value) > den.bound) || !Number.isFinite(num.bound)) return null;
  const corners = [-1, 1].flatMap((a) => [-1, 1].map((b) => (num.value + a * num.bound) / (den.value + b * den.bound)));
  return { low: Math.min(...corners), high: Math.max(...corners), value: num.value / den.value };
}

/** D along the pool direction u_i = v_i·weight(rank of i), or null once the budget is spent. */
function measurePool(search: Search, pool: number[], weight: (rank: number) => number): PoolDifference | null {
  if (!hasBudget(search)) return null;
  search.pooled++;
  const { context } = search;
  const direction = new Float64Array(context.x.length);
  let analytic = 0;
  let roundoffScale = 0;
  for (let rank = 0; rank < pool.length; rank++) {
    const index = pool[rank];
    const u = search.weights[index] * weight(rank);
    direction[index] = u;
    analytic += context.gradient[index] * u;
    roundoffScale += Math.abs(context.gradient[index] * u);
  }
  // Rounding of the dot product itself grows with the number of terms.
  const unit = context.gradientUnit * Math.sqrt(Math.max(1, pool.length));
  const { numerical, verdict } = checkDirection(context, direction, initialRelativeStep(context), analytic, { roundoffScale, unit, size: 0 }, { confirm: false });
  const usable = isUsable(verdict);
  const size = Math.max(Math.abs(analytic), Math.abs(numerical.value));
  return { direction, discrepancy: analytic - numerical.value, bound: usable ? numerical.errorBound + roundoffFloor(roundoffScale, size, unit) : Number.POSITIVE_INFINITY };
}

/** Discrepancy of a pool difference that the confirmed component errors do not account for. */
function unexplained(search: Search, difference: PoolDifference): Interval {
  let value = difference.discrepancy;
  let bound = difference.bound;
  for (const [index, error] of search.errors) {
    const u = difference.direction[index];
    if (u === 0) continue;
    value -= error.value * u;
    bound += error.bound * Math.abs(u);
  }
  return { value, bound };
}

function isExplained(rest: Interval): boolean {
  return Math.abs(rest.value) <= rest.bound;
}

function hasBudget(search: Search): boolean {
  if (search.pooled + search.coordinate < search.budget) return true;
  search.incomplete = true;
  return false;
}

/** One coordinate, checked exactly as the full check would; its error then explains pool discrepancies. */
function checkComponent(search: Search, index: number): void {
  if (search.checked.has(index) || !hasBudget(search)) return;
  search.coordinate++;
  const { context } = search;
  const direction = new Float64Array(context.x.length);
  direction[index] = 1;
  const analytic = context.gradient[index];
  const step = initialRelativeStep(context) * Math.max(Math.abs(context.x[index]), 1);
  const { numerical, verdict } = checkDirection(context, direction, step, analytic, { roundoffScale: Math.abs(analytic), unit: context.gradientUnit, size: 0 });
  search.checked.set(index, componentCheckOf(index, analytic, numerical.value, verdict));
  if (isUsable(verdict)) {
    const size = Math.max(Math.abs(analytic), Math.abs(numerical.value));
    search.errors.set(index, { value: analytic - numerical.value, bound: verdict.errorBound + roundoffFloor(Math.abs(analytic), size, context.gradientUnit) });
  }
}

/** Balanced random split into `subPools` parts, each kept in index order. */
export function splitPool(pool: number[], random: Random): number[][] {
  const shuffled = [...pool];
  for (let i = shuffled.length - 1; i > 0; i--) {
    const j = Math.floor(random.uniform() * (i + 1));
    [shuffled[i], shuffled[j]] = [shuffled[j], shuffled[i]];
  }
  const parts: number[][] = Array.from({ length: Math.min(subPools, pool.length) }, () => []);
  shuffled.forEach((index, k) => parts[k % parts.length].push(index));
  return parts.map((part) => part.sort((a, b) => a - b));
}
