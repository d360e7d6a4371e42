// The gradient check at one probe: value, gradient, repeatability, noise, then
// the full or directional comparison, its diagnosis and its findings.
import { studySteps } from './differences';
import { diagnoseComponents, diagnoseDirections } from './diagnosis';
import { mismatchMessage } from './wording';
import { checkRandomDirections, type DirectionalResult } from './directionalCheck';
import { formatList } from './format';
import { checkComponents, type FullCheckResult } from './fullCheck';
import { localiseWrongComponents } from './localise';
import { estimateNoise } from './noise';
import { gradientUnitOf, type ProbeContext } from './probeContext';
import type { Random } from './random';
import { isDecided } from './decision';
import type { ComponentCheck, Diagnosis, DirectionalCheck, Finding, ProbeReport, StepStudy } from './types';
import { CheckStopped, makeFinding, type CallSite, type UserCalls } from './userCalls';
import { largest, offset, offsetComponent } from './vectors';

export interface ProbeOutcome {
  report: ProbeReport;
  context: ProbeContext;
  diagnosis: Diagnosis | null;
  mismatch: boolean;
  kink: boolean;
  /** The gradient is zero within the error bounds here: a wrong sign or factor cannot show. */
  stationary: boolean;
  /** Not stationary, yet nothing at this probe could be decided: every error bound was too wide. */
  noisy: boolean;
  /** Every component (full mode) or direction (directional mode) got a verdict here. */
  complete: boolean;
  /** The time budget ran out during this probe's check: only some components were checked. */
  cut: boolean;
  /** f(x) differed between two calls at the same point. */
  unrepeatable: boolean;
  /** f(x) of the second call. */
  repeatedValue: number;
  findings: Finding[];
  full: FullCheckResult | null;
  directional: DirectionalResult | null;
}

/**
 * Relative noise of f above which wide bounds are blamed on the noise rather than on a zero
 * gradient: far above double rounding (~1e-16), where a simulation, a float32 computation or a
 * solver tolerance puts it (common practice).
 */
const noticeableNoise = 1e-6;
/** Shown coordinates of a probe in the report. */
const shownCoordinates = 64;
// Difference estimates (pooled and coordinate) allowed for locating wrong components at one probe.
const localisationBudget = 80;

/** What is checked at one probe, once f, ∇f and the noise there are known (checkPair plans it). */
export type ProbeWork =
  /** Every component by its own difference. */
  | { mode: 'full' }
  /** Seeded random directions; wrong components are then located. */
  | { mode: 'directional'; directions: number }
  /**
   * Where an earlier probe established the gradient: one random direction, and the components
   * no earlier probe confirmed. A mismatch here is checked again as a whole probe (checkPair).
   */
  | { mode: 'spot'; components: number[] };

/** Noise of f carried from the probe where it was measured, for a spot check. */
export interface CarriedNoise {
  absolute: number;
  /** Relative to |f| there: where |f| is larger, the noise is taken to grow with it. */
  relative: number;
}

// Random directions of a spot check.
const spotDirections = 1;

/**
 * The check at one probe: f, ∇f, then (unless `carried` gives the noise, as for a spot check)
 * repeatability and the noise of f, then the work `plan` chooses from what those cost.
 */
export function checkProbe(calls: UserCalls, x: Float64Array, probeIndex: number, carried: CarriedNoise | null, plan: (context: ProbeContext) => ProbeWork, noiseRandom: Random, directionRandom: Random): ProbeOutcome {
  const site: CallSite = { probeIndex, point: 'the probe' };
  const value = calls.objective(x, site);
  if (!Number.isFinite(value)) throw new CheckStopped(makeFinding('non-finite-value', 'objective', `the objective is ${value} at probe ${probeIndex + 1}`, site));
  const gradient = calls.gradient(x, site);
  const nonFinite: number[] = [];
  for (let i = 0; i < gradient.length; i++) if (!Number.isFinite(gradient[i])) nonFinite.push(i);
  if (nonFinite.length > 0) {
    const finding = makeFinding('non-finite-value', 'gradient', `the gradient has non-finite values at probe ${probeIndex + 1}: ${nonFinite.slice(0, 8).map((i) => `component ${i} = ${gradient[i]}`).join(', ')}${nonFinite.length > 8 ? ` and ${nonFinite.length - 8} more` : ''}`, site);
    finding.components = nonFinite;
    throw new CheckStopped(finding);
  }
  const context: ProbeContext = { calls, probeIndex, x, value, gradient, noise: 0, gradientUnit: gradientUnitOf(gradient), curvatureSeen: 0 };
  let repeated = value;
  if (carried) {
    context.noise = Math.max(carried.absolute, carried.relative * Math.abs(value));
  } else {
    repeated = calls.objective(x, site);
    const spread = Number.isFinite(repeated) ? Math.abs(repeated - value) : Math.abs(value);
    context.noise = Math.max(noiseNear(context, noiseRandom), spread);
  }
  const work = plan(context);

  const outcome: ProbeOutcome = {
    report: {
      point: Array.from(x.subarray(0, shownCoordinates)),
      dimension: x.length,
      value,
      mode: work.mode,
      components: [],
      directions: [],
      noise: relativeNoise(context),
      maxRelError: 0,
      stepStudy: null,
      smoothness: null,
      descent: [],
    },
    context,
    diagnosis: null,
    mismatch: false,
    kink: false,
    stationary: false,
    noisy: false,
    complete: false,
    cut: false,
    unrepeatable: !(repeated === value),
    repeatedValue: repeated,
    findings: [],
    full: null,
    directional: null,
  };
  if (work.mode === 'full') runFull(outcome);
  else if (work.mode === 'directional') runDirectional(outcome, work.directions, directionRandom);
  else runSpot(outcome, work.components, directionRandom);
  return outcome;
}

