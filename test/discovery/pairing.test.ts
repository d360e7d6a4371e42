// Pairing conventions: gradient names, declaration forms, `export { }`, @gradientOf, combined functions.
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import { discoverPairs, fileFindingCodes, findingCodes, onlyPair, pairNames, source } from './support';

const tuple = 'x: [number, number]';

test('each gradient name convention pairs with its objective', () => {
  const text = source(
    `export function loss(${tuple}) { return x[0] * x[0]; }`,
    `export function lossGrad(${tuple}) { return [2 * x[0], 0]; }`,
    `export function energy(${tuple}) { return x[1]; }`,
    `export function gradEnergy(${tuple}) { return [0, 1]; }`,
    `export function cost(${tuple}) { return x[0]; }`,
    `export function costGradient(${tuple}) { return [1, 0]; }`,
    `export function risk(${tuple}) { return x[0] + x[1]; }`,
    `export function risk_grad(${tuple}) { return [1, 1]; }`,
  );
  const result = discoverPairs(text, 'model.ts');
  assert.deepEqual(pairNames(result), [
    ['loss', 'lossGrad'],
    ['energy', 'gradEnergy'],
    ['cost', 'costGradient'],
    ['risk', 'risk_grad'],
  ]);
  assert.ok(result.pairs.every((pair) => pair.matchedBy === 'name' && pair.plan.recipe.split === null));
  assert.deepEqual(result.fileFindings, []);
});

