// Bundles one document (an unsaved buffer wins over the file on disk) with its
// relative imports and workspace packages into CommonJS for the sandbox, reading only
// code and JSON inside the root (confine.ts).
// Imports of Node built-ins are recorded, left external and make the bundle unrunnable,
// except the two a script guard needs (`url`, `process`), which get inert stand-ins.
import * as esbuild from 'esbuild';
import { realpath } from 'node:fs/promises';
import { builtinModules } from 'node:module';
import * as path from 'node:path';
import type { Finding } from '../engine/types';
import { BundleRoot, codeLoaderOf, refusal } from './confine';
import { confinedFiles, withoutSourceMapReads } from './confinedFiles';
import { withScopeHook } from './scopeHook';
import { scriptGuardStandIns } from './standIns';
import { confinedTsconfig } from './tsconfig';

export interface BundleError {
  message: string;
  file: string;
  /** 1-based. */
  line: number;
  /** 1-based. */
  column: number;
}

export interface Bundle {
  /** CommonJS with an inline source map; empty when there are errors. */
  code: string;
  /** Absolute path of the document that was bundled. */
  fileName: string;
  /** Directory the source map's relative source paths are resolved against. */
  sourceRoot: string;
  /** Every Node built-in the module imports, as written (`fs`, `node:child_process`). */
  builtinImports: string[];
  /** Where each built-in import is (message = the module name). */
  builtinImportSites: BundleError[];
  errors: BundleError[];
}

/** Marks the resolve errors our plugin raises for built-ins, so esbuild reports where each import is. */
const builtinMarker = 'slopecheck-builtin:';

const builtinNames = new Set(builtinModules);
const standInNamespace = 'slopecheck-stand-in';

function isBuiltin(specifier: string): boolean {
  return specifier.startsWith('node:') || builtinNames.has(specifier);
}

export interface BundleOptions {
  /** Appended with the hook: `import * as namespace from specifier` (an importing file as the entry). */
  documentImport?: { namespace: string; specifier: string };
  /** A file whose unsaved text replaces what is on disk when the entry imports it. */
  replaced?: { fileName: string; text: string };
}

/**
 * Bundles `text` as `fileName`, with the scope hook for `scopeKeys` (see scopeHook.ts) appended.
 * Only files inside `root` (the workspace folder; see bundleRootFor) are read.
 */
