// The CLI over the bundled demo workspace, compared with the truth the demo was
// built with (fixtures/demo/expected.json: each bug was planted on purpose).
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import * as path from 'node:path';
import { before, describe, test } from 'node:test';
import { fixturesDir, repoRoot } from '../support/paths';
import { CliRun, runCli } from '../support/runCli';

interface ExpectedPair {
  file: string;
  /** Absent for a gradient pair. */
  kind?: 'jacobian' | 'hessian' | 'hessianVectorProduct';
  objective: string;
  gradient: string | null;
  status: 'pass' | 'fail' | 'inconclusive';
  /** The gradient's diagnosis kind, or the matrix diagnosis kind for the other kinds. */
  diagnosis: string | null;
  factor?: number;
  components?: number[];
  /** [row, column] entries wrong at every probe (matrix kinds). */
  entries?: Array<[number, number]>;
  expectedFindings?: string[];
  learningRate?: { name: string; status: 'safe' | 'aggressive' | 'divergent' };
}

const demoDir = path.join(fixturesDir, 'demo');
const expected: ExpectedPair[] = JSON.parse(readFileSync(path.join(demoDir, 'expected.json'), 'utf8')).pairs;

describe('slopecheck --format json over the demo workspace', () => {
  let run: CliRun;
  let files: any[];
  before(async () => {
    // --smoothness: L̂ of every passing pair, held to expected.json, not only of those with a rate.
    run = await runCli(['--format', 'json', '--smoothness', demoDir]);
    files = JSON.parse(run.stdout).files;
  });

  test('stdout is the JSON document alone and the exit status reports the planted bugs', () => {
    assert.equal(run.code, 1, `expected exit 1 (error-level findings), stderr: ${run.stderr}`);
    assert.ok(Array.isArray(files) && files.length > 0);
  });

  test('every expected pair is found, and nothing else', () => {
    const found = files.flatMap((f) => f.pairs.map((p: any) => `${f.path}#${p.kind}#${p.objective}`)).sort();
    const wanted = expected.map((e) => `${path.relative(repoRoot, path.join(demoDir, e.file))}#${e.kind ?? 'gradient'}#${e.objective}`).sort();
    assert.deepEqual(found, wanted);
  });

  for (const want of expected) {
    test(`${want.file} ${want.kind ?? 'gradient'} ${want.objective}: ${want.status}${want.diagnosis ? ` (${want.diagnosis})` : ''}`, () => {
      const file = files.find((f) => f.path.endsWith(want.file));
      assert.ok(file, `file ${want.file} missing from output`);
      const pair = file.pairs.find((p: any) => p.kind === (want.kind ?? 'gradient') && p.objective === want.objective);
      assert.ok(pair, `pair ${want.objective} missing`);
      if (want.gradient) assert.equal(pair.gradient, want.gradient);
      assert.equal(pair.status, want.status, `findings: ${JSON.stringify(pair.findings, null, 1)}`);
      assert.ok(Number.isInteger(pair.line) && pair.line >= 1);
      for (const code of want.expectedFindings ?? []) assert.ok(pair.findings.some((f: any) => f.code === code), `finding ${code}`);
      if (want.diagnosis && want.kind) {
        assert.equal(pair.matrix?.diagnosis?.kind, want.diagnosis);
        const mismatch = pair.findings.find((f: any) => f.code === `${want.kind === 'hessianVectorProduct' ? 'hessian-vector-product' : want.kind}-mismatch`);
        assert.ok(mismatch, 'a mismatch finding of its kind');
        if (want.entries) assert.deepEqual(mismatch.entries, want.entries);
      } else if (want.diagnosis) {
        assert.equal(pair.diagnosis?.kind, want.diagnosis);
        if (want.factor !== undefined) assert.ok(Math.abs(pair.diagnosis.factor - want.factor) < 1e-6 * Math.abs(want.factor));
        const mismatch = pair.findings.find((f: any) => f.code === 'gradient-mismatch');
        assert.ok(mismatch, 'a gradient-mismatch finding');
        assert.equal(mismatch.severity, 'error');
        if (want.components) assert.deepEqual([...mismatch.components].sort((a: number, b: number) => a - b), want.components);
      }
      if (want.status === 'pass' && !want.kind) {
        assert.ok(pair.maxRelError !== null && pair.maxRelError < 1e-4, `maxRelError ${pair.maxRelError}`);
        assert.ok(pair.lipschitz > 0 && Math.abs(pair.safeStep * pair.lipschitz - 1) < 1e-9, 'safe step is 1/L̂');
      }
      if (want.status === 'inconclusive') assert.ok(pair.findings.some((f: any) => f.code === 'non-smooth-probe' || f.severity === 'info'));
      if (want.learningRate) {
        assert.equal(pair.learningRate?.name, want.learningRate.name);
        assert.equal(pair.learningRate?.status, want.learningRate.status);
        const expectedCode = { safe: null, aggressive: 'rate-aggressive', divergent: 'rate-divergent' }[want.learningRate.status];
        if (expectedCode) assert.ok(pair.findings.some((f: any) => f.code === expectedCode), `finding ${expectedCode}`);
      }
    });
  }
});

test('text format: a table with one row per pair and the local-estimate caution', async () => {
  const run = await runCli([demoDir]);
  assert.equal(run.code, 1);
  assert.match(run.stdout, /line\s+function → derivative\s+verdict/);
  for (const want of expected) assert.ok(run.stdout.includes(want.objective), `row for ${want.objective}`);
  assert.match(run.stdout, /local estimates near the probe points/);
  assert.match(run.stdout, /\d+ pairs in \d+ files: \d+ matching, \d+ wrong, \d+ undecided, \d+ not checked/);
});
