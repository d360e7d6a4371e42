// The comparisons a matrix check is made of: a slice of F along a direction, every output's
// derivative along it judged against A·v by the gradient's rule (checkSlice, decision.ts), a
// whole column along eⱼ, and random directions over a pool of columns.
import { componentCheckOf, directionalSize, type Judgement } from './decision';
import { defaultDifferenceSettings, type DerivativeEstimate } from './differences';
import { columnOf } from './matrixRead';
import type { MatrixProbeContext, MatrixProbeOutcome } from './matrixProbe';
import { checkSlice } from './probeContext';
import type { Random } from './random';
import type { EntryCheck } from './types';
import { BudgetSpent, type CallSite, type UserCalls } from './userCalls';
import { largest, offset, unitVector } from './vectors';

// Outputs judged between two looks at the clock: judging costs time but calls nothing, so the budget is read here too.
const outputsPerClockRead = 1000;

/** t ↦ F(x + t·v), each t evaluated once whichever output asks (a column's outputs share every call). */
export function sliceOf(calls: UserCalls, x: Float64Array, direction: ArrayLike<number>, site: CallSite): (t: number) => Float64Array {
  const seen = new Map<number, Float64Array>();
  return (t) => {
    let values = seen.get(t);
    if (!values) {
      values = calls.outputs(offset(x, t, direction), site);
      seen.set(t, values);
    }
    return values;
  };
}

export interface OutputCheck {
  numerical: DerivativeEstimate;
  verdict: Judgement;
}

/**
 * Every output's derivative along `direction` against `analytic` (A·direction). `sizes[i]` is
 * what output i's bound is compared with besides its own size; `roundoff[i]` the size of the
 * terms summed into analytic[i].
 */
function checkOutputs(context: MatrixProbeContext, direction: Float64Array, step: number, analytic: Float64Array, roundoff: ArrayLike<number>, sizes: ArrayLike<number>, unit: number): OutputCheck[] {
  const slice = sliceOf(context.calls, context.x, direction, { probeIndex: context.probeIndex, point: 'a finite-difference point' });
  return [...context.values.keys()].map((i) => {
    if (i % outputsPerClockRead === outputsPerClockRead - 1 && context.calls.remainingMs() <= 0) throw new BudgetSpent();
    return checkSlice((t) => slice(t)[i], context.values[i], step, analytic[i], { roundoffScale: roundoff[i], unit, size: sizes[i] }, { ...defaultDifferenceSettings, noise: context.noise[i], valueScale: valueScaleOf(context, i) });
  });
}

/**
 * What output i's noise is relative to: |Fᵢ(x)|, or, for an output near 0 at the probe (a residual
 * at its fit, one cancelled by symmetry), the size of the terms it sums, whose rounding its noise
 * is, so that noise is not taken to grow a trillionfold as the output leaves 0 (common practice).
 * Where only products are known, the size at which the measured noise would be rounding.
 */
function valueScaleOf(context: MatrixProbeContext, i: number): number {
  return Math.max(Math.abs(context.values[i]), context.termScale[i] ?? context.noise[i] / 2 ** -52);
}

/** max(|xⱼ|, 1): steps and sizes are relative to the point's coordinates. */
function scaleOf(x: Float64Array, j: number): number {
  return Math.max(Math.abs(x[j]), 1);
}

/**
 * Row i's scale, max over k of |Aᵢₖ|·sₖ: an entry is judged against what its row sees, so a tiny
 * entry next to large ones agrees once its bound is small against the row (a mismatch is still
 * any difference beyond the bound).
 */
function rowScales(context: MatrixProbeContext, column: Float64Array): Float64Array {
  const dense = context.analytic.dense;
  if (!dense) return column.map(Math.abs);
  const scales = new Float64Array(dense.rows);
  for (let i = 0; i < dense.rows; i++) for (let k = 0; k < dense.columns; k++) scales[i] = Math.max(scales[i], Math.abs(dense.values[i * dense.columns + k]) * scaleOf(context.x, k));
  return scales;
}

/** Column j of A, from the dense matrix or one product with eⱼ. */
function analyticColumn(context: MatrixProbeContext, j: number): Float64Array {
  if (context.analytic.dense) return columnOf(context.analytic.dense, j);
  return context.analytic.times(unitVector(context.x.length, j));
}

export function checkColumns(outcome: MatrixProbeOutcome, columns: Iterable<number>): void {
  const { context } = outcome;
  let scales: Float64Array | null = null;
  for (const j of columns) {
    const column = analyticColumn(context, j);
    scales ??= rowScales(context, column);
    const s = scaleOf(context.x, j);
    const direction = new Float64Array(context.x.length);
    direction[j] = 1;
    const rowScale = scales;
    const checks = checkOutputs(context, direction, context.relativeStep * s, column, column.map(Math.abs), rowScale.map((r) => r / s), context.unit);
    checks.forEach(({ numerical, verdict }, i) => outcome.entries.push(entryCheckOf(i, j, column[i], numerical, verdict)));
  }
}

function entryCheckOf(row: number, column: number, analytic: number, numerical: DerivativeEstimate, verdict: Judgement): EntryCheck {
  const { index: _index, ...check } = componentCheckOf(column, analytic, numerical.value, verdict);
  return { row, column, ...check };
}

/** v with vⱼ = zⱼ·sⱼ on the pool's columns (z standard normal), unit length in z. */
export function randomDirection(context: MatrixProbeContext, random: Random, pool: readonly number[]): Float64Array {
  const direction = new Float64Array(context.x.length);
  let length = 0;
  for (const j of pool) {
    const z = random.normal();
    direction[j] = z;
    length += z * z;
  }
  length = Math.sqrt(length) || 1;
  for (const j of pool) direction[j] = (direction[j] / length) * scaleOf(context.x, j);
  return direction;
}

/** A·v against the difference of F along v, output by output; the rows that disagree. */
export function checkProduct(context: MatrixProbeContext, direction: Float64Array): { checks: OutputCheck[]; analytic: Float64Array; wrongRows: number[] } {
  const analytic = context.analytic.times(direction);
  const dense = context.analytic.dense;
  const n = context.x.length;
  const roundoff = new Float64Array(analytic.length);
  const sizes = new Float64Array(analytic.length);
  const size = largest(analytic.map(Math.abs));
  for (let i = 0; i < analytic.length; i++) {
    if (dense) {
      const row = dense.values.subarray(i * n, (i + 1) * n);
      for (let j = 0; j < n; j++) roundoff[i] += Math.abs(row[j] * direction[j]);
      sizes[i] = directionalSize(row, context.x, 0, n);
    } else {
      roundoff[i] = size;
      sizes[i] = size;
    }
  }
  // Rounding of the dot products grows with the number of terms.
  const checks = checkOutputs(context, direction, context.relativeStep, analytic, roundoff, sizes, context.unit * Math.sqrt(n));
  return { checks, analytic, wrongRows: checks.flatMap((c, i) => (c.verdict.mismatch ? [i] : [])) };
}

