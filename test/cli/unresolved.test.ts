// A call recipe that cannot be resolved when the check runs: a constructor that throws, a
// factory that returns something else, data of another shape than its parameter is declared.
// Each is an error on the line that named the value, saying what the value is; the file's
// other target still runs.
import assert from 'node:assert/strict';
import * as path from 'node:path';
import { before, test } from 'node:test';
import { lineOf } from '../sandbox/support';
import { fixturesDir } from '../support/paths';
import { runCli } from '../support/runCli';
import { readFileSync } from 'node:fs';

const folder = path.join(fixturesDir, 'unresolved');
const text = readFileSync(path.join(folder, 'sensors.ts'), 'utf8');
let pairs: Array<{ objective: string; status: string; findings: Array<{ code: string; message: string; line: number }> }>;

before(async () => {
  const run = await runCli(['--format', 'json', 'sensors.ts'], { cwd: folder });
  assert.equal(run.code, 1, run.stderr);
  pairs = JSON.parse(run.stdout).files[0].pairs;
});

const only = (objective: string) => {
  const pair = pairs.find((p) => p.objective === objective);
  assert.ok(pair, objective);
  assert.equal(pair.status, 'error');
  assert.equal(pair.findings.length, 1, JSON.stringify(pair.findings));
  return pair.findings[0];
};

test('a class built without arguments whose constructor throws: the error and the throwing line', () => {
  const finding = only('Sensor.loss');
  assert.equal(finding.code, 'runtime-error');
  assert.match(finding.message, /Constructing 'new Sensor\(\)' threw: RangeError: no calibration table loaded/);
  assert.equal(finding.line, lineOf(text, "throw new RangeError('no calibration"));
});

test('a factory that returned null: unresolved-target on the line of the const that holds it', () => {
  const finding = only('problem.f');
  assert.equal(finding.code, 'unresolved-target');
  assert.match(finding.message, /'problem' is null, not an object with methods/);
  assert.equal(finding.line, lineOf(text, 'export const problem'));
});

test('data of another shape than the parameter is declared: what the value is, on the call that passed it', () => {
  const finding = only('fitError');
  assert.equal(finding.code, 'unresolved-target');
  assert.match(finding.message, /is an object with keys a, b, but the parameter `X` it is passed to is declared `number\[\]\[\]`/);
  assert.equal(finding.line, lineOf(text, 'fitErrorGrad([1], samples'));
});

test('the file’s other target still runs and passes', () => {
  assert.equal(pairs.find((p) => p.objective === 'bowl')?.status, 'pass');
});
