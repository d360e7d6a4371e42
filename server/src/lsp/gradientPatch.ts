// Edits that undo a diagnosed gradient bug at the gradient's return expressions: a flipped
// sign, a constant factor or swapped components. Array literals are edited element by
// element; any other expression is wrapped. The caller verifies the result in the sandbox.
import * as ts from 'typescript';
import type { SourceSpan } from '../discovery/types';
import type { Diagnosis } from '../engine/types';
import { nodeAtSpan, type Replacement } from './sourceEdits';

export type FixableDiagnosis = Extract<Diagnosis, { kind: 'sign' | 'factor' | 'permutation' }>;

export function isFixable(diagnosis: Diagnosis | null): diagnosis is FixableDiagnosis {
  return diagnosis !== null && (diagnosis.kind === 'sign' || diagnosis.kind === 'factor' || diagnosis.kind === 'permutation');
}

/** Replacements for every return expression, or null when one of them cannot be found. */
export function gradientPatch(sourceFile: ts.SourceFile, returns: SourceSpan[], diagnosis: FixableDiagnosis): Replacement[] | null {
  if (returns.length === 0) return null;
  const replacements: Replacement[] = [];
  for (const span of returns) {
    const node = nodeAtSpan(sourceFile, span);
    if (!node || !ts.isExpression(node)) return null;
    const text = (n: ts.Node) => n.getText(sourceFile);
    const inner = unwrap(node);
    const newText = ts.isArrayLiteralExpression(inner) && !inner.elements.some(ts.isSpreadElement)
      ? patchElements(inner.elements.map(text), inner.elements, diagnosis, text)
      : null;
    replacements.push({ start: span.start, end: span.end, newText: newText ?? wrap(node, text(node), diagnosis) });
  }
  return replacements;
}

function patchElements(texts: string[], elements: ts.NodeArray<ts.Expression>, diagnosis: FixableDiagnosis, text: (n: ts.Node) => string): string | null {
  switch (diagnosis.kind) {
    case 'sign':
      return `[${elements.map((e) => negated(e, text)).join(', ')}]`;
    case 'factor':
      return `[${elements.map((e) => scaled(e, text(e), diagnosis.factor)).join(', ')}]`;
    case 'permutation': {
      if (diagnosis.pairs.some(([i, j]) => i >= texts.length || j >= texts.length)) return null;
      const swapped = [...texts];
      for (const [i, j] of diagnosis.pairs) [swapped[i], swapped[j]] = [swapped[j], swapped[i]];
      return `[${swapped.join(', ')}]`;
    }
  }
}

function wrap(node: ts.Expression, text: string, diagnosis: FixableDiagnosis): string {
  const target = isTight(node) ? text : `(${text})`;
  switch (diagnosis.kind) {
    case 'sign':
      return `${target}.map((g) => -g)`;
    case 'factor':
      return `${target}.map((g) => ${scaledText('g', diagnosis.factor)})`;
    case 'permutation': {
      // Swaps in place and returns the same vector, so its type (tuple, Float64Array) is kept.
      const swaps = diagnosis.pairs.map(([i, j]) => `[g[${i}], g[${j}]] = [g[${j}], g[${i}]];`).join(' ');
      return `((g) => { ${swaps} return g; })(${text})`;
    }
  }
}

function negated(element: ts.Expression, text: (n: ts.Node) => string): string {
  if (ts.isPrefixUnaryExpression(element) && element.operator === ts.SyntaxKind.MinusToken) return text(element.operand);
  return isTight(element) ? `-${text(element)}` : `-(${text(element)})`;
}

function scaled(element: ts.Expression, text: string, factor: number): string {
  const multiplicative =
    ts.isBinaryExpression(element) &&
    [ts.SyntaxKind.AsteriskToken, ts.SyntaxKind.SlashToken].includes(element.operatorToken.kind);
  const left = isTight(element) || multiplicative || ts.isPrefixUnaryExpression(element) ? text : `(${text})`;
  return scaledText(left, factor);
}

/** Undoes `analytic = factor × true`: divide by a factor above 1, multiply by the inverse of one below. */
function scaledText(left: string, factor: number): string {
  const tidy = (x: number) => String(Number(x.toPrecision(12)));
  return Math.abs(factor) >= 1 ? `${left} / ${tidy(factor)}` : `${left} * ${tidy(1 / factor)}`;
}

/** Expressions that bind tighter than any operator we add (member access, calls, literals). */
function isTight(node: ts.Expression): boolean {
  return (
    ts.isIdentifier(node) ||
    ts.isNumericLiteral(node) ||
    ts.isCallExpression(node) ||
    ts.isPropertyAccessExpression(node) ||
    ts.isElementAccessExpression(node) ||
    ts.isParenthesizedExpression(node) ||
    ts.isArrayLiteralExpression(node) ||
    ts.isNonNullExpression(node)
  );
}

function unwrap(node: ts.Expression): ts.Expression {
  let current = node;
  while (ts.isParenthesizedExpression(current)) current = current.expression;
  return current;
}
