// Pairing conventions: gradient names, declaration forms, `export { }`, @gradientOf, combined functions.
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import { discoverPairs, findingCodes, onlyPair, pairNames, source } from './support';

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
  assert.ok(result.pairs.every((pair) => pair.matchedBy === 'name' && pair.plan.combined === null));
  assert.deepEqual(result.fileFindings, []);
});

test('gradX needs the capitalised objective name', () => {
  const text = source(`export function loss(${tuple}) { return 0; }`, `export function gradloss(${tuple}) { return [0, 0]; }`);
  assert.deepEqual(discoverPairs(text, 'model.ts').pairs, []);
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

test('unexported functions and non-function consts are not paired', () => {
  const text = source(
    `function loss(${tuple}) { return 0; }`,
    `export function lossGrad(${tuple}) { return [0, 0]; }`,
    `export function cost(${tuple}) { return 0; }`,
    'export const costGrad = [0, 0];',
  );
  assert.deepEqual(discoverPairs(text, 'model.ts').pairs, []);
});

test('a gradient candidate without its objective is ignored', () => {
  const text = source(`export function orphanGrad(${tuple}) { return [0, 0]; }`);
  const result = discoverPairs(text, 'model.ts');
  assert.deepEqual(result.pairs, []);
  assert.deepEqual(result.fileFindings, []);
});

test('export { } lists, with and without renaming, count under their exported names', () => {
  const text = source(
    `function quadratic(${tuple}) { return x[0] ** 2; }`,
    `const slope = (${tuple}) => [2 * x[0], 0];`,
    `function helper(${tuple}) { return 1; }`,
    'export { quadratic, slope as quadraticGrad };',
  );
  const pair = onlyPair(discoverPairs(text, 'model.ts'));
  assert.equal(pair.plan.objective, 'quadratic');
  assert.equal(pair.plan.gradient, 'quadraticGrad');
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
  assert.equal(pair.plan.gradient, 'analyticSlope');
  assert.equal(pair.matchedBy, 'gradientOf-tag');
});

test('@gradientOf may name the local function behind an export { a as b }', () => {
  const text = source(
    `function inner(${tuple}) { return x[0]; }`,
    '/** @gradientOf inner */',
    `export const slope = (${tuple}) => [1, 0];`,
    'export { inner as loss };',
  );
  const pair = onlyPair(discoverPairs(text, 'model.ts'));
  assert.deepEqual([pair.plan.objective, pair.plan.gradient], ['loss', 'slope']);
  assert.deepEqual(pair.findings, []);
});

test('@gradientOf naming an unexported function gives a missing-export error on the gradient', () => {
  const text = source(`function loss(${tuple}) { return 0; }`, '/** @gradientOf loss */', `export function slope(${tuple}) { return [0, 0]; }`);
  const pair = onlyPair(discoverPairs(text, 'model.ts'));
  const finding = pair.findings.find((f) => f.code === 'missing-export');
  assert.ok(finding);
  assert.equal(finding.severity, 'error');
  assert.equal(finding.subject, 'gradient');
  assert.match(finding.message, /`loss` is not exported/);
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

test('a tagged gradient that is not exported is reported', () => {
  const text = source(`export function loss(${tuple}) { return 0; }`, '/** @gradientOf loss */', `function slope(${tuple}) { return [0, 0]; }`);
  const result = discoverPairs(text, 'model.ts');
  assert.deepEqual(result.pairs, []);
  assert.equal(result.fileFindings[0]?.code, 'missing-export');
  assert.equal(text.slice(result.fileFindings[0].span.start, result.fileFindings[0].span.end), 'slope');
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
    result.pairs.map((pair) => [pair.plan.objective, pair.plan.combined?.gradientKey]),
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
    assert.equal(pair.plan.gradient, null);
    assert.equal(pair.plan.combined?.valueKey, 'value');
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
