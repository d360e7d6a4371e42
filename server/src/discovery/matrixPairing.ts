// Targets whose derivative is a matrix, within one group of callables (pairing.ts runs these
// passes): a residual function with its Jacobian, found before the gradient pairs so that a
// residual-like name is never taken for an objective; then, once the gradient pairs are known,
// a Hessian or a Hessian-vector product next to a gradient. Each by a tag naming its value
// function, then by the kind's naming rule (conventions.ts), confirmed by the signatures.
import type * as ts from 'typescript';
import type { Callable, CallableGroup } from './callables';
import {
  combinedJacobianKeys, combinedResidualKeys, isCombinedJacobianName, isResidualName, matrixKindNaming, residualNamesFor, type MatrixKindNaming,
} from './conventions';
import type { PairMatch } from './pairing';
import { firstParameterText, type ReturnShape } from './signatures';
import { firstWord, readTags } from './tags';
import type { DiscoveryResult } from './types';

/** What the passes share with pairing.ts for one group. */
export interface GroupPairing {
  sourceFile: ts.SourceFile;
  group: CallableGroup;
  used: Set<Callable>;
  matches: PairMatch[];
  fileFindings: DiscoveryResult['fileFindings'];
  shapeOf(c: Callable): ReturnShape;
  pointTaking(c: Callable): boolean;
  /** Its declared return type is a matrix (`number[][]`). */
  returnsMatrix(c: Callable): boolean;
  /** An info finding on a name. */
  note(code: 'ambiguous-pair' | 'unpaired-function' | 'missing-export', node: ts.Node, message: string, severity?: 'info' | 'error'): void;
}

const jacobianNaming = matrixKindNaming.find((k) => k.kind === 'jacobian')!;
const secondOrderNaming = matrixKindNaming.filter((k) => k.kind !== 'jacobian');

