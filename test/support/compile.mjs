// Shared by the three TypeScript runners (test/run.mjs, test/e2e/run.mjs, bench/run.mjs):
// find the entry files, compile them with esbuild for Node 20, run node on the result.
import * as esbuild from 'esbuild';
import { spawnSync } from 'node:child_process';
import { readdirSync, rmSync } from 'node:fs';
import * as path from 'node:path';

export const repoRoot = path.resolve(import.meta.dirname, '..', '..');

/** Every file below `dir` whose name ends with `suffix`. */
export function findFiles(dir, suffix) {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) return findFiles(full, suffix);
    return entry.name.endsWith(suffix) ? [full] : [];
  });
}

/** Keeps the files whose path contains one of the filters (all files without filters). */
export function matching(files, filters) {
  return files.filter((file) => filters.length === 0 || filters.some((f) => file.includes(f)));
}

/**
 * Compiles the entries into a fresh `outdir` (one per run, so parallel runs never delete
 * each other's files) and returns the compiled path of each entry, in order.
 * Packages stay external: they load from node_modules as in production.
 */
export async function compileForNode(entryPoints, { outdir, outbase }) {
  rmSync(outdir, { recursive: true, force: true });
  await esbuild.build({
    entryPoints,
    outdir,
    outbase,
    bundle: true,
    platform: 'node',
    target: 'node20',
    format: 'cjs',
    sourcemap: 'inline',
    packages: 'external',
    logLevel: 'warning',
  });
  return entryPoints.map((file) => path.join(outdir, path.relative(outbase, file)).replace(/\.ts$/, '.js'));
}

/** Runs node with source maps on, the repository root in SLOPECHECK_ROOT; returns the exit status. */
export function runNode(args, env = {}) {
  const run = spawnSync(process.execPath, ['--enable-source-maps', ...args], {
    stdio: 'inherit',
    env: { ...process.env, SLOPECHECK_ROOT: repoRoot, ...env },
  });
  return run.status ?? 1;
}
