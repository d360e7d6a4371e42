// Data for a pair from a file that imports it: `train.ts` does `import { mse, mseGrad } from
// './model'` and calls `mseGrad(w, train)` with its own module-level `train`. Such a pair is
// run with the importing file as the bundle's entry: the appended scope hook imports the
// document as a namespace, so its functions are reached through it and the data through the
// importer's own scope.
import * as ts from 'typescript';
import type { CallRecipe } from '../engine/types';
import { isStartName } from './conventions';
import { collectBindings, unwrapParentheses, type ModuleBindings } from './exports';
import { specifierNames, type SourceText } from './importers';
import { pairFunctions, type PairMatch } from './pairing';
import { declaringFunction, localInitializer, looksLikePoint, moduleLevelText } from './references';

/** The namespace the hook imports the document under, in the importer's scope. */
export const documentNamespace = '__slopecheckDocument';

export interface ImporterEntry {
  fileName: string;
  text: string;
  /** How the importer names the document, e.g. `./model`. */
  specifier: string;
  /** 1-based line of the importer's call that supplied the data. */
  line: number;
}

export interface ImporterInvocation {
  entry: ImporterEntry;
  recipe: Pick<CallRecipe, 'host' | 'value' | 'derivative' | 'extraArguments'>;
  start: string | null;
}

/** How the importer refers to the document's exports: `{ exportName → local name }` and namespace names. */
interface ImportedNames {
  specifier: string;
  named: Map<string, string>;
  namespaces: string[];
}

function importsOf(sourceFile: ts.SourceFile, documentFile: string): ImportedNames | null {
  for (const statement of sourceFile.statements) {
    if (!ts.isImportDeclaration(statement) || !ts.isStringLiteral(statement.moduleSpecifier) || !statement.importClause || statement.importClause.isTypeOnly) continue;
    const specifier = statement.moduleSpecifier.text;
    if (!specifierNames(specifier, sourceFile.fileName, documentFile)) continue;
    const names: ImportedNames = { specifier, named: new Map(), namespaces: [] };
    const bindings = statement.importClause.namedBindings;
    if (bindings && ts.isNamespaceImport(bindings)) names.namespaces.push(bindings.name.text);
    if (bindings && ts.isNamedImports(bindings)) {
      for (const element of bindings.elements) if (!element.isTypeOnly) names.named.set((element.propertyName ?? element.name).text, element.name.text);
    }
    return names;
  }
  return null;
}

/**
 * The first call, in a file that imports the document, of one of the pair's functions with
 * module-level values of that file after the point; null when no importer has one.
 * `extraCount` and `optional` describe the parameters after the point.
 */
export function readImporterInvocation(match: PairMatch, documentFile: string, extraCount: number, optional: (index: number) => boolean, importers: readonly SourceText[]): ImporterInvocation | null {
  const functions = pairFunctions(match);
  const host = match.group.host;
  // Through the namespace the hook imports, under the names the document exports.
  const exported = (names: string[]) => names[0];
  const hostExport = host ? exported(host.exportNames) : undefined;
  if (host ? hostExport === undefined : functions.some((c) => c.exportNames.length === 0)) return null;
  const recipe: ImporterInvocation['recipe'] = host
    ? { host: { key: `${documentNamespace}.${hostExport}`, construct: host.construct }, value: match.objective.name, derivative: match.gradient?.name ?? null, extraArguments: [] }
    : { host: null, value: `${documentNamespace}.${exported(match.objective.exportNames)}`, derivative: match.gradient ? `${documentNamespace}.${exported(match.gradient.exportNames)}` : null, extraArguments: [] };

  for (const importer of importers) {
    const sourceFile = ts.createSourceFile(importer.fileName, importer.text, ts.ScriptTarget.Latest, true);
    const imported = importsOf(sourceFile, documentFile);
    if (!imported) continue;
    const bindings = collectBindings(sourceFile);
    const callsPair = (callee: ts.Expression): boolean => {
      const node = unwrapParentheses(callee);
      const refers = (expression: ts.Expression, exportName: string): boolean =>
        (ts.isIdentifier(expression) && imported.named.get(exportName) === expression.text) ||
        (ts.isPropertyAccessExpression(expression) && expression.name.text === exportName && ts.isIdentifier(expression.expression) && imported.namespaces.includes(expression.expression.text));
      if (host) return ts.isPropertyAccessExpression(node) && functions.some((c) => c.name === node.name.text) && refers(node.expression, hostExport!);
      return functions.some((c) => c.exportNames.some((name) => refers(node, name)));
    };
    let found: ImporterInvocation | null = null;
    const visit = (node: ts.Node): void => {
      if (found) return;
      if (ts.isCallExpression(node) && callsPair(node.expression)) {
        const given = node.arguments.slice(1, 1 + extraCount);
        const texts = given.map((argument) => (ts.isSpreadElement(argument) ? null : moduleLevelText(argument, bindings)));
        const complete = texts.every((text) => text !== null) && Array.from({ length: extraCount }, (_, index) => index < texts.length || optional(index)).every(Boolean);
        if (complete && texts.length > 0) {
          found = {
            entry: { fileName: importer.fileName, text: importer.text, specifier: imported.specifier, line: sourceFile.getLineAndCharacterOfPosition(node.getStart()).line + 1 },
            recipe: { ...recipe, extraArguments: texts as string[] },
            start: importerStart(node, bindings),
          };
          return;
        }
      }
      ts.forEachChild(node, visit);
    };
    visit(sourceFile);
    if (found) return found;
  }
  return null;
}

/** The importer's start: the initial value of the point its loop passes, or its one start-named const. */
function importerStart(call: ts.CallExpression, bindings: ModuleBindings): string | null {
  const point = call.arguments[0] && unwrapParentheses(call.arguments[0]);
  const fn = point && ts.isIdentifier(point) ? declaringFunction(point) : undefined;
  if (point && ts.isIdentifier(point) && fn) {
    const initial = localInitializer(fn, point.text);
    const text = initial && looksLikePoint(initial, bindings) ? moduleLevelText(initial, bindings) : null;
    if (text !== null) return text;
  }
  if (point && looksLikePoint(point, bindings)) {
    const text = moduleLevelText(point, bindings);
    if (text !== null) return text;
  }
  const named = [...bindings.byLocalName.values()].filter((b) => b.constValue && isStartName(b.nameNode.text) && looksLikePoint(b.constValue, bindings));
  return named.length === 1 ? named[0].localName : null;
}
