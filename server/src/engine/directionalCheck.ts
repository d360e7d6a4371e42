// Gradient check for large dimensions: ∇f·v against the directional central
// difference along seeded random directions (wrong components are then located
// by localise.ts).
import type { DerivativeEstimate } from './differences';
import { directionalCheckOf, directionalSize, type Judgement } from './decision';
import { checkDirection, initialRelativeStep, noteCurvature, type ProbeContext } from './probeContext';
import type { Random } from './random';
import type { DirectionalCheck } from './types';
import { BudgetSpent } from './userCalls';
import { dot } from './vectors';

export interface DirectionalResult {
  directions: DirectionalCheck[];
  kinks: number;
  /** Step of the best estimate along the first direction, and that direction, for the step study. */
  firstDirection: { direction: Float64Array; step: number; numerical: number } | null;
  /** The time budget ran out before every direction was tested. */
  cut: boolean;
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
  const size = directionalSize(context.gradient, context.x, from, to);
  const { numerical, verdict } = checkDirection(context, direction, initialRelativeStep(context), analytic, { roundoffScale, unit, size }, options);
  noteCurvature(context, numerical, dot(direction, direction));
  return { analytic, numerical, verdict };
}

export function checkRandomDirections(context: ProbeContext, random: Random, count: number): DirectionalResult {
  const n = context.x.length;
  const result: DirectionalResult = { directions: [], kinks: 0, firstDirection: null, cut: false };
  for (let k = 0; k < count; k++) {
    const direction = rangeDirection(context, random, 0, n);
    let test: RangeTest;
    try {
      test = testDirection(context, direction, 0, n);
    } catch (err) {
      // Out of time: the directions tested so far still count (a mismatch among them decides).
      if (!(err instanceof BudgetSpent)) throw err;
      result.cut = true;
      break;
    }
    result.directions.push(directionalCheckOf(test.analytic, test.numerical.value, test.verdict));
    if (test.numerical.kink) result.kinks++;
    if (k === 0) result.firstDirection = { direction, step: test.numerical.step, numerical: test.numerical.value };
  }
  return result;
}
