// Entry point of discovery: finds objective/gradient pairs in one document's text, with the
// probe points, dimension and learning rate to check them with. Parses the text as given
// (an unsaved buffer works) and never reads the disk or runs user code.
import * as ts from 'typescript';
import type { Finding } from '../engine/types';
import { collectBindings, type ModuleBindings } from './exports';
import { assignLearningRates } from './learningRate';
import { matchPairs, type MatchedFunction, type PairMatch } from './pairing';
import { readProbeTags, settleDimension } from './probes';
import { returnedExpressions } from './returns';
import { hasSkipDirective } from './skip';
import { spanOfNode, spanOfRange } from './spans';
import { collectTypeDeclarations, firstParameterType, isFloat64ArrayType, tupleLength, type TypeDeclarations } from './typeShapes';
import type { DiscoveredPair, DiscoveryResult, NamedSpan } from './types';

export function discoverPairs(text: string, fileName: string): DiscoveryResult {
  const sourceFile = ts.createSourceFile(fileName, text, ts.ScriptTarget.Latest, true, scriptKindOf(fileName));
  const bindings = collectBindings(sourceFile);
  const types = collectTypeDeclarations(sourceFile);
  const paired = matchPairs(sourceFile, bindings, types);
  const learningRates = assignLearningRates(sourceFile, bindings, paired.matches);
  const pairs = paired.matches.map((match) => describePair(sourceFile, bindings, types, match, learningRates.rates.get(match) ?? null));
  return { pairs, fileFindings: [...syntaxErrors(sourceFile), ...paired.fileFindings, ...learningRates.fileFindings] };
}

function describePair(
  sourceFile: ts.SourceFile,
  bindings: ModuleBindings,
  types: TypeDeclarations,
  match: PairMatch,
  learningRate: DiscoveredPair['learningRate'],
): DiscoveredPair {
  const { objective, gradient } = match;
  const parameterType = firstParameterType(objective.binding.fn!);
  const hosts = [objective.binding.docHost, ...(gradient ? [gradient.binding.docHost] : [])];
  const probes = readProbeTags(sourceFile, hosts, bindings);
  const settled = settleDimension(tupleLength(parameterType, types), probes);
  const findings: Finding[] = [...match.findings, ...probes.findings, ...settled.findings];
  if (probes.probes.length === 0 && probes.probeExports.length === 0 && settled.dimension === null) {
    findings.push(unknownDimension(objective.name));
  }
  return {
    objective: { ...namedSpan(sourceFile, objective), probeTags: probes.tagSpans },
    gradient: gradient
      ? { ...namedSpan(sourceFile, gradient), returnExpressions: returnedExpressions(gradient.binding.fn!).map((e) => spanOfNode(sourceFile, e)) }
      : null,
    learningRate,
    matchedBy: match.matchedBy,
    skipped: hasSkipDirective(sourceFile, objective.binding.statement),
    plan: {
      objective: objective.name,
      gradient: gradient?.name ?? null,
      combined: match.combined,
      argumentKind: isFloat64ArrayType(parameterType, types) ? 'float64array' : 'array',
      probes: probes.probes,
      probeExports: probes.probeExports,
      dimension: settled.dimension,
      learningRate: learningRate ? { name: learningRate.name, value: learningRate.value } : null,
    },
    findings,
  };
}

function namedSpan(sourceFile: ts.SourceFile, matched: MatchedFunction): NamedSpan {
  return {
    name: matched.name,
    nameSpan: spanOfNode(sourceFile, matched.binding.nameNode),
    declarationSpan: spanOfNode(sourceFile, matched.binding.statement),
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
      'or state the length with /** @dimension 3 */.',
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
