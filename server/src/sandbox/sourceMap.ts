// Maps a stack trace from the sandbox back to the user's source through the
// bundle's inline source map.
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

const inlineMapPattern = /\/\/# sourceMappingURL=data:application\/json;base64,([A-Za-z0-9+/=]+)\s*$/;
const framePattern = new RegExp(`${bundleScriptName.replace(/\./g, '\\.')}:(\\d+):(\\d+)`);

function readInlineMap(code: string): SourceMap | null {
  const match = inlineMapPattern.exec(code);
  if (!match) return null;
  try {
    const payload = JSON.parse(Buffer.from(match[1], 'base64').toString('utf8')) as SourceMapPayload;
    return new SourceMap(payload);
  } catch {
    return null;
  }
}

/** The first frame of `stack` that lands in the user's own code (not a package), or null. */
export function locateInUserSource(stack: string, bundle: Pick<Bundle, 'code' | 'sourceRoot'>): SourceLocation | null {
  const map = readInlineMap(bundle.code);
  if (!map) return null;
  for (const frame of stack.split('\n')) {
    const match = framePattern.exec(frame);
    if (!match) continue;
    // Stack positions are 1-based; the source map's are 0-based.
    const entry = map.findEntry(Number(match[1]) - 1, Number(match[2]) - 1) as Partial<{
      originalSource: string;
      originalLine: number;
      originalColumn: number;
    }>;
    if (entry.originalSource === undefined || entry.originalLine === undefined) continue;
    const source = entry.originalSource;
    const file = source.startsWith('file:') ? fileURLToPath(source) : path.resolve(bundle.sourceRoot, source);
    if (file.split(path.sep).includes('node_modules')) continue;
    return { file, line: entry.originalLine + 1, column: (entry.originalColumn ?? 0) + 1 };
  }
  return null;
}
