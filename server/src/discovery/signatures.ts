// What a function's signature says, read from the syntax alone (no type checker): whether it
// returns a number, a vector, a value with its gradient, or something else, and whether its
// first parameter can be a point. Declared types win; otherwise the returned expressions and
// the local variables they name are read.
import * as ts from 'typescript';
import type { DeclaredParameter } from '../engine/types';
import { unwrapParentheses, type FunctionNode } from './exports';
import { returnedExpressions } from './returns';
import { localDeclaration } from './references';
import { objectTypeKeys, propertyNameText, resolveType, returnType, type TypeDeclarations } from './typeShapes';

export type ReturnShape =
  | { kind: 'number' }
  | { kind: 'vector' }
  /** `[f, g]`: a number and a vector. */
  | { kind: 'valueAndVector' }
  | { kind: 'object'; keys: string[] }
  | { kind: 'other' }
  | { kind: 'unknown' };

const unknown: ReturnShape = { kind: 'unknown' };

export function returnShape(fn: FunctionNode, types: TypeDeclarations): ReturnShape {
  const declared = shapeOfType(returnType(fn), types);
  if (declared.kind !== 'unknown') return declared;
  const shapes = returnedExpressions(fn).map((expression) => shapeOfExpression(expression, fn, types, 0));
  const known = shapes.filter((shape) => shape.kind !== 'unknown');
  if (known.length === 0) return unknown;
  // Returns that disagree (a number here, a vector there) say nothing reliable.
  return known.every((shape) => shape.kind === known[0].kind) ? known[0] : { kind: 'other' };
}

/** The first parameter could hold a point: it is not declared as a scalar, string or boolean. */
export function takesPoint(fn: FunctionNode, types: TypeDeclarations): boolean {
  const parameter = fn.parameters[0];
  if (!parameter || parameter.dotDotDotToken) return false;
  const type = parameter.type ?? ts.getJSDocType(parameter);
  if (!type) return true;
  const shape = shapeOfType(type, types);
  if (shape.kind === 'vector') return true;
  const resolved = resolveType(type, types);
  return !(resolved && [ts.SyntaxKind.NumberKeyword, ts.SyntaxKind.StringKeyword, ts.SyntaxKind.BooleanKeyword].includes(resolved.kind));
}

/** The first parameter's declared type as written (for comparing two signatures), or null. */
export function firstParameterText(fn: FunctionNode): string | null {
  const type = fn.parameters[0]?.type ?? (fn.parameters[0] ? ts.getJSDocType(fn.parameters[0]) : undefined);
  return type ? type.getText().replace(/\s+|readonly/g, '') : null;
}

/** What a parameter's declared type lets the sandbox check a data value against, or null. */
export function declaredParameter(parameter: ts.ParameterDeclaration, types: TypeDeclarations): DeclaredParameter | null {
  const type = parameter.type ?? ts.getJSDocType(parameter);
  if (!type || !ts.isIdentifier(parameter.name)) return null;
  const shape = shapeOfType(type, types);
  const declared = type.getText();
  if (shape.kind === 'number' || shape.kind === 'vector') return { name: parameter.name.text, declared, shape: shape.kind };
  if (shape.kind === 'object') return { name: parameter.name.text, declared, shape: 'object' };
  const resolved = resolveType(type, types);
  const element = resolved && ts.isArrayTypeNode(resolved) ? resolved.elementType : resolved && ts.isTypeReferenceNode(resolved) && resolved.typeArguments?.length === 1 && ts.isIdentifier(resolved.typeName) && ['Array', 'ReadonlyArray'].includes(resolved.typeName.text) ? resolved.typeArguments[0] : undefined;
  if (element && shapeOfType(element, types).kind === 'vector') return { name: parameter.name.text, declared, shape: 'matrix' };
  return null;
}

/** The declared return type is a matrix: `number[][]`, `Float64Array[]`, `Array<number[]>`. */
export function returnsMatrix(fn: FunctionNode, types: TypeDeclarations): boolean {
  const resolved = resolveType(returnType(fn), types);
  const element = resolved && ts.isArrayTypeNode(resolved) ? resolved.elementType : resolved && ts.isTypeReferenceNode(resolved) && resolved.typeArguments?.length === 1 && ts.isIdentifier(resolved.typeName) && ['Array', 'ReadonlyArray'].includes(resolved.typeName.text) ? resolved.typeArguments[0] : undefined;
  return element !== undefined && shapeOfType(element, types).kind === 'vector';
}