test('gradX needs the capitalised objective name; the unpaired gradient says why', () => {
  const text = source(`export function loss(${tuple}) { return 0; }`, `export function gradloss(${tuple}) { return [0, 0]; }`);
  const result = discoverPairs(text, 'model.ts');
  assert.deepEqual(result.pairs, []);
  assert.deepEqual(fileFindingCodes(result), ['unpaired-function']);
  assert.match(result.fileFindings[0].message, /`gradloss` looks like a gradient but was not paired: no objective name matches it\. If it is the gradient of `loss`, tag it, e\.g\. \/\*\* @gradientOf loss \*\//);
});

test('arrow functions and function expressions in exported consts count', () => {
  const text = source(
    `export const loss = (${tuple}) => x[0] * x[1];`,
    `export const lossGrad = function (${tuple}) { return [x[1], x[0]]; };`,
    `export const area = function area(${tuple}) { return x[0] * x[1]; };`,
    `export const areaGrad = ((${tuple}) => [x[1], x[0]]);`,
  );
  assert.deepEqual(pairNames(discoverPairs(text, 'model.ts')), [
    ['loss', 'lossGrad'],
    ['area', 'areaGrad'],
  ]);
});

test('functions need not be exported; non-function consts are not paired', () => {
  const text = source(
    `function loss(${tuple}) { return 0; }`,
    `function lossGrad(${tuple}) { return [0, 0]; }`,
    `export function cost(${tuple}) { return 0; }`,
    'export const costGrad = [0, 0];',
  );
  assert.deepEqual(pairNames(discoverPairs(text, 'model.ts')), [['loss', 'lossGrad']]);
});

test('an exported gradient without its objective gets an information finding, not silence', () => {
  const text = source(`export function orphanGrad(${tuple}) { return [0, 0]; }`);
  const result = discoverPairs(text, 'model.ts');
  assert.deepEqual(result.pairs, []);
  assert.deepEqual(result.fileFindings.map((f) => [f.code, f.severity]), [['unpaired-function', 'info']]);
  assert.match(result.fileFindings[0].message, /no function next to it returns a number/);
});

test('export { } lists, with and without renaming, count under their exported names', () => {
  const text = source(
    `function quadratic(${tuple}) { return x[0] ** 2; }`,
    `const slope = (${tuple}) => [2 * x[0], 0];`,
    `function helper(${tuple}) { return 1; }`,
    'export { quadratic, slope as quadraticGrad };',
  );
  const pair = onlyPair(discoverPairs(text, 'model.ts'));
  assert.equal(pair.objective.name, 'quadratic');
  // The sandbox reaches the functions by their local names.
  assert.deepEqual([pair.plan.recipe.value, pair.plan.recipe.derivative], ['quadratic', 'slope']);
  // Spans point at the local declarations, where the code and any JSDoc live.
  assert.equal(pair.gradient?.name, 'quadraticGrad');
  assert.equal(text.slice(pair.gradient!.nameSpan.start, pair.gradient!.nameSpan.end), 'slope');
});

test('@gradientOf pairs a gradient of any name and wins over name matching', () => {
  const text = source(
    `export function loss(${tuple}) { return x[0] ** 2 + x[1] ** 2; }`,
    `export function lossGrad(${tuple}) { return [0, 0]; }`,
    '/** @gradientOf loss */',
    `export function analyticSlope(${tuple}) { return [2 * x[0], 2 * x[1]]; }`,
  );
  const result = discoverPairs(text, 'model.ts');
  const pair = onlyPair(result);
  assert.equal(pair.plan.recipe.derivative, 'analyticSlope');
  assert.equal(pair.matchedBy, 'tag');
});

test('@gradientOf may name the local function behind an export { a as b }', () => {
  const text = source(
    `function inner(${tuple}) { return x[0]; }`,
    '/** @gradientOf inner */',
    `export const slope = (${tuple}) => [1, 0];`,
    'export { inner as loss };',
  );
  const pair = onlyPair(discoverPairs(text, 'model.ts'));
  assert.deepEqual([pair.objective.name, pair.gradient?.name], ['loss', 'slope']);
  assert.deepEqual([pair.plan.recipe.value, pair.plan.recipe.derivative], ['inner', 'slope']);
  assert.deepEqual(pair.findings, []);
});

test('@gradientOf may name a function that is not exported', () => {
  const text = source(`function loss(${tuple}) { return 0; }`, '/** @gradientOf loss */', `export function slope(${tuple}) { return [0, 0]; }`);
  const pair = onlyPair(discoverPairs(text, 'model.ts'));
  assert.deepEqual(pairNames({ pairs: [pair], fileFindings: [] }), [['loss', 'slope']]);
  assert.deepEqual(pair.findings, []);
});

test('@gradientOf naming nothing in the file gives a file-level missing-export error at the tag', () => {
  const text = source('/** @gradientOf lossTypo */', `export function slope(${tuple}) { return [0, 0]; }`);
  const result = discoverPairs(text, 'model.ts');
  assert.deepEqual(result.pairs, []);
  assert.equal(result.fileFindings.length, 1);
  const [finding] = result.fileFindings;
  assert.equal(finding.code, 'missing-export');
  assert.equal(finding.severity, 'error');
  assert.equal(finding.subject, 'gradient');
  assert.equal(text.slice(finding.span.start, finding.span.end), '@gradientOf lossTypo');
});

test('a tagged gradient that is not exported is paired', () => {
  const text = source(`export function loss(${tuple}) { return 0; }`, '/** @gradientOf loss */', `function slope(${tuple}) { return [0, 0]; }`);
  assert.deepEqual(pairNames(discoverPairs(text, 'model.ts')), [['loss', 'slope']]);
});

test('combined functions: by tag, by name and by declared return type', () => {
  const text = source(
    'interface Evaluation { value: number; grad: number[] }',
    'type Both = { value: number; gradient: number[] };',
    '/** @valueAndGradient */',
    `export function tagged(${tuple}) { return { value: x[0], grad: [1, 0] }; }`,
    `export function lossValueAndGradient(${tuple}) { return { value: x[0], gradient: [1, 0] }; }`,
    `export function lossWithGradient(${tuple}) { return { value: x[0], gradient: [1, 0] }; }`,
    `export function viaInterface(${tuple}): Evaluation { return { value: x[0], grad: [1, 0] }; }`,
    `export const viaAlias = (${tuple}): Both => ({ value: x[0], gradient: [1, 0] });`,
    `export function viaLiteral(${tuple}): { value: number; grad: number[] } { return { value: 0, grad: [0, 0] }; }`,
    `export function plain(${tuple}): { value: number; other: number[] } { return { value: 0, other: [] }; }`,
  );
  const result = discoverPairs(text, 'model.ts');
  assert.deepEqual(
    result.pairs.map((pair) => [pair.objective.name, pair.plan.recipe.split?.derivative]),
    [
      ['tagged', 'grad'],
      ['lossValueAndGradient', 'gradient'],
      ['lossWithGradient', 'gradient'],
      ['viaInterface', 'grad'],
      ['viaAlias', 'gradient'],
      ['viaLiteral', 'grad'],
    ],
  );
  for (const pair of result.pairs) {
    assert.equal(pair.matchedBy, 'combined');
    assert.equal(pair.gradient, null);
    assert.equal(pair.plan.recipe.derivative, null);
    assert.equal(pair.plan.recipe.split?.value, 'value');
    assert.deepEqual(findingCodes(pair), []);
  }
});

test('pairs come in document order of the objective', () => {
  const text = source(
    `export function zetaGrad(${tuple}) { return [0, 0]; }`,
    `export function beta(${tuple}) { return 0; }`,
    `export function zeta(${tuple}) { return 0; }`,
    `export function betaGrad(${tuple}) { return [0, 0]; }`,
  );
  assert.deepEqual(pairNames(discoverPairs(text, 'model.ts')), [
    ['beta', 'betaGrad'],
    ['zeta', 'zetaGrad'],
  ]);
});
