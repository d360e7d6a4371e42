// The naming and tagging rules by which discovery pairs objectives with derivatives and finds
// the data, start point and learning rate to check them with. The README's "Conventions"
// section documents them for users, one line each; keep the two in step.

export const tagNames = {
  gradientOf: 'gradientOf',
  valueAndGradient: 'valueAndGradient',
  probe: 'probe',
  dimension: 'dimension',
  learningRateFor: 'learningRateFor',
  data: 'data',
  jacobianOf: 'jacobianOf',
  hessianOf: 'hessianOf',
  hessianVectorProductOf: 'hessianVectorProductOf',
} as const;

const capitalise = (name: string) => name.charAt(0).toUpperCase() + name.slice(1);
const uncapitalise = (name: string) => name.charAt(0).toLowerCase() + name.slice(1);

/** How closely a derivative's name ties it to an objective; lower wins. */
export type NameRank = 1 | 2 | 3;

/**
 * Objective names a derivative name points to, each with its rank:
 * 1 — the derivative names the objective whole: `lossGrad`, `gradLoss`, `loss_grad`, `costPrime`, `misfitSlope`, `dLoss`, `df`, `gradF`;
 * 2 — both share a stem: `softmaxGrad` ↔ `softmaxLoss`, `residualGradient` ↔ `residualCost`.
 */
export function objectiveNamesFor(derivative: string): Array<{ name: string; rank: NameRank }> {
  const found: Array<{ name: string; rank: NameRank }> = [];
  if (isGenericDerivativeName(derivative)) return found;
  const add = (name: string, rank: NameRank) => {
    if (name !== '' && name !== derivative && !found.some((entry) => entry.name === name)) found.push({ name, rank });
  };
  let match: RegExpExecArray | null;
  if ((match = /^(.+?)(?:Grad|Gradient|Prime|Deriv|Derivative|Slope|_grad|_gradient|_prime|_deriv|_slope)$/.exec(derivative))) {
    add(match[1], 1);
    for (const word of objectiveWords) add(match[1] + capitalise(word), 2);
  }
  // `fprime`, `fgrad`: a one- or two-letter objective with a lower-case suffix, as numerical codes write it.
  if ((match = /^([a-z]{1,2})(?:prime|grad|deriv)$/.exec(derivative))) add(match[1], 1);
  // `gradFn` ↔ `lossFn`, `gradientFunction` ↔ `costFunction`: the same word after the role.
  if ((match = /^(?:grad|gradient)([A-Z]\w*)$/.exec(derivative))) for (const word of objectiveWords) add(word + match[1], 2);
  if ((match = /^(?:grad|d|deriv)_?([A-Za-z].*)$/.exec(derivative))) {
    const rest = match[1];
    // `dLoss` and `gradLoss` name `loss`; `df` names `f`; a lower-case rest after `d` (`dot`, `data`) is a word, not a derivative.
    if (/^[A-Z]/.test(rest) || derivative.includes('_') || rest.length === 1) {
      add(uncapitalise(rest), 1);
      add(rest, 1);
    }
  }
  return found;
}

/** Words an objective's name ends with (`meanLoss`, `poseEnergy`), for shared stems and the generic rule. */
const objectiveWords = ['loss', 'cost', 'objective', 'energy', 'error', 'value', 'nll', 'risk', 'fn', 'func', 'obj', 'misfit', 'residual', 'sse', 'mse'];

/** A derivative named generically (`gradient`, `grad`) pairs with the only objective-like function next to it. */
export function isGenericDerivativeName(name: string): boolean {
  return /^(gradient|grad|gradients|derivative|dfdx|df_dx|slope)$/i.test(name);
}

/** `objective`, `f`, `energy`, `totalLoss`, `poseEnergy`: a name an objective is given. */
export function isObjectiveLikeName(name: string): boolean {
  if (/^(f|fn|func|fx|evaluate|value|objective|obj|target)$/i.test(name)) return true;
  const lower = name.toLowerCase();
  return objectiveWords.some((word) => word.length > 2 && lower.endsWith(word));
}

/** `lossGrad`, `dCost`, `gradient`: a name a derivative is given. */
export function isDerivativeLikeName(name: string): boolean {
  return isGenericDerivativeName(name) || objectiveNamesFor(name).length > 0 || /grad|deriv|prime|slope/i.test(name);
}

/** `lossValueAndGradient`, `lossWithGradient`, `lossAndGrad`: one function returning both. */
export function isCombinedName(name: string): boolean {
  return /^.+(ValueAndGradient|WithGradient|AndGrad|AndGradient|ValueAndGrad)$/.test(name);
}

