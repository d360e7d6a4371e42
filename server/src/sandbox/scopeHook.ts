// The scope hook: a few lines appended to the user's module before bundling, through which
// the sandbox reaches what a check plan names — module-level values whether exported or not,
// imports, members (`train.X`) and start expressions. Each key is the source text of a
// module-level expression; its value is a thunk, so nothing is evaluated until a check asks.
import type { CheckPlan } from '../engine/types';

/** The global the appended code sets in the sandbox's realm; the runner takes it after loading. */
export const scopeHookGlobal = '__slopecheckScope';

/** Every scope key a plan reads. */
export function scopeKeysOf(plan: Pick<CheckPlan, 'recipe' | 'probeKeys' | 'start' | 'residuals'>): string[] {
  const keys: string[] = [];
  for (const recipe of [plan.recipe, ...(plan.residuals ? [plan.residuals] : [])]) {
    keys.push(...(recipe.host ? [recipe.host.key] : [recipe.value, ...(recipe.derivative === null ? [] : [recipe.derivative])]));
    for (const argument of recipe.extraArguments) if (argument !== null) keys.push(argument);
  }
  keys.push(...plan.probeKeys);
  if (plan.start !== null) keys.push(plan.start);
  return [...new Set(keys)];
}

/**
 * The module's text with the hook appended on lines of its own after the last line, so
 * source positions of the user's code do not move. A key that names nothing fails only
 * when its thunk is called, as a ReferenceError the runner reports.
 */
export function withScopeHook(text: string, keys: readonly string[], documentImport?: { namespace: string; specifier: string }): string {
  if (keys.length === 0) return text;
  const entries = [...new Set(keys)].map((key) => `${JSON.stringify(key)}: () => (${key})`);
  // An importing file as the entry reaches the checked document through a namespace import (importerCalls.ts).
  const importLine = documentImport ? `import * as ${documentImport.namespace} from ${JSON.stringify(documentImport.specifier)};\n` : '';
  return `${text}\n${importLine};globalThis.${scopeHookGlobal} = {\n${entries.join(',\n')}\n};\n`;
}
