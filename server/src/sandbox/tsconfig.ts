// The tsconfig esbuild is given: the nearest tsconfig.json (or jsconfig.json) from the document up to
// the root, with its `extends` chain, each read here under the root's rule (confine.ts). Given one,
// esbuild reads no tsconfig itself: it would search above the root and follow `extends` anywhere,
// and it quotes an unparsable file's text in its errors.
import { readFile, stat } from 'node:fs/promises';
import * as path from 'node:path';
import type { TsconfigRaw } from 'esbuild';
import * as ts from 'typescript';
import { BundleRoot, isPathLike } from './confine';

export type ConfinedTsconfig = { tsconfigRaw: TsconfigRaw } | { error: { message: string; file: string } };

interface Layer {
  /** Folder of the config file, which its relative paths are resolved against. */
  dir: string;
  compilerOptions: Record<string, unknown>;
}

/** Raised for a config that cannot be used; the message names it. */
class Unusable extends Error {
  constructor(message: string, readonly file: string) {
    super(message);
  }
}

const configNames = ['tsconfig.json', 'jsconfig.json'];

export async function confinedTsconfig(documentFile: string, root: BundleRoot): Promise<ConfinedTsconfig> {
  const nearest = await nearestConfig(path.dirname(documentFile), root);
  if (nearest === null) return { tsconfigRaw: {} };
  try {
    return { tsconfigRaw: merged(await layersOf(nearest, root, new Set()), path.dirname(nearest)) };
  } catch (error) {
    if (!(error instanceof Unusable)) throw error;
    return { error: { message: error.message, file: error.file } };
  }
}

async function nearestConfig(folder: string, root: BundleRoot): Promise<string | null> {
  for (let dir = folder; root.mayHold(dir); dir = path.dirname(dir)) {
    for (const name of configNames) {
      const file = path.join(dir, name);
      if (await isFile(file)) return file;
    }
    if (dir === root.folder || path.dirname(dir) === dir) break;
  }
  return null;
}

/** The chain from the farthest ancestor config to `file`, each config once. */
async function layersOf(file: string, root: BundleRoot, seen: Set<string>): Promise<Layer[]> {
  const name = path.basename(file);
  const real = await root.realPathInside(file);
  if (real === null) throw new Unusable(`${name} is outside the workspace folder ${root.folder}`, file);
  if (seen.has(real)) return [];
  seen.add(real);
  const { config } = ts.parseConfigFileTextToJson(real, await readFile(real, 'utf8'));
  if (!isRecord(config)) throw new Unusable(`${name} could not be read as JSON`, file);
  const parents: unknown[] = Array.isArray(config.extends) ? config.extends : config.extends === undefined ? [] : [config.extends];
  const layers: Layer[] = [];
  for (const parent of parents) {
    const parentFile = typeof parent === 'string' ? await extendedConfig(parent, path.dirname(real), root) : null;
    if (parentFile === null) throw new Unusable(`${name} extends '${String(parent)}', which is not a file inside the workspace folder ${root.folder}`, file);
    layers.push(...(await layersOf(parentFile, root, seen)));
  }
  layers.push({ dir: path.dirname(real), compilerOptions: isRecord(config.compilerOptions) ? config.compilerOptions : {} });
  return layers;
}

/** The file an `extends` names, found the way TypeScript looks (a path, or a package in node_modules inside the root). */
async function extendedConfig(specifier: string, dir: string, root: BundleRoot): Promise<string | null> {
  const bases: string[] = [];
  if (isPathLike(specifier)) bases.push(path.resolve(dir, specifier));
  else for (let d = dir; root.mayHold(d); d = path.dirname(d)) {
    bases.push(path.join(d, 'node_modules', specifier));
    if (path.dirname(d) === d) break;
  }
  for (const base of bases) {
    for (const candidate of [base, `${base}.json`, path.join(base, 'tsconfig.json')]) {
      const real = await root.realPathInside(candidate);
      if (real !== null && (await isFile(real))) return real;
    }
  }
  return null;
}

/**
 * Later layers win, option by option, as in TypeScript. `baseUrl` and `paths` are made absolute:
 * each is relative to the config that declares it (`paths` to `baseUrl` when there is one).
 */
function merged(layers: Layer[], configDir: string): TsconfigRaw {
  const compilerOptions: Record<string, unknown> = {};
  let baseUrl: string | undefined;
  let paths: { dir: string; patterns: Record<string, unknown> } | undefined;
  const absolute = (dir: string, value: string) => path.resolve(dir, value.replace('${configDir}', configDir));
  for (const { dir, compilerOptions: options } of layers) {
    for (const [key, value] of Object.entries(options)) {
      if (key === 'baseUrl') baseUrl = typeof value === 'string' ? absolute(dir, value) : undefined;
      else if (key === 'paths') paths = isRecord(value) ? { dir, patterns: value } : undefined;
      else compilerOptions[key] = value;
    }
  }
  if (baseUrl !== undefined) compilerOptions.baseUrl = baseUrl;
  if (paths) {
    const base = baseUrl ?? paths.dir;
    compilerOptions.paths = Object.fromEntries(
      Object.entries(paths.patterns).map(([pattern, targets]) => [
        pattern,
        (Array.isArray(targets) ? targets : []).filter((target): target is string => typeof target === 'string').map((target) => absolute(base, target)),
      ]),
    );
  }
  return { compilerOptions } as TsconfigRaw;
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

async function isFile(file: string): Promise<boolean> {
  return (await stat(file).catch(() => null))?.isFile() === true;
}
