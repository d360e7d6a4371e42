// The workspace's source files, for finding the files that import a document (a training
// script whose data a pair needs). Folders are walked with a bound on their size, file texts
// are cached by modification time, and an open document's buffer wins over its file.
import { promises as fs } from 'node:fs';
import * as path from 'node:path';
import { ImporterIndex, type SourceText } from '../discovery/importers';

const sourceFile = /\.(ts|tsx|mts|cts|js|jsx|mjs|cjs)$/;
const skippedFolders = new Set(['node_modules', '.git', 'dist', 'out', 'build', 'coverage']);
/** A workspace larger than this is searched only this far (common practice for editor scans). */
const maxFiles = 5000;
const maxFileBytes = 1_000_000;

export class WorkspaceSources {
  private readonly texts = new Map<string, { mtimeMs: number; text: string }>();

  constructor(
    private readonly folders: () => readonly string[],
    private readonly openText: (fileName: string) => string | undefined,
  ) {}

  async importersOf(fileName: string): Promise<SourceText[]> {
    const files = await this.list();
    // Only files that mention the document's name can import it: parse just those.
    const stem = path.basename(fileName).replace(/\.[^.]+$/, '');
    const candidates: SourceText[] = [];
    for (const file of files) {
      const text = this.openText(file) ?? (await this.read(file));
      if (text !== null && text.includes(stem)) candidates.push({ fileName: file, text });
    }
    return new ImporterIndex(candidates).importersOf(fileName);
  }

  private async list(): Promise<string[]> {
    const found: string[] = [];
    const walk = async (folder: string): Promise<void> => {
      let entries;
      try {
        entries = await fs.readdir(folder, { withFileTypes: true });
      } catch {
        return;
      }
      for (const entry of entries) {
        if (found.length >= maxFiles) return;
        const full = path.join(folder, entry.name);
        if (entry.isDirectory() && !skippedFolders.has(entry.name) && !entry.name.startsWith('.')) await walk(full);
        else if (entry.isFile() && sourceFile.test(entry.name) && !entry.name.endsWith('.d.ts')) found.push(full);
      }
    };
    for (const folder of this.folders()) await walk(folder);
    return found;
  }

  private async read(file: string): Promise<string | null> {
    try {
      const stat = await fs.stat(file);
      if (stat.size > maxFileBytes) return null;
      const known = this.texts.get(file);
      if (known && known.mtimeMs === stat.mtimeMs) return known.text;
      const text = await fs.readFile(file, 'utf8');
      this.texts.set(file, { mtimeMs: stat.mtimeMs, text });
      return text;
    } catch {
      return null;
    }
  }
}
