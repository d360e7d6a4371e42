// Reading how the file itself uses a pair: the calls of its functions, whether an expression
// at some place in the file refers only to module-level values (so the sandbox can evaluate
// it through the scope hook), and the value of a numeric reference such as `opts.lr`.
import * as ts from 'typescript';
import type { Callable, CallableGroup } from './callables';
import { evaluateNumber } from './constant';
import { unwrapParentheses, type ModuleBindings, type TopLevelBinding } from './exports';
import { pairFunctions, type PairMatch } from './pairing';
import { propertyNameText } from './typeShapes';

/** ECMAScript globals an expression of module-level values may also use. */
const knownGlobals = new Set(['Math', 'Number', 'Array', 'Float64Array', 'Float32Array', 'Object', 'JSON', 'Infinity', 'NaN', 'undefined']);

/** Every call in the file that `test` accepts, in document order. */
function callsWhere(sourceFile: ts.SourceFile, test: (call: ts.CallExpression) => boolean): ts.CallExpression[] {
  const calls: ts.CallExpression[] = [];
  const visit = (node: ts.Node): void => {
    if (ts.isCallExpression(node) && test(node)) calls.push(node);
    ts.forEachChild(node, visit);
  };
  visit(sourceFile);
  return calls;
}

/** Every call of `callable` in the file: `loss(…)`, or `model.loss(…)` for a host's method. */
export function callsOf(sourceFile: ts.SourceFile, group: CallableGroup, callable: Callable): ts.CallExpression[] {
  return callsWhere(sourceFile, (call) => refersTo(call.expression, group, callable));
}

/** True when `node` names one of the pair's functions, or its host, anywhere inside it. */
export function mentionsPair(node: ts.Node, match: PairMatch): boolean {
  if (ts.isExpression(node) && pairFunctions(match).some((c) => refersTo(node, match.group, c))) return true;
  if (match.group.host && ts.isIdentifier(node) && node.text === match.group.host.key) return true;
  return ts.forEachChild(node, (child) => mentionsPair(child, match) || undefined) ?? false;
}

/**
 * Where the file uses a pair, in document order: calls of its functions (`kind: 'call'`, a
 * training loop) and calls that are handed them or their host (`kind: 'handed'`, an optimizer).
 */
export function pairSites(sourceFile: ts.SourceFile, match: PairMatch): Array<{ kind: 'call' | 'handed'; node: ts.CallExpression }> {
  const callsPairFunction = (call: ts.CallExpression) => pairFunctions(match).some((c) => refersTo(call.expression, match.group, c));
  return callsWhere(sourceFile, (call) => callsPairFunction(call) || call.arguments.some((argument) => mentionsPair(argument, match))).map((node) => ({
    kind: callsPairFunction(node) ? 'call' : 'handed',
    node,
  }));
}

/** `loss` (module function) or `model.loss` (host method), as written at a call or passed as a value. */
export function refersTo(expression: ts.Expression, group: CallableGroup, callable: Callable): boolean {
  const node = unwrapParentheses(expression);
  if (!group.host) return ts.isIdentifier(node) && node.text === callable.name;
  return ts.isPropertyAccessExpression(node) && node.name.text === callable.name && ts.isIdentifier(node.expression) && node.expression.text === group.host.key;
}

/**
 * The expression's text when every name in it is a module-level binding (or an ECMAScript
 * global) at the place it is written, so the scope hook can evaluate it; null otherwise.
 * A name declared by an enclosing function (a parameter, a local) is not module-level.
 */
export function moduleLevelText(expression: ts.Expression, bindings: ModuleBindings): string | null {
  let ok = true;
  const visit = (node: ts.Node): void => {
    if (!ok) return;
    if (ts.isFunctionLike(node) || ts.isClassLike(node)) {
      ok = false;
      return;
    }
    if (ts.isTypeNode(node)) return;
    if (ts.isIdentifier(node) && !isPropertyName(node)) {
      if (!(bindings.byLocalName.has(node.text) || knownGlobals.has(node.text)) || isShadowed(node)) ok = false;
      return;
    }
    ts.forEachChild(node, visit);
  };
  visit(expression);
  return ok ? expression.getText() : null;
}

function isPropertyName(node: ts.Identifier): boolean {
  const parent = node.parent;
  return (ts.isPropertyAccessExpression(parent) && parent.name === node) || (ts.isPropertyAssignment(parent) && parent.name === node);
}

/** True when a function around `node` declares its name (parameter, local, inner function). */
function isShadowed(node: ts.Identifier): boolean {
  return declaringFunction(node) !== undefined;
}

function declaresName(fn: ts.SignatureDeclaration, name: string): boolean {
  return fn.parameters.some((p) => bindsName(p.name, name)) || localDeclaration(fn, name) !== undefined;
}

/**
 * The declaration of `name` in `fn`'s own body (a `let`/`const`/`var`, destructured names
 * included, or an inner function declaration); nested functions declare for themselves.
 */
