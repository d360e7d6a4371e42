// Plain data shared by the engine, the sandbox, the CLI and the language server.
// Nothing here may depend on Node, LSP or VS Code: the engine also runs inside
// the sandbox's bare `vm` context, where only ECMAScript built-ins exist.

/** A point in parameter space, in the realm and kind the user's code expects. */
export type Vector = number[] | Float64Array;

/** How a point is handed to the user's functions. */
export type ArgumentKind = 'array' | 'float64array';

export type Severity = 'error' | 'warning' | 'info';

/** Overall verdict for one objective/gradient pair. */
export type PairStatus = 'pass' | 'fail' | 'inconclusive' | 'error';

/** Verdict on a declared learning rate against the local Lipschitz estimate. */
export type RateStatus = 'safe' | 'aggressive' | 'divergent';

/** Tunable budgets of a check. Every field has a default in `defaultCheckOptions`. */
export interface CheckOptions {
  /** Seed of every random choice (probes, directions), so runs are repeatable. */
  seed: number;
  /** Random probes drawn when the dimension is known but no @probe is given. */
  probeCount: number;
  /** Up to this dimension every component is differenced; above it, random directions. */
  fullCheckMaxDimension: number;
  /** Random directions tried per probe in the large-dimension check. */
  directionCount: number;
  /** Largest Krylov dimension of the Lanczos iteration. */
  lanczosSteps: number;
  /** Length of the short gradient-descent runs that confirm a learning-rate verdict. */
  descentSteps: number;
  /**
   * Also compute what only the report's plots show: the step study and descent runs at 1/L̂ and
   * 2/λ⁺. They cost calls the verdict does not need, so only the report asks for them.
   */
  plots: boolean;
  /**
   * Estimate the curvature (L̂, 1/L̂, 2/λ⁺) even when no learning rate is declared: a hover, the
   * report or a CLI flag asks for it. Without a rate it costs calls no verdict needs.
   */
  smoothness: boolean;
}

export const defaultCheckOptions: CheckOptions = {
  seed: 1,
  probeCount: 3,
  fullCheckMaxDimension: 64,
  directionCount: 6,
  lanczosSteps: 40,
  descentSteps: 20,
  plots: false,
  smoothness: false,
};

/**
 * What a target checks. The value function and its derivative are, by kind: an objective f and
 * its gradient; residuals r and their Jacobian J (J[i][j] = ∂rᵢ/∂xⱼ); a gradient ∇f and its
 * Hessian; a gradient and a Hessian-vector product (x, v) ↦ H(x)v. Findings call the first
 * function the subject 'objective' and the second 'gradient', whatever the kind.
 */
export type TargetKind = 'gradient' | 'jacobian' | 'hessian' | 'hessianVectorProduct';

export const targetKinds: readonly TargetKind[] = ['gradient', 'jacobian', 'hessian', 'hessianVectorProduct'];

/**
 * How the sandbox calls one target's functions in the user's realm. Every key below is a
 * key of the module's scope hook: the source text of a module-level expression (`loss`,
 * `model`, `train.X`, `[0.5, 1]`) that the bundle exposes to the sandbox (see sandbox/scopeHook.ts).
 */
export interface CallRecipe {
  /** The object whose methods the functions are; null for functions of the module itself. */
  host: { key: string; construct: boolean } | null;
  /** The function giving f, or f with its derivative when `split` is set: a scope key, or a method name on the host. */
  value: string;
  /** The derivative's scope key or method name; null when `split` takes it from the value function's result. */
  derivative: string | null;
  /** Where one result holds both: `{ value: 'loss', derivative: 'grad' }`, or '0' and '1' for `[f, g]`. */
  split: { value: string; derivative: string } | null;
  /** Scope keys of the arguments after the point, in order; null leaves that argument to its default. */
  extraArguments: Array<string | null>;
  /** What each of those parameters is declared as, when its type says: a value of another shape is reported before any call. */
  extraParameters?: Array<DeclaredParameter | null>;
}

/** A parameter after the point with a declared type the sandbox can check a value against. */
export interface DeclaredParameter {
  name: string;
  /** The type as written, for messages. */
  declared: string;
  shape: 'number' | 'vector' | 'matrix' | 'object';
}

