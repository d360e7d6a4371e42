// Top-level bindings of a module (functions, consts, variables, classes, imports) and the
// names they are exported under. `export function f`, `export const f = …`, `export { g as f }`,
// and CommonJS `module.exports = { f }`, `exports.f = f` all count as exports.
import * as ts from 'typescript';

export type FunctionNode = ts.FunctionDeclaration | ts.ArrowFunction | ts.FunctionExpression | ts.MethodDeclaration;

export type BindingKind = 'function' | 'const' | 'variable' | 'class' | 'import';

export interface TopLevelBinding {
  localName: string;
  nameNode: ts.Identifier;
  /** The whole statement, e.g. `export const lr = 0.01;`. */
  statement: ts.Statement;
  /** The node its JSDoc belongs to (a function or variable declaration). */
  docHost: ts.Node;
  /** Set when the binding is a function (declaration, arrow or function expression). */
  fn: FunctionNode | null;
  /** Initializer of a `const` that is not a function. */
  constValue: ts.Expression | null;
  kind: BindingKind;
  /** Set for a class declaration. */
  classNode?: ts.ClassDeclaration;
}

export interface ExportedBinding {
  exportName: string;
  binding: TopLevelBinding;
}

export interface ModuleBindings {
  byLocalName: Map<string, TopLevelBinding>;
  byExportName: Map<string, TopLevelBinding>;
  /** Every export, in document order of the declaration it names. */
  exported: ExportedBinding[];
  /** Every top-level function, exported or not, in document order. */
  functions: TopLevelBinding[];
}

export function collectBindings(sourceFile: ts.SourceFile): ModuleBindings {
  const byLocalName = new Map<string, TopLevelBinding>();
  const exportPairs: Array<{ exportName: string; localName: string }> = [];
  const add = (binding: TopLevelBinding) => {
    if (!byLocalName.has(binding.localName)) byLocalName.set(binding.localName, binding);
  };

  for (const statement of sourceFile.statements) {
    const exported = hasExportKeyword(statement);
    if (ts.isFunctionDeclaration(statement) && statement.name && statement.body) {
      add({ localName: statement.name.text, nameNode: statement.name, statement, docHost: statement, fn: statement, constValue: null, kind: 'function' });
      if (exported && !hasDefaultKeyword(statement)) exportPairs.push({ exportName: statement.name.text, localName: statement.name.text });
    } else if (ts.isClassDeclaration(statement) && statement.name) {
      add({ localName: statement.name.text, nameNode: statement.name, statement, docHost: statement, fn: null, constValue: null, kind: 'class', classNode: statement });
      if (exported && !hasDefaultKeyword(statement)) exportPairs.push({ exportName: statement.name.text, localName: statement.name.text });
    } else if (ts.isVariableStatement(statement)) {
      const isConst = (statement.declarationList.flags & ts.NodeFlags.Const) !== 0;
      for (const declaration of statement.declarationList.declarations) {
        if (!ts.isIdentifier(declaration.name)) continue;
        const value = declaration.initializer ? unwrapParentheses(declaration.initializer) : undefined;
        const fn = value && (ts.isArrowFunction(value) || ts.isFunctionExpression(value)) ? value : null;
        add({
          localName: declaration.name.text,
          nameNode: declaration.name,
          statement,
          docHost: declaration,
          fn,
          constValue: fn || !isConst ? null : declaration.initializer ?? null,
          kind: fn ? 'function' : isConst ? 'const' : 'variable',
        });
        if (exported) exportPairs.push({ exportName: declaration.name.text, localName: declaration.name.text });
      }
    } else if (ts.isImportDeclaration(statement) && statement.importClause && !statement.importClause.isTypeOnly) {
      for (const nameNode of importedNames(statement.importClause)) {
        add({ localName: nameNode.text, nameNode, statement, docHost: statement, fn: null, constValue: null, kind: 'import' });
      }
    } else if (ts.isExportDeclaration(statement) && !statement.moduleSpecifier && !statement.isTypeOnly) {
      const clause = statement.exportClause;
      if (!clause || !ts.isNamedExports(clause)) continue;
      for (const specifier of clause.elements) {
        if (specifier.isTypeOnly) continue;
        const local = specifier.propertyName ?? specifier.name;
        exportPairs.push({ exportName: specifier.name.text, localName: local.text });
      }
    } else if (ts.isExpressionStatement(statement)) {
      exportPairs.push(...commonJsExports(statement.expression));
      const assigned = commonJsMember(statement);
      if (assigned) {
        add(assigned);
        exportPairs.push({ exportName: assigned.nameNode.text, localName: assigned.localName });
      }
    }
  }

  const exported: ExportedBinding[] = [];
  const byExportName = new Map<string, TopLevelBinding>();
  for (const { exportName, localName } of exportPairs) {
    const binding = byLocalName.get(localName);
    if (!binding || byExportName.has(exportName)) continue;
    byExportName.set(exportName, binding);
    exported.push({ exportName, binding });
  }
  exported.sort((a, b) => a.binding.nameNode.pos - b.binding.nameNode.pos);
  const functions = [...byLocalName.values()].filter((binding) => binding.fn !== null);
  functions.sort((a, b) => a.nameNode.pos - b.nameNode.pos);
  return { byLocalName, byExportName, exported, functions };
}

