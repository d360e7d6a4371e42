// SourceSpan construction. Positions are UTF-16 offsets into the text as given,
// which is what both TypeScript and LSP count in.
import * as ts from 'typescript';
import type { SourceSpan } from './types';

export function spanOfRange(sourceFile: ts.SourceFile, start: number, end: number): SourceSpan {
  const from = sourceFile.getLineAndCharacterOfPosition(start);
  const to = sourceFile.getLineAndCharacterOfPosition(end);
  return {
    start,
    end,
    startLine: from.line,
    startCharacter: from.character,
    endLine: to.line,
    endCharacter: to.character,
    line: from.line + 1,
  };
}

/** The node's own text: leading comments and JSDoc are left out. */
export function spanOfNode(sourceFile: ts.SourceFile, node: ts.Node): SourceSpan {
  return spanOfRange(sourceFile, node.getStart(sourceFile), node.end);
}

/** A JSDoc tag from its `@` to the last character of its text (the comment's `*` margins are trimmed). */
export function spanOfTag(sourceFile: ts.SourceFile, tag: ts.JSDocTag): SourceSpan {
  const raw = sourceFile.text.slice(tag.pos, tag.end);
  const trimmed = raw.replace(/[\s*]+$/, '');
  return spanOfRange(sourceFile, tag.pos, tag.pos + trimmed.length);
}
