// Compiles bench/main.ts with esbuild (packages external) and runs it.
// Usage: node bench/run.mjs [section...]   sections: accuracy smoothness scale latency (default: all)
import * as esbuild from 'esbuild';
import { spawnSync } from 'node:child_process';
import { rmSync } from 'node:fs';
import * as path from 'node:path';

const root = path.resolve(import.meta.dirname ?? path.dirname(new URL(import.meta.url).pathname), '..');
const outdir = path.join(root, '.bench-build', String(process.pid));
rmSync(outdir, { recursive: true, force: true });
await esbuild.build({
  entryPoints: [path.join(root, 'bench', 'main.ts')],
  outdir,
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'cjs',
  sourcemap: 'inline',
  packages: 'external',
  logLevel: 'warning',
});
const run = spawnSync(process.execPath, ['--enable-source-maps', path.join(outdir, 'main.js'), ...process.argv.slice(2)], {
  stdio: 'inherit',
  env: { ...process.env, SLOPECHECK_ROOT: root },
});
rmSync(outdir, { recursive: true, force: true });
process.exit(run.status ?? 1);