/** A learning rate found in the user's code, with the momentum coefficient next to it if any. */
export interface DeclaredRate {
  name: string;
  value: number;
  momentum?: { name: string; value: number };
}

/** What the sandbox is asked to check for one target. Built by discovery, serialised as JSON. */
export interface CheckPlan {
  kind: TargetKind;
  /** How the user names the value function, for messages: `loss`, `model.loss`. */
  label: string;
  recipe: CallRecipe;
  argumentKind: ArgumentKind;
  /** Literal probe points from `@probe [..]` tags. */
  probes: number[][];
  /** Scope keys of consts whose values are probe points (`@probe name`). */
  probeKeys: string[];
  /** Scope key of the user's starting point: probe 1, with seeded perturbations around it, when no @probe is given. */
  start: string | null;
  /** Dimension known from a tuple parameter type or `@dimension`, used for seeded random probes. */
  dimension: number | null;
  learningRate: DeclaredRate | null;
  options: CheckOptions;
  /**
   * Gradient pairs whose objective calls a residual function that has a Jacobian: that target's
   * recipe, so that ∇f is compared with Jᵀr (or 2Jᵀr).
   */
  residuals?: CallRecipe;
}

/** Stable finding codes. They appear in the CLI, SARIF rules and editor diagnostics. */
export type FindingCode =
  | 'gradient-mismatch'
  | 'jacobian-mismatch'
  | 'hessian-mismatch'
  | 'hessian-vector-product-mismatch'
  | 'hessian-not-symmetric'
  | 'matrix-wrong-shape'
  | 'matrix-undecided'
  | 'least-squares-inconsistent'
  | 'value-not-a-vector'
  | 'gradient-wrong-length'
  | 'gradient-not-a-vector'
  | 'non-finite-value'
  | 'non-smooth-probe'
  | 'noisy-objective'
  | 'gradient-undecided'
  | 'budget-spent'
  | 'stationary-probe'
  | 'objective-not-a-number'
  | 'unrepeatable-objective'
  | 'input-mutated'
  | 'async-result'
  | 'runtime-error'
  | 'timeout'
  | 'sandbox-crash'
  | 'memory-limit'
  | 'builtin-import'
  | 'bundle-error'
  | 'syntax-error'
  | 'missing-export'
  | 'unresolved-target'
  | 'missing-argument'
  | 'ambiguous-pair'
  | 'unpaired-function'
  | 'unknown-dimension'
  | 'bad-probe'
  | 'rate-aggressive'
  | 'rate-divergent'
  | 'rate-unconfirmed';

/** Which declaration a finding belongs on in the editor. */
export type FindingSubject = 'objective' | 'gradient' | 'learningRate' | 'probe' | 'recipe';

export interface Finding {
  code: FindingCode;
  severity: Severity;
  message: string;
  subject: FindingSubject;
  /** 0-based component indices involved (mismatch, non-finite). */
  components?: number[];
  /** 0-based (row, column) entries of a matrix involved (mismatch, non-finite, asymmetry). */
  entries?: Array<[number, number]>;
  /** For subject 'recipe': the scope key of the value that could not be used (the host, a data argument, the start). */
  recipeKey?: string;
  /** Index of the probe the finding was seen at. */
  probeIndex?: number;
  /** Raw stack of a user error, as thrown in the sandbox; the host maps it to the user's line. */
  stack?: string;
  /** User source location of a runtime error, filled in by the host after source mapping (1-based). */
  location?: { file: string; line: number; column: number };
}

/**
 * Why a derivative got no verdict: its error bound is as large as it is, the differences do not
 * settle as the step shrinks (a pole or singularity within the step), the objective has a kink
 * there, the whole probe is a stationary point, or the time budget ran out before it was checked.
 */
export type UndecidedReason = 'bound-too-wide' | 'singular-within-step' | 'not-smooth' | 'stationary' | 'out-of-time';

/** One component of the full (coordinate-wise) check. */
export interface ComponentCheck {
  index: number;
  analytic: number;
  numerical: number;
  /** Bound on |numerical − true derivative| from extrapolation error plus noise. */
  errorBound: number;
  /** |analytic − numerical| / max(|analytic|, |numerical|, tiny). */
  relError: number;
  mismatch: boolean;
  /** Set when this component was neither confirmed nor found wrong, with the reason. */
  undecided?: UndecidedReason;
}

