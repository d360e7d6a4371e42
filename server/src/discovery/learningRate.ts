// Learning rates where people put them: a const tagged `@learningRateFor X`; the rate the
// training loop's update uses (`w[j] -= lr * g[j]`, `opts.lr`), with the momentum coefficient
// next to it; an options object handed to the optimizer with the pair; or, when the file
// has exactly one pair, a module-level const or options field with a conventional name.
import * as ts from 'typescript';
import type { DeclaredRate as PlanRate } from '../engine/types';
import { evaluateNumber } from './constant';
import { learningRateNames, momentumNames, tagNames } from './conventions';
import { unwrapParentheses, type ModuleBindings } from './exports';
import type { PairMatch } from './pairing';
import { enclosingFunction, fieldNumber, pairSites, resolveNumber, type NumberReference } from './references';
import { spanOfNode } from './spans';
import { firstWord, readTags } from './tags';
import { propertyNameText } from './typeShapes';
import type { DiscoveredPair, DiscoveryResult } from './types';

export type DeclaredRate = NonNullable<DiscoveredPair['learningRate']>;

export function assignLearningRates(
  sourceFile: ts.SourceFile,
  bindings: ModuleBindings,
  matches: PairMatch[],
): { rates: Map<PairMatch, DeclaredRate>; fileFindings: DiscoveryResult['fileFindings'] } {
  const rates = new Map<PairMatch, DeclaredRate>();
  const fileFindings: DiscoveryResult['fileFindings'] = [];
  const give = (match: PairMatch, reference: NumberReference | null, momentum?: NumberReference | null) => {
    if (!reference || rates.has(match) || !(reference.value > 0) || !Number.isFinite(reference.value)) return;
    rates.set(match, declaredRate(sourceFile, reference, momentum ?? null));
  };

  // 1. Tags name the pair.
  for (const binding of bindings.byLocalName.values()) {
    if (!binding.constValue) continue;
    const tag = readTags(sourceFile, binding.docHost, tagNames.learningRateFor)[0];
    if (!tag) continue;
    const target = firstWord(tag.text);
    const match = matches.find((m) => [m.objective, m.gradient].some((c) => c && (c.name === target || c.label === target)));
    if (!match) {
      fileFindings.push({
        code: 'missing-export',
        severity: 'error',
        subject: 'learningRate',
        message: `\`${binding.localName}\` is tagged @learningRateFor ${target || '(nothing)'}, but this file has no checked objective named \`${target}\`.`,
        span: tag.span,
      });
      continue;
    }
    const value = evaluateNumber(binding.constValue);
    if (value !== null) give(match, { name: binding.localName, value, nameNode: binding.nameNode, declaration: binding.statement, valueNode: binding.constValue });
  }

  // 2. The update of a training loop that calls the pair, and options handed to an optimizer with it.
  //    Gradient pairs only: a residual/Jacobian loop's step is a Gauss–Newton or Levenberg–Marquardt
  //    step (`p -= damping * delta`), no learning rate; a Jacobian's rate is named by its tag.
  const gradientPairs = matches.filter((match) => match.kind === 'gradient');
  for (const match of gradientPairs) {
    for (const site of pairSites(sourceFile, match)) {
      if (rates.has(match)) break;
      if (site.kind === 'call') {
        const fn = enclosingFunction(site.node);
        if (fn) give(match, updateRate(fn, bindings), momentumIn(fn, bindings));
      } else {
        for (const argument of site.node.arguments) give(match, optionsRate(argument, bindings));
      }
    }
  }

  // 3. One pair: a conventional name at module level, or a conventional field of a module-level options object.
  if (gradientPairs.length === 1 && !rates.has(gradientPairs[0])) {
    for (const binding of [...bindings.byLocalName.values()].sort((a, b) => a.nameNode.pos - b.nameNode.pos)) {
      // A const tagged for another objective is never a rate by its name.
      if (!binding.constValue || readTags(sourceFile, binding.docHost, tagNames.learningRateFor).length > 0) continue;
      if (learningRateNames.includes(binding.localName)) give(gradientPairs[0], resolveNumber(binding.nameNode, bindings));
      else give(gradientPairs[0], optionsRate(binding.nameNode, bindings));
    }
  }
  return { rates, fileFindings };
}

/**
 * The rate in an update of `fn`: a number multiplying (or dividing) into the right side of
 * `w[j] -= lr * g[j]` or `w[j] - lr * g[j]`, read as a const or options field.
 */
function updateRate(fn: ts.SignatureDeclaration, bindings: ModuleBindings): NumberReference | null {
  let found: NumberReference | null = null;
  const visit = (node: ts.Node): void => {
    if (found) return;
    if ((ts.isIdentifier(node) || ts.isPropertyAccessExpression(node)) && isStepFactor(node)) {
      const reference = resolveNumber(node, bindings);
      if (reference && !momentumNames.includes(lastName(reference.name))) {
        found = reference;
        return;
      }
    }
    if (ts.isIdentifier(node)) return;
    ts.forEachChild(node, visit);
  };
  const body = (fn as { body?: ts.Node }).body;
  if (body) visit(body);
  return found;
}

