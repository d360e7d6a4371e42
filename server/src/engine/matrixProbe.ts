// The check of a derivative matrix at one probe: a vector function F (the residuals, or a
// gradient) against A, what the user says is its derivative (a Jacobian, a Hessian, or the
// products of a Hessian-vector product function). One difference of F along a direction gives
// every output's derivative at once: along eⱼ a whole column of A, along a random v all of A·v.
// Each output is judged by the same rule as a gradient component (checkSlice, decision.ts).
import { componentCheckOf, directionalSize, isDecided, type Judgement } from './decision';
import { defaultDifferenceSettings, type DerivativeEstimate } from './differences';
import { diagnoseMatrix } from './matrixDiagnosis';
import { columnOf, type DenseMatrix } from './matrixRead';
import { splitPool } from './localise';
import { estimateNoise } from './noise';
import { largestRelError, sanitised } from './probeCheck';
import { checkSlice, gradientUnitOf } from './probeContext';
import type { Random } from './random';
import type { DirectionalCheck, EntryCheck, MatrixDiagnosis, ProbeReport } from './types';
import { BudgetSpent, CheckStopped, makeFinding, type CallSite, type UserCalls } from './userCalls';
import { largest, norm2, offset } from './vectors';

/** What the user's derivative says at the probe. */
export interface AnalyticMatrix {
  /** The whole matrix when the user's function returns one; null when it only gives products. */
  dense: DenseMatrix | null;
  /** A·v: from `dense`, or a call of the user's product function. */
  times(v: Float64Array): Float64Array;
}

export interface MatrixProbeContext {
  calls: UserCalls;
  probeIndex: number;
  x: Float64Array;
  /** F(x). */
  values: Float64Array;
  /** Absolute noise of each output of F near x (Moré–Wild). */
  noise: Float64Array;
  /** First difference step relative to max(|xⱼ|, 1). */
  relativeStep: number;
  analytic: AnalyticMatrix;
  /** Unit roundoff the analytic entries seem to be computed in. */
  unit: number;
}

/** What is checked at one probe. */
export type MatrixWork =
  /** Every column, each by one difference of F (needs the dense matrix). */
  | { mode: 'full' }
  /** Random directions, then the wrong columns located by pooled directions. */
  | { mode: 'directional'; directions: number }
  /** Where an earlier probe confirmed most entries: one random direction and the columns still open. */
  | { mode: 'spot'; columns: number[] };

export interface MatrixProbeOutcome {
  report: ProbeReport;
  context: MatrixProbeContext;
  /** Every entry checked here (full and spot work; the located ones in directional work). */
  entries: EntryCheck[];
  diagnosis: MatrixDiagnosis | null;
  mismatch: boolean;
  kink: boolean;
  cut: boolean;
  /** Every entry (full) or direction (directional) got a verdict. */
  complete: boolean;
  unrepeatable: boolean;
  /** Columns located wrong in directional work, and whether the search finished. */
  localisation: ProbeReport['localisation'];
}

// Entries kept in a report (a 64 × 64 heat map); beyond, only wrong and undecided ones.
export const shownEntries = 4096;
/**
 * Entries of the largest matrix checked column by column: every entry is a difference tableau
 * and a row of the report, about 20 µs and 150 bytes each, so 50 000 stay near a second and a few
 * MB; a larger one is checked along random directions, its wrong columns located.
 */
export const largestWholeMatrix = 50_000;
// Outputs judged between two looks at the clock: judging costs time but calls nothing, so the budget is read here too.
const outputsPerClockRead = 1000;
// Directional differences (pooled and column) allowed for locating wrong columns at one probe.
const localisationBudget = 80;
// Pools this small are checked column by column.
const directCheckSize = 3;
// As for a gradient: the first step 4·ε_r^(1/5) of the relative noise, within [10⁻³, 0.05] (common practice).
const smallestInitialStep = 1e-3;
const largestInitialStep = 0.05;

/**
 * F(x), A at x (`analyticAt` reads and validates the user's matrix, knowing F's length), the
 * repeatability and noise of F, then the work `plan` chooses.
 */
