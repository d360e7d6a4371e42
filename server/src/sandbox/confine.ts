// What a bundle may read: files inside its root (the workspace folder), judged after symlinks are
// resolved, and only code and JSON. Anything else a module can name — an absolute path, `../` out of
// the root, a tsconfig path, a link, an import attribute asking for text or bytes — is refused, so no
// other file's text can reach the bundle, its error messages or the user's console.
import { realpath } from 'node:fs/promises';
import * as path from 'node:path';
import type { Loader } from 'esbuild';

/** The only loaders a bundled file gets, by extension. */
const codeLoaders: Readonly<Record<string, Loader>> = {
  '.ts': 'ts', '.mts': 'ts', '.cts': 'ts', '.tsx': 'tsx', '.js': 'js', '.mjs': 'js', '.cjs': 'js', '.jsx': 'jsx', '.json': 'json',
};

/** The loader for a file that may be bundled; undefined for any other kind of file. */
export function codeLoaderOf(fileName: string): Loader | undefined {
  const extension = path.extname(fileName).toLowerCase();
  return Object.hasOwn(codeLoaders, extension) ? codeLoaders[extension] : undefined;
}

/** True for a specifier that names a path (`./x`, `../x`, `/x`) rather than a package. */
export function isPathLike(specifier: string): boolean {
  return path.isAbsolute(specifier) || /^\.\.?(?:[/\\]|$)/.test(specifier);
}

/** True when `fileName` is `folder` or lies beneath it (by the names as written). */
export function isInside(folder: string, fileName: string): boolean {
  const relative = path.relative(folder, fileName);
  return relative === '' || (relative !== '..' && !relative.startsWith(`..${path.sep}`) && !path.isAbsolute(relative));
}

/** The root a document is bundled under: the workspace folder when it holds the document, else the document's own folder. */
export function bundleRootFor(fileName: string, workspaceFolder?: string): string {
  const file = path.resolve(fileName);
  return workspaceFolder !== undefined && isInside(path.resolve(workspaceFolder), file) ? path.resolve(workspaceFolder) : path.dirname(file);
}

/** Why an import is not bundled; the import is named as written. */
export const refusal = {
  outside: (specifier: string, root: BundleRoot) => `'${specifier}' is outside the workspace folder ${root.folder}; only files inside it are bundled`,
  computedOutside: (root: BundleRoot) =>
    `an import with a computed path matches files outside the workspace folder ${root.folder}; only files inside it are bundled`,
  notCode: (specifier: string) => `'${specifier}' is not code or JSON; only ${Object.keys(codeLoaders).join(' ')} files are bundled`,
  attributes: (specifier: string, attributes: Record<string, string>) =>
    `'${specifier}' is imported with ${JSON.stringify(attributes)}; only code and JSON are bundled, and the only import attribute allowed is { type: 'json' }`,
  /** For an error esbuild raised in a file outside the root (a package.json it read on its own): the error may quote that file. */
  withheld: (root: BundleRoot) =>
    `bundling could not use a file outside the workspace folder ${root.folder} (such as a package.json in a folder above it); its text is not shown`,
};

/** True when an import's attributes are none, or `{ type: 'json' }` (the JSON loader, which is allowed anyway). */
export function attributesAllowed(attributes: Record<string, string>): boolean {
  const keys = Object.keys(attributes);
  return keys.length === 0 || (keys.length === 1 && attributes.type === 'json');
}

export class BundleRoot {
  private constructor(
    /** The folder as the caller named it. */
    readonly folder: string,
    /** The same folder with symlinks resolved: what every file's real path is judged against. */
    private readonly realFolder: string,
  ) {}

  static async of(folder: string): Promise<BundleRoot> {
    const given = path.resolve(folder);
    return new BundleRoot(given, await realpath(given).catch(() => given));
  }

  /** By names alone: could `fileName` be inside? False refuses it before the disk is asked. */
  mayHold(fileName: string): boolean {
    return isInside(this.folder, fileName) || isInside(this.realFolder, fileName);
  }

  /** The real path of `fileName` when it exists inside the root; null when it is outside or missing. */
  async realPathInside(fileName: string): Promise<string | null> {
    if (!this.mayHold(fileName)) return null;
    const real = await realpath(fileName).catch(() => null);
    return real !== null && isInside(this.realFolder, real) ? real : null;
  }
}
