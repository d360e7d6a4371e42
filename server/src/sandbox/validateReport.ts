// The host's check of a report that arrives from the sandbox process. That process ran the
// user's code, so its reply is data to read with care, not a PairReport to trust: every field
// is read as an own data property, held to what the type allows (exact enum words, finite
// numbers, arrays of the right shapes), and what could be huge is capped. The result is a
// fresh plain object; anything malformed gives `{ problem }` instead, never an exception.
// Runs before the host fills in `location` from the source map: a location the sandbox
// sends is dropped, since only the host's mapping may say which file a finding is in.
import { allFindingCodes } from '../check/codes';
import type {
  ComponentCheck,
  DescentRun,
  Diagnosis,
  DirectionalCheck,
  EntryCheck,
  Finding,
  FindingSubject,
  LeastSquaresForm,
  LearningRateVerdict,
  MatrixDiagnosis,
  MatrixSummary,
  PairReport,
  PairStatus,
  ProbeReport,
  RateStatus,
  Severity,
  SmoothnessEstimate,
  StepStudy,
  TargetKind,
  UndecidedReason,
} from '../engine/types';
import { targetKinds } from '../engine/types';
import {
  boolean,
  count,
  countPair,
  cut,
  finite,
  isRecord,
  listOf,
  Malformed,
  measurement,
  mostTellingOf,
  nonNegative,
  nullOr,
  objectOf,
  oneOf,
  ownValue,
  textUpTo,
  wordsOf,
  type Reader,
} from './untrustedValues';
import { reportLimits } from './reportLimits';

export { reportLimits };


/** The report rebuilt from checked fields, or what was wrong with it. Never throws. */
export function validateReport(value: unknown): { report: PairReport } | { problem: string } {
  try {
    const report = pairReport(value, 'report');
    const length = JSON.stringify(report).length;
    if (length > reportLimits.reportLength) return { problem: `the report is ${length} characters of JSON, more than the ${reportLimits.reportLength} allowed` };
    return { report };
  } catch (error) {
    // Only a Proxy, which JSON never makes, can throw anything else while being read.
    return { problem: error instanceof Malformed ? error.message : 'the report could not be read' };
  }
}

/**
 * The console lines of a reply: strings only (others are left out), each line and all of them
 * capped, a last line saying so when lines were left out; anything but a list gives none.
 */
export function validateConsole(value: unknown): string[] {
  if (!Array.isArray(value)) return [];
  const lines: string[] = [];
  let length = 0;
  let next = 0;
  for (; next < value.length && lines.length < reportLimits.consoleLines; next++) {
    const line = ownValue(value, next);
    if (typeof line !== 'string') continue;
    const kept = cut(line, reportLimits.consoleLineLength);
    if (length + kept.length > reportLimits.consoleLength) break;
    lines.push(kept);
    length += kept.length;
  }
  if (next < value.length) {
    lines.length = Math.min(lines.length, reportLimits.consoleLines - 1);
    lines.push(`… [console output cut: ${value.length} lines in all]`);
  }
  return lines;
}

// The report's fields (engine/types.ts).

const severities = wordsOf<Severity>({ error: true, warning: true, info: true });
const status = oneOf(wordsOf<PairStatus>({ pass: true, fail: true, inconclusive: true, error: true }));
const severity = oneOf(severities);
const code = oneOf(allFindingCodes);
const subject = oneOf(wordsOf<FindingSubject>({ objective: true, gradient: true, learningRate: true, probe: true, recipe: true }));
const rateStatus = oneOf(wordsOf<RateStatus>({ safe: true, aggressive: true, divergent: true }));
const probeMode = oneOf(wordsOf<ProbeReport['mode']>({ full: true, directional: true, spot: true }));
const runLabel = oneOf(wordsOf<DescentRun['label']>({ declared: true, safe: true, limit: true }));

const messageText = textUpTo(reportLimits.messageLength);
const longText = textUpTo(reportLimits.stackLength);
const shortText = textUpTo(reportLimits.nameLength);
const numbers = listOf(measurement, reportLimits.numbers);
const indices = listOf(count, reportLimits.numbers);

