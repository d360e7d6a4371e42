// The CLI over a folder of 1000 files: most without pairs, some with a correct pair, one with a
// wrong gradient, one binary, one with a syntax error. Every file is listed with its own result,
// and the exit status is that of the worst problem.
import assert from 'node:assert/strict';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { after, before, describe, test } from 'node:test';
import { runCli } from '../support/runCli';

const fileCount = 1000;
const correctCount = 20;

// ∇ Σ (x_i − c·i)² = 2(x − c·i) (common practice); each correct file gets its own c.
const correctModule = (c: number) => `
/** @probe [0.5, -1, 3] */
export function spread${c}(x: number[]): number { return x.reduce((s, v, i) => s + (v - ${c} * i) ** 2, 0); }
export function spread${c}Grad(x: number[]): number[] { return x.map((v, i) => 2 * (v - ${c} * i)); }
`;
// The same with the factor 2 left out: a gradient at half its true size.
const halvedModule = correctModule(7).replace(/spread7/g, 'halved').replace('2 * (v - 7 * i)', '(v - 7 * i)');
// Files without a pair: exports that are not functions, and a function with no gradient.
const plainModule = (n: number) => `export const label${n} = 'file ${n}';\nexport function scaled${n}(x: number): number { return ${n} * x; }\n`;

let dir: string;
/** Relative path (as the CLI prints it when run from `dir` on '.') → what the file holds. */
const kinds = new Map<string, 'plain' | 'correct' | 'halved' | 'binary' | 'syntax'>();

before(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-many-'));
  // Ten folders of a hundred files, so the folder walk recurses.
  for (let n = 0; n < fileCount; n++) {
    const folder = `part${Math.floor(n / 100)}`;
    mkdirSync(path.join(dir, folder), { recursive: true });
    const relative = path.join(folder, `m${n}.ts`);
    const kind = n === 500 ? 'halved' : n === 501 ? 'binary' : n === 502 ? 'syntax' : n % 50 === 7 ? 'correct' : 'plain';
    kinds.set(relative, kind);
    const file = path.join(dir, relative);
    if (kind === 'plain') writeFileSync(file, plainModule(n));
    if (kind === 'correct') writeFileSync(file, correctModule(n));
    if (kind === 'halved') writeFileSync(file, halvedModule);
    // The start of an ELF header: NUL bytes mark it as binary.
    if (kind === 'binary') writeFileSync(file, Buffer.from([0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0, 0, 0, 0, 0]));
    if (kind === 'syntax') writeFileSync(file, `${correctModule(502)}\nexport function unfinished( {\n`);
  }
});
after(() => rmSync(dir, { recursive: true, force: true }));

const pathsOf = (kind: string) => [...kinds].filter(([, k]) => k === kind).map(([p]) => p);

describe('slopecheck over a folder of 1000 files', () => {
  let code: number | null;
  let stderr: string;
  let files: any[];
  let summary: any;
  before(async () => {
    // A generous kill timer only, so a hang fails the test instead of stalling the suite.
    const run = await runCli(['--format', 'json', '.'], { cwd: dir, timeoutMs: 600_000 });
    code = run.code;
    stderr = run.stderr;
    ({ files, summary } = JSON.parse(run.stdout));
  });

  test('the plan of the folder is as intended', () => {
    assert.equal(kinds.size, fileCount);
    assert.equal(pathsOf('correct').length, correctCount);
  });

  test('every file is listed once, and the binary file makes the exit status 2', () => {
    assert.equal(code, 2, 'unreadable input outranks the wrong gradient (exit 1)');
    assert.equal(files.length, fileCount);
    assert.deepEqual(files.map((f) => f.path).sort(), [...kinds.keys()].sort());
    assert.match(stderr, /m501\.ts: is not a text file/);
  });

  test('files without pairs have no pairs and no findings', () => {
    for (const relative of pathsOf('plain')) {
      const file = files.find((f) => f.path === relative);
      assert.deepEqual([file.pairs, file.findings, file.error], [[], [], undefined], relative);
    }
  });

  test('each correct pair passes, and the wrong one fails with a factor diagnosis on its gradient', () => {
    for (const relative of pathsOf('correct')) {
      const [pair] = files.find((f) => f.path === relative).pairs;
      assert.equal(pair.status, 'pass', `${relative}: ${JSON.stringify(pair.findings)}`);
    }
    const [halved] = files.find((f) => f.path === pathsOf('halved')[0]).pairs;
    assert.equal(halved.status, 'fail');
    const mismatch = halved.findings.find((f: any) => f.code === 'gradient-mismatch');
    assert.ok(mismatch, JSON.stringify(halved.findings));
    assert.equal(mismatch.line, 4, 'the line of halvedGrad');
    assert.match(mismatch.message, /0\.5/);
  });

  test('the binary file and the syntax error are reported on their own', () => {
    const binary = files.find((f) => f.path === pathsOf('binary')[0]);
    assert.match(binary.error, /not a text file/);
    const broken = files.find((f) => f.path === pathsOf('syntax')[0]);
    const syntax = broken.findings.find((f: any) => f.code === 'syntax-error');
    assert.ok(syntax, JSON.stringify(broken.findings));
    // The parser notices the missing '}' where the file ends: the line after the unfinished declaration.
    assert.equal(syntax.line, 7, syntax.message);
    // Its pair is not run: the module cannot be bundled.
    const [pair] = broken.pairs;
    assert.equal(pair.status, 'error');
    assert.deepEqual(pair.findings.map((f: any) => f.code), ['bundle-error']);
  });

  test('the summary counts every pair found', () => {
    assert.equal(summary.pairs, correctCount + 2);
    assert.deepEqual(summary.byStatus, { pass: correctCount, fail: 1, inconclusive: 0, error: 1 });
  });
});
