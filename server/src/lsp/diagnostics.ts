// Turns a document's check into LSP diagnostics: one per pair and finding code,
// with per-probe repeats merged into one message that says how often they were seen.
import { DiagnosticSeverity, type Diagnostic, type DiagnosticRelatedInformation, type Range } from 'vscode-languageserver';
import { findingSpan, sameFile, type DocumentCheck, type PairOutcome } from '../check/checkDocument';
import { findingHelpUrl } from '../check/codes';
import type { SourceSpan } from '../discovery/types';
import type { Finding, Severity } from '../engine/types';
import { kindWording } from '../engine/kindWording';
import { matrixMismatchMessage, mismatchMessage } from '../engine/wording';

export const diagnosticSource = 'slopecheck';

/** What code actions need to find the pair a diagnostic belongs to. */
export interface DiagnosticData {
  objective: string;
}

export interface DiagnosticContext {
  uri: string;
  /** The text the check ran on: for placing runtime errors on their line. */
  text: string;
  /** The client shows related information (publishDiagnostics.relatedInformation). */
  relatedInformation: boolean;
  /** URL of the README the codes link to (shippedReadmeUrl). */
  readme: string;
}

const severities: Record<Severity, DiagnosticSeverity> = {
  error: DiagnosticSeverity.Error,
  warning: DiagnosticSeverity.Warning,
  info: DiagnosticSeverity.Information,
};

export function toDiagnostics(check: DocumentCheck, context: DiagnosticContext): Diagnostic[] {
  const diagnostics = check.fileFindings.map((finding) => diagnostic(finding, finding.message, toRange(finding.span), context.readme));
  for (const outcome of check.pairs) diagnostics.push(...pairDiagnostics(check.fileName, outcome, context));
  return diagnostics;
}

function pairDiagnostics(fileName: string, outcome: PairOutcome, context: DiagnosticContext): Diagnostic[] {
  const groups = new Map<string, { range: Range; findings: Finding[] }>();
  for (const finding of outcome.report.findings) {
    const range = findingRange(fileName, outcome, finding, context.text);
    const key = `${finding.code}@${range.start.line}:${range.start.character}`;
    const group = groups.get(key) ?? groups.set(key, { range, findings: [] }).get(key)!;
    group.findings.push(finding);
  }
  return [...groups.values()].map(({ range, findings }) => {
    const lead = worstFinding(outcome, findings);
    const message = lead.code === kindWording[outcome.pair.kind].mismatchCode ? mismatchDiagnostic(outcome, lead, findings) : withRepeats(lead.message, findings, outcome);
    const result = diagnostic(lead, message, range, context.readme);
    result.data = { objective: outcome.pair.key } satisfies DiagnosticData;
    if (context.relatedInformation) {
      const related = relatedInformation(outcome, lead, context.uri);
      if (related.length > 0) result.relatedInformation = related;
    }
    return result;
  });
}

function diagnostic(finding: Finding, message: string, range: Range, readme: string): Diagnostic {
  return {
    range,
    severity: severities[finding.severity],
    source: diagnosticSource,
    code: finding.code,
    codeDescription: { href: findingHelpUrl(finding.code, readme) },
    message,
  };
}

/** The user's throwing line (without its indentation) when it is in this document, else the finding's name. */
function findingRange(fileName: string, outcome: PairOutcome, finding: Finding, text: string): Range {
  const location = finding.location;
  if (location && sameFile(location.file, fileName)) {
    const lines = text.split('\n');
    const line = Math.min(Math.max(location.line - 1, 0), lines.length - 1);
    const content = lines[line].replace(/\r$/, '');
    const indent = content.length - content.trimStart().length;
    return { start: { line, character: indent }, end: { line, character: content.trimEnd().length } };
  }
  return toRange(findingSpan(outcome.pair, finding));
}

export function toRange(span: SourceSpan): Range {
  return { start: { line: span.startLine, character: span.startCharacter }, end: { line: span.endLine, character: span.endCharacter } };
}

/** The finding seen at the probe with the largest relative error (the first when none is larger). */
function worstFinding(outcome: PairOutcome, findings: Finding[]): Finding {
  const errorAt = (finding: Finding) => (finding.probeIndex === undefined ? 0 : (outcome.report.probes[finding.probeIndex]?.maxRelError ?? 0));
  return findings.reduce((a, b) => (errorAt(b) > errorAt(a) ? b : a));
}

/** The worst probe's mismatch in the user's names, and how many probes saw it. */
function mismatchDiagnostic(outcome: PairOutcome, worst: Finding, findings: Finding[]): string {
  const { pair, report } = outcome;
  const probe = worst.probeIndex === undefined ? undefined : report.probes[worst.probeIndex];
  if (!probe) return withRepeats(worst.message, findings, outcome);
  const wording = kindWording[pair.kind];
  const names = { gradient: pair.gradient?.name ?? `the ${wording.derivative} of ${pair.objective.name}`, objective: pair.objective.name };
  const message = report.matrix ? matrixMismatchMessage(probe, worst.probeIndex!, report.matrix.diagnosis, wording, names) : mismatchMessage(probe, worst.probeIndex!, report.diagnosis, names);
  return `${message}${seenAt(findings, outcome)}`;
}

function withRepeats(message: string, findings: Finding[], outcome: PairOutcome): string {
  return findings.length > 1 ? `${message}${seenAt(findings, outcome)}` : message;
}

function seenAt(findings: Finding[], outcome: PairOutcome): string {
  const probes = new Set(findings.flatMap((f) => (f.probeIndex === undefined ? [] : [f.probeIndex])));
  const total = outcome.report.probes.length;
  // One probe checked says nothing more: the check stops at the first probe with a mismatch.
  if (probes.size === 0 || total <= 1) return '';
  return ` Seen at ${probes.size} of ${total} probes.`;
}

/** The other half of the pair, and the probe tag the finding was seen at. */
function relatedInformation(outcome: PairOutcome, finding: Finding, uri: string): DiagnosticRelatedInformation[] {
  const { pair } = outcome;
  const related: DiagnosticRelatedInformation[] = [];
  const at = (span: SourceSpan, message: string) => related.push({ location: { uri, range: toRange(span) }, message });
  const wording = kindWording[pair.kind];
  if (finding.subject === 'gradient' || finding.subject === 'learningRate') at(pair.objective.nameSpan, `${wording.value} ${pair.objective.name}`);
  if (finding.subject !== 'gradient' && pair.gradient) at(pair.gradient.nameSpan, `${wording.derivative} ${pair.gradient.name}`);
  const tags = pair.objective.probeTags;
  if (finding.probeIndex !== undefined && tags.length > 0) {
    // Tags and probes line up one to one only when every probe came from its own tag.
    const tag = tags.length === outcome.report.probes.length ? tags[finding.probeIndex] : tags[0];
    if (tag) at(tag, `probe ${finding.probeIndex + 1}`);
  }
  return related;
}
