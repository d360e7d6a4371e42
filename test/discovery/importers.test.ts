// Data from a file that imports the pair: a training script calling `mseGrad(w, train)` with its
// own module-level `train`. The pair is then run with that script as the bundle's entry.
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import { documentNamespace } from '../../server/src/discovery/importerCalls';
import { ImporterIndex, specifierNames } from '../../server/src/discovery/importers';
import { discoverPairs, onlyPair, source } from './support';

const model = source(
  'export interface Batch { t: number[]; h: number[] }',
  'export function mse(w: number[], batch: Batch): number { return (w[0] * batch.t[0] - batch.h[0]) ** 2; }',
  'export function mseGrad(w: number[], batch: Batch): number[] { return [2 * batch.t[0] * (w[0] * batch.t[0] - batch.h[0])]; }',
);
const train = source(
  "import { mse, mseGrad as slope, type Batch } from './model.js';",
  'const train: Batch = { t: [1, 2], h: [2, 4] };',
  'export function fit() {',
  '  const w = [0.5];',
  '  for (let k = 0; k < 10; k++) w[0] -= 0.1 * slope(w, train)[0];',
  '  return mse(w, train);',
  '}',
);

test('specifiers name a file with or without its extension, as .js for .ts, and by folder for index files', () => {
  assert.ok(specifierNames('./model', '/w/src/train.ts', '/w/src/model.ts'));
  assert.ok(specifierNames('./model.js', '/w/src/train.ts', '/w/src/model.ts'));
  assert.ok(specifierNames('../src/model', '/w/scripts/train.ts', '/w/src/model.ts'));
  assert.ok(specifierNames('./lib', '/w/src/train.ts', '/w/src/lib/index.ts'));
  assert.ok(!specifierNames('./modelling', '/w/src/train.ts', '/w/src/model.ts'));
  assert.ok(!specifierNames('model', '/w/src/train.ts', '/w/src/model.ts'), 'a package name is not a workspace file');
});

test('the importer index lists the files that import a file, never the file itself', () => {
  const index = new ImporterIndex([
    { fileName: '/w/model.ts', text: model },
    { fileName: '/w/train.ts', text: train },
    { fileName: '/w/plot.ts', text: "import { draw } from './chart';\n" },
  ]);
  assert.deepEqual(index.importersOf('/w/model.ts').map((s) => s.fileName), ['/w/train.ts']);
  assert.deepEqual(index.importersOf('/w/train.ts'), []);
});

test("the importer's call supplies the data; its loop supplies the start; the functions go through the namespace", () => {
  const alone = onlyPair(discoverPairs(model, '/w/model.ts'));
  assert.ok(alone.findings.some((f) => f.code === 'missing-argument'));
  assert.equal(alone.entry, null);

  const pair = onlyPair(discoverPairs(model, '/w/model.ts', () => [{ fileName: '/w/train.ts', text: train }]));
  assert.deepEqual(pair.findings.filter((f) => f.code === 'missing-argument' || f.code === 'unknown-dimension'), []);
  assert.deepEqual(pair.entry && { fileName: pair.entry.fileName, specifier: pair.entry.specifier, line: pair.entry.line }, { fileName: '/w/train.ts', specifier: './model.js', line: 5 });
  assert.deepEqual(pair.plan.recipe, {
    host: null,
    value: `${documentNamespace}.mse`,
    derivative: `${documentNamespace}.mseGrad`,
    split: null,
    extraArguments: ['train'],
    extraParameters: [{ name: 'batch', declared: 'Batch', shape: 'object' }],
  });
  assert.equal(pair.plan.start, '[0.5]');
  // The names the user knows stay those of the document.
  assert.deepEqual([pair.objective.name, pair.gradient?.name], ['mse', 'mseGrad']);
});

test('an importer whose call passes its own local values cannot supply them', () => {
  const local = source("import { mse, mseGrad } from './model';", 'export function fit(data) { return mseGrad([1], data); }');
  const pair = onlyPair(discoverPairs(model, '/w/model.ts', () => [{ fileName: '/w/train.ts', text: local }]));
  assert.equal(pair.entry, null);
  assert.ok(pair.findings.some((f) => f.code === 'missing-argument'));
});
