// How to call a pair the way the file itself does: the values of the arguments after the
// point (a `@data` tag, a call in the file whose other arguments are module-level values,
// or default parameter values), and the user's own starting point (a const named like a
// start, or the point the file hands to its training loop or optimizer).
import * as ts from 'typescript';
import type { CallRecipe, DeclaredParameter, Finding } from '../engine/types';
import { declaredParameter } from './signatures';
import type { TypeDeclarations } from './typeShapes';
import { isStartName, tagNames } from './conventions';
import { unwrapParentheses, type FunctionNode, type ModuleBindings } from './exports';
import { pairFunctions, type PairMatch } from './pairing';
import { readImporterInvocation, documentNamespace, type ImporterEntry } from './importerCalls';
import type { SourceText } from './importers';
import { argumentsPassedFor, callsOf, declaringFunction, localInitializer, looksLikePoint, mentionsPair, moduleLevelText, pairSites } from './references';
import { spanOfNode } from './spans';
import { readTags } from './tags';
import type { SourceSpan } from './types';

export interface Invocation {
  /** Scope keys of the arguments after the point; null leaves one to its default. */
  extraArguments: Array<string | null>;
  /** The declared parameters those arguments go to, as far as their types say. */
  extraParameters: Array<DeclaredParameter | null>;
  /**
   * Set when the data come from a file that imports this one: that file is the bundle's entry,
   * and the functions are reached through the namespace it imports this document under.
   */
  entry: ImporterEntry | null;
  functionsViaEntry: Pick<CallRecipe, 'host' | 'value' | 'derivative'> | null;
  /** Scope key of the start point, or null. */
  start: string | null;
  /** Where each scope key was named, so a value that fails at run time is reported there. */
  keySpans: Record<string, SourceSpan>;
  findings: Finding[];
}

/** `dimension`: the number of coordinates the signature states, if it does; a start of another length is not this pair's. */
export function readInvocation(sourceFile: ts.SourceFile, bindings: ModuleBindings, types: TypeDeclarations, match: PairMatch, dimension: number | null, importers: () => readonly SourceText[]): Invocation {
  const invocation: Invocation = { extraArguments: [], extraParameters: [], entry: null, functionsViaEntry: null, start: null, keySpans: {}, findings: [] };
  const viaImporter = readExtraArguments(sourceFile, bindings, types, match, invocation, importers);
  readStart(sourceFile, bindings, match, dimension, invocation);
  if (viaImporter) {
    // Everything is now read in the importer's scope: its start, else this file's exported one.
    const ownStart = invocation.start !== null ? bindings.exported.find((e) => e.binding.localName === invocation.start)?.exportName : undefined;
    invocation.start = viaImporter.start ?? (ownStart !== undefined ? `${documentNamespace}.${ownStart}` : null);
    invocation.keySpans = {};
  }
  return invocation;
}

