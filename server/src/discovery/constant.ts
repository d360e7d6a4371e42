// Value of a numeric constant expression, computed by walking the syntax tree (user code
// is never evaluated here): literals, unary +/-, parentheses and + - * / ** of those.
import * as ts from 'typescript';

export function evaluateNumber(expression: ts.Expression): number | null {
  if (ts.isNumericLiteral(expression)) return Number(expression.text);
  if (ts.isParenthesizedExpression(expression)) return evaluateNumber(expression.expression);
  // `0.01 as const`, `0.01 satisfies number` keep the literal's value.
  if (ts.isAsExpression(expression) || ts.isSatisfiesExpression(expression)) return evaluateNumber(expression.expression);
  if (ts.isPrefixUnaryExpression(expression)) {
    const operand = evaluateNumber(expression.operand);
    if (operand === null) return null;
    if (expression.operator === ts.SyntaxKind.MinusToken) return -operand;
    if (expression.operator === ts.SyntaxKind.PlusToken) return operand;
    return null;
  }
  if (ts.isBinaryExpression(expression)) {
    const left = evaluateNumber(expression.left);
    const right = evaluateNumber(expression.right);
    if (left === null || right === null) return null;
    switch (expression.operatorToken.kind) {
      case ts.SyntaxKind.PlusToken:
        return left + right;
      case ts.SyntaxKind.MinusToken:
        return left - right;
      case ts.SyntaxKind.AsteriskToken:
        return left * right;
      case ts.SyntaxKind.SlashToken:
        return left / right;
      case ts.SyntaxKind.AsteriskAsteriskToken:
        return left ** right;
      default:
        return null;
    }
  }
  return null;
}
