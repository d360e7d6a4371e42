// Which other files of the workspace import a file, read from their text alone. A pair whose
// data are not in its own file may be called with them by a training script that imports it.
import * as path from 'node:path';
import * as ts from 'typescript';

export interface SourceText {
  /** Absolute path. */
  fileName: string;
  text: string;
}

const stem = (file: string) => file.replace(/\.[cm]?[jt]sx?$/, '');

/**
 * The keys a relative specifier written in `fromFile` can match a file by: the resolved path
 * without its extension (`./model`, `./model.js` and `./model.ts` all name model.ts), or,
 * for `./lib`, the folder of lib/index.ts.
 */
function keysOfSpecifier(specifier: string, fromFile: string): string[] {
  if (!specifier.startsWith('.')) return [];
  return [stem(path.resolve(path.dirname(fromFile), specifier))];
}

function keysOfFile(fileName: string): string[] {
  const target = stem(path.resolve(fileName));
  return path.basename(target) === 'index' ? [target, path.dirname(target)] : [target];
}

/** The files that import one another, indexed once, so `importersOf(file)` is cheap for many files. */
export class ImporterIndex {
  private byKey: Map<string, SourceText[]> | null = null;

  constructor(private readonly sources: readonly SourceText[]) {}

  importersOf(fileName: string): SourceText[] {
    if (!this.byKey) {
      this.byKey = new Map();
      for (const source of this.sources) {
        for (const imported of ts.preProcessFile(source.text, true, true).importedFiles) {
          for (const key of keysOfSpecifier(imported.fileName, source.fileName)) {
            const list = this.byKey.get(key) ?? [];
            if (!list.includes(source)) list.push(source);
            this.byKey.set(key, list);
          }
        }
      }
    }
    const self = path.resolve(fileName);
    const found = keysOfFile(fileName).flatMap((key) => this.byKey!.get(key) ?? []);
    return [...new Set(found)].filter((source) => path.resolve(source.fileName) !== self);
  }
}

/** True when `specifier`, written in `fromFile`, names `targetFile`. */
export function specifierNames(specifier: string, fromFile: string, targetFile: string): boolean {
  const keys = keysOfFile(targetFile);
  return keysOfSpecifier(specifier, fromFile).some((key) => keys.includes(key));
}
