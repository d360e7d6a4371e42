// Gradient check for large dimensions: ∇f·v against the directional central
// difference along seeded random directions, then group testing on index ranges
// to find the wrong components with O(k log n) difference estimates.
import type { DerivativeEstimate } from './differences';
import { checkDirection, initialRelativeStep, type Judgement, type ProbeContext } from './probeContext';
import type { Random } from './random';
import type { ComponentCheck, DirectionalCheck } from './types';

export interface DirectionalResult {
  directions: DirectionalCheck[];
  kinks: number;
  decidable: number;
  /** Largest rate of change of f seen at the first difference step. */
  slopeScale: number;
  /** Step of the best estimate along the first direction, and that direction, for the step study. */
  firstDirection: { direction: Float64Array; step: number; numerical: number } | null;
}

interface RangeTest {
  analytic: number;
  numerical: DerivativeEstimate;
  verdict: Judgement;
}

/**
 * Direction v restricted to indices [from, to): v_i = z_i·max(|x_i|, 1) with z
 * standard normal and unit length over the range, so steps are relative to x.
 */
function rangeDirection(context: ProbeContext, random: Random, from: number, to: number): Float64Array {
  const direction = new Float64Array(context.x.length);
  let length = 0;
  for (let i = from; i < to; i++) {
    const z = random.normal();
    direction[i] = z;
    length += z * z;
  }
  length = Math.sqrt(length) || 1;
  for (let i = from; i < to; i++) direction[i] = (direction[i] / length) * Math.max(Math.abs(context.x[i]), 1);
  return direction;
}

function testDirection(context: ProbeContext, direction: Float64Array, from: number, to: number, options: { minLevels?: number; confirm?: boolean } = {}): RangeTest {
  let analytic = 0;
  let roundoffScale = 0;
  for (let i = from; i < to; i++) {
    const term = context.gradient[i] * direction[i];
    analytic += term;
    roundoffScale += Math.abs(term);
  }
  // Rounding of the dot product itself grows with the number of terms.
  const unit = context.gradientUnit * Math.max(1, Math.sqrt(to - from));
  const { numerical, verdict } = checkDirection(context, direction, initialRelativeStep(context), analytic, roundoffScale, unit, options);
  return { analytic, numerical, verdict };
}

export function checkRandomDirections(context: ProbeContext, random: Random, count: number): DirectionalResult {
  const n = context.x.length;
  const result: DirectionalResult = { directions: [], kinks: 0, decidable: 0, slopeScale: 0, firstDirection: null };
  for (let k = 0; k < count; k++) {
    const direction = rangeDirection(context, random, 0, n);
    const test = testDirection(context, direction, 0, n);
    result.directions.push({ analytic: test.analytic, numerical: test.numerical.value, errorBound: test.verdict.errorBound, mismatch: test.verdict.mismatch });
    if (test.numerical.kink) result.kinks++;
    result.slopeScale = Math.max(result.slopeScale, test.numerical.slopeScale);
    if (test.verdict.decidable) result.decidable++;
    if (k === 0) result.firstDirection = { direction, step: test.numerical.step, numerical: test.numerical.value };
  }
  return result;
}

export interface Localisation {
  components: ComponentCheck[];
  /** Group tests spent. */
  tests: number;
  /** The budget ran out before every wrong range was narrowed to one component. */
  exhausted: boolean;
}

/**
 * Adaptive group testing by bisection of index ranges (common practice in
 * combinatorial group testing). A range is wrong when a random direction
 * supported on it gives a mismatch; when the left half of a wrong range tests
 * clean, the right half must hold the error and is not tested again.
 */
export function localiseWrongComponents(context: ProbeContext, random: Random, budget: number): Localisation {
  const found: ComponentCheck[] = [];
  let tests = 0;
  let exhausted = false;
  const pending: Array<[number, number]> = [[0, context.x.length]];
  const isWrong = (from: number, to: number): boolean => {
    tests++;
    return testRange(context, random, from, to).verdict.mismatch;
  };
  while (pending.length > 0) {
    const [from, to] = pending.pop()!;
    if (to - from === 1) {
      found.push(componentCheck(context, from));
      continue;
    }
    if (tests + 2 > budget) {
      exhausted = true;
      break;
    }
    const middle = from + Math.floor((to - from) / 2);
    const leftWrong = isWrong(from, middle);
    const rightWrong = leftWrong ? isWrong(middle, to) : true;
    if (rightWrong) pending.push([middle, to]);
    if (leftWrong) pending.push([from, middle]);
  }
  found.sort((a, b) => a.index - b.index);
  return { components: found.filter((c) => c.mismatch), tests, exhausted };
}

function testRange(context: ProbeContext, random: Random, from: number, to: number): RangeTest {
  // Unconfirmed here: a false positive range only costs tests, since every
  // component it leads to is checked and confirmed on its own.
  return testDirection(context, rangeDirection(context, random, from, to), from, to, { minLevels: 3, confirm: false });
}

/** One coordinate, checked exactly as the full check would. */
function componentCheck(context: ProbeContext, index: number): ComponentCheck {
  const direction = new Float64Array(context.x.length);
  direction[index] = 1;
  const analytic = context.gradient[index];
  const { numerical, verdict } = checkDirection(context, direction, initialRelativeStep(context) * Math.max(Math.abs(context.x[index]), 1), analytic, Math.abs(analytic), context.gradientUnit);
  return { index, analytic: context.gradient[index], numerical: numerical.value, errorBound: verdict.errorBound, relError: verdict.relError, mismatch: verdict.mismatch };
}
