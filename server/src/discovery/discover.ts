// Entry point of discovery: finds check targets in one document's text — each a value
// function with its derivative, how to call them (host object, data arguments, start point)
// and the learning rate to judge. Parses the text as given (an unsaved buffer works) and
// never reads the disk or runs user code.
import * as ts from 'typescript';
import type { CallRecipe, Finding } from '../engine/types';
import { collectCallables, type Callable } from './callables';
import { collectBindings, type ModuleBindings } from './exports';
import type { SourceText } from './importers';
import { readInvocation } from './invocation';
import { assignLearningRates, planRate } from './learningRate';
import { anchorOf, matchPairs, type PairMatch } from './pairing';
import { readProbeTags, settleDimension } from './probes';
import { returnedExpressions } from './returns';
import { hasSkipDirective } from './skip';
import { spanOfNode, spanOfRange } from './spans';
import { collectTypeDeclarations, firstParameterType, isFloat64ArrayType, tupleLength, type TypeDeclarations } from './typeShapes';
import type { DiscoveredPair, DiscoveryResult, NamedSpan } from './types';

/**
 * `importers` lists the workspace files that import this one; it is asked only when a pair
 * takes data that this file does not supply.
 */
export function discoverPairs(text: string, fileName: string, importers: () => readonly SourceText[] = () => []): DiscoveryResult {
  const sourceFile = ts.createSourceFile(fileName, text, ts.ScriptTarget.Latest, true, scriptKindOf(fileName));
  const bindings = collectBindings(sourceFile);
  const types = collectTypeDeclarations(sourceFile);
  const paired = matchPairs(sourceFile, collectCallables(bindings), types);
  // A rate belongs to descent on an objective: a gradient's, or ½‖r‖² of a Jacobian's residuals.
  const learningRates = assignLearningRates(sourceFile, bindings, paired.matches.filter((m) => m.kind === 'gradient' || m.kind === 'jacobian'));
  let known: readonly SourceText[] | null = null;
  const importersOnce = () => (known ??= importers());
  const pairs = paired.matches.map((match) => describePair(sourceFile, bindings, types, match, learningRates.rates.get(match) ?? null, importersOnce));
  linkResiduals(paired.matches, pairs);
  inheritProbes(paired.matches, pairs);
  return { pairs, fileFindings: [...syntaxErrors(sourceFile), ...paired.fileFindings, ...learningRates.fileFindings] };
}

function describePair(
  sourceFile: ts.SourceFile,
  bindings: ModuleBindings,
  types: TypeDeclarations,
  match: PairMatch,
  learningRate: DiscoveredPair['learningRate'],
  importers: () => readonly SourceText[],
): DiscoveredPair {
  const { objective, gradient, group } = match;
  // The signature that shows the parameter: the objective's, or for an imported objective the derivative's.
  const signature = (objective.fn ?? gradient?.fn)!;
  const parameterType = signature ? firstParameterType(signature) : undefined;
  const hosts = [objective.docHost, ...(gradient ? [gradient.docHost] : [])];
  const probes = readProbeTags(sourceFile, hosts, bindings);
  const settled = settleDimension(tupleLength(parameterType, types), probes);
  const invocation = readInvocation(sourceFile, bindings, types, match, settled.dimension, importers);
  const findings: Finding[] = [...match.findings, ...probes.findings, ...settled.findings, ...invocation.findings];
  const hasProbes = probes.probes.length > 0 || probes.probeKeys.length > 0;
  if (!hasProbes && invocation.start === null && settled.dimension === null) findings.push(unknownDimension(objective.label));
  const recipeSpans = { ...invocation.keySpans };
  if (group.host && !invocation.entry) recipeSpans[group.host.key] = spanOfNode(sourceFile, group.host.binding.nameNode);
  const recipe: CallRecipe = {
    ...(invocation.functionsViaEntry ?? {
      host: group.host ? { key: group.host.key, construct: group.host.construct } : null,
      value: objective.name,
      derivative: gradient?.name ?? null,
    }),
    split: match.split,
    extraArguments: invocation.extraArguments,
    ...(invocation.extraArguments.length > 0 ? { extraParameters: invocation.extraParameters.slice(0, invocation.extraArguments.length) } : {}),
  };
  return {
    kind: match.kind,
    key: anchorOf(match).label,
    ...(match.gradientPair ? { gradientPair: anchorOf(match.gradientPair).label } : {}),
    objective: { ...namedSpan(sourceFile, objective), probeTags: probes.tagSpans },
    gradient: gradient
      ? { ...namedSpan(sourceFile, gradient), returnExpressions: gradient.fn ? returnedExpressions(gradient.fn).map((e) => spanOfNode(sourceFile, e)) : [] }
      : null,
    learningRate,
    matchedBy: match.matchedBy,
    recipeSpans,
    entry: invocation.entry,
    skipped: hasSkipDirective(sourceFile, anchorOf(match).declaration as ts.Statement),
    plan: {
      kind: match.kind,
      label: objective.label,
      recipe,
      argumentKind: isFloat64ArrayType(parameterType, types) ? 'float64array' : 'array',
      probes: probes.probes,
      probeKeys: probes.probeKeys,
      start: hasProbes ? null : invocation.start,
      dimension: settled.dimension,
      learningRate: planRate(learningRate),
    },
    findings,
  };
}