/** Value names an import brings in: `import a, { b as c } from`, `import * as ns from`. */
function importedNames(clause: ts.ImportClause): ts.Identifier[] {
  const names: ts.Identifier[] = clause.name ? [clause.name] : [];
  const bindings = clause.namedBindings;
  if (bindings && ts.isNamespaceImport(bindings)) names.push(bindings.name);
  if (bindings && ts.isNamedImports(bindings)) names.push(...bindings.elements.filter((e) => !e.isTypeOnly).map((e) => e.name));
  return names;
}

/** `module.exports = { a, b: c }`, `module.exports.a = a`, `exports.a = a`: exports of local names. */
function commonJsExports(expression: ts.Expression): Array<{ exportName: string; localName: string }> {
  if (!ts.isBinaryExpression(expression) || expression.operatorToken.kind !== ts.SyntaxKind.EqualsToken) return [];
  const target = expression.left;
  const value = unwrapParentheses(expression.right);
  const isModuleExports = (node: ts.Expression) =>
    ts.isPropertyAccessExpression(node) && ts.isIdentifier(node.expression) && node.expression.text === 'module' && node.name.text === 'exports';
  if (isModuleExports(target) && ts.isObjectLiteralExpression(value)) {
    return value.properties.flatMap((property) => {
      if (ts.isShorthandPropertyAssignment(property)) return [{ exportName: property.name.text, localName: property.name.text }];
      if (ts.isPropertyAssignment(property) && ts.isIdentifier(property.name) && ts.isIdentifier(property.initializer)) {
        return [{ exportName: property.name.text, localName: property.initializer.text }];
      }
      return [];
    });
  }
  const isExportsObject = (node: ts.Expression) => (ts.isIdentifier(node) && node.text === 'exports') || isModuleExports(node);
  if (ts.isPropertyAccessExpression(target) && isExportsObject(target.expression) && ts.isIdentifier(value)) {
    return [{ exportName: target.name.text, localName: value.text }];
  }
  return [];
}

/**
 * `exports.loss = function (w) {…}`, `module.exports.x0 = [1, 2]`: a value with no local name.
 * Its "local name" is the member expression itself, which is how the scope hook reaches it;
 * it is exported under the property name.
 */
function commonJsMember(statement: ts.ExpressionStatement): TopLevelBinding | null {
  const expression = statement.expression;
  if (!ts.isBinaryExpression(expression) || expression.operatorToken.kind !== ts.SyntaxKind.EqualsToken) return null;
  const target = expression.left;
  const value = unwrapParentheses(expression.right);
  if (!ts.isPropertyAccessExpression(target) || ts.isIdentifier(value)) return null;
  const owner = target.expression.getText();
  if (owner !== 'exports' && owner !== 'module.exports') return null;
  const fn = ts.isArrowFunction(value) || ts.isFunctionExpression(value) ? value : null;
  return { localName: target.getText(), nameNode: target.name as ts.Identifier, statement, docHost: statement, fn, constValue: fn ? null : expression.right, kind: fn ? 'function' : 'const' };
}

function hasExportKeyword(statement: ts.Statement): boolean {
  return ts.canHaveModifiers(statement) && (ts.getModifiers(statement) ?? []).some((m) => m.kind === ts.SyntaxKind.ExportKeyword);
}

function hasDefaultKeyword(statement: ts.Statement): boolean {
  return ts.canHaveModifiers(statement) && (ts.getModifiers(statement) ?? []).some((m) => m.kind === ts.SyntaxKind.DefaultKeyword);
}

/** `(x) => …` wrapped in parentheses is still the function. */
export function unwrapParentheses(expression: ts.Expression): ts.Expression {
  let current = expression;
  while (ts.isParenthesizedExpression(current)) current = current.expression;
  return current;
}