/** Fills in the extra arguments; returns the importer's invocation when they come from a file that imports this one. */
function readExtraArguments(sourceFile: ts.SourceFile, bindings: ModuleBindings, types: TypeDeclarations, match: PairMatch, invocation: Invocation, importers: () => readonly SourceText[]): ReturnType<typeof readImporterInvocation> {
  // The local function's parameters tell what is needed; an imported objective shows none.
  const fn = pairFunctions(match).map((c) => c.fn).find((f): f is FunctionNode => f !== null);
  if (!fn) return null;
  const extra = fn.parameters.slice(1).filter((p) => !p.dotDotDotToken);
  if (extra.length === 0) return null;
  invocation.extraParameters = extra.map((parameter) => declaredParameter(parameter, types));
  const optional = (index: number) => !!(extra[index].initializer || extra[index].questionToken);

  // 1. `@data a, b` on either function.
  for (const callable of pairFunctions(match)) {
    const tag = readTags(sourceFile, callable.docHost, tagNames.data)[0];
    if (!tag) continue;
    const names = tag.text.split(/[\s,]+/).filter((word) => word !== '');
    const unknown = names.find((name) => !bindings.byLocalName.has(name.split('.')[0]));
    if (unknown !== undefined || names.length === 0) {
      invocation.findings.push({ code: 'missing-argument', severity: 'error', subject: 'objective', message: `\`@data ${tag.text}\` on \`${callable.label}\` must name module-level values of this file${unknown ? `; there is no \`${unknown.split('.')[0]}\`` : ''}, e.g. /** @data trainX, trainY */.` });
      return null;
    }
    invocation.extraArguments = names;
    for (const name of names) invocation.keySpans[name] = tag.span;
    return null;
  }

  // 2. A call in the file whose other arguments are module-level values (a training loop, a test),
  //    directly or through the parameters of the function around the call.
  for (const callable of pairFunctions(match)) {
    for (const call of callsOf(sourceFile, match.group, callable)) {
      const given = call.arguments.slice(1, 1 + extra.length);
      if (given.some(ts.isSpreadElement)) continue;
      const values = given.map((argument) => moduleLevelArgument(argument, bindings));
      if (values.some((value) => value === null)) continue;
      if (extra.some((_, index) => index >= values.length && !optional(index))) continue;
      invocation.extraArguments = values.map((value) => value!.text);
      for (const value of values) invocation.keySpans[value!.text] = spanOfNode(sourceFile, value!.node);
      return null;
    }
  }

  // 3. Default values: the call leaves them out.
  if (extra.every((_, index) => optional(index))) return null;

  // 4. A workspace file that imports this one and calls the pair with its own module-level values.
  const viaImporter = readImporterInvocation(match, sourceFile.fileName, extra.length, optional, importers());
  if (viaImporter) {
    invocation.entry = viaImporter.entry;
    invocation.extraArguments = viaImporter.recipe.extraArguments;
    invocation.functionsViaEntry = { host: viaImporter.recipe.host, value: viaImporter.recipe.value, derivative: viaImporter.recipe.derivative };
    return viaImporter;
  }
  const missing = extra.filter((_, index) => !optional(index)).map((p) => `\`${p.name.getText()}\``);
  invocation.findings.push({
    code: 'missing-argument',
    severity: 'info',
    subject: 'objective',
    message:
      `\`${match.objective.label}\` takes ${missing.join(', ')} after the point, and Slopecheck found no value for ${missing.length === 1 ? 'it' : 'them'}, so the pair was not checked. ` +
      `Name module-level values with a tag, e.g. /** @data ${extra.map((p) => p.name.getText()).join(', ')} */, call it once in this file or in a workspace file that imports it with module-level values (as a training loop does), or give the parameter a default value.`,
  });
  return null;
}

/** Number of coordinates when the text says it (`[1, 2, 3]`, `new Float64Array([…])`), else null. */
function staticLength(expression: ts.Expression): number | null {
  const node = unwrapParentheses(expression);
  if (ts.isArrayLiteralExpression(node) && !node.elements.some(ts.isSpreadElement)) return node.elements.length;
  if ((ts.isNewExpression(node) || ts.isCallExpression(node)) && node.arguments?.length === 1) {
    const argument = unwrapParentheses(node.arguments[0]);
    if (ts.isArrayLiteralExpression(argument)) return staticLength(argument);
  }
  return null;
}

function readStart(sourceFile: ts.SourceFile, bindings: ModuleBindings, match: PairMatch, dimension: number | null, invocation: Invocation): void {
  const fits = (expression: ts.Expression) => dimension === null || staticLength(expression) === null || staticLength(expression) === dimension;
  const linked = linkedStarts(sourceFile, bindings, match);

  // 1. A module-level const named like a start (`x0`, `w0`, `initialGuess`, `startPose`).
  // `exports.x0 = […]` goes by its property name.
  const named = [...bindings.byLocalName.values()].filter((b) => b.constValue && isStartName(b.nameNode.text) && looksLikePoint(b.constValue, bindings) && fits(b.constValue));
  const chosen = named.length === 1 ? named[0] : named.find((b) => linked.some((l) => l.text === b.localName || new RegExp(`\\b${b.localName}\\b`).test(l.text)));
  if (chosen) {
    invocation.start = chosen.localName;
    invocation.keySpans[chosen.localName] = spanOfNode(sourceFile, chosen.nameNode);
    return;
  }
  // 2. The point the file passes to its optimizer or starts its training loop from.
  const first = linked[0];
  if (first) {
    invocation.start = first.text;
    invocation.keySpans[first.text] = spanOfNode(sourceFile, first.node);
  }
}

/**
 * Points the file starts this pair from, in document order: point-like arguments of a call
 * that is handed the pair's functions (`minimize(loss, lossGrad, [1, 1])`), and the
 * initial value of the point a training loop passes to them (`let w = x0.slice()`).
 */
function linkedStarts(sourceFile: ts.SourceFile, bindings: ModuleBindings, match: PairMatch): Array<{ text: string; node: ts.Node }> {
  const found: Array<{ text: string; node: ts.Node }> = [];
  const add = (expression: ts.Expression) => {
    if (!looksLikePoint(expression, bindings)) return;
    const text = moduleLevelText(expression, bindings);
    if (text !== null && !found.some((f) => f.text === text)) found.push({ text, node: expression });
  };
  for (const site of pairSites(sourceFile, match)) {
    const node = site.node;
    if (site.kind === 'call') {
      // A training loop: the point's own initial value in the function that declares it (the
      // call may sit in an arrow inside it: `w.map((v, i) => v - lr * grad(w)[i])`).
      const point = node.arguments[0] && unwrapParentheses(node.arguments[0]);
      if (point && ts.isIdentifier(point)) {
        const fn = declaringFunction(point);
        const initial = fn && localInitializer(fn, point.text);
        if (initial) add(initial);
        // `function fit(start) { let w = start.slice(); … }` called as `fit([5.5, 20])`: the caller's point.
        const source = initial ? copiedFrom(initial) : point;
        if (source) for (const passed of passedFor(source)) add(passed);
      }
    } else {
      for (const argument of node.arguments) if (!mentionsPair(argument, match)) add(argument);
    }
  }
  return found;
}

/** What the file's calls pass for `name` when a function around it takes it as a parameter. */
function passedFor(name: ts.Identifier): ts.Expression[] {
  const fn = declaringFunction(name);
  return fn ? argumentsPassedFor(fn, name.text) : [];
}

/**
 * The module-level value an argument of a call stands for: the argument itself, or, when it is a
 * parameter of a function around the call (`function fit(run) { … grad(w, run) … }`), the first
 * module-level value a call of that function passes for it (`fit(coolingRun)`).
 */
function moduleLevelArgument(argument: ts.Expression, bindings: ModuleBindings): { text: string; node: ts.Node } | null {
  const text = moduleLevelText(argument, bindings);
  if (text !== null) return { text, node: argument };
  const node = unwrapParentheses(argument);
  if (!ts.isIdentifier(node)) return null;
  for (const passed of passedFor(node)) {
    const passedText = moduleLevelText(passed, bindings);
    if (passedText !== null) return { text: passedText, node: passed };
  }
  return null;
}

/** The name a point is copied from: `start.slice()`, `[...start]`, `Array.from(start)`, `Float64Array.from(start)`, `start`. */
function copiedFrom(expression: ts.Expression): ts.Identifier | undefined {
  const node = unwrapParentheses(expression);
  if (ts.isIdentifier(node)) return node;
  if (ts.isArrayLiteralExpression(node) && node.elements.length === 1 && ts.isSpreadElement(node.elements[0])) return copiedFrom(node.elements[0].expression);
  if (ts.isCallExpression(node) && ts.isPropertyAccessExpression(node.expression)) {
    const method = node.expression.name.text;
    if (['slice', 'concat', 'map'].includes(method)) return copiedFrom(node.expression.expression);
    if (method === 'from' && node.arguments.length >= 1) return copiedFrom(node.arguments[0]);
  }
  if (ts.isNewExpression(node) && node.arguments?.length === 1) return copiedFrom(node.arguments[0]);
  return undefined;
}
