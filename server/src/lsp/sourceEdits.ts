// Small helpers for edits computed on the document's text with the TypeScript parser.
import * as ts from 'typescript';
import type { SourceSpan } from '../discovery/types';

/** A replacement of text[start, end) by newText, in offsets of the text it was computed on. */
export interface Replacement {
  start: number;
  end: number;
  newText: string;
}

export function parseSource(text: string, fileName: string): ts.SourceFile {
  const kind = /\.(m|c)?jsx?$/i.test(fileName) ? ts.ScriptKind.JS : ts.ScriptKind.TS;
  return ts.createSourceFile(fileName, text, ts.ScriptTarget.Latest, true, kind);
}

/** The outermost node that spans exactly `span` (as discovery measured it, without leading trivia). */
export function nodeAtSpan(sourceFile: ts.SourceFile, span: Pick<SourceSpan, 'start' | 'end'>): ts.Node | null {
  let found: ts.Node | null = null;
  const visit = (node: ts.Node): void => {
    if (found || node.getStart(sourceFile) > span.start || node.end < span.end) return;
    if (node.getStart(sourceFile) === span.start && node.end === span.end) {
      found = node;
      return;
    }
    ts.forEachChild(node, visit);
  };
  ts.forEachChild(sourceFile, visit);
  return found;
}

export function applyReplacements(text: string, replacements: Replacement[]): string {
  const sorted = [...replacements].sort((a, b) => b.start - a.start);
  return sorted.reduce((result, r) => result.slice(0, r.start) + r.newText + result.slice(r.end), text);
}

/** Leading whitespace of the line that holds `offset`. */
export function indentationAt(text: string, offset: number): { lineStart: number; indent: string } {
  const lineStart = text.lastIndexOf('\n', offset - 1) + 1;
  const indent = /^[ \t]*/.exec(text.slice(lineStart))![0];
  return { lineStart, indent };
}
