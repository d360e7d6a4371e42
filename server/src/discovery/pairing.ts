// Which functions form check targets, within each group of callables (the module's functions,
// or one host object's methods): residuals and Jacobians first (matrixPairing.ts), then
// objective/gradient pairs: `@gradientOf` tags first, then names
// (`lossGrad`, `dLoss`, `costPrime`, then shared stems such as `softmaxLoss`/`softmaxGrad`,
// then a generic `gradient` next to the only objective-like function), each confirmed by the
// signatures; then functions that return value and gradient together; then Hessians and
// Hessian-vector products next to the gradients found.
import type * as ts from 'typescript';
import type { Finding, TargetKind } from '../engine/types';
import type { Callable, CallableGroup } from './callables';
import { combinedGradientKeys, combinedValueKeys, isCombinedName, isDerivativeLikeName, isGenericDerivativeName, isObjectiveLikeName, objectiveNamesFor, tagNames, type NameRank } from './conventions';
import { matchJacobians, matchSecondOrder, noteUnpairedJacobians, type GroupPairing } from './matrixPairing';
import { firstParameterText, returnShape, returnsMatrix, takesPoint, type ReturnShape } from './signatures';
import { spanOfNode } from './spans';
import { firstWord, hasTag, readTags } from './tags';
import type { TypeDeclarations } from './typeShapes';
import type { DiscoveryResult, MatchedBy } from './types';

export interface PairMatch {
  kind: TargetKind;
  group: CallableGroup;
  /** The value function: the objective, the residual function, or the gradient a Hessian belongs to. */
  objective: Callable;
  /** The derivative; null when one function returns both (`split`). */
  gradient: Callable | null;
  split: { value: string; derivative: string } | null;
  matchedBy: MatchedBy;
  findings: Finding[];
  /** A Hessian or Hessian-vector product: the gradient pair it belongs to (its probes and start are the pair's). */
  gradientPair?: PairMatch;
}

type FileFinding = DiscoveryResult['fileFindings'][number];

/**
 * The function a target is known by (a match's Callable, a discovered target's span): the
 * objective of a gradient pair, the derivative of the other kinds (one gradient may carry both a
 * Hessian and a product). Its name is the target's key, its line the target's line, and a skip
 * comment goes above it.
 */
export function anchorOf<Named>(target: { kind: TargetKind; objective: Named; gradient: Named | null }): Named {
  return target.kind === 'gradient' || !target.gradient ? target.objective : target.gradient;
}

/** The functions of a pair: the objective, then its derivative when it has one of its own. */
export function pairFunctions(match: PairMatch): Callable[] {
  return match.gradient ? [match.objective, match.gradient] : [match.objective];
}

interface Proposal {
  derivative: Callable;
  objective: Callable;
  rank: NameRank | 3;
}

export function matchPairs(sourceFile: ts.SourceFile, groups: CallableGroup[], types: TypeDeclarations): { matches: PairMatch[]; fileFindings: FileFinding[] } {
  const matches: PairMatch[] = [];
  const fileFindings: FileFinding[] = [];
  for (const group of groups) matchGroup(sourceFile, group, types, matches, fileFindings);
  matches.sort((a, b) => anchorOf(a).nameNode.pos - anchorOf(b).nameNode.pos);
  return { matches, fileFindings };
}

