// Compiles every test/**/*.test.ts with esbuild and runs them with node's test runner.
// Usage: node test/run.mjs [substring filter...]
import { rmSync } from 'node:fs';
import * as path from 'node:path';
import { compileForNode, findFiles, matching, repoRoot, runNode } from './support/compile.mjs';

const testRoot = path.join(repoRoot, 'test');
const outdir = path.join(repoRoot, '.test-build', String(process.pid));
const filters = process.argv.slice(2);

const tests = matching(findFiles(testRoot, '.test.ts'), filters);
if (tests.length === 0) {
  console.error(`no test files match ${filters.join(' ')}`);
  process.exit(2);
}
const built = await compileForNode(tests, { outdir, outbase: testRoot });
const status = runNode(['--test', '--test-concurrency=2', ...built]);
rmSync(outdir, { recursive: true, force: true });
process.exit(status);