export function localDeclaration(fn: ts.SignatureDeclaration, name: string): ts.VariableDeclaration | ts.FunctionDeclaration | undefined {
  let found: ts.VariableDeclaration | ts.FunctionDeclaration | undefined;
  const visit = (node: ts.Node): void => {
    if (found) return;
    if ((ts.isVariableDeclaration(node) && bindsName(node.name, name)) || (ts.isFunctionDeclaration(node) && node.name?.text === name)) {
      found = node;
      return;
    }
    if (ts.isFunctionLike(node)) return;
    ts.forEachChild(node, visit);
  };
  const body = (fn as { body?: ts.Node }).body;
  if (body) ts.forEachChild(body, visit);
  return found;
}

function bindsName(name: ts.BindingName, wanted: string): boolean {
  if (ts.isIdentifier(name)) return name.text === wanted;
  return name.elements.some((element) => !ts.isOmittedExpression(element) && bindsName(element.name, wanted));
}

/** The innermost function around `node`, or undefined at module level. */
export function enclosingFunction(node: ts.Node): ts.SignatureDeclaration | undefined {
  for (let scope = node.parent; scope && !ts.isSourceFile(scope); scope = scope.parent) {
    if (ts.isFunctionLike(scope)) return scope;
  }
  return undefined;
}

/** The initializer a local name of `fn` is declared with (`let w = x0.slice()`), or its parameter's default. */
export function localInitializer(fn: ts.SignatureDeclaration, name: string): ts.Expression | undefined {
  const parameter = fn.parameters.find((p) => ts.isIdentifier(p.name) && p.name.text === name);
  if (parameter) return parameter.initializer;
  const declaration = localDeclaration(fn, name);
  return declaration && ts.isVariableDeclaration(declaration) && ts.isIdentifier(declaration.name) ? declaration.initializer : undefined;
}

/** A point written out: `[0.5, 1]`, `new Float64Array([…])`, `new Array(3).fill(0)`, `x0.slice()`, or a const holding one. */
export function looksLikePoint(expression: ts.Expression, bindings: ModuleBindings, depth = 0): boolean {
  const node = unwrapParentheses(expression);
  if (ts.isAsExpression(node) || ts.isSatisfiesExpression(node)) return looksLikePoint(node.expression, bindings, depth);
  if (ts.isArrayLiteralExpression(node)) return node.elements.length > 0 && node.elements.every((e) => !ts.isArrayLiteralExpression(unwrapParentheses(e)) && !ts.isObjectLiteralExpression(unwrapParentheses(e)));
  if (ts.isNewExpression(node) && ts.isIdentifier(node.expression)) return ['Float64Array', 'Float32Array', 'Array'].includes(node.expression.text);
  if (ts.isCallExpression(node) && ts.isPropertyAccessExpression(node.expression)) {
    const method = node.expression.name.text;
    if (['from', 'of'].includes(method)) return true;
    if (['slice', 'fill', 'map', 'concat'].includes(method)) return looksLikePoint(node.expression.expression, bindings, depth);
  }
  if (ts.isIdentifier(node) && depth < 2) {
    const value = bindings.byLocalName.get(node.text)?.constValue;
    return !!value && looksLikePoint(value, bindings, depth + 1);
  }
  return false;
}

/** A number written in the file, and where: `lr` (a const) or `opts.lr` (a field of an options object). */
export interface NumberReference {
  name: string;
  value: number;
  /** The const's or the field's name. */
  nameNode: ts.Node;
  /** The statement that declares it. */
  declaration: ts.Node;
  /** The expression that gives the value, for edits. */
  valueNode: ts.Expression;
}

/**
 * The value of `lr`, `opts.lr` or `config.optimizer.lr` at the place it is written: a
 * module-level const (or a field of one), or, inside a function, a local const or a
 * parameter default that is itself a number or such a reference.
 */
export function resolveNumber(expression: ts.Expression, bindings: ModuleBindings, depth = 0): NumberReference | null {
  const node = unwrapParentheses(expression);
  if (depth > 3) return null;
  if (ts.isIdentifier(node)) {
    const owner = declaringFunction(node);
    if (owner) {
      // A rate is a constant: a local that the function reassigns (a line search's `step /= 2`) is not one.
      if (isReassigned(owner, node.text)) return null;
      // A parameter without a default: what the file's first call passes (`sgd(w0, 0.01)`).
      const local = localInitializer(owner, node.text) ?? argumentsPassedFor(owner, node.text)[0];
      if (!local) return null;
      const literal = evaluateNumber(local);
      if (literal !== null) return { name: node.text, value: literal, nameNode: node, declaration: local.parent, valueNode: local };
      return resolveNumber(local, bindings, depth + 1);
    }
    const binding = bindings.byLocalName.get(node.text);
    return binding ? numberOfConst(binding, node.text) : null;
  }
  if (ts.isPropertyAccessExpression(node)) {
    const path = memberPath(node);
    if (!path) return null;
    const owner = declaringFunction(rootIdentifier(node));
    if (owner) {
      // `function train(opts = defaults)` reading `opts.lr`: follow the local back to a module-level object.
      const local = localInitializer(owner, path[0]);
      if (!local || !ts.isIdentifier(unwrapParentheses(local))) return null;
      path[0] = (unwrapParentheses(local) as ts.Identifier).text;
    }
    const binding = bindings.byLocalName.get(path[0]);
    if (!binding?.constValue) return null;
    return fieldNumber(binding, binding.constValue, path.slice(1), path.join('.'));
  }
  return null;
}

