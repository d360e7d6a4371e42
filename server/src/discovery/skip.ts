// The `// slopecheck-skip` directive: a line comment directly above an objective's
// declaration (above or below its JSDoc) tells the checker to leave that pair alone.
import * as ts from 'typescript';
import { skipDirective } from './conventions';

/**
 * True when the comments directly above `statement` (no blank line between them and it)
 * include `// slopecheck-skip`, optionally followed by a reason.
 */
export function hasSkipDirective(sourceFile: ts.SourceFile, statement: ts.Statement): boolean {
  const text = sourceFile.text;
  const comments = ts.getLeadingCommentRanges(text, statement.pos) ?? [];
  let next = statement.getStart(sourceFile);
  // Walk back from the declaration through the comments that touch it, one line apart at most.
  for (let i = comments.length - 1; i >= 0; i--) {
    const comment = comments[i];
    if (/\n[ \t\r]*\n/.test(text.slice(comment.end, next))) break;
    const body = text.slice(comment.pos, comment.end);
    if (comment.kind === ts.SyntaxKind.SingleLineCommentTrivia && isSkipComment(body)) return true;
    next = comment.pos;
  }
  return false;
}

/** `// slopecheck-skip`, alone or followed by a reason; `// slopecheck-skipped` does not count. */
function isSkipComment(body: string): boolean {
  const words = body.replace(/^\/\/\s*/, '');
  return words.startsWith(skipDirective) && !/^[\w-]/.test(words.slice(skipDirective.length));
}