// Ranks for trimming long lists, lowest kept first. An entry that is not what it should be ranks
// lowest of all, so it is kept and refused, rather than trimmed away with the list's tail.
const severityRank = (f: unknown) => (isRecord(f) ? severities.indexOf(ownValue(f, 'severity') as Severity) : -1);
const mismatchRank = (c: unknown) => (isRecord(c) && ownValue(c, 'mismatch') === false ? 1 : 0);

// Readers are defined before use: the ones a reader names must exist when it is built.

/** What a component check and a direction check share. */
const compared = { analytic: measurement, numerical: measurement, errorBound: measurement, mismatch: boolean };
const undecided = { undecided: oneOf(wordsOf<UndecidedReason>({ 'bound-too-wide': true, 'singular-within-step': true, 'not-smooth': true, stationary: true, 'out-of-time': true })) };
const directionalCheck = objectOf<DirectionalCheck>(compared, undecided);
const componentCheck = objectOf<ComponentCheck>({ index: count, ...compared, relError: measurement }, undecided);
const entryCheck = objectOf<EntryCheck>({ row: count, column: count, ...compared, relError: measurement }, undecided);

const stepStudy = objectOf<StepStudy>(
  {
    // -1 stands for a random direction.
    component: (value, at) => (value === -1 ? -1 : count(value, at)),
    steps: numbers,
    errors: numbers,
    chosenStep: measurement,
  },
  {},
);

const descentRun = objectOf<DescentRun>({ label: runLabel, rate: measurement, values: numbers, decreased: boolean }, {});

const probeSmoothness = objectOf<NonNullable<ProbeReport['smoothness']>>(
  { lambdaMax: measurement, lambdaMin: measurement, ritzValues: numbers, secantMax: measurement, hessianVectorProducts: count },
  { lambdaMaxResidual: measurement, lambdaMinResidual: measurement, productError: measurement, checkCurvature: measurement },
);

const probeReport = objectOf<ProbeReport>(
  {
    point: numbers,
    dimension: count,
    value: measurement,
    mode: probeMode,
    components: mostTellingOf(componentCheck, reportLimits.components, mismatchRank),
    directions: mostTellingOf(directionalCheck, reportLimits.directions, mismatchRank),
    noise: measurement,
    maxRelError: measurement,
    stepStudy: nullOr(stepStudy),
    smoothness: nullOr(probeSmoothness),
    descent: listOf(descentRun, reportLimits.descentRuns),
  },
  {
    localisation: objectOf<NonNullable<ProbeReport['localisation']>>({ pooledDifferences: count, coordinateDifferences: count, incomplete: boolean }, {}),
    entries: mostTellingOf(entryCheck, reportLimits.entries, mismatchRank),
  },
);

const finding = objectOf<Finding>(
  { code, severity, message: messageText, subject },
  {
    components: indices,
    entries: listOf(countPair, reportLimits.numbers),
    // A scope key cut short names no line any more; the finding then stays on the objective.
    recipeKey: longText,
    probeIndex: count,
    stack: longText,
    // Only the host's source mapping says where a finding is (see the top of the file).
    location: 'not read',
  },
);

/** Each kind of diagnosis with the fields it has. */
const diagnosisOfKind: { [K in Diagnosis['kind']]: Reader<Extract<Diagnosis, { kind: K }>> } = {
  sign: objectOf({ kind: oneOf(['sign']) }, {}),
  factor: objectOf({ kind: oneOf(['factor']), factor: measurement }, {}),
  permutation: objectOf({ kind: oneOf(['permutation']), pairs: listOf(countPair, reportLimits.numbers) }, {}),
  subset: objectOf({ kind: oneOf(['subset']), components: indices }, {}),
  unknown: objectOf({ kind: oneOf(['unknown']) }, {}),
};
const diagnosisKind = objectOf<Pick<Diagnosis, 'kind'>>({ kind: oneOf(Object.keys(diagnosisOfKind) as Array<Diagnosis['kind']>) }, {});
const diagnosis: Reader<Diagnosis> = (value, at) => diagnosisOfKind[diagnosisKind(value, at).kind](value, at);

