// The `// slopecheck-skip` directive directly above an objective leaves its pair unchecked.
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import { discoverPairs, source } from './support';

const pair = ['export function loss(x: [number, number]) { return x[0] * x[1]; }', 'export function lossGrad(x: [number, number]) { return [x[1], x[0]]; }'];
const skipped = (text: string) => discoverPairs(text, 'model.ts').pairs.map((p) => p.skipped);

test('the directive above or below the JSDoc skips the pair', () => {
  assert.deepEqual(skipped(source('// slopecheck-skip', '/** @probe [1, 2] */', ...pair)), [true]);
  assert.deepEqual(skipped(source('/** @probe [1, 2] */', '// slopecheck-skip', ...pair)), [true]);
  assert.deepEqual(skipped(source('// slopecheck-skip: kinked on purpose', ...pair)), [true]);
  assert.deepEqual(skipped(source('  //slopecheck-skip', 'export const loss = (x: [number, number]) => x[0];', 'export const lossGrad = (x: [number, number]) => [1, 0];')), [true]);
});

test('the probes of a skipped pair are still read: the JSDoc stays attached below the directive', () => {
  const result = discoverPairs(source('/** @probe [1, 2] */', '// slopecheck-skip', ...pair), 'model.ts');
  assert.deepEqual(result.pairs[0].plan.probes, [[1, 2]]);
});

test('a blank line, another word, or a directive on the gradient does not skip', () => {
  assert.deepEqual(skipped(source('// slopecheck-skip', '', ...pair)), [false]);
  assert.deepEqual(skipped(source('// slopecheck-skipped', ...pair)), [false]);
  assert.deepEqual(skipped(source('/* slopecheck-skip */', ...pair)), [false]);
  assert.deepEqual(skipped(source(pair[0], '// slopecheck-skip', pair[1])), [false]);
  assert.deepEqual(skipped(source(...pair)), [false]);
});
