// Where the functions to pair live: the module itself (its top-level functions and the
// functions it imports), and each host object built at module level — an instance of a
// class of the file, an object literal of functions, or a factory's result — or an
// exported class whose constructor takes no arguments.
import * as ts from 'typescript';
import { unwrapParentheses, type FunctionNode, type ModuleBindings, type TopLevelBinding } from './exports';
import { localDeclaration } from './references';
import { returnedExpressions } from './returns';
import { propertyNameText } from './typeShapes';

export interface Callable {
  /** Function or method name: the local name, as the scope hook reaches it. */
  name: string;
  /** Every name it goes by: the local name and the names it is exported under. */
  names: string[];
  /** The names other modules can import it by (for a method: none of its own; see `Host.exportNames`). */
  exportNames: string[];
  /** How the user refers to it: `loss`, `model.loss`. */
  label: string;
  /** Null for an imported function: its body is in another file. */
  fn: FunctionNode | null;
  nameNode: ts.Node;
  /** The declaration, for spans and for inserting a comment above it. */
  declaration: ts.Node;
  /** The node its JSDoc belongs to. */
  docHost: ts.Node;
  exported: boolean;
}

export interface Host {
  /** Scope key of the module-level value (or class) the methods are read from. */
  key: string;
  /** True when the sandbox builds the instance itself with `new Key()`. */
  construct: boolean;
  /** The binding the host comes from, for findings about it. */
  binding: TopLevelBinding;
  /** The names other modules can import the host by. */
  exportNames: string[];
}

export interface CallableGroup {
  /** Null for the module's own functions. */
  host: Host | null;
  callables: Callable[];
}

export function collectCallables(bindings: ModuleBindings): CallableGroup[] {
  const exportedBindings = new Set(bindings.exported.map((entry) => entry.binding));
  const exportNames = (binding: TopLevelBinding) => bindings.exported.filter((entry) => entry.binding === binding).map((entry) => entry.exportName);
  const moduleCallables: Callable[] = [...bindings.byLocalName.values()]
    .filter((binding) => binding.fn !== null || binding.kind === 'import')
    .sort((a, b) => a.nameNode.pos - b.nameNode.pos)
    .map((binding) => ({
      name: binding.localName,
      names: [...new Set([binding.localName, ...exportNames(binding)])],
      exportNames: exportNames(binding),
      // Users know a function by the name other modules import it under.
      label: exportNames(binding)[0] ?? binding.localName,
      fn: binding.fn,
      nameNode: binding.nameNode,
      declaration: binding.statement,
      docHost: binding.docHost,
      exported: exportedBindings.has(binding),
    }));
  const groups: CallableGroup[] = [{ host: null, callables: moduleCallables }];

  const classesWithInstance = new Set<ts.ClassDeclaration>();
  for (const binding of [...bindings.byLocalName.values()].sort((a, b) => a.nameNode.pos - b.nameNode.pos)) {
    if (binding.kind !== 'const' && binding.kind !== 'variable') continue;
    const members = hostMembers(binding, bindings);
    if (!members) continue;
    if (members.classNode) classesWithInstance.add(members.classNode);
    groups.push({
      host: { key: binding.localName, construct: false, binding, exportNames: exportNames(binding) },
      callables: members.callables.map((c) => ({ ...c, names: [c.name], exportNames: [], label: `${binding.localName}.${c.name}`, exported: exportedBindings.has(binding) })),
    });
  }
  for (const binding of bindings.byLocalName.values()) {
    const classNode = binding.classNode;
    if (!classNode || classesWithInstance.has(classNode) || !exportedBindings.has(binding) || !constructsWithoutArguments(classNode)) continue;
    const callables = classMethods(classNode).map((c) => ({ ...c, names: [c.name], exportNames: [], label: `${binding.localName}.${c.name}`, exported: true }));
    groups.push({ host: { key: binding.localName, construct: true, binding, exportNames: exportNames(binding) }, callables });
  }
  return groups.filter((group) => group.callables.length > 0);
}

/** The methods a module-level value will have, read from how it is built; null when it is not a host. */
type Member = Omit<Callable, 'label' | 'exported' | 'names' | 'exportNames'>;