/** One random direction of the large-dimension check. */
export interface DirectionalCheck {
  analytic: number;
  numerical: number;
  errorBound: number;
  mismatch: boolean;
  undecided?: UndecidedReason;
}

/** Numerical-derivative error against step size, for the log–log plot. */
export interface StepStudy {
  /** Component index (or -1 for a random direction) the study was made on. */
  component: number;
  steps: number[];
  /** |central difference(h) − best estimate| at each step. */
  errors: number[];
  chosenStep: number;
}

export interface DescentRun {
  label: 'declared' | 'safe' | 'limit';
  rate: number;
  /** f at each iterate, starting with f(probe). */
  values: number[];
  decreased: boolean;
}

/** One entry of a Jacobian or Hessian against its difference: row i (output), column j (coordinate). */
export interface EntryCheck extends DirectionalCheck {
  row: number;
  column: number;
  relError: number;
}

export interface ProbeReport {
  /** The point (first 64 coordinates only, for large dimensions). */
  point: number[];
  dimension: number;
  /** f(x) for a gradient; ‖F(x)‖₂ of the value function's vector for the matrix kinds. */
  value: number;
  /**
   * full: every component; directional: random directions, then the wrong components located;
   * spot: where an earlier probe established the gradient, one random direction and the
   * components no earlier probe confirmed.
   */
  mode: 'full' | 'directional' | 'spot';
  /** Every component in full mode; the localised ones in directional mode; the open ones in spot mode. */
  components: ComponentCheck[];
  /**
   * Matrix kinds: the entries checked (every one in full mode up to `shownEntries`, else the wrong
   * and undecided ones); the heat map of the report is drawn from them.
   */
  entries?: EntryCheck[];
  directions: DirectionalCheck[];
  /** How the wrong components were located after random directions disagreed (directional mode). */
  localisation?: { pooledDifferences: number; coordinateDifferences: number; incomplete: boolean };
  /** Estimated relative noise level of f near the probe (Moré & Wild). */
  noise: number;
  maxRelError: number;
  stepStudy: StepStudy | null;
  smoothness: {
    lambdaMax: number;
    lambdaMin: number;
    /** Ritz values of the final Lanczos tridiagonal matrix, ascending. */
    ritzValues: number[];
    secantMax: number;
    /** Products the Lanczos iteration made; two more measure their error (productError). */
    hessianVectorProducts: number;
    /** Lanczos residual ‖Hy − θy‖ of the λmax and λmin Ritz pairs: an eigenvalue lies within it of each. */
    lambdaMaxResidual?: number;
    lambdaMinResidual?: number;
    /** |yᵀH_t y − yᵀH_2t y| for the dominant Ritz vector y: the error of the products at step t. */
    productError?: number;
    /** Largest |vᵀHv|/‖v‖² the gradient check's own differences bound from below: a lower bound on L̂ at no extra call. */
    checkCurvature?: number;
  } | null;
  descent: DescentRun[];
}

export type Diagnosis =
  | { kind: 'sign' }
  | { kind: 'factor'; factor: number }
  | { kind: 'permutation'; pairs: Array<[number, number]> }
  | { kind: 'subset'; components: number[] }
  | { kind: 'unknown' };

/** Local smoothness estimates near the probes. Never a global guarantee. */
export interface SmoothnessEstimate {
  /**
   * L̂: largest curvature magnitude found (Lanczos |λ_max|, |λ_min| or a secant slope), widened by
   * the Lanczos residual when that Ritz value had not converged.
   */
  lipschitz: number;
  /** μ̂: smallest curvature seen; negative means non-convex near the probes. */
  mu: number;
  /** Lanczos residual of the Ritz value that gave L̂; absent when a secant slope gave it. */
  lipschitzResidual?: number;
  /** Lanczos residual of the Ritz value that gave μ̂. */
  muResidual?: number;
  /** κ̂ = L̂ / μ̂ when μ̂ > 0, else null. */
  kappa: number | null;
  /** 1/L̂. */
  safeStep: number;
  /**
   * 2/λ⁺ with λ⁺ the largest positive curvature (a Lanczos Ritz value, which lies below the true
   * λ_max): steps at or above it diverge on the quadratic model. Null when no positive curvature
   * was found: descent along negative curvature does not diverge on that model.
   */
  divergenceStep: number | null;
  /** L̂ includes the residual of an unconverged Lanczos estimate. */
  widened?: boolean;
  /** L̂ includes this error of the Hessian-vector products, measured with two step sizes. */
  productError?: number;
}

