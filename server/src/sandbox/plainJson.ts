// JSON of plain report data that ignores whatever user code put on the prototypes of
// its realm (an inherited toJSON, a replaced Object.keys). Runs inside the sandbox's
// context, where JSON.stringify would honour an inherited toJSON on any value.
// Every built-in it uses is captured when the runner loads, before user code runs.
const { apply } = Reflect;
const ownKeys = Object.keys;
const isArray = Array.isArray;
const replace = String.prototype.replace;
const charCodeAt = String.prototype.charCodeAt;
const numberToString = Number.prototype.toString;
const join = Array.prototype.join;
const push = Array.prototype.push;
const specialCharacters = /[\u0000-\u001f"\\]/g;
const escapes: Record<string, string> = { '"': '\\"', '\\': '\\\\', '\n': '\\n', '\r': '\\r', '\t': '\\t', '\b': '\\b', '\f': '\\f' };

function quote(text: string): string {
  const escaped = apply(replace, text, [
    specialCharacters,
    (c: string) => escapes[c] ?? '\\u' + ('0000' + apply(numberToString, apply(charCodeAt, c, [0]), [16])).slice(-4),
  ]) as string;
  return '"' + escaped + '"';
}

/** Like JSON.stringify for numbers, strings, booleans, null, arrays and plain objects (own keys only). */
export function plainJson(value: unknown): string {
  if (value === null || value === undefined) return 'null';
  switch (typeof value) {
    case 'number':
      return Number.isFinite(value) ? `${value}` : 'null';
    case 'boolean':
      return value ? 'true' : 'false';
    case 'string':
      return quote(value);
    case 'object': {
      const parts: string[] = [];
      if (isArray(value)) {
        for (let i = 0; i < value.length; i++) apply(push, parts, [plainJson(value[i])]);
        return '[' + apply(join, parts, [',']) + ']';
      }
      for (const key of ownKeys(value)) {
        const field = (value as Record<string, unknown>)[key];
        if (field !== undefined && typeof field !== 'function') apply(push, parts, [quote(key) + ':' + plainJson(field)]);
      }
      return '{' + apply(join, parts, [',']) + '}';
    }
    default:
      return 'null';
  }
}