/**
 * A gradient pair whose objective calls the residual function of a Jacobian target of the same
 * group gets that target's recipe, so the check compares ∇f with Jᵀr (both run from one bundle).
 */
function linkResiduals(matches: PairMatch[], pairs: DiscoveredPair[]): void {
  matches.forEach((match, index) => {
    const objective = match.objective.fn;
    if (match.kind !== 'gradient' || !objective || pairs[index].entry) return;
    const source = matches.findIndex((m) => m.kind === 'jacobian' && m.group === match.group && !pairs[matches.indexOf(m)].entry && calls(objective, m.objective.name));
    if (source >= 0) pairs[index].plan.residuals = pairs[source].plan.recipe;
  });
}

/**
 * A Hessian or product is checked where its gradient pair is: the pair's probes, start and
 * dimension, when it has none of its own (a `@probe` sits above the objective, not the Hessian).
 */
function inheritProbes(matches: PairMatch[], pairs: DiscoveredPair[]): void {
  matches.forEach((match, index) => {
    if (!match.gradientPair) return;
    const own = pairs[index];
    const pair = pairs[matches.indexOf(match.gradientPair)];
    if (own.plan.probes.length > 0 || own.plan.probeKeys.length > 0 || own.plan.start !== null || own.entry || pair.entry) return;
    own.plan = { ...own.plan, probes: pair.plan.probes, probeKeys: pair.plan.probeKeys, start: pair.plan.start, dimension: own.plan.dimension ?? pair.plan.dimension };
    own.recipeSpans = { ...pair.recipeSpans, ...own.recipeSpans };
    own.findings = own.findings.filter((finding) => finding.code !== 'unknown-dimension' || (own.plan.dimension === null && own.plan.probes.length === 0 && own.plan.probeKeys.length === 0 && own.plan.start === null));
  });
}

/** `name(…)`, `this.name(…)` or `host.name(…)` somewhere in the function's body. */
function calls(fn: ts.Node, name: string): boolean {
  const visit = (node: ts.Node): boolean => {
    if (ts.isCallExpression(node)) {
      const callee = node.expression;
      if ((ts.isIdentifier(callee) && callee.text === name) || (ts.isPropertyAccessExpression(callee) && callee.name.text === name)) return true;
    }
    return ts.forEachChild(node, visit) ?? false;
  };
  return visit(fn);
}

function namedSpan(sourceFile: ts.SourceFile, callable: Callable): NamedSpan {
  return {
    name: callable.label,
    nameSpan: spanOfNode(sourceFile, callable.nameNode),
    declarationSpan: spanOfNode(sourceFile, callable.declaration),
  };
}

function unknownDimension(objective: string): Finding {
  return {
    code: 'unknown-dimension',
    severity: 'info',
    subject: 'objective',
    message:
      `Slopecheck does not know how many coordinates \`${objective}\` takes, so it has no point to check at. ` +
      'Add a probe point in a JSDoc comment above it, e.g. /** @probe [0.5, -1, 2] */, give its parameter a tuple type such as [number, number], ' +
      'declare a start point as a module-level const such as `const x0 = [0.5, -1, 2]`, or state the length with /** @dimension 3 */.',
  };
}

function syntaxErrors(sourceFile: ts.SourceFile): DiscoveryResult['fileFindings'] {
  // parseDiagnostics is internal but stable; a lone source file has no other diagnostics.
  const diagnostics: readonly ts.DiagnosticWithLocation[] = (sourceFile as unknown as { parseDiagnostics?: ts.DiagnosticWithLocation[] }).parseDiagnostics ?? [];
  return diagnostics.map((diagnostic) => ({
    code: 'syntax-error',
    severity: 'error',
    // Findings need a subject; a syntax error belongs to no pair, so it goes with the objectives.
    subject: 'objective',
    message: ts.flattenDiagnosticMessageText(diagnostic.messageText, '\n'),
    span: spanOfRange(sourceFile, diagnostic.start, diagnostic.start + diagnostic.length),
  }));
}

function scriptKindOf(fileName: string): ts.ScriptKind {
  const extension = /\.[^./\\]+$/.exec(fileName)?.[0].toLowerCase();
  switch (extension) {
    case '.js':
    case '.mjs':
    case '.cjs':
      return ts.ScriptKind.JS;
    case '.jsx':
      return ts.ScriptKind.JSX;
    case '.tsx':
      return ts.ScriptKind.TSX;
    default:
      return ts.ScriptKind.TS;
  }
}