function matchGroup(sourceFile: ts.SourceFile, group: CallableGroup, types: TypeDeclarations, matches: PairMatch[], fileFindings: FileFinding[]): void {
  const shapes = new Map<Callable, ReturnShape>(group.callables.map((c) => [c, c.fn ? returnShape(c.fn, types) : { kind: 'unknown' }]));
  const shapeOf = (c: Callable) => shapes.get(c)!;
  const pointTaking = (c: Callable) => c.fn === null || takesPoint(c.fn, types);
  const canBeObjective = (c: Callable) => pointTaking(c) && ['number', 'unknown'].includes(shapeOf(c).kind);
  const canBeDerivative = (c: Callable) => c.fn !== null && takesPoint(c.fn, types) && ['vector', 'unknown'].includes(shapeOf(c).kind);
  const used = new Set<Callable>();
  const byName = (name: string) => group.callables.find((c) => c.names.includes(name));
  const note = (code: Finding['code'], node: ts.Node, message: string, severity: Finding['severity'] = 'info') =>
    fileFindings.push({ code, severity, subject: 'gradient', message, span: spanOfNode(sourceFile, node) });
  const groupPairing: GroupPairing = { sourceFile, group, used, matches, fileFindings, shapeOf, pointTaking, note, returnsMatrix: (c) => c.fn !== null && returnsMatrix(c.fn, types) };

  // 0. Residuals and their Jacobian, before a residual-like name can be taken for an objective.
  matchJacobians(groupPairing);

  // 1. Tags: `@gradientOf X` on the derivative names its objective, whatever the names.
  for (const derivative of group.callables) {
    const tag = readTags(sourceFile, derivative.docHost, tagNames.gradientOf)[0];
    if (!tag) continue;
    used.add(derivative);
    const target = firstWord(tag.text);
    if (target === '') {
      fileFindings.push({ code: 'missing-export', severity: 'error', subject: 'gradient', message: `\`@gradientOf\` on \`${derivative.label}\` needs the objective's name, e.g. /** @gradientOf loss */.`, span: tag.span });
      continue;
    }
    const objective = byName(target);
    if (!objective || objective === derivative) {
      fileFindings.push({ code: 'missing-export', severity: 'error', subject: 'gradient', message: `\`${derivative.label}\` is tagged @gradientOf ${target}, but ${group.host ? `\`${group.host.key}\` has no method` : 'this file has no function'} named \`${target}\`.`, span: tag.span });
      continue;
    }
    if (used.has(objective) && matches.some((m) => m.objective === objective)) continue;
    used.add(objective);
    matches.push({ kind: 'gradient', group, objective, gradient: derivative, split: null, matchedBy: 'tag', findings: [] });
  }

  // 2. Names, confirmed by signature: the derivative returns a vector (or we cannot tell), the objective a number.
  //    Names that tie the two come first; a generic `gradient` then pairs with the only objective-like function left.
  const rejected = new Map<Callable, string>();
  const ambiguous = new Set<Callable>();
  const pairByNames = (propose: (derivative: Callable) => Array<{ objective: Callable; rank: NameRank | 3 }>) => {
    const proposals: Proposal[] = [];
    for (const derivative of group.callables) {
      if (used.has(derivative) || ambiguous.has(derivative) || !canBeDerivative(derivative)) continue;
      for (const { objective, rank } of propose(derivative)) {
        if (used.has(objective)) continue;
        const why = signatureConflict(objective, derivative, canBeObjective, shapeOf);
        if (why) rejected.set(derivative, why);
        // A weak link by name needs the signatures to say something, not merely not to disagree.
        else if (rank === 1 || shapeOf(objective).kind === 'number' || shapeOf(derivative).kind === 'vector') proposals.push({ derivative, objective, rank });
      }
    }
    const best = new Map<Callable, Proposal[]>();
    for (const proposal of proposals) {
      const current = best.get(proposal.derivative);
      if (!current || proposal.rank < current[0].rank) best.set(proposal.derivative, [proposal]);
      else if (proposal.rank === current[0].rank && !current.some((p) => p.objective === proposal.objective)) current.push(proposal);
    }
    const claims = new Map<Callable, Proposal[]>();
    for (const [derivative, options] of best) {
      if (options.length > 1) {
        ambiguous.add(derivative);
        note('ambiguous-pair', derivative.nameNode, `\`${derivative.label}\` could be the gradient of ${listNames(options.map((o) => o.objective))}; it was not checked. Name its objective with a tag, e.g. /** @gradientOf ${options[0].objective.name} */.`);
        continue;
      }
      const claim = claims.get(options[0].objective) ?? [];
      claim.push(options[0]);
      claims.set(options[0].objective, claim);
    }
    for (const [objective, claim] of claims) {
      const strongest = Math.min(...claim.map((p) => p.rank));
      const winners = claim.filter((p) => p.rank === strongest);
      if (winners.length > 1) {
        note('ambiguous-pair', objective.nameNode, `\`${objective.label}\` has more than one candidate gradient: ${listNames(winners.map((w) => w.derivative))}; none was checked. Tag the right one, e.g. /** @gradientOf ${objective.name} */ above \`${winners[0].derivative.name}\`.`);
        winners.forEach((w) => ambiguous.add(w.derivative));
        continue;
      }
      const { derivative, rank } = winners[0];
      used.add(objective);
      used.add(derivative);
      matches.push({ kind: 'gradient', group, objective, gradient: derivative, split: null, matchedBy: rank === 1 ? 'name' : rank === 2 ? 'shared-stem' : 'only-candidate', findings: [] });
    }
  };
  pairByNames((derivative) =>
    derivative.names.flatMap((alias) => objectiveNamesFor(alias)).flatMap(({ name, rank }) => {
      const objective = byName(name);
      return objective && objective !== derivative ? [{ objective, rank }] : [];
    }),
  );
  pairByNames((derivative) =>
    derivative.names.some(isGenericDerivativeName)
      ? group.callables.filter((c) => c !== derivative && !used.has(c) && c.names.some(isObjectiveLikeName)).map((objective) => ({ objective, rank: 3 as const }))
      : [],
  );

  // 3. One function returning value and gradient: `[f, g]`, `{ value, gradient }`, `{ loss, grad }`, …
  for (const callable of group.callables) {
    if (used.has(callable) || !callable.fn || !takesPoint(callable.fn, types)) continue;
    const split = combinedSplit(callable, shapeOf(callable));
    if (!split) continue;
    used.add(callable);
    matches.push({ kind: 'gradient', group, objective: callable, gradient: null, split, matchedBy: 'combined', findings: [] });
  }

  // Hessians and Hessian-vector products, next to the gradients just found; then a note on any
  // matrix-returning function beside a residual-like one that no name paired.
  matchSecondOrder(groupPairing);
  noteUnpairedJacobians(groupPairing);

  // 4. Nothing skipped silently: a function left unpaired that looks like a gradient — by its name, or
  //    by returning a vector from the same declared parameter as an objective left unpaired — says why.
  const objectives = group.callables.filter((c) => !used.has(c) && c.fn && canBeObjective(c) && shapeOf(c).kind === 'number');
  const sameParameter = (a: Callable, b: Callable) => a.fn !== null && b.fn !== null && firstParameterText(a.fn) !== null && firstParameterText(a.fn) === firstParameterText(b.fn);
  for (const callable of group.callables) {
    if (used.has(callable) || ambiguous.has(callable) || !(callable.exported || group.host) || !callable.fn || !canBeDerivative(callable)) continue;
    const byName = callable.names.some(isDerivativeLikeName);
    if (!byName && !(shapeOf(callable).kind === 'vector' && objectives.some((o) => o !== callable && sameParameter(o, callable)))) continue;
    const candidates = objectives.filter((c) => c !== callable);
    const reason = rejected.get(callable) ?? (candidates.length === 0 ? 'no function next to it returns a number' : 'no objective name matches it');
    const tagHint = candidates.length > 0 ? ` If it is the gradient of ${listNames(candidates)}, tag it, e.g. /** @gradientOf ${candidates[0].name} */.` : ' Tag it /** @gradientOf name */ with its objective\'s name.';
    note('unpaired-function', callable.nameNode, `\`${callable.label}\` looks like a gradient but was not paired: ${reason}.${tagHint}`);
  }
}

