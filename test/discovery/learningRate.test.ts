// Declared learning rates: tags, conventional names, arithmetic values and spans.
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import { assertSpanCovers, discoverPairs, onlyPair, source } from './support';

const pairSource = [
  'export function loss(x: [number, number]) { return x[0] ** 2; }',
  'export function lossGrad(x: [number, number]) { return [2 * x[0], 0]; }',
];
const secondPairSource = [
  'export function cost(x: [number, number]) { return x[1] ** 2; }',
  'export function costGrad(x: [number, number]) { return [0, 2 * x[1]]; }',
];

test('each conventional name is used when the file has exactly one pair', () => {
  for (const name of ['learningRate', 'lr', 'stepSize', 'alpha', 'eta']) {
    const text = source(...pairSource, `export const ${name} = 0.05;`);
    const pair = onlyPair(discoverPairs(text, 'model.ts'));
    assert.deepEqual(pair.plan.learningRate, { name, value: 0.05 }, name);
    assert.equal(pair.learningRate?.name, name);
  }
});

test('a conventional name need not be exported', () => {
  const pair = onlyPair(discoverPairs(source(...pairSource, 'const lr = 0.05;'), 'model.ts'));
  assert.deepEqual(pair.plan.learningRate, { name: 'lr', value: 0.05 });
});

test('other names and non-numeric consts are not learning rates', () => {
  for (const line of [
    'export const rate = 0.05;',
    "export const lr = 'fast';",
    'export const lr = [0.1];',
    'export const lr = Math.PI / 100;',
    'export const lr = -0.1;',
    'export const lr = 0;',
    'export let lr = 0.1;',
  ]) {
    const pair = onlyPair(discoverPairs(source(...pairSource, line), 'model.ts'));
    assert.equal(pair.plan.learningRate, null, line);
    assert.equal(pair.learningRate, null, line);
  }
});

test('with two pairs a conventional name alone is ambiguous and not used', () => {
  const result = discoverPairs(source(...pairSource, ...secondPairSource, 'export const lr = 0.1;'), 'model.ts');
  assert.equal(result.pairs.length, 2);
  assert.ok(result.pairs.every((pair) => pair.plan.learningRate === null));
});

test('@learningRateFor assigns a rate of any name to its pair', () => {
  const text = source(
    ...pairSource,
    ...secondPairSource,
    '/** @learningRateFor cost */',
    'export const costStep = 0.25;',
    '/** @learningRateFor loss */',
    'export const lr = 0.125;',
  );
  const result = discoverPairs(text, 'model.ts');
  assert.deepEqual(
    result.pairs.map((pair) => [pair.objective.name, pair.plan.learningRate]),
    [
      ['loss', { name: 'lr', value: 0.125 }],
      ['cost', { name: 'costStep', value: 0.25 }],
    ],
  );
});

test('a tagged rate wins over a conventional name', () => {
  const text = source(...pairSource, 'export const lr = 0.5;', '/** @learningRateFor loss */', 'export const chosen = 0.01;');
  assert.deepEqual(onlyPair(discoverPairs(text, 'model.ts')).plan.learningRate, { name: 'chosen', value: 0.01 });
});

test('@learningRateFor naming no pair is reported at the tag', () => {
  const text = source(...pairSource, '/** @learningRateFor lossTypo */', 'export const lr = 0.5;');
  const result = discoverPairs(text, 'model.ts');
  assert.equal(onlyPair(result).plan.learningRate, null);
  assert.equal(result.fileFindings.length, 1);
  assert.equal(result.fileFindings[0].subject, 'learningRate');
  assertSpanCovers(text, result.fileFindings[0].span, '@learningRateFor lossTypo');
});

test('arithmetic of literals is evaluated from the syntax tree', () => {
  // Expected values are the same expressions evaluated by JavaScript itself.
  const cases: Array<[string, number]> = [
    ['1 / 200', 1 / 200],
    ['2e-3 * 0.5', 2e-3 * 0.5],
    ['-(-0.1)', 0.1],
    ['(1 + 1) / (4 * 10)', (1 + 1) / (4 * 10)],
    ['10 ** -3', 10 ** -3],
    ['0.3 - 0.1', 0.3 - 0.1],
    ['1_000 / 1e5', 1_000 / 1e5],
    ['0x10 / 256', 0x10 / 256],
    ['+0.02', 0.02],
    ['0.01 as const', 0.01],
  ];
  for (const [expression, expected] of cases) {
    const pair = onlyPair(discoverPairs(source(...pairSource, `export const lr = ${expression};`), 'model.ts'));
    assert.equal(pair.plan.learningRate?.value, expected, expression);
  }
});

