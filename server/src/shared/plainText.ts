// Text that came from user code (names, messages, file paths), made safe to print on a
// terminal. Pure, so every text output (CLI, logs) can share it.

/**
 * Control characters (C0, DEL, C1: cursor moves, screen clears, window titles, erasing by
 * CR or backspace) and the marks that make a terminal show text in another order than it is
 * (bidi embeddings, overrides, isolates) or break a line (U+2028, U+2029).
 */
const unprintable = /[\p{Cc}\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/gu;

const shortEscapes: Record<string, string> = { '\n': '\\n', '\r': '\\r', '\t': '\\t' };

/**
 * `text` with every unprintable character written as a visible escape (`\n`, `\u001b`,
 * `\u202e`); ordinary Unicode (L̂, →, μ̂) is kept. The escapes are JSON's, so a line of
 * JSON text stays valid JSON with the same meaning.
 */
export function printableLine(text: string): string {
  return text.replace(unprintable, (c) => shortEscapes[c] ?? `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`);
}

/** Each line of `text` made printable, the line breaks between them kept (JSON and SARIF documents). */
export function printableLines(text: string): string {
  return text.split('\n').map(printableLine).join('\n');
}