export function checkMatrixProbe(
  calls: UserCalls,
  x: Float64Array,
  probeIndex: number,
  analyticAt: (x: Float64Array, outputs: number, site: CallSite) => AnalyticMatrix,
  plan: (context: MatrixProbeContext) => MatrixWork,
  random: Random,
): MatrixProbeOutcome {
  const site: CallSite = { probeIndex, point: 'the probe' };
  const values = calls.outputs(x, site);
  const bad = [...values.keys()].filter((i) => !Number.isFinite(values[i]));
  if (bad.length > 0) throw new CheckStopped(makeFinding('non-finite-value', 'objective', `the value function has non-finite outputs at probe ${probeIndex + 1}: ${bad.slice(0, 6).map((i) => `output ${i} = ${values[i]}`).join(', ')}`, site));
  const analytic = analyticAt(x, values.length, site);
  const repeated = calls.outputs(x, site);
  const unrepeatable = values.some((v, i) => !(repeated[i] === v));
  const noise = noiseOfOutputs(calls, x, values, probeIndex, random);
  const floor = roundingFloor(analytic, x);
  for (let i = 0; i < noise.length; i++) noise[i] = Math.max(noise[i], floor[i] ?? 0, Number.isFinite(repeated[i]) ? Math.abs(repeated[i] - values[i]) : Math.abs(values[i]));
  const scale = Math.max(largest(values.map(Math.abs)), largest(noise));
  const relativeNoise = largest(noise) / Math.max(scale, Number.MIN_VALUE);
  const relativeStep = Math.min(largestInitialStep, Math.max(smallestInitialStep, 4 * Math.pow(relativeNoise, 1 / 5)));
  const unit = analytic.dense ? gradientUnitOf(analytic.dense.values) : 2 ** -52;
  const context: MatrixProbeContext = { calls, probeIndex, x, values, noise, relativeStep, analytic, unit };
  const work = plan(context);
  const outcome: MatrixProbeOutcome = {
    report: {
      point: Array.from(x.subarray(0, 64)),
      dimension: x.length,
      value: norm2(values),
      mode: work.mode,
      components: [],
      directions: [],
      noise: relativeNoise,
      maxRelError: 0,
      stepStudy: null,
      smoothness: null,
      descent: [],
    },
    context,
    entries: [],
    diagnosis: null,
    mismatch: false,
    kink: false,
    cut: false,
    complete: false,
    unrepeatable,
    localisation: undefined,
  };
  try {
    if (work.mode === 'full') checkColumns(outcome, x.keys());
    else if (work.mode === 'directional') checkDirections(outcome, work.directions, random, true);
    else if (checkDirections(outcome, 1, random, false)) checkColumns(outcome, work.columns);
  } catch (err) {
    if (!(err instanceof BudgetSpent)) throw err;
    outcome.cut = true;
  }
  settle(outcome, work);
  return outcome;
}

/**
 * The least noise an output carries: the rounding of its terms, 2⁻⁵²·Σⱼ |Aᵢⱼ|·max(|xⱼ|, 1). An output
 * flat along the noise direction (or 0 at the probe) shows none in the Moré–Wild table, yet its
 * values along a coordinate still carry the rounding of the terms that cancel there.
 */
function roundingFloor(analytic: AnalyticMatrix, x: Float64Array): Float64Array {
  const dense = analytic.dense;
  const floor = new Float64Array(dense ? dense.rows : 0);
  // Products alone give no terms: the measured noise stands (an empty floor reads as 0).
  if (!dense) return floor;
  for (let i = 0; i < dense.rows; i++) for (let j = 0; j < dense.columns; j++) floor[i] += Math.abs(dense.values[i * dense.columns + j]) * Math.max(Math.abs(x[j]), 1);
  return floor.map((sum) => 2 ** -52 * sum);
}

/** The Moré–Wild noise of every output along one seeded ±max(|xᵢ|, 1) direction, sharing the evaluations. */
function noiseOfOutputs(calls: UserCalls, x: Float64Array, values: Float64Array, probeIndex: number, random: Random): Float64Array {
  const direction = x.map((xi) => (random.uniform() < 0.5 ? -1 : 1) * Math.max(Math.abs(xi), 1));
  const slice = sliceOf(calls, x, direction, { probeIndex, point: 'a noise-estimation point' });
  return values.map((v, i) => estimateNoise((t) => slice(t)[i], v));
}

