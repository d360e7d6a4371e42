// The naming and tagging rules by which discovery pairs objectives with gradients.
// The README's "Conventions" section documents them for users; keep the two in step.

export const tagNames = {
  gradientOf: 'gradientOf',
  valueAndGradient: 'valueAndGradient',
  probe: 'probe',
  dimension: 'dimension',
  learningRateFor: 'learningRateFor',
} as const;

/** Gradient names accepted for objective `x`, in order of preference. */
export function gradientNamesFor(objective: string): string[] {
  const capitalised = objective.charAt(0).toUpperCase() + objective.slice(1);
  return [`${objective}Grad`, `grad${capitalised}`, `${objective}Gradient`, `${objective}_grad`];
}

/** `lossValueAndGradient`, `lossWithGradient`: one function returning both. */
export function isCombinedName(name: string): boolean {
  return /^.+(ValueAndGradient|WithGradient)$/.test(name);
}

/** Keys of a combined function's result. */
export const combinedValueKey = 'value';
export const combinedGradientKeys = ['gradient', 'grad'] as const;

/** Names a learning-rate const may have when the file holds exactly one pair. */
export const learningRateNames: readonly string[] = ['learningRate', 'lr', 'stepSize', 'alpha', 'eta'];

/** Line comment above an objective that leaves its pair unchecked. */
export const skipDirective = 'slopecheck-skip';
