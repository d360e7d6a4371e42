// Spans, return expressions, syntax errors, JavaScript files and unsaved buffers.
import * as assert from 'node:assert/strict';
import { existsSync } from 'node:fs';
import { test } from 'node:test';
import { assertSpanCovers, discoverPairs, onlyPair, source } from './support';

test('name and declaration spans, in LSP line/character, exclude the JSDoc', () => {
  const text = source(
    '// Σ: a non-ASCII comment, so UTF-16 columns matter 😀',
    '/** @probe [1, 2] */',
    'export function loss(x: number[]) { return x[0] * x[1]; }',
    '',
    '  export const lossGrad = (x: number[]) => [x[1], x[0]];',
  );
  const pair = onlyPair(discoverPairs(text, 'model.ts'));
  assertSpanCovers(text, pair.objective.nameSpan, 'loss');
  assertSpanCovers(text, pair.objective.declarationSpan, 'export function loss(x: number[]) { return x[0] * x[1]; }');
  assertSpanCovers(text, pair.objective.probeTags[0], '@probe [1, 2]');
  assertSpanCovers(text, pair.gradient!.nameSpan, 'lossGrad');
  assertSpanCovers(text, pair.gradient!.declarationSpan, 'export const lossGrad = (x: number[]) => [x[1], x[0]];');
  assert.equal(pair.gradient!.declarationSpan.startCharacter, 2);
  // The arrow's expression body is its return expression.
  assert.equal(pair.gradient!.returnExpressions.length, 1);
  assertSpanCovers(text, pair.gradient!.returnExpressions[0], '[x[1], x[0]]');
});

test('spans after astral characters count UTF-16 code units on the same line', () => {
  const text = source('/* 😀😀 */ export function loss(x: [number]) { return x[0]; } export function lossGrad(x: [number]) { return [1]; }');
  const pair = onlyPair(discoverPairs(text, 'model.ts'));
  assertSpanCovers(text, pair.objective.nameSpan, 'loss');
  // Each emoji is two UTF-16 code units: '/* ' + 4 + ' */ ' puts `export` at character 11.
  assert.equal(pair.objective.declarationSpan.startCharacter, 11);
});

test('return expressions: every direct return, but none of nested functions', () => {
  const text = source(
    'export function loss(x: [number, number]) { return x[0] ** 2; }',
    'export function lossGrad(x: [number, number]) {',
    '  const helper = (y: number) => { return y * 99; };',
    '  function inner() { return [7, 7]; }',
    '  if (x[0] < 0) {',
    '    return [2 * x[0], helper(0)];',
    '  }',
    '  for (const _ of [1]) { return [2 * x[0], 0 + 0]; }',
    '  return [2 * x[0], 0];',
    '}',
  );
  const gradient = onlyPair(discoverPairs(text, 'model.ts')).gradient!;
  assert.equal(gradient.returnExpressions.length, 3);
  assertSpanCovers(text, gradient.returnExpressions[0], '[2 * x[0], helper(0)]');
  assertSpanCovers(text, gradient.returnExpressions[1], '[2 * x[0], 0 + 0]');
  assertSpanCovers(text, gradient.returnExpressions[2], '[2 * x[0], 0]');
});

test('a file with syntax errors still yields its pairs, and each parse error becomes a finding', () => {
  const text = source(
    'export function loss(x: [number, number]) { return x[0] ** 2; }',
    'export function lossGrad(x: [number, number]) { return [2 * x[0], 0]; }',
    'export function broken(x: number[] { return x',
  );
  const result = discoverPairs(text, 'model.ts');
  assert.deepEqual(
    result.pairs.map((pair) => pair.objective.name),
    ['loss'],
  );
  assert.ok(result.fileFindings.length >= 1);
  const first = result.fileFindings[0];
  assert.equal(first.code, 'syntax-error');
  assert.equal(first.severity, 'error');
  // The parser stops at the `{` where `)` was expected, on the third line.
  assert.equal(first.message, "',' expected.");
  assertSpanCovers(text, first.span, '{', 2);
  assert.equal(first.span.line, 3);
});

test('a valid file has no file findings', () => {
  const text = source('export function loss(x: [number]) { return x[0]; }', 'export function lossGrad(x: [number]) { return [1]; }');
  assert.deepEqual(discoverPairs(text, 'model.ts').fileFindings, []);
});

test('JavaScript files: JSDoc tags, JSDoc parameter types and export forms', () => {
  const text = source(
    '/**',
    ' * @param {[number, number]} x',
    ' */',
    'export function loss(x) { return x[0] ** 2 + x[1] ** 2; }',
    '/** @gradientOf loss */',
    'export const slope = (x) => [2 * x[0], 2 * x[1]];',
    '/** @param {Float64Array} w',
    ' *  @probe [1, 2, 3] */',
    'export function energy(w) { return w[0]; }',
    'export function energyGrad(w) { return [1, 0, 0]; }',
    '/** @returns {{ value: number, grad: number[] }} */',
    'export function both(x) { return { value: 0, grad: [0] }; }',
    '/** @learningRateFor loss */',
    'export const lr = 1 / 10;',
  );
  const result = discoverPairs(text, 'model.js');
  assert.deepEqual(result.fileFindings, []);
  assert.deepEqual(
    result.pairs.map((pair) => [pair.objective.name, pair.gradient?.name ?? null, pair.matchedBy, pair.plan.dimension, pair.plan.argumentKind]),
    [
      ['loss', 'slope', 'tag', 2, 'array'],
      ['energy', 'energyGrad', 'name', 3, 'float64array'],
      ['both', null, 'combined', null, 'array'],
    ],
  );
  assert.deepEqual(result.pairs[0].plan.learningRate, { name: 'lr', value: 0.1 });
  assert.deepEqual(result.pairs[2].plan.recipe.split, { value: 'value', derivative: 'grad' });
});

test('the file extension picks the parser: .js, .mjs and .cjs parse as JavaScript', () => {
  // `<number>z` is a type assertion in TypeScript but opens a JSX element in JavaScript
  // (TypeScript Handbook, "JSX", section "The as operator"; that TypeScript parses .js files with JSX on is from memory).
  const text = source('export function loss(x) { return 0; }', 'export function lossGrad(x) { return [0]; }', 'export const y = <number>z;');
  assert.deepEqual(discoverPairs(text, 'model.ts').fileFindings, []);
  for (const fileName of ['model.js', 'model.mjs', 'model.cjs', 'MODEL.JS']) {
    const result = discoverPairs(text, fileName);
    assert.ok(result.fileFindings.some((finding) => finding.code === 'syntax-error'), fileName);
    assert.equal(result.pairs[0]?.gradient?.name, 'lossGrad', fileName);
  }
});

test('an unsaved buffer whose file does not exist is read from the text given', () => {
  const fileName = 'untitled-never-saved-buffer.ts';
  assert.equal(existsSync(fileName), false);
  const text = source('export const loss = (x: [number]) => x[0] ** 2;', 'export const lossGrad = (x: [number]) => [2 * x[0]];');
  const pair = onlyPair(discoverPairs(text, fileName));
  assert.deepEqual([pair.objective.name, pair.gradient?.name, pair.plan.dimension], ['loss', 'lossGrad', 1]);
});
