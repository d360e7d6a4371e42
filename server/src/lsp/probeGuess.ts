// A `@probe` tag for an objective whose dimension is unknown: guess the dimension from
// the largest literal index the objective reads (`x[4]` → 5 coordinates), or from a
// destructuring of its parameter, and insert the tag into its JSDoc or a new one.
import * as ts from 'typescript';
import type { DiscoveredPair } from '../discovery/types';
import { indentationAt, nodeAtSpan, type Replacement } from './sourceEdits';

export const fallbackDimension = 3;
/** A point away from zero, where many objectives are degenerate (common practice). */
const guessedCoordinate = 0.5;

export function probeTagText(dimension: number): string {
  return `@probe [${Array.from({ length: dimension }, () => guessedCoordinate).join(', ')}]`;
}

export function probeInsertion(sourceFile: ts.SourceFile, pair: DiscoveredPair): { replacement: Replacement; dimension: number } {
  const statement = nodeAtSpan(sourceFile, pair.objective.declarationSpan);
  const fn = statement ? objectiveFunction(statement, pair.objective.name) : null;
  const dimension = (fn && guessDimension(fn)) ?? fallbackDimension;
  const start = pair.objective.declarationSpan.start;
  return { replacement: insertTag(sourceFile.text, start, jsDocAbove(sourceFile.text, statement), probeTagText(dimension)), dimension };
}

function objectiveFunction(statement: ts.Node, name: string): ts.SignatureDeclaration | null {
  if (ts.isFunctionDeclaration(statement)) return statement;
  if (!ts.isVariableStatement(statement)) return null;
  const declaration = statement.declarationList.declarations.find((d) => ts.isIdentifier(d.name) && d.name.text === name);
  let value = declaration?.initializer;
  while (value && ts.isParenthesizedExpression(value)) value = value.expression;
  return value && (ts.isArrowFunction(value) || ts.isFunctionExpression(value)) ? value : null;
}

/** Largest literal index of the first parameter plus one, or the length of its destructuring. */
export function guessDimension(fn: ts.SignatureDeclaration): number | null {
  const parameter = fn.parameters[0];
  if (!parameter) return null;
  if (ts.isArrayBindingPattern(parameter.name)) return parameter.name.elements.length || null;
  if (!ts.isIdentifier(parameter.name)) return null;
  const name = parameter.name.text;
  let dimension = 0;
  const visit = (node: ts.Node): void => {
    if (ts.isElementAccessExpression(node) && ts.isIdentifier(node.expression) && node.expression.text === name && ts.isNumericLiteral(node.argumentExpression)) {
      dimension = Math.max(dimension, Number(node.argumentExpression.text) + 1);
    }
    if (ts.isVariableDeclaration(node) && ts.isArrayBindingPattern(node.name) && node.initializer && ts.isIdentifier(node.initializer) && node.initializer.text === name) {
      dimension = Math.max(dimension, node.name.elements.length);
    }
    ts.forEachChild(node, visit);
  };
  if ('body' in fn && fn.body) visit(fn.body);
  return Number.isInteger(dimension) && dimension > 0 ? dimension : null;
}

/** Into the JSDoc directly above the declaration at `start`, or as a new one-line JSDoc. */
function insertTag(text: string, start: number, doc: ts.CommentRange | null, tag: string): Replacement {
  const { lineStart, indent } = indentationAt(text, start);
  if (!doc) return { start: lineStart, end: lineStart, newText: `${indent}/** ${tag} */\n` };
  const body = text.slice(doc.pos, doc.end);
  if (!body.includes('\n')) {
    const words = body.slice(3, -2).trim();
    const lines = ['/**', ...(words ? [` * ${words}`] : []), ` * ${tag}`, ' */'];
    return { start: doc.pos, end: doc.end, newText: lines.join(`\n${indent}`) };
  }
  const close = doc.end - 2;
  const closing = indentationAt(text, close);
  if (/^[ \t]*$/.test(text.slice(closing.lineStart, close))) {
    return { start: closing.lineStart, end: closing.lineStart, newText: `${indent} * ${tag}\n` };
  }
  return { start: close, end: close, newText: `\n${indent} * ${tag}\n${indent} ` };
}

/** The last JSDoc among the comments that lead the statement (TypeScript attaches it there). */
function jsDocAbove(text: string, statement: ts.Node | null): ts.CommentRange | null {
  if (!statement) return null;
  const docs = (ts.getLeadingCommentRanges(text, statement.pos) ?? []).filter((r) => text.startsWith('/**', r.pos));
  return docs[docs.length - 1] ?? null;
}
