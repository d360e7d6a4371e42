// Reading our JSDoc tags (`@probe`, `@gradientOf`, …). Works the same in .ts and .js files.
import * as ts from 'typescript';
import { spanOfTag } from './spans';
import type { SourceSpan } from './types';

export interface TagReading {
  /** The tag's text after its name, trimmed; the comment's `*` margins are already gone. */
  text: string;
  span: SourceSpan;
}

/** Every tag named `tagName` in the JSDoc of `host` (a function or variable declaration). */
export function readTags(sourceFile: ts.SourceFile, host: ts.Node, tagName: string): TagReading[] {
  return ts
    .getJSDocTags(host)
    .filter((tag) => tag.tagName.text === tagName)
    .map((tag) => ({ text: (ts.getTextOfJSDocComment(tag.comment) ?? '').trim(), span: spanOfTag(sourceFile, tag) }));
}

export function hasTag(host: ts.Node, tagName: string): boolean {
  return ts.getJSDocTags(host).some((tag) => tag.tagName.text === tagName);
}

/** First word of a tag's text: `@gradientOf loss — the mean loss` names `loss`. */
export function firstWord(text: string): string {
  return text.split(/\s+/)[0] ?? '';
}
