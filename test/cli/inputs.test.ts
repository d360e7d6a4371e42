// Bad and awkward input to the CLI: each problem is reported clearly and the
// other files are still checked.
import assert from 'node:assert/strict';
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { before, test } from 'node:test';
import { runCli } from '../support/runCli';

// ∇(Σ (x_i − i)²) = 2(x − i): a correct pair (common practice).
const goodModule = `
/** @probe [0.5, -1, 3] */
export function spread(x: number[]): number { return x.reduce((s, v, i) => s + (v - i) ** 2, 0); }
export function spreadGrad(x: number[]): number[] { return x.map((v, i) => 2 * (v - i)); }
`;

let dir: string;
before(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-cli-'));
  writeFileSync(path.join(dir, 'good.ts'), goodModule);
  writeFileSync(path.join(dir, 'broken.ts'), goodModule + '\nexport function oops( {\n');
  writeFileSync(path.join(dir, 'hang.ts'), goodModule.replace(/spread/g, 'stall').replace('return x.reduce', 'for (;;) {} return x.reduce'));
  writeFileSync(path.join(dir, 'binary.ts'), Buffer.from([0x7f, 0x45, 0x4c, 0x46, 0, 1, 2, 0]));
  mkdirSync(path.join(dir, 'node_modules', 'dep'), { recursive: true });
  writeFileSync(path.join(dir, 'node_modules', 'dep', 'index.ts'), goodModule.replace(/spread/g, 'vendored'));
});

test('usage errors exit 2 with a message and the usage text on stderr', async () => {
  const run = await runCli(['--format', 'yaml', dir]);
  assert.equal(run.code, 2);
  assert.equal(run.stdout, '');
  assert.match(run.stderr, /--format must be text, json or sarif/);
  assert.match(run.stderr, /Usage: slopecheck/);
});

test('a missing path exits 2, names the path, and the rest is still checked', async () => {
  const missing = path.join(dir, 'nope.ts');
  const run = await runCli(['--format', 'json', path.join(dir, 'good.ts'), missing]);
  assert.equal(run.code, 2);
  assert.match(run.stderr, /cannot read .*nope\.ts: no such file or folder/);
  const files = JSON.parse(run.stdout).files;
  assert.equal(files.find((f: any) => f.path.endsWith('good.ts')).pairs[0].status, 'pass');
  assert.equal(files.find((f: any) => f.path.endsWith('nope.ts')).error, 'no such file or folder');
});

test('a folder: syntax error, hang and binary file each get their own finding; the good file passes; node_modules is skipped', async () => {
  const run = await runCli(['--format', 'json', '--timeout-ms', '1500', dir]);
  assert.equal(run.code, 2, 'the binary file is unreadable input');
  const files: any[] = JSON.parse(run.stdout).files;
  const byName = (name: string) => files.find((f) => path.basename(f.path) === name);
  assert.equal(files.some((f) => f.path.includes('node_modules')), false);
  assert.equal(byName('good.ts').pairs[0].status, 'pass');
  assert.ok(byName('broken.ts').findings.some((f: any) => f.code === 'syntax-error' && f.line >= 5));
  const stall = byName('hang.ts').pairs[0];
  assert.equal(stall.status, 'error');
  assert.ok(stall.findings.some((f: any) => f.code === 'timeout'));
  assert.match(byName('binary.ts').error, /not a text file/);
  assert.match(run.stderr, /binary\.ts: is not a text file/);
});

test('a clean file exits 0; text output names the pair', async () => {
  const run = await runCli([path.join(dir, 'good.ts')]);
  assert.equal(run.code, 0, run.stderr);
  assert.match(run.stdout, /spread → spreadGrad\s+gradient matches/);
});

test('a folder\'s .tsx and .jsx files are checked too, JSX and all', async () => {
  const folder = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-jsx-'));
  const component = 'export const Label = (props: { text: string }) => <span>{props.text}</span>;\n';
  writeFileSync(path.join(folder, 'Chart.tsx'), goodModule + component);
  writeFileSync(path.join(folder, 'Legend.jsx'), goodModule.replace(/: number\[\]|: number/g, '').replace(/spread/g, 'legendSpread') + 'export const Key = (props) => <b>{props.name}</b>;\n');
  const run = await runCli(['--format', 'json', folder]);
  const files = JSON.parse(run.stdout).files.map((file: any) => [path.basename(file.path), file.pairs.map((p: any) => [p.objective, p.status])]);
  assert.deepEqual(files.sort(), [['Chart.tsx', [['spread', 'pass']]], ['Legend.jsx', [['legendSpread', 'pass']]]]);
});
