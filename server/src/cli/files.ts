// Turns the paths given on the command line into the list of source files to check.
import { promises as fs } from 'node:fs';
import * as path from 'node:path';

const checkedExtensions = /\.(ts|mts|cts|tsx|js|mjs|cjs|jsx)$/;
const skippedFolders = new Set(['node_modules', '.git']);

export interface CollectedFiles {
  files: string[];
  /** Paths that could not be read, with a message for the user. */
  unreadable: Array<{ path: string; message: string }>;
}

export async function collectFiles(paths: string[]): Promise<CollectedFiles> {
  const found = new Set<string>();
  const unreadable: CollectedFiles['unreadable'] = [];
  for (const given of paths) {
    try {
      const stat = await fs.stat(given);
      if (stat.isDirectory()) for (const file of await walk(given)) found.add(file);
      else found.add(given);
    } catch (error) {
      unreadable.push({ path: given, message: describeFsError(error) });
    }
  }
  return { files: [...found].sort(), unreadable };
}

async function walk(folder: string): Promise<string[]> {
  const entries = await fs.readdir(folder, { withFileTypes: true });
  const nested = await Promise.all(
    entries.map(async (entry) => {
      const full = path.join(folder, entry.name);
      if (entry.isDirectory()) return skippedFolders.has(entry.name) ? [] : walk(full);
      return entry.isFile() && checkedExtensions.test(entry.name) && !entry.name.endsWith('.d.ts') ? [full] : [];
    }),
  );
  return nested.flat();
}

/** Reads a source file, refusing binary content. */
export async function readSource(file: string): Promise<string> {
  const bytes = await fs.readFile(file);
  if (bytes.includes(0)) throw new Error('is not a text file (it contains NUL bytes)');
  return bytes.toString('utf8');
}

export function describeFsError(error: unknown): string {
  const code = (error as NodeJS.ErrnoException)?.code;
  if (code === 'ENOENT') return 'no such file or folder';
  if (code === 'EACCES' || code === 'EPERM') return 'permission denied';
  if (code === 'EISDIR') return 'is a folder';
  return error instanceof Error ? error.message : String(error);
}
