// Positions in source text, found by searching it, so expected ranges never come from the server.
export interface Position {
  line: number;
  /** UTF-16 code units, as LSP counts them and as JavaScript strings index. */
  character: number;
}
export interface Range {
  start: Position;
  end: Position;
}

export function positionAt(text: string, offset: number): Position {
  const lineStart = text.lastIndexOf('\n', offset - 1) + 1;
  return { line: text.slice(0, lineStart).split('\n').length - 1, character: offset - lineStart };
}

/** The range of `name` where it is declared: `export function name` or `export const name`. */
export function declaredName(text: string, name: string): Range {
  const declaration = new RegExp(`export (?:function|const) (${name})\\b`).exec(text);
  if (!declaration) throw new Error(`no exported declaration of ${name}`);
  const start = declaration.index + declaration[0].length - name.length;
  return { start: positionAt(text, start), end: positionAt(text, start + name.length) };
}
