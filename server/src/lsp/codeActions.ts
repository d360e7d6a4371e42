// Quick fixes for Slopecheck's diagnostics: a safe learning rate, a verified gradient fix,
// a guessed @probe, and the skip directive.
import { CodeActionKind, type CodeAction, type Diagnostic, type Position, type TextEdit } from 'vscode-languageserver';
import type { PairOutcome } from '../check/checkDocument';
import { skipDirective } from '../discovery/conventions';
import { anchorOf } from '../discovery/pairing';
import type { DiscoveredPair, NamedSpan } from '../discovery/types';
import type { FindingCode } from '../engine/types';
import { diagnosticSource, type DiagnosticData } from './diagnostics';
import { gradientPatch, isFixable } from './gradientPatch';
import { probeInsertion } from './probeGuess';
import { applyReplacements, indentationAt, parseSource, type Replacement } from './sourceEdits';
import { describeDiagnosis, floorToSignificant } from '../shared/wording';

export interface CodeActionInput {
  uri: string;
  fileName: string;
  /** The document's current text; `pairs` were discovered in it. */
  text: string;
  pairs: DiscoveredPair[];
  positionAt(offset: number): Position;
  /** The diagnostics the client asks about. */
  diagnostics: Diagnostic[];
  outcome(objective: string): PairOutcome | null;
  /** True when the patched text makes the pair pass in the sandbox. */
  verify(patchedText: string, objective: string): Promise<boolean>;
}

const rateCodes = new Set<string>(['rate-aggressive', 'rate-divergent'] satisfies FindingCode[]);

export async function codeActions(input: CodeActionInput): Promise<CodeAction[]> {
  const actions: CodeAction[] = [];
  const skipOffered = new Set<DiscoveredPair>();
  for (const diagnostic of input.diagnostics) {
    if (diagnostic.source !== diagnosticSource) continue;
    const pair = pairOf(input.pairs, diagnostic, input);
    if (!pair) continue;
    const outcome = input.outcome(pair.key);
    const code = String(diagnostic.code);
    if (rateCodes.has(code)) {
      const action = safeRateAction(input, pair, outcome, diagnostic);
      if (action) actions.push(action);
    } else if (code === 'gradient-mismatch') {
      const action = await gradientFixAction(input, pair, outcome, diagnostic);
      if (action) actions.push(action);
    } else if (code === 'unknown-dimension') {
      const { replacement, dimension } = probeInsertion(parseSource(input.text, input.fileName), pair);
      actions.push(quickFix(`Add a @probe point with ${dimension} coordinates to ${pair.objective.name}`, input, [replacement], diagnostic, false));
    }
    if (!skipOffered.has(pair)) {
      skipOffered.add(pair);
      const anchor = anchorOf<NamedSpan>(pair);
      const { lineStart, indent } = indentationAt(input.text, anchor.declarationSpan.start);
      const edit = { start: lineStart, end: lineStart, newText: `${indent}// ${skipDirective}\n` };
      actions.push(quickFix(`Skip checking ${anchor.name} (// ${skipDirective})`, input, [edit], diagnostic, false));
    }
  }
  return actions;
}

/** The rate 1/L̂ rounded down to two significant figures, so it stays at or below the safe step. */
export function safeRateValue(safeStep: number): number {
  return floorToSignificant(safeStep, 2);
}

function safeRateAction(input: CodeActionInput, pair: DiscoveredPair, outcome: PairOutcome | null, diagnostic: Diagnostic): CodeAction | null {
  const safeStep = outcome?.report.smoothness?.safeStep;
  if (!pair.learningRate || safeStep === undefined || !(safeStep > 0) || !Number.isFinite(safeStep)) return null;
  const value = safeRateValue(safeStep);
  const span = pair.learningRate.valueSpan;
  return quickFix(`Set ${pair.learningRate.name} to ${value} (1/L̂ near the probes, rounded down)`, input, [{ start: span.start, end: span.end, newText: String(value) }], diagnostic, true);
}

async function gradientFixAction(input: CodeActionInput, pair: DiscoveredPair, outcome: PairOutcome | null, diagnostic: Diagnostic): Promise<CodeAction | null> {
  const diagnosis = outcome?.report.diagnosis ?? null;
  if (!pair.gradient || !isFixable(diagnosis)) return null;
  const replacements = gradientPatch(parseSource(input.text, input.fileName), pair.gradient.returnExpressions, diagnosis);
  if (!replacements) return null;
  if (!(await input.verify(applyReplacements(input.text, replacements), pair.key))) return null;
  return quickFix(`Fix ${pair.gradient.name}: ${describeDiagnosis(diagnosis)} (checked in the sandbox)`, input, replacements, diagnostic, true);
}

function quickFix(title: string, input: CodeActionInput, replacements: Replacement[], diagnostic: Diagnostic, isPreferred: boolean): CodeAction {
  const edits: TextEdit[] = replacements.map((r) => ({ range: { start: input.positionAt(r.start), end: input.positionAt(r.end) }, newText: r.newText }));
  return { title, kind: CodeActionKind.QuickFix, diagnostics: [diagnostic], isPreferred, edit: { changes: { [input.uri]: edits } } };
}

/** By the objective the diagnostic carries, else by the name it sits on. */
function pairOf(pairs: DiscoveredPair[], diagnostic: Diagnostic, input: CodeActionInput): DiscoveredPair | null {
  const objective = (diagnostic.data as Partial<DiagnosticData> | undefined)?.objective;
  if (objective) return pairs.find((p) => p.key === objective) ?? null;
  const { line, character } = diagnostic.range.start;
  return (
    pairs.find((p) =>
      [p.objective.nameSpan, p.gradient?.nameSpan, p.learningRate?.nameSpan].some((s) => s && input.positionAt(s.start).line === line && s.startCharacter === character),
    ) ?? null
  );
}