function hostMembers(binding: TopLevelBinding, bindings: ModuleBindings): { callables: Member[]; classNode?: ts.ClassDeclaration } | null {
  const declaration = binding.docHost;
  if (!ts.isVariableDeclaration(declaration) || !declaration.initializer) return null;
  const value = unwrapParentheses(declaration.initializer);
  const classNode = instantiatedClass(value, bindings);
  if (classNode) return { callables: classMethods(classNode), classNode };
  if (ts.isObjectLiteralExpression(value)) return objectMembers(value, null);
  if (ts.isCallExpression(value) && ts.isIdentifier(value.expression)) {
    // A factory of this file: its returned object literal (or `new C(…)`) gives the methods.
    const factory = bindings.byLocalName.get(value.expression.text)?.fn;
    if (!factory) return null;
    for (const returned of returnedExpressions(factory)) {
      const expression = unwrapParentheses(returned);
      const built = instantiatedClass(expression, bindings);
      if (built) return { callables: classMethods(built), classNode: built };
      if (ts.isObjectLiteralExpression(expression)) return objectMembers(expression, factory);
    }
  }
  return null;
}

function instantiatedClass(value: ts.Expression, bindings: ModuleBindings): ts.ClassDeclaration | undefined {
  if (!ts.isNewExpression(value) || !ts.isIdentifier(value.expression)) return undefined;
  return bindings.byLocalName.get(value.expression.text)?.classNode;
}

/** Public methods and function-valued fields of a class (not static, not `private`, `protected` or `#`-named). */
function classMethods(classNode: ts.ClassDeclaration): Member[] {
  return classNode.members.flatMap((member): Member[] => {
    if (!member.name || ts.isPrivateIdentifier(member.name) || hasModifier(member, ts.SyntaxKind.StaticKeyword) || hasModifier(member, ts.SyntaxKind.PrivateKeyword) || hasModifier(member, ts.SyntaxKind.ProtectedKeyword)) return [];
    const name = propertyNameText(member.name);
    if (name === undefined) return [];
    if (ts.isMethodDeclaration(member) && member.body) return [{ name, fn: member, nameNode: member.name, declaration: member, docHost: member }];
    if (ts.isPropertyDeclaration(member) && member.initializer) {
      const value = unwrapParentheses(member.initializer);
      if (ts.isArrowFunction(value) || ts.isFunctionExpression(value)) return [{ name, fn: value, nameNode: member.name, declaration: member, docHost: member }];
    }
    return [];
  });
}

/** Function members of an object literal; shorthand `{ f, grad }` in a factory resolves to the factory's local functions. */
function objectMembers(literal: ts.ObjectLiteralExpression, factory: FunctionNode | null): { callables: Member[] } {
  const callables = literal.properties.flatMap((property): Member[] => {
    const name = property.name ? propertyNameText(property.name as ts.PropertyName) : undefined;
    if (name === undefined) return [];
    if (ts.isMethodDeclaration(property) && property.body) return [{ name, fn: property, nameNode: property.name, declaration: property, docHost: property }];
    let value: ts.Expression | undefined;
    if (ts.isPropertyAssignment(property)) value = unwrapParentheses(property.initializer);
    if (ts.isShorthandPropertyAssignment(property)) value = property.name;
    if (!value) return [];
    if (ts.isArrowFunction(value) || ts.isFunctionExpression(value)) return [{ name, fn: value, nameNode: property.name!, declaration: property, docHost: property }];
    if (ts.isIdentifier(value) && factory) {
      const local = localFunction(factory, value.text);
      if (local) return [{ name, fn: local.fn, nameNode: local.nameNode, declaration: local.declaration, docHost: local.declaration }];
    }
    return [];
  });
  return { callables };
}

/** A function declared directly in a factory's body, by name. */
function localFunction(factory: FunctionNode, name: string): { fn: FunctionNode; nameNode: ts.Identifier; declaration: ts.Node } | undefined {
  const local = localDeclaration(factory, name);
  if (local && ts.isFunctionDeclaration(local) && local.body && local.name) return { fn: local, nameNode: local.name, declaration: local };
  if (!local || !ts.isVariableDeclaration(local) || !local.initializer || !ts.isIdentifier(local.name)) return undefined;
  const value = unwrapParentheses(local.initializer);
  return ts.isArrowFunction(value) || ts.isFunctionExpression(value) ? { fn: value, nameNode: local.name, declaration: local } : undefined;
}

function hasModifier(member: ts.ClassElement, kind: ts.SyntaxKind): boolean {
  return ts.canHaveModifiers(member) && (ts.getModifiers(member) ?? []).some((m) => m.kind === kind);
}

/** No constructor, or one whose parameters are all optional or defaulted. */
function constructsWithoutArguments(classNode: ts.ClassDeclaration): boolean {
  const constructor = classNode.members.find(ts.isConstructorDeclaration);
  return !constructor || constructor.parameters.every((p) => p.questionToken || p.initializer || p.dotDotDotToken);
}
