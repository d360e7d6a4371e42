// The words and figures a user reads about a pair, one set for every place they appear
// (diagnostics, hover, code lens, quick pick, status bar, report, CLI).
import type { CheckPlan, PairStatus } from '../engine/types';

// Figures and the shape of an error are worded where the engine words its findings.
export { shortNumber } from '../engine/format';
export { describeDiagnosis } from '../engine/wording';

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
export function describeCall(plan: Pick<CheckPlan, 'recipe'>, namespace?: string): string {
  const { recipe } = plan;
  const plain = (key: string) => withoutNamespace(key, namespace);
  const host = recipe.host ? (recipe.host.construct ? `new ${plain(recipe.host.key)}()` : plain(recipe.host.key)) : null;
  const args = ['x', ...recipe.extraArguments.map((a) => a ?? '(default)')].join(', ');
  const call = (fn: string) => `${host ? `${host}.` : ''}${plain(fn)}(${args})`;
  if (recipe.split) return `${call(recipe.value)}: value [${JSON.stringify(recipe.split.value)}], gradient [${JSON.stringify(recipe.split.derivative)}]`;
  return recipe.derivative === null ? call(recipe.value) : `${call(recipe.value)} and ${call(recipe.derivative)}`;
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
