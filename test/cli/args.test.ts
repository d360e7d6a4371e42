import assert from 'node:assert/strict';
import { test } from 'node:test';
import { parseArguments, UsageError } from '../../server/src/cli/args';

test('defaults: text format, seed 1, 10000 ms', () => {
  assert.deepEqual(parseArguments(['a.ts']), { format: 'text', seed: 1, timeoutMs: 10000, smoothness: false, memoryMb: 512, paths: ['a.ts'] });
  assert.equal((parseArguments(['--smoothness', 'a.ts']) as { smoothness: boolean }).smoothness, true);
});

test('flags with separate and inline values', () => {
  assert.deepEqual(parseArguments(['--format', 'sarif', '--seed=7', '--timeout-ms', '250', '--memory-mb', '256', 'src', 'b.js']), {
    format: 'sarif',
    seed: 7,
    timeoutMs: 250,
    smoothness: false,
    memoryMb: 256,
    paths: ['src', 'b.js'],
  });
});

test('usage errors say what is wrong', () => {
  assert.throws(() => parseArguments([]), (e: Error) => e instanceof UsageError && /no files/.test(e.message));
  assert.throws(() => parseArguments(['--format', 'xml', 'a.ts']), /text, json or sarif/);
  assert.throws(() => parseArguments(['--seed', '-3', 'a.ts']), /--seed must be a whole number/);
  assert.throws(() => parseArguments(['--timeout-ms', '0', 'a.ts']), /≥ 1/);
  assert.throws(() => parseArguments(['--timeout-ms']), /needs a value/);
  // The sandbox boots in about 60 MB: below the floor it could not even start.
  assert.throws(() => parseArguments(['--memory-mb', '64', 'a.ts']), /--memory-mb .*≥ 128/);
  assert.throws(() => parseArguments(['--frobnicate', 'a.ts']), /unknown option --frobnicate/);
  assert.equal(parseArguments(['--help']), 'help');
});
