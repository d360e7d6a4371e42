// Where the functions live: exported instances, classes built without arguments, instances
// and factory results at module level, object literals, CommonJS exports, imports. The
// recipe must say how the sandbox reaches each, and the names must be the user's.
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import { discoverPairs, onlyPair, pairNames, source } from './support';

const methods = [
  '  loss(w: number[]): number { return this.scale * w[0] * w[0]; }',
  '  lossGrad(w: number[]): number[] { return [2 * this.scale * w[0]]; }',
];

test('an exported instance: its methods pair, called on the instance', () => {
  const text = source('class Bowl {', '  constructor(private scale: number) {}', ...methods, '}', 'export const model = new Bowl(3);');
  const pair = onlyPair(discoverPairs(text, 'bowl.ts'));
  assert.deepEqual(pairNames({ pairs: [pair], fileFindings: [] }), [['model.loss', 'model.lossGrad']]);
  assert.deepEqual(pair.plan.recipe, { host: { key: 'model', construct: false }, value: 'loss', derivative: 'lossGrad', split: null, extraArguments: [] });
  assert.equal(pair.plan.label, 'model.loss');
});

test('an exported class whose constructor takes no arguments is built by the sandbox', () => {
  const text = source('export class Bowl {', '  scale = 2;', ...methods, '}');
  const pair = onlyPair(discoverPairs(text, 'bowl.ts'));
  assert.deepEqual(pair.plan.recipe.host, { key: 'Bowl', construct: true });
  assert.equal(pair.objective.name, 'Bowl.loss');
});

test('a class that needs arguments and has no instance in the file gives no target', () => {
  const text = source('export class Bowl {', '  constructor(private scale: number) {}', ...methods, '}');
  assert.deepEqual(discoverPairs(text, 'bowl.ts').pairs, []);
});

test('an instance built at module level without export is used, not a second construction', () => {
  const text = source('export class Bowl {', '  scale = 1;', ...methods, '}', 'const fitted = new Bowl();');
  const pair = onlyPair(discoverPairs(text, 'bowl.ts'));
  assert.deepEqual(pair.plan.recipe.host, { key: 'fitted', construct: false });
});

test("a factory's result, with functions declared inside the factory, and an object literal of arrows", () => {
  const text = source(
    'function makeObjective(data: number[]) {',
    '  function f(p: number[]) { return data[0] * p[0] * p[0]; }',
    '  function grad(p: number[]) { return [2 * data[0] * p[0]]; }',
    '  return { f, grad };',
    '}',
    'export const problem = makeObjective([2]);',
    'export const spring = { energy: (x: number[]) => 0.5 * x[0] * x[0], energyGrad: (x: number[]) => [x[0]] };',
  );
  const result = discoverPairs(text, 'factory.ts');
  assert.deepEqual(pairNames(result), [
    ['problem.f', 'problem.grad'],
    ['spring.energy', 'spring.energyGrad'],
  ]);
  // The factory itself returns functions, not a value with its gradient.
  assert.ok(result.pairs.every((pair) => pair.plan.recipe.split === null));
  // A runtime failure of the host is reported where the host is named.
  assert.equal(text.slice(result.pairs[0].recipeSpans.problem.start, result.pairs[0].recipeSpans.problem.end), 'problem');
});

test('value and gradient from one function: [f, g], { loss, grad }, { cost, dw }, { value, dx }', () => {
  const text = source(
    'export function a(x: number[]) { let f = 0; const g = [0]; f += x[0] ** 2; g[0] = 2 * x[0]; return [f, g]; }',
    'export function b(x: number[]) { return { loss: x[0] ** 2, grad: [2 * x[0]] }; }',
    'export function c(x: number[]) { const dw = [2 * x[0]]; const cost = x[0] ** 2; return { cost, dw }; }',
    'export function d(x: number[]): { value: number; dx: number[] } { return { value: x[0] ** 2, dx: [2 * x[0]] }; }',
  );
  assert.deepEqual(
    discoverPairs(text, 'both.ts').pairs.map((pair) => [pair.objective.name, pair.plan.recipe.split]),
    [
      ['a', { value: '0', derivative: '1' }],
      ['b', { value: 'loss', derivative: 'grad' }],
      ['c', { value: 'cost', derivative: 'dw' }],
      ['d', { value: 'value', derivative: 'dx' }],
    ],
  );
});

test('CommonJS: exports.f = function …, module.exports = { … }, and a start exported the same way', () => {
  const text = source(
    'exports.loss = function (k) { return k[0] * k[0]; };',
    'exports.lossGrad = function (k) { return [2 * k[0]]; };',
    'function cost(p) { return p[0] ** 4; }',
    'function costPrime(p) { return [4 * p[0] ** 3]; }',
    'module.exports.k0 = [0.5];',
    'module.exports = Object.assign(module.exports, {});',
    'Object.assign(exports, { cost, costPrime });',
  );
  const result = discoverPairs(text, 'shelf.js');
  assert.deepEqual(pairNames(result), [
    ['loss', 'lossGrad'],
    ['cost', 'costPrime'],
  ]);
  assert.deepEqual([result.pairs[0].plan.recipe.value, result.pairs[0].plan.recipe.derivative], ['exports.loss', 'exports.lossGrad']);
  assert.equal(result.pairs[0].plan.start, 'module.exports.k0');
});

test('across files: an imported objective pairs with the gradient written here; two imports are not paired here', () => {
  const gradientHere = source(
    "import { reachError } from './arm';",
    'export function reachErrorGrad(q: [number, number]): [number, number] { return [q[0], q[1]]; }',
  );
  const pair = onlyPair(discoverPairs(gradientHere, 'armGrad.ts'));
  assert.deepEqual([pair.plan.recipe.value, pair.plan.recipe.derivative, pair.plan.dimension], ['reachError', 'reachErrorGrad', 2]);

  const tagged = source("import { misfit as m } from './survey';", '/** @gradientOf m */', 'export function slope(x: number[]) { return [x[0]]; }');
  assert.deepEqual(pairNames(discoverPairs(tagged, 'slope.ts')), [['m', 'slope']]);

  const bothImported = source("import { loss, lossGrad } from './model';", 'export const w = lossGrad([1, 2]);');
  assert.deepEqual(discoverPairs(bothImported, 'train.ts').pairs, []);
});