/** Shape of a declared type: `number`, `number[]`, `Float64Array`, tuples and same-file aliases. */
export function shapeOfType(type: ts.TypeNode | undefined, types: TypeDeclarations): ReturnShape {
  const resolved = resolveType(type, types);
  if (!resolved) return unknown;
  if (ts.isInterfaceDeclaration(resolved) || ts.isTypeLiteralNode(resolved)) return { kind: 'object', keys: objectTypeKeys(type, types) ?? [] };
  if (resolved.kind === ts.SyntaxKind.NumberKeyword) return { kind: 'number' };
  if (ts.isArrayTypeNode(resolved)) return isNumberType(resolved.elementType, types) ? { kind: 'vector' } : { kind: 'other' };
  if (ts.isTupleTypeNode(resolved)) {
    const elements = resolved.elements.map((element) => (ts.isNamedTupleMember(element) ? element.type : element));
    if (elements.every((element) => isNumberType(element, types))) return { kind: 'vector' };
    if (elements.length === 2 && isNumberType(elements[0], types) && shapeOfType(elements[1], types).kind === 'vector') return { kind: 'valueAndVector' };
    return { kind: 'other' };
  }
  if (ts.isTypeReferenceNode(resolved) && ts.isIdentifier(resolved.typeName)) {
    const name = resolved.typeName.text;
    if (name === 'Float64Array' || name === 'Float32Array') return { kind: 'vector' };
    if ((name === 'Array' || name === 'ReadonlyArray') && resolved.typeArguments?.length === 1) {
      return isNumberType(resolved.typeArguments[0], types) ? { kind: 'vector' } : { kind: 'other' };
    }
    return unknown;
  }
  if (resolved.kind === ts.SyntaxKind.VoidKeyword || resolved.kind === ts.SyntaxKind.StringKeyword || resolved.kind === ts.SyntaxKind.BooleanKeyword) return { kind: 'other' };
  return unknown;
}

function isNumberType(type: ts.TypeNode, types: TypeDeclarations): boolean {
  return resolveType(type, types)?.kind === ts.SyntaxKind.NumberKeyword;
}

const vectorConstructors = new Set(['Float64Array', 'Float32Array', 'Array']);
const vectorMethods = new Set(['map', 'slice', 'concat', 'fill', 'from', 'of', 'subarray']);
// Calls that give a number: Math's functions and reductions written the usual way.
const numberMethods = new Set(['reduce']);

/** Deep enough for `return total` → `let total = sum(...)` → a helper's return; shallow enough to stay cheap. */
const maxDepth = 3;

function shapeOfExpression(node: ts.Expression, fn: FunctionNode, types: TypeDeclarations, depth: number): ReturnShape {
  const expression = stripAssertions(unwrapParentheses(node));
  if (ts.isAsExpression(node) || ts.isSatisfiesExpression(node)) {
    const declared = shapeOfType(node.type, types);
    if (declared.kind !== 'unknown') return declared;
  }
  if (ts.isNumericLiteral(expression)) return { kind: 'number' };
  if (ts.isPrefixUnaryExpression(expression)) return shapeOfExpression(expression.operand, fn, types, depth);
  if (ts.isBinaryExpression(expression)) {
    const operator = expression.operatorToken.kind;
    if ([ts.SyntaxKind.AsteriskToken, ts.SyntaxKind.SlashToken, ts.SyntaxKind.MinusToken, ts.SyntaxKind.AsteriskAsteriskToken, ts.SyntaxKind.PercentToken].includes(operator)) return { kind: 'number' };
    if (operator === ts.SyntaxKind.PlusToken) {
      const left = shapeOfExpression(expression.left, fn, types, depth);
      return left.kind === 'unknown' ? shapeOfExpression(expression.right, fn, types, depth) : left;
    }
    return unknown;
  }
  if (ts.isArrayLiteralExpression(expression)) {
    const elements = expression.elements;
    if (elements.length === 2 && !elements.some(ts.isSpreadElement)) {
      const [first, second] = elements.map((element) => shapeOfExpression(element, fn, types, depth));
      if (first.kind === 'number' && second.kind === 'vector') return { kind: 'valueAndVector' };
    }
    if (elements.some((element) => ts.isArrayLiteralExpression(unwrapParentheses(element)))) return { kind: 'other' };
    return { kind: 'vector' };
  }
  if (ts.isObjectLiteralExpression(expression)) {
    // An object of functions is a factory's product (`{ f, grad }`), not a value with its gradient.
    if (expression.properties.some((property) => holdsFunction(property, fn))) return { kind: 'other' };
    return { kind: 'object', keys: expression.properties.flatMap((property) => (property.name && propertyNameText(property.name as ts.PropertyName)) || []) };
  }
  if (ts.isNewExpression(expression) && ts.isIdentifier(expression.expression) && vectorConstructors.has(expression.expression.text)) return { kind: 'vector' };
  if (ts.isCallExpression(expression)) return shapeOfCall(expression, fn, types, depth);
  if (ts.isIdentifier(expression) && depth < maxDepth) return shapeOfLocal(expression.text, fn, types, depth + 1);
  return unknown;
}