export async function bundleDocument(
  text: string,
  fileName: string,
  root: string,
  scopeKeys: readonly string[] = [],
  options: BundleOptions = {},
): Promise<Bundle> {
  const absoluteFile = path.resolve(fileName);
  const sourceRoot = path.dirname(absoluteFile);
  const base = { code: '', fileName: absoluteFile, sourceRoot, builtinImports: [], builtinImportSites: [] };
  const confinement = await BundleRoot.of(root);
  const tsconfig = await confinedTsconfig(absoluteFile, confinement);
  if ('error' in tsconfig) return { ...base, errors: [{ ...tsconfig.error, line: 1, column: 1 }] };
  const replaced = options.replaced;
  const unsaved = new Map<string, string>();
  if (replaced) unsaved.set(await realpath(replaced.fileName).catch(() => path.resolve(replaced.fileName)), replaced.text);
  const builtinImports = new Set<string>();
  const recordBuiltins: esbuild.Plugin = {
    name: 'record-builtins',
    setup(build) {
      build.onResolve({ filter: /.*/ }, (args) => {
        if (!isBuiltin(args.path)) return undefined;
        const standIn = scriptGuardStandIns[args.path.replace(/^node:/, '')];
        if (standIn !== undefined) return { path: args.path, namespace: standInNamespace };

        builtinImports.add(args.path);
        return { errors: [{ text: builtinMarker + args.path }] };
      });
      build.onLoad({ filter: /.*/, namespace: standInNamespace }, (args) => ({
        contents: scriptGuardStandIns[args.path.replace(/^node:/, '')],
        loader: 'js',
      }));
    },
  };
  try {
    const result = await esbuild.build({
      stdin: {
        contents: withoutSourceMapReads(withScopeHook(text, scopeKeys, options.documentImport)),
        sourcefile: path.basename(absoluteFile),
        resolveDir: sourceRoot,
        loader: loaderFor(absoluteFile),
      },
      absWorkingDir: sourceRoot,
      // Given a tsconfig, esbuild looks for none on disk.
      tsconfigRaw: tsconfig.tsconfigRaw,
      bundle: true,
      format: 'cjs',
      // The sandbox is a bare ECMAScript realm, not Node: prefer packages' portable entry points.
      platform: 'neutral',
      mainFields: ['module', 'main'],
      target: 'es2022',
      write: false,
      sourcemap: 'inline',
      sourcesContent: false,
      logLevel: 'silent',
      plugins: [recordBuiltins, confinedFiles(confinement, unsaved)],
    });
    const code = result.outputFiles?.[0]?.text ?? '';
    return { ...base, code, errors: [] };
  } catch (error) {
    const messages = (error as Partial<esbuild.BuildFailure>).errors;
    if (!Array.isArray(messages)) throw error;
    const located = await Promise.all(messages.map((message) => withheldOutside(toBundleError(message, sourceRoot, absoluteFile), confinement, absoluteFile)));
    const builtinImportSites = located
      .filter((site) => site.message.startsWith(builtinMarker))
      .map((site) => ({ ...site, message: site.message.slice(builtinMarker.length) }));
    return {
      ...base,
      builtinImports: [...builtinImports],
      builtinImportSites,
      errors: located.filter((e) => !e.message.startsWith(builtinMarker)),
    };
  }
}

/** The document's loader: its text is code whatever its name says. */
function loaderFor(fileName: string): esbuild.Loader {
  const loader = codeLoaderOf(fileName);
  return loader === undefined || loader === 'json' ? 'ts' : loader;
}

function toBundleError(message: esbuild.Message, sourceRoot: string, documentFile: string): BundleError {
  const location = message.location;
  return {
    message: message.text,
    file: location ? path.resolve(sourceRoot, location.file) : documentFile,
    line: location?.line ?? 1,
    column: (location?.column ?? 0) + 1,
  };
}

/** An error esbuild located in a file outside the root (a package.json it read on its own) may quote that file's text. */
async function withheldOutside(error: BundleError, root: BundleRoot, documentFile: string): Promise<BundleError> {
  if (error.file === documentFile || (await root.realPathInside(error.file)) !== null) return error;
  return { message: refusal.withheld(root), file: documentFile, line: 1, column: 1 };
}

/** True when the bundle may be executed in the sandbox. */
export function isRunnable(bundle: Bundle): boolean {
  return bundle.errors.length === 0 && bundle.builtinImports.length === 0;
}

/** Findings explaining why a bundle is not executed; empty when it is runnable. */
export function unrunnableBundleFindings(bundle: Bundle): Finding[] {
  const findings: Finding[] = bundle.errors.map((error) => ({
    code: 'bundle-error',
    severity: 'error',
    subject: 'objective',
    message: `The module could not be bundled: ${error.message}`,
    location: locationOf(error),
  }));
  if (bundle.builtinImports.length > 0) {
    const names = bundle.builtinImports.map((name) => `'${name}'`).join(', ');
    findings.push({
      code: 'builtin-import',
      severity: 'error',
      subject: 'objective',
      message: `The module imports ${bundle.builtinImports.length === 1 ? 'the Node built-in' : 'the Node built-ins'} ${names}; for safety it was not executed. Move the pure math into a module without Node imports.`,
      ...(bundle.builtinImportSites[0] ? { location: locationOf(bundle.builtinImportSites[0]) } : {}),
    });
  }
  return findings;
}

function locationOf(site: BundleError): NonNullable<Finding['location']> {
  return { file: site.file, line: site.line, column: site.column };
}