/** The innermost function around `node` that declares its name, or undefined when the name is module-level. */
export function declaringFunction(node: ts.Identifier): ts.SignatureDeclaration | undefined {
  for (let scope: ts.Node | undefined = node.parent; scope && !ts.isSourceFile(scope); scope = scope.parent) {
    if (ts.isFunctionLike(scope) && declaresName(scope, node.text)) return scope;
  }
  return undefined;
}

/**
 * What the file's calls of `fn` pass for its parameter `name`, in document order: `function
 * fit(run)` called as `fit(coolingRun)` gives `coolingRun`. Empty when `name` is no parameter.
 */
export function argumentsPassedFor(fn: ts.SignatureDeclaration, name: string): ts.Expression[] {
  const index = fn.parameters.findIndex((p) => ts.isIdentifier(p.name) && p.name.text === name);
  if (index < 0) return [];
  return callsOfFunction(fn.getSourceFile(), fn).flatMap((call) => (call.arguments[index] ? [call.arguments[index]] : []));
}

/** True when `fn` assigns to `name` (`=`, `+=`, `/=`, `++`, …) anywhere in its body. */
function isReassigned(fn: ts.SignatureDeclaration, name: string): boolean {
  let found = false;
  const isName = (target: ts.Expression) => ts.isIdentifier(target) && target.text === name;
  const visit = (node: ts.Node): void => {
    if (found) return;
    if (ts.isBinaryExpression(node) && node.operatorToken.kind >= ts.SyntaxKind.FirstAssignment && node.operatorToken.kind <= ts.SyntaxKind.LastAssignment && isName(node.left)) found = true;
    else if ((ts.isPrefixUnaryExpression(node) || ts.isPostfixUnaryExpression(node)) && [ts.SyntaxKind.PlusPlusToken, ts.SyntaxKind.MinusMinusToken].includes(node.operator) && isName(node.operand)) found = true;
    else ts.forEachChild(node, visit);
  };
  const body = (fn as { body?: ts.Node }).body;
  if (body) visit(body);
  return found;
}

function numberOfConst(binding: TopLevelBinding, name: string): NumberReference | null {
  if (!binding.constValue) return null;
  const value = evaluateNumber(binding.constValue);
  return value === null ? null : { name, value, nameNode: binding.nameNode, declaration: binding.statement, valueNode: binding.constValue };
}

/** A numeric field reached through object literals: `{ optimizer: { lr: 0.01 } }` with path ['optimizer', 'lr']. */
export function fieldNumber(binding: TopLevelBinding, value: ts.Expression, path: string[], name: string): NumberReference | null {
  let current = unwrapParentheses(value);
  let nameNode: ts.Node = binding.nameNode;
  for (const key of path) {
    if (ts.isAsExpression(current) || ts.isSatisfiesExpression(current)) current = unwrapParentheses(current.expression);
    if (!ts.isObjectLiteralExpression(current)) return null;
    const property = current.properties.find((p) => ts.isPropertyAssignment(p) && propertyNameText(p.name) === key) as ts.PropertyAssignment | undefined;
    if (!property) return null;
    nameNode = property.name;
    current = property.initializer;
  }
  const number = evaluateNumber(current);
  return number === null ? null : { name, value: number, nameNode, declaration: binding.statement, valueNode: current };
}

function rootIdentifier(node: ts.PropertyAccessExpression): ts.Identifier {
  let current: ts.Expression = node;
  while (ts.isPropertyAccessExpression(current)) current = current.expression;
  return current as ts.Identifier;
}

/** ['opts', 'lr'] for `opts.lr`; null when the chain does not start at a plain name. */
function memberPath(node: ts.PropertyAccessExpression): string[] | null {
  const path: string[] = [];
  let current: ts.Expression = node;
  while (ts.isPropertyAccessExpression(current)) {
    path.unshift(current.name.text);
    current = current.expression;
  }
  if (!ts.isIdentifier(current)) return null;
  path.unshift(current.text);
  return path;
}

/** Calls, anywhere in the file, of a function declared by name (`function fit`, `const fit = (…) =>`). */
export function callsOfFunction(sourceFile: ts.SourceFile, fn: ts.SignatureDeclaration): ts.CallExpression[] {
  const name = ts.isFunctionDeclaration(fn) ? fn.name?.text : ts.isVariableDeclaration(fn.parent) && ts.isIdentifier(fn.parent.name) ? fn.parent.name.text : undefined;
  if (name === undefined) return [];
  return callsWhere(sourceFile, (call) => ts.isIdentifier(call.expression) && call.expression.text === name);
}