/** `lr` in `w[j] -= lr * g[j]`, `w[j] - lr * g[j] / s`: a factor of the term subtracted in an update. */
function isStepFactor(node: ts.Expression): boolean {
  if (ts.isPropertyAccessExpression(node.parent) && node.parent.name === node) return false;
  let term: ts.Node = node;
  while (ts.isParenthesizedExpression(term.parent) || (ts.isBinaryExpression(term.parent) && [ts.SyntaxKind.AsteriskToken, ts.SyntaxKind.SlashToken].includes(term.parent.operatorToken.kind) && (term.parent.operatorToken.kind === ts.SyntaxKind.AsteriskToken || term.parent.left === term))) {
    term = term.parent;
  }
  if (term === node) return false;
  const parent = term.parent;
  return ts.isBinaryExpression(parent) && parent.right === term && [ts.SyntaxKind.MinusEqualsToken, ts.SyntaxKind.MinusToken].includes(parent.operatorToken.kind);
}

/** A momentum coefficient of `fn`'s update: a const or options field with a momentum name, used as a factor. */
function momentumIn(fn: ts.SignatureDeclaration, bindings: ModuleBindings): NumberReference | null {
  let found: NumberReference | null = null;
  const visit = (node: ts.Node): void => {
    if (found) return;
    if ((ts.isIdentifier(node) || ts.isPropertyAccessExpression(node)) && ts.isBinaryExpression(node.parent) && node.parent.operatorToken.kind === ts.SyntaxKind.AsteriskToken) {
      const reference = resolveNumber(node, bindings);
      if (reference && momentumNames.includes(lastName(reference.name))) {
        found = reference;
        return;
      }
    }
    ts.forEachChild(node, visit);
  };
  const body = (fn as { body?: ts.Node }).body;
  if (body) visit(body);
  return found;
}

/** A conventional rate field of an options object: `{ lr: 0.05 }` written inline, or a module-level `opts`. */
function optionsRate(expression: ts.Expression, bindings: ModuleBindings): NumberReference | null {
  const node = unwrapParentheses(expression);
  if (ts.isIdentifier(node)) {
    const binding = bindings.byLocalName.get(node.text);
    if (!binding?.constValue) return null;
    for (const path of ratePaths(binding.constValue)) {
      const reference = fieldNumber(binding, binding.constValue, path, [node.text, ...path].join('.'));
      if (reference) return reference;
    }
    return null;
  }
  if (ts.isObjectLiteralExpression(node)) {
    const property = node.properties.find((p): p is ts.PropertyAssignment => ts.isPropertyAssignment(p) && learningRateNames.includes(propertyNameText(p.name) ?? ''));
    const value = property ? evaluateNumber(property.initializer) : null;
    if (property && value !== null) return { name: propertyNameText(property.name)!, value, nameNode: property.name, declaration: property, valueNode: property.initializer };
  }
  return null;
}

/** Paths to rate fields in an object literal, one level of nesting deep: ['lr'], ['optimizer', 'learningRate']. */
function ratePaths(value: ts.Expression): string[][] {
  const node = unwrapParentheses(value);
  if (!ts.isObjectLiteralExpression(node)) return [];
  const paths: string[][] = [];
  for (const property of node.properties) {
    if (!ts.isPropertyAssignment(property)) continue;
    const key = propertyNameText(property.name);
    if (key === undefined) continue;
    if (learningRateNames.includes(key)) paths.push([key]);
    else if (ts.isObjectLiteralExpression(unwrapParentheses(property.initializer))) paths.push(...ratePaths(property.initializer).filter((p) => p.length === 1).map((p) => [key, ...p]));
  }
  return paths;
}

function lastName(name: string): string {
  return name.slice(name.lastIndexOf('.') + 1);
}

function declaredRate(sourceFile: ts.SourceFile, reference: NumberReference, momentum: NumberReference | null): DeclaredRate {
  return {
    name: reference.name,
    nameSpan: spanOfNode(sourceFile, reference.nameNode),
    declarationSpan: spanOfNode(sourceFile, reference.declaration),
    value: reference.value,
    valueSpan: spanOfNode(sourceFile, reference.valueNode),
    ...(momentum && momentum.value > 0 ? { momentum: { name: momentum.name, value: momentum.value } } : {}),
  };
}

export function planRate(rate: DeclaredRate | null): PlanRate | null {
  if (!rate) return null;
  return { name: rate.name, value: rate.value, ...(rate.momentum ? { momentum: rate.momentum } : {}) };
}