export interface LearningRateVerdict {
  name: string;
  value: number;
  /** The momentum coefficient found next to the rate; reported, not yet part of the verdict. */
  momentum?: { name: string; value: number };
  status: RateStatus;
  /** Per probe: did f go down over the short run at this rate? */
  decreased: boolean[];
}

/** The shape of a wrong Jacobian or Hessian. Rows are outputs (residuals), columns coordinates. */
export type MatrixDiagnosis =
  | { kind: 'transposed' }
  /** Row i holds the derivatives of output i + shift. */
  | { kind: 'rowShift'; shift: number }
  | { kind: 'columnSwap'; pairs: Array<[number, number]> }
  /** Two outputs' rows exchanged (two residuals written in each other's place). */
  | { kind: 'rowSwap'; pairs: Array<[number, number]> }
  /** The whole matrix is `factor` × the true one (−1: the sign). */
  | { kind: 'matrixFactor'; factor: number }
  /** Each listed column is `factor` × the true column (−1: its sign). */
  | { kind: 'columnFactor'; columns: Array<{ index: number; factor: number }> }
  | { kind: 'rowFactor'; rows: Array<{ index: number; factor: number }> }
  /** Only the diagonal is wrong, by a common factor (a doubled diagonal). */
  | { kind: 'diagonalFactor'; factor: number }
  /** Only the diagonal is wrong, by a common offset: analytic − true = offset (a λ·I term missing or extra). */
  | { kind: 'diagonalOffset'; offset: number }
  /**
   * Every wrong entry is off the diagonal and its mirror image is right: terms added on one side of
   * the diagonal only (all below it, all above it, or null: some below and some above).
   */
  | { kind: 'oneSided'; side: 'lower' | 'upper' | null }
  | { kind: 'entry'; row: number; column: number }
  /** Every wrong entry lies in these few columns (or rows), not by one factor: a chain-rule factor that varies along them. */
  | { kind: 'columns'; columns: number[] }
  | { kind: 'rows'; rows: number[] }
  /** The wrong entries lie within rows [from, to] × columns [from, to]. */
  | { kind: 'region'; rows: [number, number]; columns: [number, number] }
  | { kind: 'unknown' };

/** What the matrix kinds add to a report. */
export interface MatrixSummary {
  /** Outputs (residuals; n for a Hessian) and coordinates. */
  rows: number;
  columns: number;
  diagnosis: MatrixDiagnosis | null;
  /** Hessian, when asymmetric: the largest |H[i][j] − H[j][i]| beyond rounding, where it is, and the size it is judged against. */
  asymmetry?: { row: number; column: number; gap: number; scale: number };
  /**
   * Jacobian: the Gauss–Newton model of ½‖r‖² at the probe where the check held: σmax(J)², its
   * Lipschitz constant, and the condition number of JᵀJ (null when JᵀJ is singular to rounding).
   */
  leastSquares?: { probeIndex: number; sigmaMaxSquared: number; sigmaMinSquared: number; conditionNumber: number | null };
}

/** Whether f is ½‖r‖² or ‖r‖² of the residuals found with it, and whether ∇f is Jᵀr or 2Jᵀr; null for neither. */
export interface LeastSquaresForm {
  probeIndex: number;
  /** 'half': f = ½‖r‖²; 'full': f = ‖r‖². */
  objective: 'half' | 'full' | null;
  /** 'half': ∇f = Jᵀr; 'full': ∇f = 2Jᵀr. */
  gradient: 'half' | 'full' | null;
}

export interface PairReport {
  kind: TargetKind;
  status: PairStatus;
  dimension: number | null;
  maxRelError: number | null;
  diagnosis: Diagnosis | null;
  /** Matrix kinds only. */
  matrix?: MatrixSummary;
  /** Gradient pairs whose objective is built from residuals with a Jacobian. */
  leastSquaresForm?: LeastSquaresForm;
  smoothness: SmoothnessEstimate | null;
  learningRate: LearningRateVerdict | null;
  probes: ProbeReport[];
  findings: Finding[];
  evaluations: { objective: number; gradient: number };
  elapsedMs: number;
}