/** Keys of a combined function's result: one names the value, the other the gradient. */
export const combinedValueKeys: readonly string[] = ['value', 'loss', 'f', 'cost', 'fx', 'energy', 'objective'];
export const combinedGradientKeys: readonly string[] = ['gradient', 'grad', 'g', 'dw', 'dx', 'df', 'dfdx'];

/**
 * The kinds whose derivative is a matrix, one naming rule each. `stem` reads a derivative's name:
 * '' for a generic name (`jacobian`, `J`, `hessian`, `hvp`), the stem it names (`fit` for
 * `fitJacobian`, `loss` for `lossHessian` or `hessianLoss`), or null when the name is not this
 * kind's. A Jacobian's value function is named by the stem (`fit`, `fitResiduals`, `fitResid`),
 * or is the only residual-like function next to a generic one; a Hessian's or a product's is the
 * gradient of the pair whose objective (or gradient) the stem names, or of the only pair.
 */
export interface MatrixKindNaming {
  kind: 'jacobian' | 'hessian' | 'hessianVectorProduct';
  tag: string;
  stem(name: string): string | null;
}

const stemRule = (generic: RegExp, suffixes: string, prefixes: string) => (name: string): string | null => {
  if (generic.test(name)) return '';
  const suffix = new RegExp(`^(.+?)_?(?:${suffixes})$`).exec(name);
  if (suffix) return suffix[1];
  const prefix = new RegExp(`^(?:${prefixes})(?:Of)?([A-Z]\\w*)$`).exec(name);
  return prefix ? uncapitalise(prefix[1]) : null;
};

export const matrixKindNaming: readonly MatrixKindNaming[] = [
  { kind: 'jacobian', tag: tagNames.jacobianOf, stem: stemRule(/^(jacobian|jac|J|jacobianFn|jacobianMatrix)$/, 'Jacobian|Jac|jacobian|jac', 'jacobian|jac') },
  { kind: 'hessianVectorProduct', tag: tagNames.hessianVectorProductOf, stem: stemRule(/^(hvp|Hv|hessVec|hessvec|hessianVector|hessianVectorProduct|hessianTimes|hessianTimesVector)$/, 'Hvp|HessVec|HessianVectorProduct|HessianVector|HessianTimes|hvp', 'hvp|hessVec|hessianVectorProduct|hessianTimes') },
  { kind: 'hessian', tag: tagNames.hessianOf, stem: stemRule(/^(hessian|hess|H|hessianFn|hessianMatrix)$/, 'Hessian|Hess|hessian|hess', 'hessian|hess') },
];

/** Names a Jacobian's stem gives its residual function: `fit` → fit, fitResiduals, fitResidual, fitResid, fitRes. */
export function residualNamesFor(stem: string): string[] {
  return [stem, ...['Residuals', 'Residual', 'Resid', 'Res', '_residuals', '_residual', '_resid'].map((suffix) => stem + (suffix.startsWith('_') ? suffix : capitalise(suffix)))];
}

/** `residuals`, `r`, `resid`, `poseResiduals`: a name a residual function is given. */
export function isResidualName(name: string): boolean {
  return /^(r|res|resid|residual|residuals|residualFn|residualVector|computeResiduals)$/.test(name) || /^[a-z]\w*(Residuals?|Resid)$/.test(name) || /^[a-z]\w*_resid(uals?)?$/.test(name);
}

/** `residualsAndJacobian`, `fitWithJacobian`: one function returning residuals and Jacobian. */
export function isCombinedJacobianName(name: string): boolean {
  return /^.+(AndJacobian|WithJacobian|AndJac)$/.test(name);
}

/** Keys of such a function's result: one names the residuals, the other the Jacobian. */
export const combinedResidualKeys: readonly string[] = ['r', 'residuals', 'residual', 'resid', 'res', 'f', 'fx'];
export const combinedJacobianKeys: readonly string[] = ['J', 'jacobian', 'jac'];

/** Names of a module-level const that holds a starting point. */
export function isStartName(name: string): boolean {
  return /^[A-Za-z]+_?0$/.test(name) || /^(init|initial|start)([A-Z_].*)?$/.test(name) || /^(guess|[a-z]\w*(Guess|Init|Start))$/.test(name);
}

/** Names a learning rate goes by: a const (`lr`), or a field of an options object (`opts.lr`, `config.learningRate`). */
export const learningRateNames: readonly string[] = ['learningRate', 'lr', 'stepSize', 'alpha', 'eta', 'learning_rate', 'step_size'];

/** Names of a momentum coefficient used next to a learning rate. */
export const momentumNames: readonly string[] = ['momentum', 'beta', 'beta1', 'mu', 'gamma', 'rho'];

/** Line comment above an objective that leaves its pair unchecked. */
export const skipDirective = 'slopecheck-skip';