function shapeOfCall(call: ts.CallExpression, fn: FunctionNode, types: TypeDeclarations, depth: number): ReturnShape {
  const callee = call.expression;
  if (ts.isPropertyAccessExpression(callee)) {
    const method = callee.name.text;
    if (ts.isIdentifier(callee.expression) && callee.expression.text === 'Math') return { kind: 'number' };
    if (ts.isIdentifier(callee.expression) && vectorConstructors.has(callee.expression.text) && (method === 'from' || method === 'of')) return { kind: 'vector' };
    if (vectorMethods.has(method)) return { kind: 'vector' };
    if (numberMethods.has(method)) return unknown;
    return unknown;
  }
  if (ts.isIdentifier(callee) && depth < maxDepth) {
    const target = findFunction(callee.text, call.getSourceFile());
    if (target) return returnShape(target, types);
  }
  return unknown;
}

/** The shape of a local `let`/`const` of `fn` named `name`, from its type or initializer. */
function shapeOfLocal(name: string, fn: FunctionNode, types: TypeDeclarations, depth: number): ReturnShape {
  const declaration = localDeclaration(fn, name);
  if (!declaration || !ts.isVariableDeclaration(declaration)) return unknown;
  if (declaration.type) return shapeOfType(declaration.type, types);
  return declaration.initializer ? shapeOfExpression(declaration.initializer, fn, types, depth) : unknown;
}

/** A top-level function declaration or function-valued const of the file, by name. */
function findFunction(name: string, sourceFile: ts.SourceFile): FunctionNode | undefined {
  for (const statement of sourceFile.statements) {
    if (ts.isFunctionDeclaration(statement) && statement.name?.text === name && statement.body) return statement;
    if (ts.isVariableStatement(statement)) {
      for (const declaration of statement.declarationList.declarations) {
        if (!ts.isIdentifier(declaration.name) || declaration.name.text !== name || !declaration.initializer) continue;
        const value = unwrapParentheses(declaration.initializer);
        if (ts.isArrowFunction(value) || ts.isFunctionExpression(value)) return value;
      }
    }
  }
  return undefined;
}

function holdsFunction(property: ts.ObjectLiteralElementLike, fn: FunctionNode): boolean {
  if (ts.isMethodDeclaration(property) || ts.isGetAccessorDeclaration(property)) return true;
  if (ts.isPropertyAssignment(property)) {
    const value = unwrapParentheses(property.initializer);
    return ts.isArrowFunction(value) || ts.isFunctionExpression(value);
  }
  if (ts.isShorthandPropertyAssignment(property)) {
    const local = localDeclaration(fn, property.name.text);
    if (local && ts.isFunctionDeclaration(local)) return true;
    const value = local && ts.isVariableDeclaration(local) && local.initializer ? unwrapParentheses(local.initializer) : undefined;
    return !!value && (ts.isArrowFunction(value) || ts.isFunctionExpression(value));
  }
  return false;
}

function stripAssertions(expression: ts.Expression): ts.Expression {
  let current = expression;
  while (ts.isAsExpression(current) || ts.isSatisfiesExpression(current) || ts.isNonNullExpression(current) || ts.isParenthesizedExpression(current)) current = current.expression;
  return current;
}
