// SARIF output validated against the OASIS SARIF 2.1.0 JSON schema
// (sarif-schema-2.1.0, OASIS Static Analysis Results Interchange Format
// Version 2.1.0, 2020; the rtm.5 copy shipped in the npm package
// @microsoft/jest-sarif, a JSON Schema draft-04 document, hence ajv-draft-04).
import Ajv from 'ajv-draft-04';
import addFormats from 'ajv-formats';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import * as path from 'node:path';
import { test } from 'node:test';
import { fixturesDir, repoRoot } from '../support/paths';
import { runCli } from '../support/runCli';

test('slopecheck --format sarif over the demo is valid SARIF 2.1.0 with our rules and results', async () => {
  const run = await runCli(['--format', 'sarif', path.join(fixturesDir, 'demo')]);
  assert.equal(run.code, 1);
  const log: any = JSON.parse(run.stdout);
  const schema = JSON.parse(readFileSync(path.join(repoRoot, 'node_modules/@microsoft/jest-sarif/lib/schemas/sarif-2.1.0-rtm.5.json'), 'utf8'));
  const ajv = new Ajv({ strict: false, allErrors: true, unicodeRegExp: false });
  addFormats(ajv);
  const validate = ajv.compile(schema);
  const valid = validate(JSON.parse(run.stdout));
  assert.ok(valid, JSON.stringify(validate.errors?.slice(0, 5), null, 1));

  assert.equal(log.version, '2.1.0');
  const run0 = log.runs[0];
  const ruleIds = run0.tool.driver.rules.map((r: any) => r.id);
  assert.ok(run0.results.length > 0);
  for (const result of run0.results) {
    assert.ok(ruleIds.includes(result.ruleId));
    assert.equal(ruleIds[result.ruleIndex], result.ruleId);
    const loc = result.locations[0].physicalLocation;
    assert.ok(loc.region.startLine >= 1);
    assert.match(loc.artifactLocation.uri, /\.ts$/);
  }
  assert.ok(run0.results.some((r: any) => r.ruleId === 'gradient-mismatch' && r.level === 'error'));
  // The demo's Jacobian and Hessian (fixtures/demo/expected.json): rows of their own, on the derivative's line.
  const lineOf = (file: string, needle: string) => readFileSync(path.join(fixturesDir, 'demo', 'src', file), 'utf8').split('\n').findIndex((line) => line.includes(needle)) + 1;
  const at = (ruleId: string, file: string) => run0.results.find((r: any) => r.ruleId === ruleId && r.locations[0].physicalLocation.artifactLocation.uri.endsWith(file));
  assert.equal(at('jacobian-mismatch', 'sonde.ts')?.locations[0].physicalLocation.region.startLine, lineOf('sonde.ts', 'export function sondeJacobian'));
  assert.equal(at('hessian-not-symmetric', 'raft.ts')?.locations[0].physicalLocation.region.startLine, lineOf('raft.ts', 'export function raftEnergyHessian'));
  assert.match(at('jacobian-mismatch', 'sonde.ts').message.text, /column 1 wrong/);
});
