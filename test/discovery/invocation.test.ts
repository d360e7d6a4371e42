// How a pair is called the way the file itself calls it: data arguments from a tag, a
// training loop or defaults, and the user's start point from a named const, the optimizer
// call or the training loop's initial point.
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import { discoverPairs, findingCodes, onlyPair, source } from './support';

const dataPair = [
  'export function loss(w: number[], X: number[][], y: number[]): number { return w[0] * X[0][0] - y[0]; }',
  'export function lossGrad(w: number[], X: number[][], y: number[]): number[] { return [X[0][0]]; }',
];
const data = ['const trainX = [[1], [2]];', 'const trainY = [1, 2];'];

test('@data names the module-level values passed after the point', () => {
  const pair = onlyPair(discoverPairs(source(...data, '/** @data trainX, trainY */', ...dataPair), 'fit.ts'));
  assert.deepEqual(pair.plan.recipe.extraArguments, ['trainX', 'trainY']);
  assert.deepEqual(pair.findings.filter((f) => f.code === 'missing-argument'), []);
});

test('@data naming nothing in the file is an error that shows the form', () => {
  const pair = onlyPair(discoverPairs(source(...data, '/** @data trainX, testY */', ...dataPair), 'fit.ts'));
  assert.deepEqual(findingCodes(pair).filter((c) => c === 'missing-argument'), ['missing-argument']);
  assert.match(pair.findings[0].message, /there is no `testY`/);
  assert.equal(pair.findings[0].severity, 'error');
});

test("a training loop's call supplies the data when its other arguments are module-level values", () => {
  const text = source(
    ...data,
    ...dataPair,
    'export function fit(X: number[][]) {',
    '  const w = [0];',
    '  for (let k = 0; k < 10; k++) {',
    '    lossGrad(w, X, trainY);', // X is the parameter here, not module-level: skipped
    '    const g = lossGrad(w, trainX, trainY);',
    '    w[0] -= 0.1 * g[0];',
    '  }',
    '}',
  );
  const pair = onlyPair(discoverPairs(text, 'fit.ts'));
  assert.deepEqual(pair.plan.recipe.extraArguments, ['trainX', 'trainY']);
  assert.equal(text.slice(pair.recipeSpans.trainX.start, pair.recipeSpans.trainX.end), 'trainX');
});

test("data handed to the training function are followed to its caller: fit(trainX) calling lossGrad(w, X, trainY)", () => {
  const text = source(
    ...data,
    ...dataPair,
    'export function fit(X: number[][], rate = 0.1) {',
    '  const w = [0];',
    '  for (let k = 0; k < 10; k++) w[0] -= rate * lossGrad(w, X, trainY)[0];',
    '  return w;',
    '}',
    'if (process.argv[1]?.endsWith("fit.ts")) console.log(fit(trainX));',
  );
  const pair = onlyPair(discoverPairs(text, 'fit.ts'));
  assert.deepEqual(pair.plan.recipe.extraArguments, ['trainX', 'trainY']);
  // The span of a followed value is where the caller passes it.
  assert.equal(text.slice(pair.recipeSpans.trainX.start, pair.recipeSpans.trainX.end), 'trainX');
  assert.ok(pair.recipeSpans.trainX.start > text.indexOf('console.log'));
});

test('member expressions of module-level values are arguments too: mseGrad(w, train.X, train.y)', () => {
  const text = source(
    'const train = { X: [[1]], y: [1] };',
    ...dataPair.map((line) => line.replace(/\bloss/g, 'mse')),
    'const g = mseGrad([0], train.X, train.y);',
  );
  assert.deepEqual(onlyPair(discoverPairs(text, 'fit.ts')).plan.recipe.extraArguments, ['train.X', 'train.y']);
});

test('default parameter values need nothing; a missing value is an information finding naming the parameter', () => {
  const defaults = source(
    ...data,
    'export function loss(w: number[], X = trainX, y = trainY): number { return w[0] * X[0][0] - y[0]; }',
    'export function lossGrad(w: number[], X = trainX, y = trainY): number[] { return [X[0][0]]; }',
    '/** @probe [1] */ export const unused = 0;',
  );
  const pair = onlyPair(discoverPairs(defaults, 'fit.ts'));
  assert.deepEqual(pair.plan.recipe.extraArguments, []);
  assert.ok(!findingCodes(pair).includes('missing-argument'));

  const missing = onlyPair(discoverPairs(source(...dataPair), 'fit.ts'));
  const finding = missing.findings.find((f) => f.code === 'missing-argument');
  assert.ok(finding);
  assert.equal(finding.severity, 'info');
  assert.match(finding.message, /`loss` takes `X`, `y` after the point.*@data X, y.*default value/);
});

