// Pairs under `// slopecheck-skip` are not run, and the CLI says so in text and JSON.
import assert from 'node:assert/strict';
import { mkdtempSync, writeFileSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { test } from 'node:test';
import { runCli } from '../support/runCli';

// ∇ Σ x_i² = 2x (common practice); `hidden` has a planted sign bug that the directive hides.
const module = `
/** @probe [0.5, -1] */
export function bowl(x: number[]): number { return x[0] ** 2 + x[1] ** 2; }
export function bowlGrad(x: number[]): number[] { return [2 * x[0], 2 * x[1]]; }

// slopecheck-skip: known to be wrong
/** @probe [0.5, -1] */
export function hidden(x: number[]): number { return x[0] ** 2; }
export function hiddenGrad(x: number[]): number[] { return [-2 * x[0], 0]; }
`;

test('skipped pairs are listed, not run, and do not fail the run', async () => {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-skip-'));
  const file = path.join(dir, 'skip.ts');
  writeFileSync(file, module);
  const json = await runCli(['--format', 'json', file]);
  assert.equal(json.code, 0, json.stderr);
  const [entry] = JSON.parse(json.stdout).files;
  assert.deepEqual(entry.skipped, ['hidden']);
  assert.deepEqual(entry.pairs.map((p: any) => p.objective), ['bowl']);
  const text = await runCli([file]);
  assert.match(text.stdout, /skipped {2}line 8 {2}hidden \(\/\/ slopecheck-skip\)/);
});
