// End-to-end tests: builds the product, packages it as a .vsix, compiles test/e2e/**/*.e2e.ts
// with esbuild and runs them one file at a time under node's test runner.
// Fails (never skips) when test/e2e/setup.sh has not installed the tools.
// Usage: node test/e2e/run.mjs [substring filter...]
import { spawnSync } from 'node:child_process';
import { mkdirSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import * as path from 'node:path';
import { compileForNode, findFiles, matching, repoRoot as root, runNode } from '../support/compile.mjs';

const here = import.meta.dirname;
const testRoot = path.join(root, 'test');
const outdir = path.join(root, '.test-build', `e2e-${process.pid}`);
const resultsDir = path.join(root, 'test-results', 'e2e');
const vsix = path.join(resultsDir, 'slopecheck.vsix');
const filters = process.argv.slice(2);

function step(title, command, args) {
  console.log(`e2e: ${title}`);
  const run = spawnSync(command, args, { cwd: root, stdio: 'inherit' });
  if (run.status !== 0) {
    console.error(`e2e: ${title} failed (exit ${run.status ?? run.signal})`);
    process.exit(1);
  }
}

const tests = matching(findFiles(here, '.e2e.ts'), filters);
if (tests.length === 0) {
  console.error(`no end-to-end test files match ${filters.join(' ')}`);
  process.exit(2);
}
// The tools module is compiled with the tests, so this check and the tests read one list.
const suiteEntry = path.join(here, 'electron', 'suite', 'index.ts');
const [toolsModule, , ...built] = await compileForNode([path.join(here, 'tools.ts'), suiteEntry, ...tests], { outdir, outbase: testRoot });
process.env.SLOPECHECK_ROOT = root;
const { missingTools, setupHint } = createRequire(import.meta.url)(toolsModule);
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

// One file at a time: each starts its own code-server and browser, and the machine may have two cores.
const status = runNode(['--test', '--test-concurrency=1', ...built], { SLOPECHECK_E2E_VSIX: vsix });
rmSync(outdir, { recursive: true, force: true });
process.exit(status);
