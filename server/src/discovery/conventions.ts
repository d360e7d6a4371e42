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
