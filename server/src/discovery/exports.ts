// Top-level functions and consts of a module, and the names they are exported under.
// Both `export function f` / `export const f = …` and `export { f }` / `export { g as f }` count.
import * as ts from 'typescript';

export type FunctionNode = ts.FunctionDeclaration | ts.ArrowFunction | ts.FunctionExpression;

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
      add({ localName: statement.name.text, nameNode: statement.name, statement, docHost: statement, fn: statement, constValue: null });
      if (exported && !hasDefaultKeyword(statement)) exportPairs.push({ exportName: statement.name.text, localName: statement.name.text });
    } else if (ts.isVariableStatement(statement)) {
      const isConst = (statement.declarationList.flags & ts.NodeFlags.Const) !== 0;
      for (const declaration of statement.declarationList.declarations) {
        if (!ts.isIdentifier(declaration.name) || !declaration.initializer) continue;
        const value = unwrapParentheses(declaration.initializer);
        const fn = ts.isArrowFunction(value) || ts.isFunctionExpression(value) ? value : null;
        if (!fn && !isConst) continue;
        add({
          localName: declaration.name.text,
          nameNode: declaration.name,
          statement,
          docHost: declaration,
          fn,
          constValue: fn ? null : declaration.initializer,
        });
        if (exported) exportPairs.push({ exportName: declaration.name.text, localName: declaration.name.text });
      }
    } else if (ts.isExportDeclaration(statement) && !statement.moduleSpecifier && !statement.isTypeOnly) {
      const clause = statement.exportClause;
      if (!clause || !ts.isNamedExports(clause)) continue;
      for (const specifier of clause.elements) {
        if (specifier.isTypeOnly) continue;
        const local = specifier.propertyName ?? specifier.name;
        exportPairs.push({ exportName: specifier.name.text, localName: local.text });
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
  return { byLocalName, byExportName, exported, functions };
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
