// Shared helpers of the discovery tests.
import * as assert from 'node:assert/strict';
import { TextDocument } from 'vscode-languageserver-textdocument';
import { discoverPairs } from '../../server/src/discovery/discover';
import type { DiscoveredPair, DiscoveryResult, SourceSpan } from '../../server/src/discovery/types';

export { discoverPairs };

/** Joins lines with '\n', so tests read like the source they describe. */
export function source(...lines: string[]): string {
  return lines.join('\n') + '\n';
}

export function onlyPair(result: DiscoveryResult): DiscoveredPair {
  assert.equal(result.pairs.length, 1, `expected one pair, got ${result.pairs.map((p) => p.plan.label).join(', ')}`);
  return result.pairs[0];
}

/** Each pair as [value function, derivative], by the names the user knows them by (`loss`, `model.lossGrad`); null for a combined function. */
export function pairNames(result: DiscoveryResult): Array<[string, string | null]> {
  return result.pairs.map((pair) => [pair.objective.name, pair.gradient?.name ?? null]);
}

export function fileFindingCodes(result: DiscoveryResult): string[] {
  return result.fileFindings.map((finding) => finding.code);
}

export function findingCodes(pair: DiscoveredPair): string[] {
  return pair.findings.map((finding) => finding.code);
}

/**
 * Asserts that `span` covers exactly `needle` (its `occurrence`-th appearance in `text`), with line and
 * character as LSP counts them. The expected position comes from the LSP reference implementation of
 * text documents (Microsoft, vscode-languageserver-textdocument, `TextDocument.positionAt`), not from our code.
 */
export function assertSpanCovers(text: string, span: SourceSpan, needle: string, occurrence = 0): void {
  let start = -1;
  for (let i = 0; i <= occurrence; i++) start = text.indexOf(needle, start + 1);
  assert.ok(start >= 0, `needle not in text: ${needle}`);
  const end = start + needle.length;
  const document = TextDocument.create('untitled:test', 'typescript', 1, text);
  const from = document.positionAt(start);
  const to = document.positionAt(end);
  assert.deepEqual(span, {
    start,
    end,
    startLine: from.line,
    startCharacter: from.character,
    endLine: to.line,
    endCharacter: to.character,
    line: from.line + 1,
  });
  assert.equal(text.slice(span.start, span.end), needle);
}
