// The words and figures a user reads about a pair, one set for every place they appear
// (diagnostics, hover, code lens, quick pick, status bar, report, CLI).
import { kindWording } from '../engine/kindWording';
import type { CheckPlan, DirectionalCheck, LeastSquaresForm, PairReport, PairStatus, ProbeReport, TargetKind, UndecidedReason } from '../engine/types';
import { describeDiagnosis, describeMatrixDiagnosis } from '../engine/wording';

// Figures and the shape of an error are worded where the engine words its findings.
export { shortNumber } from '../engine/format';
export { describeDiagnosis, kindWording };

/** Rounds a positive x down to `digits` significant figures: a step taken from it stays at or below x. */
export function floorToSignificant(x: number, digits = 2): number {
  if (!(x > 0) || !Number.isFinite(x)) return x;
  const scale = 10 ** (Math.floor(Math.log10(x)) - digits + 1);
  // The tiny nudge keeps 0.026 / 1e-3 = 25.999… from flooring to 25.
  const units = Math.floor(x / scale + 1e-9);
  return Number((units * scale).toPrecision(digits));
}


/**
 * How the check calls a target, as the user would write it: `model.loss(x, trainX, trainY)`,
 * `new Bowl().loss(x)`, `lossAndGrad(x)[0]`. `namespace` is how an importing entry names the
 * document, left out of what the user reads.
 */
export function describeCall(plan: Pick<CheckPlan, 'recipe' | 'kind'>, namespace?: string): string {
  const { recipe } = plan;
  const plain = (key: string) => withoutNamespace(key, namespace);
  const host = recipe.host ? (recipe.host.construct ? `new ${plain(recipe.host.key)}()` : plain(recipe.host.key)) : null;
  const data = recipe.extraArguments.map((a) => a ?? '(default)');
  const call = (fn: string, direction: string[] = []) => `${host ? `${host}.` : ''}${plain(fn)}(${['x', ...direction, ...data].join(', ')})`;
  // One result holding both: `lossAndGrad(x).loss and .grad`, `residualsAndJacobian(x)[0] and [1]`.
  const member = (key: string) => (/^\d+$/.test(key) ? `[${key}]` : /^[A-Za-z_$][\w$]*$/.test(key) ? `.${key}` : `[${JSON.stringify(key)}]`);
  if (recipe.split) return `${call(recipe.value)}${member(recipe.split.value)} and ${member(recipe.split.derivative)}`;
  // A Hessian-vector product takes its direction after the point.
  return recipe.derivative === null ? call(recipe.value) : `${call(recipe.value)} and ${call(recipe.derivative, plan.kind === 'hessianVectorProduct' ? ['v'] : [])}`;
}

/** A scope key as the user writes it: without the namespace an importing entry reaches the document by. */
export function withoutNamespace(key: string, namespace?: string): string {
  return namespace && key.startsWith(`${namespace}.`) ? key.slice(namespace.length + 1) : key;
}

/** The last part of a path, whichever separator the platform writes. */
export function baseName(fileName: string): string {
  return fileName.split(/[\\/]/).pop() ?? fileName;
}


/** What stands for 2/λ⁺ when no positive curvature was found. */
export const noDivergenceStep = 'none (no positive curvature)';

export const verdictWords: Record<PairStatus, string> = {
  pass: 'gradient matches',
  fail: 'gradient wrong',
  inconclusive: 'undecided',
  error: 'not checked',
};

/** The same verdicts as counts: "3 matching, 2 wrong". */
export const verdictCountWords: Record<PairStatus, string> = {
  pass: 'matching',
  fail: 'wrong',
  inconclusive: 'undecided',
  error: 'not checked',
};

/** A target's verdict in its own words: "Jacobian matches", "Hessian wrong", "undecided". */
export function verdictOf(report: Pick<PairReport, 'kind' | 'status'>): string {
  const derivative = kindWording[report.kind].derivative;
  if (report.status === 'pass') return `${derivative} matches`;
  if (report.status === 'fail') return `${derivative} wrong`;
  return verdictWords[report.status];
}

/** The shape of a wrong derivative, for any kind; null when nothing is wrong. */
export function errorShapeOf(report: Pick<PairReport, 'kind' | 'diagnosis' | 'matrix'>): string | null {
  if (report.matrix) return report.matrix.diagnosis ? describeMatrixDiagnosis(report.matrix.diagnosis, kindWording[report.kind]) : null;
  return report.diagnosis ? describeDiagnosis(report.diagnosis) : null;
}

/** The labels of a Jacobian's least-squares figures, one wording for the hover and the report. */
export const leastSquaresLabels = {
  sigmaMaxSquared: 'σmax(J)², L of the Gauss–Newton model of ½‖r‖²',
  conditionNumber: 'cond(JᵀJ)',
  singular: 'singular to rounding',
} as const;

/** One compared derivative as every table shows it, whatever the kind. */
export interface DerivativeRow {
  /** `3` (a component), `J[4][1]` (an entry), `direction 2`. */
  label: string;
  analytic: number;
  numerical: number;
  bound: number;
  relError: number | null;
  mismatch: boolean;
  undecided?: UndecidedReason;
}

/**
 * The rows of a probe: its entries (matrix kinds), else its components, else its random
 * directions; `heading` names the first column.
 */
export function derivativeRows(kind: TargetKind, probe: ProbeReport): { heading: string; rows: DerivativeRow[] } {
  const row = (label: string, c: DirectionalCheck, relError: number | null): DerivativeRow => ({ label, analytic: c.analytic, numerical: c.numerical, bound: c.errorBound, relError, mismatch: c.mismatch, ...(c.undecided ? { undecided: c.undecided } : {}) });
  if (probe.entries && probe.entries.length > 0) return { heading: 'entry', rows: probe.entries.map((e) => row(kindWording[kind].entry(e.row, e.column), e, e.relError)) };
  if (probe.components.length > 0) return { heading: 'component', rows: probe.components.map((c) => row(String(c.index), c, c.relError)) };
  return { heading: 'direction', rows: probe.directions.map((d, i) => row(String(i + 1), d, null)) };
}

/** "f = ½‖r‖², ∇f = Jᵀr: consistent", for a gradient pair built from residuals. */
export function describeLeastSquaresForm(form: LeastSquaresForm): string {
  const value = form.objective === 'half' ? '½‖r‖²' : form.objective === 'full' ? '‖r‖²' : 'not ½‖r‖² or ‖r‖²';
  const gradient = form.gradient === 'half' ? 'Jᵀr' : form.gradient === 'full' ? '2Jᵀr' : 'neither Jᵀr nor 2Jᵀr';
  const verdict = form.objective === null ? '' : form.objective === form.gradient ? ': consistent' : ': inconsistent';
  return `f = ${value}, ∇f = ${gradient}${verdict} (probe ${form.probeIndex + 1})`;
}
