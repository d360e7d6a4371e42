// End-to-end tests: builds the product, packages it as a .vsix, compiles test/e2e/**/*.e2e.ts
// with esbuild and runs them one file at a time under node's test runner.
// Fails (never skips) when test/e2e/setup.sh has not installed the tools.
// Usage: node test/e2e/run.mjs [substring filter...]
import * as esbuild from 'esbuild';
import { spawnSync } from 'node:child_process';
import { mkdirSync, readdirSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import * as path from 'node:path';

const here = import.meta.dirname ?? path.dirname(new URL(import.meta.url).pathname);
const root = path.resolve(here, '..', '..');
const testRoot = path.join(root, 'test');
const outdir = path.join(root, '.test-build', `e2e-${process.pid}`);
const resultsDir = path.join(root, 'test-results', 'e2e');
const vsix = path.join(resultsDir, 'slopecheck.vsix');
const filters = process.argv.slice(2);

function findE2eTests(dir) {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) return findE2eTests(full);
    return entry.name.endsWith('.e2e.ts') ? [full] : [];
  });
}

function step(title, command, args) {
  console.log(`e2e: ${title}`);
  const run = spawnSync(command, args, { cwd: root, stdio: 'inherit' });
  if (run.status !== 0) {
    console.error(`e2e: ${title} failed (exit ${run.status ?? run.signal})`);
    process.exit(1);
  }
}

const tests = findE2eTests(here).filter((file) => filters.length === 0 || filters.some((f) => file.includes(f)));
if (tests.length === 0) {
  console.error(`no end-to-end test files match ${filters.join(' ')}`);
  process.exit(2);
}
// The tools module is compiled with the tests, so this check and the tests read one list.
const suiteEntry = path.join(here, 'electron', 'suite', 'index.ts');
rmSync(outdir, { recursive: true, force: true });
await esbuild.build({
  entryPoints: [...tests, path.join(here, 'tools.ts'), suiteEntry],
  outdir,
  outbase: testRoot,
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'cjs',
  sourcemap: 'inline',
  packages: 'external',
  logLevel: 'warning',
});
process.env.SLOPECHECK_ROOT = root;
const { missingTools, setupHint } = createRequire(import.meta.url)(path.join(outdir, 'e2e', 'tools.js'));
const missing = missingTools();
if (missing.length > 0) {
  rmSync(outdir, { recursive: true, force: true });
  console.error(`e2e: FAILED, tools missing: ${missing.join(', ')}.\ne2e: ${setupHint}.`);
  process.exit(1);
}

step('building dist/', process.execPath, ['esbuild.mjs']);
mkdirSync(resultsDir, { recursive: true });
// vsce works offline; .vscodeignore keeps dist/, the manifest, the README and esbuild with its binary.
// The README's pictures travel in the package, so its relative links stay as they are.
const vsce = path.join(root, 'node_modules', '@vscode', 'vsce', 'vsce');
step(`packaging ${path.relative(root, vsix)}`, process.execPath, [vsce, 'package', '--no-rewrite-relative-links', '--out', vsix]);

const built = tests.map((file) => path.join(outdir, path.relative(testRoot, file)).replace(/\.ts$/, '.js'));
// One file at a time: each starts its own code-server and browser, and the machine may have two cores.
const run = spawnSync(process.execPath, ['--enable-source-maps', '--test', '--test-concurrency=1', ...built], {
  stdio: 'inherit',
  env: { ...process.env, SLOPECHECK_ROOT: root, SLOPECHECK_E2E_VSIX: vsix },
});
rmSync(outdir, { recursive: true, force: true });
process.exit(run.status ?? 1);
