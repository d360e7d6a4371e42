// Which pair the cursor is on, from the editor's document symbols. Pure, so it is tested under node.
import type { PairListing } from '../../server/src/shared/protocol';

/** The parts of a vscode DocumentSymbol or SymbolInformation this needs. */
export interface SymbolLike {
  name: string;
  range?: LineRange;
  location?: { range: LineRange };
  children?: SymbolLike[];
}

interface LineRange {
  start: { line: number };
  end: { line: number };
}

export interface SymbolSpan {
  name: string;
  startLine: number;
  endLine: number;
}

/** Every symbol of the tree with its line span. */
export function symbolSpans(symbols: SymbolLike[]): SymbolSpan[] {
  return symbols.flatMap((symbol) => {
    const range = symbol.range ?? symbol.location?.range;
    const own = range ? [{ name: symbol.name, startLine: range.start.line, endLine: range.end.line }] : [];
    return [...own, ...symbolSpans(symbol.children ?? [])];
  });
}

/**
 * The pair whose objective or gradient encloses the line (the innermost such
 * symbol wins), else the pair whose objective is named on that very line.
 */
export function pairAtCursor(pairs: PairListing[], spans: SymbolSpan[], line: number): PairListing | undefined {
  const enclosing = spans
    .filter((s) => s.startLine <= line && line <= s.endLine)
    .sort((a, b) => a.endLine - a.startLine - (b.endLine - b.startLine));
  for (const span of enclosing) {
    const pair = pairs.find((p) => p.objective === span.name || p.gradient === span.name);
    if (pair) return pair;
  }
  return pairs.find((p) => p.line === line);
}
