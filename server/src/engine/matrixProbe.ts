// The check of a derivative matrix at one probe: a vector function F (the residuals, or a
// gradient) against A, what the user says is its derivative (a Jacobian, a Hessian, or the
// products of a Hessian-vector product function). One difference of F along a direction gives
// every output's derivative at once: along eⱼ a whole column of A, along a random v all of A·v.
// Each output is judged by the same rule as a gradient component (matrixComparisons.ts); wrong
// columns of a large matrix are located by group testing (matrixLocalise.ts).
import { isDecided } from './decision';
import { checkColumns, checkProduct, randomDirection, sliceOf, type OutputCheck } from './matrixComparisons';
import { diagnoseMatrix } from './matrixDiagnosis';
import { locateColumns } from './matrixLocalise';
import type { DenseMatrix } from './matrixRead';
import { estimateNoise } from './noise';
import { largestRelError, sanitised } from './probeCheck';
import { gradientUnitOf, relativeStepFor } from './probeContext';
import type { Random } from './random';
import type { DirectionalCheck, EntryCheck, MatrixDiagnosis, ProbeReport } from './types';
import { BudgetSpent, CheckStopped, makeFinding, type CallSite, type UserCalls } from './userCalls';
import { largest, norm2 } from './vectors';

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
  /** Σⱼ |Aᵢⱼ|·max(|xⱼ|, 1) per output: the size of the terms it sums (0 where only products are known). */
  termScale: Float64Array;
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
  /** Calls made before the comparison (F, A, the repeat, the noise table): what another probe costs besides its slices. */
  setupCalls: number;
}

// Entries kept in a report (a 64 × 64 heat map); beyond, only wrong and undecided ones.
export const shownEntries = 4096;
/**
 * Entries of the largest matrix checked column by column: every entry is a difference tableau
 * and a row of the report, about 20 µs and 150 bytes each, so 50 000 stay near a second and a few
 * MB; a larger one is checked along random directions, its wrong columns located.
 */
export const largestWholeMatrix = 50_000;

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
  const callsBefore = calls.made();
  const values = calls.outputs(x, site);
  const bad = [...values.keys()].filter((i) => !Number.isFinite(values[i]));
  if (bad.length > 0) throw new CheckStopped(makeFinding('non-finite-value', 'objective', `the ${calls.roles.objective} has non-finite outputs at probe ${probeIndex + 1}: ${bad.slice(0, 6).map((i) => `output ${i} = ${values[i]}`).join(', ')}`, site));
  const analytic = analyticAt(x, values.length, site);
  const repeated = calls.outputs(x, site);
  const unrepeatable = values.some((v, i) => !(repeated[i] === v));
  const noise = noiseOfOutputs(calls, x, values, probeIndex, random);
  const termScale = termScales(analytic, x);
  // Each output's noise is at least the rounding of its terms: an output flat along the noise
  // direction, or 0 at the probe, shows none in the Moré–Wild table, yet its values along a
  // coordinate still carry the rounding of the terms that cancel there.
  for (let i = 0; i < noise.length; i++) noise[i] = Math.max(noise[i], 2 ** -52 * (termScale[i] ?? 0), Number.isFinite(repeated[i]) ? Math.abs(repeated[i] - values[i]) : Math.abs(values[i]));
  const scale = Math.max(largest(values.map(Math.abs)), largest(noise));
  const relativeNoise = largest(noise) / Math.max(scale, Number.MIN_VALUE);
  const unit = analytic.dense ? gradientUnitOf(analytic.dense.values) : 2 ** -52;
  const context: MatrixProbeContext = { calls, probeIndex, x, values, noise, relativeStep: relativeStepFor(relativeNoise), termScale, analytic, unit };
  const setupCalls = calls.made() - callsBefore;
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
    setupCalls,
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

/** Σⱼ |Aᵢⱼ|·max(|xⱼ|, 1) per output; zeros where only products are known. */
function termScales(analytic: AnalyticMatrix, x: Float64Array): Float64Array {
  const dense = analytic.dense;
  const scales = new Float64Array(dense ? dense.rows : 0);
  if (!dense) return scales;
  for (let i = 0; i < dense.rows; i++) for (let j = 0; j < dense.columns; j++) scales[i] += Math.abs(dense.values[i * dense.columns + j]) * Math.max(Math.abs(x[j]), 1);
  return scales;
}

/** The Moré–Wild noise of every output along one seeded ±max(|xᵢ|, 1) direction, sharing the evaluations. */
function noiseOfOutputs(calls: UserCalls, x: Float64Array, values: Float64Array, probeIndex: number, random: Random): Float64Array {
  const direction = x.map((xi) => (random.uniform() < 0.5 ? -1 : 1) * Math.max(Math.abs(xi), 1));
  const slice = sliceOf(calls, x, direction, { probeIndex, point: 'a noise-estimation point' });
  return values.map((v, i) => estimateNoise((t) => slice(t)[i], v));
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