/** Each kind of matrix diagnosis with the fields it has. */
const indexFactor = objectOf<{ index: number; factor: number }>({ index: count, factor: measurement }, {});
const matrixDiagnosisOfKind: { [K in MatrixDiagnosis['kind']]: Reader<Extract<MatrixDiagnosis, { kind: K }>> } = {
  transposed: objectOf({ kind: oneOf(['transposed']) }, {}),
  rowShift: objectOf({ kind: oneOf(['rowShift']), shift: finite }, {}),
  columnSwap: objectOf({ kind: oneOf(['columnSwap']), pairs: listOf(countPair, reportLimits.numbers) }, {}),
  rowSwap: objectOf({ kind: oneOf(['rowSwap']), pairs: listOf(countPair, reportLimits.numbers) }, {}),
  matrixFactor: objectOf({ kind: oneOf(['matrixFactor']), factor: measurement }, {}),
  columnFactor: objectOf({ kind: oneOf(['columnFactor']), columns: listOf(indexFactor, reportLimits.numbers) }, {}),
  rowFactor: objectOf({ kind: oneOf(['rowFactor']), rows: listOf(indexFactor, reportLimits.numbers) }, {}),
  diagonalFactor: objectOf({ kind: oneOf(['diagonalFactor']), factor: measurement }, {}),
  diagonalOffset: objectOf({ kind: oneOf(['diagonalOffset']), offset: measurement }, {}),
  oneSided: objectOf({ kind: oneOf(['oneSided']), side: nullOr(oneOf(['lower', 'upper'] as const)) }, {}),
  entry: objectOf({ kind: oneOf(['entry']), row: count, column: count }, {}),
  region: objectOf({ kind: oneOf(['region']), rows: countPair, columns: countPair }, {}),
  columns: objectOf({ kind: oneOf(['columns']), columns: indices }, {}),
  rows: objectOf({ kind: oneOf(['rows']), rows: indices }, {}),
  unknown: objectOf({ kind: oneOf(['unknown']) }, {}),
};
const matrixDiagnosisKind = objectOf<Pick<MatrixDiagnosis, 'kind'>>({ kind: oneOf(Object.keys(matrixDiagnosisOfKind) as Array<MatrixDiagnosis['kind']>) }, {});
const matrixDiagnosis: Reader<MatrixDiagnosis> = (value, at) => matrixDiagnosisOfKind[matrixDiagnosisKind(value, at).kind](value, at);

const matrixSummary = objectOf<MatrixSummary>(
  { rows: count, columns: count, diagnosis: nullOr(matrixDiagnosis) },
  {
    asymmetry: objectOf<NonNullable<MatrixSummary['asymmetry']>>({ row: count, column: count, gap: measurement, scale: measurement }, {}),
    leastSquares: objectOf<NonNullable<MatrixSummary['leastSquares']>>({ probeIndex: count, sigmaMaxSquared: measurement, sigmaMinSquared: measurement, conditionNumber: nullOr(measurement) }, {}),
  },
);

const smoothnessEstimate = objectOf<SmoothnessEstimate>(
  { lipschitz: measurement, mu: measurement, kappa: nullOr(measurement), safeStep: measurement, divergenceStep: nullOr(measurement) },
  { lipschitzResidual: measurement, muResidual: measurement, widened: boolean, productError: measurement },
);

const learningRateVerdict = objectOf<LearningRateVerdict>(
  { name: shortText, value: finite, status: rateStatus, decreased: listOf(boolean, reportLimits.probes) },
  { momentum: objectOf<{ name: string; value: number }>({ name: shortText, value: finite }, {}) },
);

const pairReport = objectOf<PairReport>(
  {
    status,
    kind: oneOf<TargetKind>(targetKinds),
    dimension: nullOr(count),
    maxRelError: nullOr(measurement),
    diagnosis: nullOr(diagnosis),
    smoothness: nullOr(smoothnessEstimate),
    learningRate: nullOr(learningRateVerdict),
    probes: listOf(probeReport, reportLimits.probes),
    findings: mostTellingOf(finding, reportLimits.findings, severityRank),
    evaluations: objectOf<PairReport['evaluations']>({ objective: count, gradient: count }, {}),
    elapsedMs: nonNegative,
  },
  {
    matrix: matrixSummary,
    leastSquaresForm: objectOf<LeastSquaresForm>({ probeIndex: count, objective: nullOr(oneOf(['half', 'full'] as const)), gradient: nullOr(oneOf(['half', 'full'] as const)) }, {}),
  },
);
