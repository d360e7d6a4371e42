// Check plans for tests and benchmarks: module-level functions by name, as discovery would plan them.
import { defaultCheckOptions, type CallRecipe, type CheckPlan } from '../../server/src/engine/types';

/** A recipe calling module-level `value` and `derivative` (or splitting `value`'s result) with the point alone. */
export function recipeOf(value: string, derivative: string | null = null, split: CallRecipe['split'] = null, extraArguments: CallRecipe['extraArguments'] = []): CallRecipe {
  return { host: null, value, derivative, split, extraArguments };
}

export function planOf(overrides: Partial<CheckPlan> = {}): CheckPlan {
  return {
    kind: 'gradient',
    label: overrides.recipe?.value ?? 'objective',
    recipe: recipeOf('objective', 'gradient'),
    argumentKind: 'array',
    probes: [[1, 2]],
    probeKeys: [],
    start: null,
    dimension: 2,
    learningRate: null,
    options: defaultCheckOptions,
    ...overrides,
  };
}
