// The expressions a function returns: those of `return` statements directly in its body
// (nested functions return for themselves), or the body of an expression-bodied arrow.
import * as ts from 'typescript';
import { unwrapParentheses, type FunctionNode } from './exports';
import { propertyNameText } from './typeShapes';

export function returnedExpressions(fn: FunctionNode): ts.Expression[] {
  const body = fn.body;
  if (!body) return [];
  if (!ts.isBlock(body)) return [body];
  const found: ts.Expression[] = [];
  const visit = (node: ts.Node): void => {
    if (ts.isFunctionLike(node) || ts.isClassLike(node)) return;
    if (ts.isReturnStatement(node) && node.expression) found.push(node.expression);
    ts.forEachChild(node, visit);
  };
  ts.forEachChild(body, visit);
  return found;
}

/** Property names of every object literal the function returns directly. */
export function returnedObjectKeys(fn: FunctionNode): string[] {
  return returnedExpressions(fn).flatMap((expression) => {
    const value = unwrapParentheses(expression);
    if (!ts.isObjectLiteralExpression(value)) return [];
    return value.properties.flatMap((property) => (property.name && propertyNameText(property.name as ts.PropertyName)) || []);
  });
}