/** Residuals and their Jacobian: tagged, named, or returned together. */
export function matchJacobians(pairing: GroupPairing): void {
  const { group, used } = pairing;
  const residualLike = (c: Callable) => pairing.pointTaking(c) && pairing.shapeOf(c).kind !== 'number';
  for (const derivative of group.callables) {
    if (used.has(derivative) || !derivative.fn || !pairing.pointTaking(derivative) || pairing.shapeOf(derivative).kind === 'number') continue;
    const tagged = taggedValue(pairing, derivative, jacobianNaming);
    if (tagged === 'reported') continue;
    let value = tagged;
    if (!value) {
      const stem = stemOf(derivative, jacobianNaming);
      if (stem === null) continue;
      const candidates = stem === ''
        ? group.callables.filter((c) => c !== derivative && !used.has(c) && c.names.some(isResidualName) && residualLike(c))
        : residualNamesFor(stem).flatMap((name) => group.callables.filter((c) => c !== derivative && !used.has(c) && c.names.includes(name) && residualLike(c))).slice(0, 1);
      if (candidates.length > 1) {
        pairing.note('ambiguous-pair', derivative.nameNode, `\`${derivative.label}\` could be the Jacobian of ${candidates.map((c) => `\`${c.label}\``).join(' or ')}; it was not checked. Name its residual function with a tag, e.g. /** @${jacobianNaming.tag} ${candidates[0].name} */.`);
        continue;
      }
      value = candidates[0] ?? null;
    }
    if (!value) continue;
    used.add(value);
    used.add(derivative);
    pairing.matches.push({ kind: 'jacobian', group, objective: value, gradient: derivative, split: null, matchedBy: tagged ? 'tag' : 'name', findings: [] });
  }
  // One function returning both: `{ r, J }`, `{ residuals, jacobian }`, or `[r, J]` from a function named so.
  for (const callable of group.callables) {
    if (used.has(callable) || !callable.fn || !pairing.pointTaking(callable)) continue;
    const shape = pairing.shapeOf(callable);
    const keys = shape.kind === 'object' ? shape.keys : [];
    const value = combinedResidualKeys.find((key) => keys.includes(key));
    const derivative = combinedJacobianKeys.find((key) => keys.includes(key));
    const named = callable.names.some(isCombinedJacobianName);
    if (!(value && derivative) && !named) continue;
    used.add(callable);
    pairing.matches.push({ kind: 'jacobian', group, objective: callable, gradient: null, split: value && derivative ? { value, derivative } : named && shape.kind === 'object' ? { value: value ?? 'r', derivative: derivative ?? 'J' } : { value: '0', derivative: '1' }, matchedBy: 'combined', findings: [] });
  }
}

/**
 * Nothing skipped silently: a function declared to return a matrix from the same first parameter
 * as a function returning a vector, both left unpaired, may be a Jacobian under a name of its own
 * (`driftSensitivity` beside `driftErrors`); a note says which tag pairs them.
 */
export function noteUnpairedJacobians(pairing: GroupPairing): void {
  const { group, used } = pairing;
  const parameterOf = (c: Callable) => (c.fn ? firstParameterText(c.fn) : null);
  for (const candidate of group.callables) {
    if (used.has(candidate) || !candidate.fn || !pairing.returnsMatrix(candidate) || parameterOf(candidate) === null) continue;
    const residuals = group.callables.filter((c) => c !== candidate && !used.has(c) && pairing.shapeOf(c).kind === 'vector' && parameterOf(c) === parameterOf(candidate));
    if (residuals.length === 0) continue;
    pairing.note('unpaired-function', candidate.nameNode, `\`${candidate.label}\` returns a matrix from the same parameter as ${residuals.map((c) => `\`${c.label}\``).join(' or ')}, which ${residuals.length === 1 ? 'returns' : 'return'} a vector, but no name pairs them. If it is the Jacobian of ${residuals.length === 1 ? `\`${residuals[0].label}\`` : 'one of them'}, tag it, e.g. /** @${jacobianNaming.tag} ${residuals[0].name} */.`);
  }
}

/**
 * A Hessian or a Hessian-vector product next to a gradient pair of the group: its value
 * function is that pair's gradient. The gradient may belong to several targets (its pair and
 * these), so it is not marked used; the derivative is.
 */
export function matchSecondOrder(pairing: GroupPairing): void {
  const { group, used } = pairing;
  const gradientPairs = pairing.matches.filter((m) => m.kind === 'gradient' && m.group === group && m.gradient !== null);
  for (const naming of secondOrderNaming) {
    for (const derivative of group.callables) {
      // A Hessian or a product returns a matrix or a vector, never one number (`H(p): number`, an entropy).
      if (used.has(derivative) || !derivative.fn || !pairing.pointTaking(derivative) || pairing.shapeOf(derivative).kind === 'number') continue;
      // A product takes the direction after the point.
      if (naming.kind === 'hessianVectorProduct' && derivative.fn.parameters.length < 2) continue;
      const tagged = taggedValue(pairing, derivative, naming);
      if (tagged === 'reported') continue;
      const stem = tagged ? tagged.name : stemOf(derivative, naming);
      if (stem === null) continue;
      const pairs = stem === '' ? gradientPairs : gradientPairs.filter((m) => [m.objective, m.gradient!].some((c) => c.names.includes(stem)));
      if (pairs.length !== 1) {
        if (pairs.length > 1 || tagged) {
          const why = pairs.length > 1 ? `it could belong to ${pairs.map((m) => `\`${m.objective.label}\``).join(' or ')}` : `\`${stem}\` is not the objective or gradient of a checked pair`;
          pairing.note(pairs.length > 1 ? 'ambiguous-pair' : 'unpaired-function', derivative.nameNode, `\`${derivative.label}\` looks like a ${naming.kind === 'hessian' ? 'Hessian' : 'Hessian-vector product'} but was not checked: ${why}. Name the objective with a tag, e.g. /** @${naming.tag} ${pairs[0]?.objective.name ?? 'loss'} */.`);
        }
        continue;
      }
      used.add(derivative);
      pairing.matches.push({ kind: naming.kind, group, objective: pairs[0].gradient!, gradient: derivative, split: null, matchedBy: tagged ? 'tag' : 'name', findings: [], gradientPair: pairs[0] });
    }
  }
}

function stemOf(derivative: Callable, naming: MatrixKindNaming): string | null {
  for (const name of derivative.names) {
    const stem = naming.stem(name);
    if (stem !== null) return stem;
  }
  return null;
}

/**
 * The function a kind's tag on `derivative` names (`@jacobianOf residuals`), null without a tag,
 * or 'reported' when the tag names nothing usable (a finding says so).
 */
function taggedValue(pairing: GroupPairing, derivative: Callable, naming: MatrixKindNaming): Callable | null | 'reported' {
  const tag = readTags(pairing.sourceFile, derivative.docHost, naming.tag)[0];
  if (!tag) return null;
  const target = firstWord(tag.text);
  const named = target === '' ? undefined : pairing.group.callables.find((c) => c !== derivative && c.names.includes(target));
  if (!named) {
    pairing.fileFindings.push({ code: 'missing-export', severity: 'error', subject: 'gradient', message: target === '' ? `\`@${naming.tag}\` on \`${derivative.label}\` needs a function's name, e.g. /** @${naming.tag} ${naming.kind === 'jacobian' ? 'residuals' : 'loss'} */.` : `\`${derivative.label}\` is tagged @${naming.tag} ${target}, but ${pairing.group.host ? `\`${pairing.group.host.key}\` has no method` : 'this file has no function'} named \`${target}\`.`, span: tag.span });
    return 'reported';
  }
  return named;
}