/** t ↦ F(x + t·v), each t evaluated once whichever output asks (a column's outputs share every call). */
function sliceOf(calls: UserCalls, x: Float64Array, direction: ArrayLike<number>, site: CallSite): (t: number) => Float64Array {
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

interface OutputCheck {
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
 * at its fit, one cancelled by symmetry), the size at which its measured noise is rounding, so
 * its noise is not taken to grow a trillionfold as it leaves 0 (common practice).
 */
function valueScaleOf(context: MatrixProbeContext, i: number): number {
  return Math.max(Math.abs(context.values[i]), context.noise[i] / 2 ** -52);
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
  const unitVector = new Float64Array(context.x.length);
  unitVector[j] = 1;
  return context.analytic.times(unitVector);
}

function checkColumns(outcome: MatrixProbeOutcome, columns: Iterable<number>): void {
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
function randomDirection(context: MatrixProbeContext, random: Random, pool: readonly number[]): Float64Array {
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
function checkProduct(context: MatrixProbeContext, direction: Float64Array): { checks: OutputCheck[]; analytic: Float64Array; wrongRows: number[] } {
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

/**
 * Random directions; a direction whose product disagrees has its wrong columns located. Returns
 * false when a direction disagreed (a spot check then stops: the probe is checked again whole).
 */
function checkDirections(outcome: MatrixProbeOutcome, count: number, random: Random, locate: boolean): boolean {
  const { context, report } = outcome;
  const all = [...context.x.keys()];
  for (let k = 0; k < count; k++) {
    const { checks, analytic } = checkProduct(context, randomDirection(context, random, all));
    report.directions.push(summariseDirection(checks, analytic));
  }
  const disagreed = report.directions.some((d) => d.mismatch);
  if (disagreed && locate) locateColumns(outcome, random);
  return !disagreed;
}

/** One row of the report per direction: the output that disagrees most (or the least decided one). */
function summariseDirection(checks: OutputCheck[], analytic: Float64Array): DirectionalCheck {
  const weight = (c: OutputCheck) => (c.verdict.mismatch ? 2 : c.verdict.undecided ? 1 : 0) + Math.min(1, c.verdict.relError);
  let worst = 0;
  checks.forEach((c, i) => {
    if (weight(c) > weight(checks[worst])) worst = i;
  });
  const c = checks[worst];
  const row: DirectionalCheck = { analytic: analytic[worst], numerical: c.numerical.value, errorBound: c.verdict.errorBound, mismatch: checks.some((o) => o.verdict.mismatch) };
  const undecided = checks.find((o) => o.verdict.undecided)?.verdict.undecided;
  if (!row.mismatch && undecided) row.undecided = undecided;
  return row;
}

/**
 * Adaptive group testing over columns: a pool's direction (zero outside it) disagrees when a
 * wrong entry lies in one of its columns; disagreeing pools are split, and pools of a few columns
 * are checked column by column, which gives the wrong entries themselves.
 */
function locateColumns(outcome: MatrixProbeOutcome, random: Random): void {
  const search = { pooled: 0, columns: 0, incomplete: false };
  const spend = () => {
    if (search.pooled + search.columns >= localisationBudget) {
      search.incomplete = true;
      return false;
    }
    return true;
  };
  const visit = (pool: number[]) => {
    if (pool.length <= directCheckSize) {
      for (const j of pool) {
        if (!spend()) return;
        search.columns++;
        checkColumns(outcome, [j]);
      }
      return;
    }
    for (const members of splitPool(pool, random)) {
      if (!spend()) return;
      search.pooled++;
      if (checkProduct(outcome.context, randomDirection(outcome.context, random, members)).wrongRows.length > 0) visit(members);
    }
  };
  try {
    visit([...outcome.context.x.keys()]);
  } catch (err) {
    if (!(err instanceof BudgetSpent)) throw err;
    search.incomplete = true;
  } finally {
    outcome.localisation = { pooledDifferences: search.pooled, coordinateDifferences: search.columns, incomplete: search.incomplete };
  }
}

/** What the probe's checks add up to: mismatch, kink, completeness, the shape of the error and the rows the report keeps. */
function settle(outcome: MatrixProbeOutcome, work: MatrixWork): void {
  const { report, entries } = outcome;
  const checks: DirectionalCheck[] = [...report.directions, ...entries];
  outcome.mismatch = checks.some((c) => c.mismatch);
  outcome.kink = checks.some((c) => c.undecided === 'not-smooth');
  outcome.complete = !outcome.cut && checks.length > 0 && checks.every((c) => isDecided(c));
  const n = outcome.context.x.length;
  const rows = outcome.context.values.length;
  if (outcome.mismatch) outcome.diagnosis = diagnoseMatrix(rows, n, entries, work.mode === 'full' && !outcome.cut);
  report.entries = (entries.length <= shownEntries ? entries : entries.filter((e) => !isDecided(e) || e.mismatch).slice(0, shownEntries)).map(sanitised);
  report.directions = report.directions.map(sanitised);
  if (outcome.localisation) report.localisation = outcome.localisation;
  report.maxRelError = largestRelError(checks);
}