/** The noise a spot check at another probe assumes: this probe's, absolute and relative to |f|. */
export function carriedNoise(context: ProbeContext): CarriedNoise {
  return { absolute: context.noise, relative: context.value !== 0 ? context.noise / Math.abs(context.value) : 0 };
}

/** The noise of f relative to |f(x)| (absolute where f(x) = 0), as the report shows it. */
export function relativeNoise(context: ProbeContext): number {
  return context.value !== 0 ? context.noise / Math.abs(context.value) : context.noise;
}

/** Noise along a seeded ±max(|x_i|, 1) direction (Moré–Wild table). */
function noiseNear(context: ProbeContext, random: Random): number {
  const direction = context.x.map((xi) => (random.uniform() < 0.5 ? -1 : 1) * Math.max(Math.abs(xi), 1));
  const site: CallSite = { probeIndex: context.probeIndex, point: 'a noise-estimation point' };
  return estimateNoise((t) => context.calls.objective(offset(context.x, t, direction), site), context.value);
}

function runFull(outcome: ProbeOutcome): void {
  const full = checkComponents(outcome.context);
  settle(outcome, null, full);
  if (!outcome.mismatch) return;
  outcome.diagnosis = diagnoseComponents(full.components, !full.cut);
  outcome.findings.push(mismatchFinding(outcome));
}

function runDirectional(outcome: ProbeOutcome, count: number, random: Random): void {
  const { context, report } = outcome;
  const directional = checkRandomDirections(context, random, count);
  settle(outcome, directional, null);
  if (!outcome.mismatch) return;
  outcome.diagnosis = diagnoseDirections(directional.directions);
  if (!outcome.diagnosis) {
    const found = localiseWrongComponents(context, random, localisationBudget);
    report.components = found.components.map(sanitised);
    report.localisation = { pooledDifferences: found.pooledDifferences, coordinateDifferences: found.coordinateDifferences, incomplete: found.incomplete };
    outcome.diagnosis = diagnoseComponents(found.components, false) ?? { kind: 'unknown' };
  }
  outcome.findings.push(mismatchFinding(outcome));
}

function runSpot(outcome: ProbeOutcome, components: number[], random: Random): void {
  const directional = checkRandomDirections(outcome.context, random, spotDirections);
  // A suspect direction ends the spot check: checkPair checks the probe again as a whole.
  const suspect = directional.directions.some((d) => d.mismatch);
  settle(outcome, directional, suspect ? null : checkComponents(outcome.context, components));
}

/**
 * What a probe's comparisons add up to, whichever work ran: a mismatch, a kink, a cut by the
 * budget, whether everything was decided (or the probe is stationary or noisy), the report's rows
 * and largest relative error, and the finding for a kink.
 */
function settle(outcome: ProbeOutcome, directional: DirectionalResult | null, full: FullCheckResult | null): void {
  const { report } = outcome;
  const directions = directional?.directions ?? [];
  const components = full?.components ?? [];
  const checks = [...directions, ...components];
  outcome.directional = directional;
  outcome.full = full;
  outcome.mismatch = checks.some((c) => c.mismatch);
  outcome.kink = (directional?.kinks ?? 0) > 0 || (full?.kinks.length ?? 0) > 0;
  outcome.cut = (directional?.cut ?? false) || (full?.cut ?? false);
  // Before the rows are copied: a stationary probe marks its checks so.
  classifyProbe(outcome, checks);
  if (outcome.cut) outcome.complete = false;
  report.directions = directions.map(sanitised);
  report.components = components.map(sanitised);
  report.maxRelError = largestRelError(checks);
  if (outcome.kink) outcome.findings.push(nonSmoothFinding(outcome, full?.kinks ?? []));
}

