// The esbuild hooks that hold a bundle to its root (the rule is in confine.ts): each import is
// resolved by esbuild, then judged by its real path, and every file is read here, never by esbuild.
// A refusal is a resolve error, so esbuild reports it at the importing line.
import { readFile } from 'node:fs/promises';
import * as path from 'node:path';
import type * as esbuild from 'esbuild';
import { attributesAllowed, BundleRoot, codeLoaderOf, isPathLike, refusal } from './confine';

/** Marks the hook's own resolve calls, which esbuild answers. */
const innerResolve = Symbol('confined-resolve');

/**
 * esbuild follows a file's last `sourceMappingURL` comment and reads the map it names from anywhere
 * on disk. When a file names anything but an inline `data:` map, a last comment with a URL scheme
 * esbuild does not support is appended, and it reads none. Positions of the code above do not move.
 */
export function withoutSourceMapReads(text: string): string {
  return /sourceMappingURL=(?!data:)/i.test(text) ? `${text}\n//# sourceMappingURL=slopecheck:none\n` : text;
}

function refused(text: string): { errors: esbuild.PartialMessage[] } {
  return { errors: [{ text }] };
}

/** `unsaved`: text that replaces a file on disk, by the file's real path. */
export function confinedFiles(root: BundleRoot, unsaved: ReadonlyMap<string, string>): esbuild.Plugin {
  return {
    name: 'confined-files',
    setup(build) {
      build.onResolve({ filter: /.*/ }, async (args) => {
        if (args.pluginData === innerResolve) return undefined;
        if (!attributesAllowed(args.with)) return refused(refusal.attributes(args.path, args.with));
        // A path that leaves the root as written is refused before the disk is asked whether it exists.
        if (isPathLike(args.path) && !root.mayHold(path.resolve(args.resolveDir, args.path))) return refused(refusal.outside(args.path, root));
        const resolved = await build.resolve(args.path, {
          kind: args.kind, importer: args.importer, namespace: args.namespace, resolveDir: args.resolveDir, with: args.with, pluginData: innerResolve,
        });
        // Unresolvable or external: esbuild reports it in its usual words, or leaves it to run time.
        if (resolved.errors.length > 0 || resolved.external) return undefined;
        const real = resolved.namespace === 'file' ? await root.realPathInside(resolved.path) : null;
        if (real === null) return refused(refusal.outside(args.path, root));
        if (codeLoaderOf(real) === undefined) return refused(refusal.notCode(args.path));
        return { path: real };
      });

      // Paths resolved above arrive here, and also the files esbuild itself matches for an import with a
      // computed path (`import(`./data/${name}.ts`)`), which never pass the resolve hook: the rule again.
      build.onLoad({ filter: /.*/, namespace: 'file' }, async (args) => {
        const real = await root.realPathInside(args.path);
        // Not named: the file was found by listing a folder outside the root.
        if (real === null) return refused(refusal.computedOutside(root));
        if (!attributesAllowed(args.with)) return refused(refusal.attributes(args.path, args.with));
        const loader = codeLoaderOf(real);
        if (loader === undefined) return refused(refusal.notCode(args.path));
        const text = unsaved.get(real) ?? (await readFile(real, 'utf8'));
        return { contents: loader === 'json' ? text : withoutSourceMapReads(text), loader, resolveDir: path.dirname(real) };
      });
    },
  };
}
