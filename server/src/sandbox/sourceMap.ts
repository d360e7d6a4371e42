// Maps a stack trace from the sandbox back to the user's source through the
// bundle's inline source map. The map is not ours alone: esbuild folds in the maps that
// workspace files carry (`//# sourceMappingURL=data:…`), and the stack is user-made text,
// so nothing read from either may make this throw or point outside plain files.
import { SourceMap, type SourceMapPayload } from 'node:module';
import * as path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Bundle } from './bundle';

/** The name the sandbox gives the user's bundle, so its frames can be told apart. */
export const bundleScriptName = 'slopecheck-bundle.js';

export interface SourceLocation {
  file: string;
  /** 1-based. */
  line: number;
  /** 1-based. */
  column: number;
}

const inlineMapPrefix = '//# sourceMappingURL=data:application/json;base64,';
const base64Text = /^[A-Za-z0-9+/=]+\s*$/;
/**
 * Largest inline map parsed, in base64 characters (about 6 MB of JSON). Our own bundles'
 * maps carry no sources' text and stay far below it; a bigger one comes from a workspace
 * file, and decoding and parsing it would stall the language server's event loop on every
 * runtime error. Beyond it, findings keep their place on the objective.
 */
const maxInlineMapLength = 8 * 1024 * 1024;
/** Frames of a stack looked at: the user's frame is among the first few; a stack is user-made text. */
const maxFrames = 200;
const framePattern = new RegExp(`${bundleScriptName.replace(/\./g, '\\.')}:(\\d+):(\\d+)`);
/** A URL scheme (`file:`, `http:`, `webpack:`), as opposed to a path. */
const schemePattern = /^[A-Za-z][A-Za-z0-9+.-]*:/;

function readInlineMap(code: string): SourceMap | null {
  const start = code.lastIndexOf(inlineMapPrefix);
  if (start < 0) return null;
  const encoded = code.slice(start + inlineMapPrefix.length);
  if (encoded.length > maxInlineMapLength || !base64Text.test(encoded)) return null;
  try {
    const payload = JSON.parse(Buffer.from(encoded, 'base64').toString('utf8')) as SourceMapPayload;
    return new SourceMap(payload);
  } catch {
    return null;
  }
}

/** The first frame of `stack` that lands in the user's own code (not a package), or null. Never throws. */
export function locateInUserSource(stack: string, bundle: Pick<Bundle, 'code' | 'sourceRoot'>): SourceLocation | null {
  const map = readInlineMap(bundle.code);
  if (!map) return null;
  for (const frame of String(stack).split('\n', maxFrames)) {
    const match = framePattern.exec(frame);
    if (!match) continue;
    const location = locateFrame(map, Number(match[1]), Number(match[2]), bundle.sourceRoot);
    if (location) return location;
  }
  return null;
}

/** The user's file, line and column of one bundle position (1-based), or null when the map says nothing usable. */
function locateFrame(map: SourceMap, line: number, column: number, sourceRoot: string): SourceLocation | null {
  if (!isPosition(line, 1) || !isPosition(column, 1)) return null;
  let entry: Partial<{ originalSource: unknown; originalLine: unknown; originalColumn: unknown }>;
  try {
    // Stack positions are 1-based; the source map's are 0-based.
    entry = map.findEntry(line - 1, column - 1);
  } catch {
    return null;
  }
  const originalColumn = entry.originalColumn ?? 0;
  if (!isPosition(entry.originalLine, 0) || !isPosition(originalColumn, 0)) return null;
  const file = plainFile(entry.originalSource, sourceRoot);
  if (file === null || file.split(path.sep).includes('node_modules')) return null;
  return { file, line: entry.originalLine + 1, column: originalColumn + 1 };
}

/** An integer position from `lowest` that stays one an editor can show once made 1-based (LSP: up to 2³¹ − 1). */
function isPosition(value: unknown, lowest: number): value is number {
  return typeof value === 'number' && Number.isSafeInteger(value) && value >= lowest && value < 2 ** 31 - 1;
}

/**
 * The absolute path of a map's source: a path (relative ones from the bundle's folder) or a
 * `file:` URL of this machine; null for anything else (another host, another scheme, no text).
 */
function plainFile(source: unknown, sourceRoot: string): string | null {
  if (typeof source !== 'string' || source === '') return null;
  const file = path.isAbsolute(source) ? path.normalize(source) : schemePattern.test(source) ? fileOfUrl(source) : path.resolve(sourceRoot, source);
  return file === null || file.includes('\0') ? null : file;
}

function fileOfUrl(url: string): string | null {
  if (!url.startsWith('file:')) return null;
  try {
    return fileURLToPath(url);
  } catch {
    // A host name (file://server/x.ts), or a path a URL cannot hold on this system.
    return null;
  }
}