test('name, value and declaration spans of a learning rate', () => {
  const text = source(...pairSource, '', '/** Step size. */', 'export const stepSize = 1 / 200;');
  const rate = onlyPair(discoverPairs(text, 'model.ts')).learningRate;
  assert.ok(rate);
  assertSpanCovers(text, rate.nameSpan, 'stepSize');
  assertSpanCovers(text, rate.valueSpan, '1 / 200');
  assertSpanCovers(text, rate.declarationSpan, 'export const stepSize = 1 / 200;');
});

test('a rate exported through export { } counts', () => {
  const text = source(...pairSource, 'const lr = 0.02;', 'export { lr };');
  assert.deepEqual(onlyPair(discoverPairs(text, 'model.ts')).plan.learningRate, { name: 'lr', value: 0.02 });
});

test('a field of a module-level options object, nested one level deep', () => {
  const opts = onlyPair(discoverPairs(source(...pairSource, 'const opts = { lr: 0.05, iters: 200 };'), 'model.ts'));
  assert.deepEqual(opts.plan.learningRate, { name: 'opts.lr', value: 0.05 });
  const nested = onlyPair(discoverPairs(source(...pairSource, 'export const config = { epochs: 3, optimizer: { learningRate: 2e-3 } };'), 'model.ts'));
  assert.deepEqual(nested.plan.learningRate, { name: 'config.optimizer.learningRate', value: 2e-3 });
  assertSpanCovers(source(...pairSource, 'export const config = { epochs: 3, optimizer: { learningRate: 2e-3 } };'), nested.learningRate!.valueSpan, '2e-3');
});

test("the rate of the training loop's update, with the momentum coefficient next to it", () => {
  const text = source(
    ...pairSource,
    ...secondPairSource,
    'const step = 0.02;',
    'const beta = 0.9;',
    'export function train(w: [number, number]) {',
    '  const v = [0, 0];',
    '  for (let k = 0; k < 100; k++) {',
    '    const g = costGrad(w);',
    '    for (let j = 0; j < 2; j++) { v[j] = beta * v[j] + g[j]; w[j] -= step * v[j]; }',
    '  }',
    '}',
  );
  const result = discoverPairs(text, 'model.ts');
  assert.deepEqual(
    result.pairs.map((pair) => [pair.objective.name, pair.plan.learningRate]),
    [
      ['loss', null],
      ['cost', { name: 'step', value: 0.02, momentum: { name: 'beta', value: 0.9 } }],
    ],
  );
});

test('a parameter default of the training function, and options written into the optimizer call', () => {
  const loop = source(...pairSource, 'export function fit(w: [number, number], lr = 0.3) {', '  const g = lossGrad(w);', '  return w.map((wi, i) => wi - lr * g[i]);', '}');
  assert.deepEqual(onlyPair(discoverPairs(loop, 'model.ts')).plan.learningRate, { name: 'lr', value: 0.3 });
  const handed = source(...pairSource, 'export const result = descend(loss, lossGrad, [1, 1], { maxIter: 50, stepSize: 0.125 });');
  assert.deepEqual(onlyPair(discoverPairs(handed, 'model.ts')).plan.learningRate, { name: 'stepSize', value: 0.125 });
});

test("a rate passed to the training function: what the file's call of it passes", () => {
  const text = source(...pairSource, 'function sgd(w: [number, number], rate: number) {', '  const g = lossGrad(w);', '  return [w[0] - rate * g[0], w[1] - rate * g[1]];', '}', 'export const fitted = sgd([1, 1], 0.0625);');
  const pair = onlyPair(discoverPairs(text, 'model.ts'));
  assert.deepEqual(pair.plan.learningRate, { name: 'rate', value: 0.0625 });
  assertSpanCovers(text, pair.learningRate!.valueSpan, '0.0625');
});