/** The mismatch finding, naming the wrong components the report lists. */
function mismatchFinding(outcome: ProbeOutcome): Finding {
  const { probeIndex } = outcome.context;
  const finding = makeFinding('gradient-mismatch', 'gradient', mismatchMessage(outcome.report, probeIndex, outcome.diagnosis), { probeIndex, point: 'the probe' });
  const components = outcome.report.components.filter((c) => c.mismatch).map((c) => c.index);
  if (components.length > 0) finding.components = components;
  return finding;
}

/** Largest |analytic − numerical| / max(|analytic|, |numerical|) among the decided derivatives. */
export function largestRelError(checks: DirectionalCheck[]): number {
  const decided = checks.filter((c) => isDecided(c));
  return Math.max(0, largest(decided.map((c) => Math.abs(c.analytic - c.numerical) / (Math.max(Math.abs(c.analytic), Math.abs(c.numerical)) || 1))));
}

/**
 * Whether the probe decided everything, is stationary (every derivative, analytic and numerical,
 * within its error bound of zero: there a factor or a sign cannot show, and the components are
 * marked so), or is noisy (nothing decided for wide bounds though the gradient is not zero).
 */
function classifyProbe(outcome: ProbeOutcome, checks: Array<ComponentCheck | DirectionalCheck>): void {
  outcome.complete = checks.every((c) => isDecided(c));
  if (outcome.mismatch || outcome.kink || checks.length === 0) return;
  const undecidedAll = checks.every((c) => c.undecided === 'bound-too-wide');
  if (!undecidedAll) return;
  const zeroWithinBounds = checks.every((c) => Math.abs(c.analytic) <= c.errorBound && Math.abs(c.numerical) <= c.errorBound);
  outcome.stationary = zeroWithinBounds && outcome.report.noise <= noticeableNoise;
  if (outcome.stationary) for (const c of checks) c.undecided = 'stationary';
  else outcome.noisy = true;
}

function nonSmoothFinding(outcome: ProbeOutcome, components: number[]): Finding {
  const where = components.length > 0 ? `along component ${formatList(components)}` : 'along a random direction';
  const finding = makeFinding('non-smooth-probe', 'objective', `the objective looks non-smooth at probe ${outcome.context.probeIndex + 1} ${where}: forward and backward differences disagree and do not converge as the step shrinks, so the gradient cannot be checked there`, { probeIndex: outcome.context.probeIndex, point: 'the probe' });
  finding.severity = 'info';
  if (components.length > 0) finding.components = components;
  return finding;
}

/** Error of the plain central difference against step size, for the component (or direction) that matters most. */
export function buildStepStudy(outcome: ProbeOutcome): StepStudy | null {
  const { context } = outcome;
  const site: CallSite = { probeIndex: context.probeIndex, point: 'a step-study point' };
  if (outcome.full && outcome.full.components.length > 0) {
    const candidates = outcome.full.components.filter((c) => Number.isFinite(c.numerical));
    if (candidates.length === 0) return null;
    const worst = candidates.reduce((a, b) => (rank(b) > rank(a) ? b : a));
    const scale = Math.max(Math.abs(context.x[worst.index]), 1);
    const phi = (t: number) => context.calls.objective(offsetComponent(context.x, worst.index, t), site);
    const study = studySteps(phi, worst.numerical, 0.1 * scale);
    return { component: worst.index, ...study, chosenStep: outcome.full.steps[outcome.full.components.indexOf(worst)] };
  }
  const first = outcome.directional?.firstDirection;
  if (!first || !Number.isFinite(first.numerical)) return null;
  const phi = (t: number) => context.calls.objective(offset(context.x, t, first.direction), site);
  return { component: -1, ...studySteps(phi, first.numerical, 0.1), chosenStep: first.step };
}

/** Mismatches first, then by relative error. */
function rank(c: ComponentCheck): number {
  return (c.mismatch ? 2 : 0) + Math.min(c.relError, 1);
}

/** A row with its non-finite figures made finite for the report, which JSON must carry. */
export function sanitised<Check extends DirectionalCheck>(c: Check): Check {
  return { ...c, numerical: finiteOr(c.numerical, 0), errorBound: finiteOr(c.errorBound, Number.MAX_VALUE) };
}

function finiteOr(value: number, fallback: number): number {
  return Number.isFinite(value) ? value : fallback;
}