test('a start point: a const named like a start, of any of the usual names', () => {
  for (const name of ['x0', 'w0', 'theta0', 'p0', 'initialWeights', 'initGuess', 'startPose', 'guess', 'start', 'qInit', 'poseStart']) {
    const text = source('export function f(x: number[]) { return x[0] ** 2; }', 'export function df(x: number[]) { return [2 * x[0]]; }', `const ${name} = [0.5];`);
    const pair = onlyPair(discoverPairs(text, 'start.ts'));
    assert.equal(pair.plan.start, name, name);
    assert.ok(!findingCodes(pair).includes('unknown-dimension'), name);
  }
});

test('a start of the wrong length for a tuple parameter is not taken; @probe tags win over a start', () => {
  const tuple = ['export function f(x: [number, number]) { return x[0] ** 2; }', 'export function df(x: [number, number]) { return [2 * x[0], 0]; }'];
  assert.equal(onlyPair(discoverPairs(source(...tuple, 'const x0 = [1, 2, 3];'), 's.ts')).plan.start, null);
  assert.equal(onlyPair(discoverPairs(source(...tuple, 'const x0 = [1, 2];'), 's.ts')).plan.start, 'x0');
  const probed = onlyPair(discoverPairs(source('/** @probe [1, 1] */', ...tuple, 'const x0 = [1, 2];'), 's.ts'));
  assert.equal(probed.plan.start, null);
  assert.deepEqual(probed.plan.probes, [[1, 1]]);
});

test('the point handed to an optimizer with the pair, or the initial point of a training loop', () => {
  const pair = ['function cost(p: number[]) { return p[0] ** 2; }', 'function costPrime(p: number[]) { return [2 * p[0]]; }'];
  const optimizer = source(...pair, 'const result = minimize(cost, costPrime, [0.25, 4], { lr: 0.1 });');
  assert.equal(onlyPair(discoverPairs(optimizer, 'o.ts')).plan.start, '[0.25, 4]');

  const wrapped = source(...pair, 'const D = 3;', 'const result = minimize((p) => cost(p), (p) => costPrime(p), new Float64Array(D));');
  assert.equal(onlyPair(discoverPairs(wrapped, 'o.ts')).plan.start, 'new Float64Array(D)');

  const loop = source(...pair, 'const seed = [2, 2];', 'function fit() {', '  let p = seed.slice();', '  for (let k = 0; k < 5; k++) { const g = costPrime(p); p = p.map((v, i) => v - 0.1 * g[i]); }', '}');
  assert.equal(onlyPair(discoverPairs(loop, 'o.ts')).plan.start, 'seed.slice()');

  const passedIn = source(...pair, 'function fit(from: number[]) {', '  const p = from.slice();', '  costPrime(p);', '}', 'export function main() { fit([5.5, 20]); }');
  assert.equal(onlyPair(discoverPairs(passedIn, 'o.ts')).plan.start, '[5.5, 20]');

  // The gradient called inside an arrow of the update: the point is declared by the function around it.
  const inArrow = source(...pair, 'const seed = [2, 2];', 'function fit() {', '  let p = seed.slice();', '  for (let k = 0; k < 5; k++) p = p.map((v, i) => v - 0.1 * costPrime(p)[i]);', '}');
  assert.equal(onlyPair(discoverPairs(inArrow, 'o.ts')).plan.start, 'seed.slice()');
});

test('a start built from a function-local value cannot be evaluated, so none is taken', () => {
  const text = source(
    'function cost(p: number[]) { return p[0] ** 2; }',
    'function costPrime(p: number[]) { return [2 * p[0]]; }',
    'function fit(n: number) { const p = new Array(n).fill(0); costPrime(p); }',
  );
  const pair = onlyPair(discoverPairs(text, 'o.ts'));
  assert.equal(pair.plan.start, null);
  assert.ok(findingCodes(pair).includes('unknown-dimension'));
});
