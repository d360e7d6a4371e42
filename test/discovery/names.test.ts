// Pairing beyond `XGrad`: shared stems and derivative prefixes, the generic `gradient` next to
// the only objective-like function, signatures that confirm or rule out a pair, and the
// information findings for ambiguous and unpaired functions. Sources are written the way
// practitioners name things (common practice), not in the product's own conventions.
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import { discoverPairs, fileFindingCodes, pairNames, source } from './support';

const sum = (name: string, ret = 'number') => `export function ${name}(x: number[]): ${ret} { return x[0] * x[0] + x[1]; }`;
const grad = (name: string) => `export function ${name}(x: number[]): number[] { return [2 * x[0], 1]; }`;

test('derivative names that name their objective whole: Prime, d…, grad…, gradF, df', () => {
  const cases: Array<[string, string]> = [
    ['cost', 'costPrime'],
    ['loss', 'dLoss'],
    ['f', 'df'],
    ['f', 'gradF'],
    ['nll', 'nllGrad'],
    ['residualSS', 'residualSSGradient'],
    ['risk', 'risk_prime'],
    ['f', 'fprime'],
  ];
  for (const [objective, derivative] of cases) {
    const result = discoverPairs(source(sum(objective), grad(derivative)), 'fit.ts');
    assert.deepEqual(pairNames(result), [[objective, derivative]], derivative);
    assert.equal(result.pairs[0].matchedBy, 'name', derivative);
  }
});

test('a shared stem pairs softmaxLoss with softmaxGrad, confirmed by what each returns', () => {
  const result = discoverPairs(source(sum('softmaxLoss'), grad('softmaxGrad'), sum('hingeCost'), grad('hingeGradient')), 'classify.ts');
  assert.deepEqual(pairNames(result), [
    ['softmaxLoss', 'softmaxGrad'],
    ['hingeCost', 'hingeGradient'],
  ]);
  assert.ok(result.pairs.every((pair) => pair.matchedBy === 'shared-stem'));
});

test('the same word after the role: gradFn with lossFn, gradientFunction with costFunction', () => {
  const result = discoverPairs(source(sum('lossFn'), grad('gradFn'), sum('costFunction'), grad('gradientFunction')), 'roles.ts');
  assert.deepEqual(pairNames(result), [
    ['lossFn', 'gradFn'],
    ['costFunction', 'gradientFunction'],
  ]);
});

test('a generic `gradient` pairs with the only objective-like function; with two it lists both and the tag', () => {
  const alone = discoverPairs(source(sum('energy'), grad('gradient'), 'function dot(a: number[], b: number[]) { return a[0] * b[0]; }'), 'pose.ts');
  assert.deepEqual(pairNames(alone), [['energy', 'gradient']]);
  assert.equal(alone.pairs[0].matchedBy, 'only-candidate');

  const two = discoverPairs(source(sum('objective'), sum('energy'), grad('gradient')), 'pose.ts');
  assert.deepEqual(two.pairs, []);
  assert.deepEqual(fileFindingCodes(two), ['ambiguous-pair']);
  assert.match(two.fileFindings[0].message, /`gradient` could be the gradient of `objective` or `energy`.*\/\*\* @gradientOf objective \*\//);
});

test('functions paired by a stronger rule are not candidates of the generic one', () => {
  const result = discoverPairs(source(sum('loss'), grad('lossGrad'), sum('energy'), grad('gradient')), 'mixed.ts');
  assert.deepEqual(pairNames(result), [
    ['loss', 'lossGrad'],
    ['energy', 'gradient'],
  ]);
  assert.deepEqual(result.fileFindings, []);
});

test('two equally good gradients for one objective are both left out, with the tag that settles it', () => {
  const result = discoverPairs(source(sum('loss'), grad('lossGrad'), grad('gradLoss')), 'twice.ts');
  assert.deepEqual(result.pairs, []);
  assert.deepEqual(fileFindingCodes(result), ['ambiguous-pair']);
  assert.match(result.fileFindings[0].message, /`loss` has more than one candidate gradient: `lossGrad` or `gradLoss`/);
});

test('signatures rule out a pair: an objective returning a vector, or first parameters of different types', () => {
  const vectorObjective = discoverPairs(source('export function loss(x: number[]): number[] { return x; }', grad('lossGrad')), 'a.ts');
  assert.deepEqual(vectorObjective.pairs, []);
  assert.deepEqual(fileFindingCodes(vectorObjective), ['unpaired-function']);
  assert.match(vectorObjective.fileFindings[0].message, /`loss` returns a vector, so it cannot be the objective/);

  const mismatched = discoverPairs(source('export function loss(x: Float64Array): number { return x[0]; }', grad('lossGrad')), 'b.ts');
  assert.deepEqual(mismatched.pairs, []);
  assert.match(mismatched.fileFindings[0].message, /`loss` takes `Float64Array` but `lossGrad` takes `number\[\]`/);
});

test('scalar helpers are not pairs and raise nothing: sigmoid and sigmoidPrime take a number', () => {
  const text = source(
    'function sigmoid(z: number) { return 1 / (1 + Math.exp(-z)); }',
    'function sigmoidPrime(z: number) { const s = sigmoid(z); return s * (1 - s); }',
    sum('loss'),
    grad('lossGrad'),
  );
  const result = discoverPairs(text, 'net.ts');
  assert.deepEqual(pairNames(result), [['loss', 'lossGrad']]);
  assert.deepEqual(result.fileFindings, []);
});

test('return shapes are read from locals and helpers when no type is written (JavaScript)', () => {
  const text = source(
    'function predict(w, x) { return w[0] * x + w[1]; }',
    'export function mse(w) {',
    '  let total = 0;',
    '  for (let i = 0; i < 3; i++) total += (predict(w, i) - i) ** 2;',
    '  return total / 3;',
    '}',
    'export function mseGrad(w) {',
    '  const g = new Array(2).fill(0);',
    '  for (let i = 0; i < 3; i++) { const r = predict(w, i) - i; g[0] += (2 * r * i) / 3; g[1] += (2 * r) / 3; }',
    '  return g;',
    '}',
  );
  assert.deepEqual(pairNames(discoverPairs(text, 'fit.js')), [['mse', 'mseGrad']]);
});

test('`misfitSlope` is the gradient of `misfit`', () => {
  assert.deepEqual(pairNames(discoverPairs(source(sum('misfit'), grad('misfitSlope')), 'fit.ts')), [['misfit', 'misfitSlope']]);
});

test('a function returning a vector from the same declared parameter as an unpaired objective is reported, whatever its name', () => {
  const text = source(
    'export class Reach {',
    '  private tip(q: Float64Array): [number, number] { return [q[0], q[1]]; }',
    '  distanceSq(q: Float64Array): number { return q[0] * q[0]; }',
    '  jacobianTransposeResidual(q: Float64Array): Float64Array { return new Float64Array([2 * q[0]]); }',
    '}',
    'export const pick = new Reach();',
  );
  const result = discoverPairs(text, 'reach.ts');
  assert.deepEqual(result.pairs, []);
  // The private helper is no candidate; the public method is, with the tag that pairs it.
  assert.deepEqual(fileFindingCodes(result), ['unpaired-function']);
  assert.match(result.fileFindings[0].message, /`pick\.jacobianTransposeResidual` looks like a gradient.*If it is the gradient of `pick\.distanceSq`, tag it, e\.g\. \/\*\* @gradientOf distanceSq \*\//);
});