/** Why the signatures rule a pair out, or null when they allow it. */
function signatureConflict(objective: Callable, derivative: Callable, canBeObjective: (c: Callable) => boolean, shapeOf: (c: Callable) => ReturnShape): string | null {
  if (!canBeObjective(objective)) {
    const shape = shapeOf(objective).kind;
    return `\`${objective.label}\` ${shape === 'vector' ? 'returns a vector' : shape === 'unknown' || shape === 'number' ? 'does not take a point as its first parameter' : 'does not return a number'}, so it cannot be the objective`;
  }
  const objectiveType = objective.fn ? firstParameterText(objective.fn) : null;
  const derivativeType = derivative.fn ? firstParameterText(derivative.fn) : null;
  if (objectiveType !== null && derivativeType !== null && objectiveType !== derivativeType) {
    return `\`${objective.label}\` takes \`${objectiveType}\` but \`${derivative.label}\` takes \`${derivativeType}\``;
  }
  return null;
}

/** Result keys of a function returning value and gradient together, or null. */
function combinedSplit(callable: Callable, shape: ReturnShape): PairMatch['split'] {
  if (shape.kind === 'valueAndVector') return { value: '0', derivative: '1' };
  const keys = shape.kind === 'object' ? shape.keys : [];
  const value = combinedValueKeys.find((key) => keys.includes(key));
  const derivative = combinedGradientKeys.find((key) => keys.includes(key));
  if (value && derivative) return { value, derivative };
  // Tagged or named as combined, with a result we cannot read: the conventional keys.
  if (hasTag(callable.docHost, tagNames.valueAndGradient) || callable.names.some(isCombinedName)) return { value: value ?? combinedValueKeys[0], derivative: derivative ?? combinedGradientKeys[0] };
  return null;
}

function listNames(callables: Callable[]): string {
  const names = callables.map((c) => `\`${c.label}\``);
  return names.length <= 1 ? names.join('') : `${names.slice(0, -1).join(', ')} or ${names[names.length - 1]}`;
}
