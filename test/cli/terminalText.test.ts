// Text from user code reaches the terminal as visible escapes, never as control sequences:
// printableLine itself, the text table, and the built CLI's text, JSON and SARIF output.
import assert from 'node:assert/strict';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { after, describe, test } from 'node:test';
import { checkDocument } from '../../server/src/check/checkDocument';
import { formatText } from '../../server/src/cli/formatText';
import { defaultCheckOptions, type PairReport } from '../../server/src/engine/types';
import { errorReport } from '../../server/src/sandbox/reports';
import { printableLine, printableLines } from '../../server/src/shared/plainText';
import { runCli } from '../support/runCli';

// A window title (OSC … BEL), a screen clear (CSI 2J), a carriage return that would print over
// the line, a right-to-left override, NUL, backspace and the one-byte CSI of C1.
const hostile = 'fit\x1b]0;owned\x07\x1b[2J\rall good\u202eevil\0\b\u009b31m';
const hostileEscaped = 'fit\\u001b]0;owned\\u0007\\u001b[2J\\rall good\\u202eevil\\u0000\\u0008\\u009b31m';

/** What a terminal could act on: control characters, bidi marks, Unicode line separators. */
const actionable = /[\p{Cc}\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/u;

function assertPrintable(output: string): void {
  for (const [i, line] of output.split('\n').entries()) assert.doesNotMatch(line, actionable, `line ${i + 1}: ${JSON.stringify(line)}`);
}

const workDir = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-terminal-'));
after(() => rmSync(workDir, { recursive: true, force: true }));

// ∇(x0² + x1²) = (2·x0, 2·x1), by hand; the objective throws the hostile text instead of returning.
const throwingModule = `/** @probe [1, 2] */
export function loss(x: number[]): number { throw new Error(${JSON.stringify(hostile)}); }
export function lossGrad(x: number[]): number[] { return [2 * x[0], 2 * x[1]]; }
`;

describe('printableLine', () => {
  test('every control and bidi character becomes a visible escape', () => {
    assert.equal(printableLine(hostile), hostileEscaped);
    assert.equal(printableLine('a\nb\tc\u2028d\u2066e\u200ff'), 'a\\nb\\tc\\u2028d\\u2066e\\u200ff');
  });

  test('ordinary Unicode is kept as it is', () => {
    const figures = 'L̂ = 20 → 1/L̂ = 0.05, μ̂ ≈ 2, κ̂ = L̂/μ̂, ∂f/∂xᵢ, 日本語, 👩‍🔬';
    assert.equal(printableLine(figures), figures);
  });

  test('a JSON document keeps its meaning and its line breaks', () => {
    const document = JSON.stringify({ message: hostile, list: [hostile] }, null, 2);
    const printable = printableLines(document);
    assertPrintable(printable);
    assert.equal(printable.split('\n').length, document.split('\n').length);
    assert.deepEqual(JSON.parse(printable), { message: hostile, list: [hostile] });
  });
});

describe('formatText', () => {
  test("a report's message, learning-rate name and file path are printed escaped, each finding on its own line", async () => {
    const fileName = path.join(workDir, 'model.ts');
    const report: PairReport = {
      ...errorReport([{ code: 'runtime-error', severity: 'error', subject: 'objective', message: hostile }]),
      learningRate: { name: `lr${hostile}`, value: 0.1, status: 'safe', decreased: [] },
    };
    const runner = { run: async () => ({ report, console: [hostile], consoleTruncated: false }) };
    const check = await checkDocument(throwingModule, fileName, runner, defaultCheckOptions);
    assert.equal(check.pairs.length, 1, 'the pair was found and "run"');
    const text = formatText([
      { path: `model${hostile}.ts`, check, error: null },
      { path: 'gone.ts', check: null, error: `cannot open ${hostile}` },
    ]);
    assertPrintable(text);
    const lines = text.split('\n');
    assert.equal(lines[0], `model${hostileEscaped}.ts`);
    assert.ok(lines.some((line) => line.endsWith(`runtime-error: ${hostileEscaped}`)), text);
    assert.ok(lines.some((line) => line.includes(`lr${hostileEscaped} = 0.1 (safe)`)), text);
    assert.ok(lines.includes(`  cannot check: cannot open ${hostileEscaped}`), text);
  });
});

describe('the built CLI', () => {
  const fileName = `model${'\x1b[2J'}.ts`;
  writeFileSync(path.join(workDir, fileName), throwingModule);

  test('text output: the thrown message and the file name arrive as visible escapes', async () => {
    const run = await runCli([workDir], { cwd: workDir });
    assert.equal(run.code, 1, run.stderr);
    assertPrintable(run.stdout);
    assert.match(run.stdout, /^model\\u001b\[2J\.ts$/m);
    assert.ok(run.stdout.includes(`Error: ${hostileEscaped}`), run.stdout);
  });

  test('JSON output: nothing raw a terminal acts on, and the parsed message is the thrown text', async () => {
    const run = await runCli(['--format', 'json', workDir], { cwd: workDir });
    assert.equal(run.code, 1, run.stderr);
    assertPrintable(run.stdout);
    const [file] = JSON.parse(run.stdout).files;
    assert.equal(file.path, fileName);
    const finding = file.pairs[0].findings.find((f: { code: string }) => f.code === 'runtime-error');
    assert.ok(finding.message.endsWith(`Error: ${hostile}`), JSON.stringify(finding.message));
  });

  test('SARIF output: the same', async () => {
    const run = await runCli(['--format', 'sarif', workDir], { cwd: workDir });
    assert.equal(run.code, 1, run.stderr);
    assertPrintable(run.stdout);
    const [result] = JSON.parse(run.stdout).runs[0].results;
    assert.ok(result.message.text.endsWith(`Error: ${hostile}`), JSON.stringify(result.message.text));
  });
});
