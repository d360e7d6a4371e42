// The words and figures a user reads about a pair, one set for every place they appear
// (diagnostics, hover, code lens, quick pick, status bar, report, CLI).
import { formatList } from '../engine/format';
import type { CheckPlan, Diagnosis, PairStatus } from '../engine/types';

/** Rounds a positive x down to `digits` significant figures: a step taken from it stays at or below x. */
export function floorToSignificant(x: number, digits = 2): number {
  if (!(x > 0) || !Number.isFinite(x)) return x;
  const scale = 10 ** (Math.floor(Math.log10(x)) - digits + 1);
  // The tiny nudge keeps 0.026 / 1e-3 = 25.999… from flooring to 25.
  const units = Math.floor(x / scale + 1e-9);
  return Number((units * scale).toPrecision(digits));
}

/** A figure for a card or a lens: three significant digits, exponent form when very large or small. */
export function shortNumber(x: number | null | undefined, digits = 3): string {
  if (x === null || x === undefined) return '—';
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return '0';
  const magnitude = Math.abs(x);
  if (magnitude >= 1e4 || magnitude < 1e-3) return Number(x.toPrecision(digits)).toExponential().replace('e+', 'e');
  return String(Number(x.toPrecision(digits)));
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

/** The shape of a wrong gradient in a few words. */
export function describeDiagnosis(diagnosis: Diagnosis | null): string {
  if (!diagnosis) return 'wrong';
  switch (diagnosis.kind) {
    case 'sign':
      return 'sign flipped';
    case 'factor':
      return `off by a constant factor (${shortNumber(diagnosis.factor, 6)}× the true gradient)`;
    case 'permutation':
      return `components swapped (${diagnosis.pairs.map(([i, j]) => `${i} ↔ ${j}`).join(', ')})`;
    case 'subset':
      return `${diagnosis.components.length === 1 ? 'component' : 'components'} ${formatList(diagnosis.components, 6)} wrong`;
    default:
      return 'wrong, with no simple pattern';
  }
}

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
