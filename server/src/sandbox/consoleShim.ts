// The `console` user code sees inside the sandbox: it collects lines instead of
// printing them, with a cap so a chatty loop cannot flood the host.
// Runs inside the vm context; no Node APIs.

import { plainJson } from './plainJson';
import { reportLimits } from './reportLimits';

// plainJson captures its built-ins before user code runs and ignores an inherited toJSON,
// so a module that pollutes its realm cannot break the hand-over.
const stringify = plainJson;

const maxLines = reportLimits.consoleLines;
const maxBytes = reportLimits.consoleLength;
const maxLineLength = reportLimits.consoleLineLength;
const maxItems = 20;

const lines: string[] = [];
let bytes = 0;
let truncated = false;

function record(line: string): void {
  if (truncated) return;
  const clipped = line.length > maxLineLength ? `${line.slice(0, maxLineLength)}…` : line;
  if (lines.length >= maxLines || bytes + clipped.length > maxBytes) {
    truncated = true;
    return;
  }
  lines.push(clipped);
  bytes += clipped.length;
}

/** Roughly what console.log shows: strings bare at the top level, quoted inside containers. */
function format(value: unknown, depth: number): string {
  switch (typeof value) {
    case 'string':
      return depth === 0 ? value : `'${value}'`;
    case 'bigint':
      return `${value}n`;
    case 'function':
      return `[Function: ${value.name || '(anonymous)'}]`;
    case 'object':
      return value === null ? 'null' : formatObject(value, depth);
    default:
      return String(value);
  }
}

function formatObject(value: object, depth: number): string {
  if (value instanceof Error) return value.stack ?? `${value.name}: ${value.message}`;
  const isList = Array.isArray(value) || (ArrayBuffer.isView(value) && !(value instanceof DataView));
  if (depth >= 2) return isList ? '[Array]' : '[Object]';
  if (isList) {
    const items = Array.from(value as ArrayLike<unknown>);
    const shown = items.slice(0, maxItems).map((item) => format(item, depth + 1));
    if (items.length > maxItems) shown.push(`… ${items.length - maxItems} more`);
    return `[ ${shown.join(', ')} ]`;
  }
  const keys = Object.keys(value);
  const shown = keys.slice(0, maxItems).map((key) => `${key}: ${format((value as Record<string, unknown>)[key], depth + 1)}`);
  if (keys.length > maxItems) shown.push(`… ${keys.length - maxItems} more`);
  return `{ ${shown.join(', ')} }`;
}

function formatSafely(value: unknown): string {
  try {
    return format(value, 0);
  } catch {
    return '[unprintable]';
  }
}

function write(...args: unknown[]): void {
  record(args.map(formatSafely).join(' '));
}

/** Replaces the context's `console` with one that collects lines. */
export function installConsole(): void {
  const shim = {
    log: write,
    info: write,
    warn: write,
    error: write,
    debug: write,
    trace: write,
    dir: (value: unknown) => write(value),
    table: (value: unknown) => write(value),
    assert: (condition: unknown, ...args: unknown[]) => {
      if (!condition) write('Assertion failed', ...args);
    },
  };
  Object.defineProperty(globalThis, 'console', { value: shim, writable: true, configurable: true, enumerable: false });
}

/** The collected lines, as JSON `{ lines, truncated }`. */
export function takeConsole(): string {
  return stringify({ lines, truncated });
}
