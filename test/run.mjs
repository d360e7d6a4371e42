// Compiles every test/**/*.test.ts with esbuild and runs them with node's test runner.
// Usage: node test/run.mjs [substring filter...]
import * as esbuild from 'esbuild';
import { spawnSync } from 'node:child_process';
import { readdirSync, rmSync } from 'node:fs';
import * as path from 'node:path';

const root = path.resolve(import.meta.dirname ?? path.dirname(new URL(import.meta.url).pathname), '..');
// One folder per run, so parallel runs (several engineers, watch mode) never delete each other's files.
const outdir = path.join(root, '.test-build', String(process.pid));
const filters = process.argv.slice(2);

function findTests(dir) {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) return findTests(full);
    return entry.name.endsWith('.test.ts') ? [full] : [];
  });
}

const tests = findTests(path.join(root, 'test')).filter((file) => filters.length === 0 || filters.some((f) => file.includes(f)));
if (tests.length === 0) {
  console.error(`no test files match ${filters.join(' ')}`);
  process.exit(2);
}
rmSync(outdir, { recursive: true, force: true });
await esbuild.build({
  entryPoints: tests,
  outdir,
  outbase: path.join(root, 'test'),
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'cjs',
  sourcemap: 'inline',
  packages: 'external',
  logLevel: 'warning',
});
const built = tests.map((file) => path.join(outdir, path.relative(path.join(root, 'test'), file)).replace(/\.ts$/, '.js'));
const run = spawnSync(process.execPath, ['--enable-source-maps', '--test', '--test-concurrency=2', ...built], {
  stdio: 'inherit',
  env: { ...process.env, SLOPECHECK_ROOT: root },
});
rmSync(outdir, { recursive: true, force: true });
process.exit(run.status ?? 1);
