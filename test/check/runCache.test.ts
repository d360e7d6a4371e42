// The result cache in front of the sandbox: keyed by bundle code and plan, bounded,
// and never remembering cancelled or machine-dependent outcomes.
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import { checkDocument, type PairRunner } from '../../server/src/check/checkDocument';
import { CachedRunner } from '../../server/src/check/runCache';
import { defaultCheckOptions, type CheckPlan, type Finding } from '../../server/src/engine/types';
import type { Bundle } from '../../server/src/sandbox/bundle';
import { errorReport } from '../../server/src/sandbox/reports';
import { planOf, recipeOf } from '../support/plans';

function countingRunner(findings: Finding[] = []): PairRunner & { runs: number } {
  const runner = {
    runs: 0,
    run: async () => {
      runner.runs++;
      return { report: errorReport([...findings]), console: [], consoleTruncated: false };
    },
  };
  return runner;
}

const bundle = (code: string): Bundle => ({ code, fileName: '/x/a.ts', sourceRoot: '/x', builtinImports: [], builtinImportSites: [], errors: [] });
const plan = (seed: number): CheckPlan => planOf({ recipe: recipeOf('f', 'g'), probes: [[1]], dimension: null, options: { ...defaultCheckOptions, seed } });

test('the same code and plan run once; other code or options run again', async () => {
  const inner = countingRunner();
  const cache = new CachedRunner(() => inner);
  await cache.run(bundle('a'), plan(1));
  const again = await cache.run(bundle('a'), plan(1));
  again.report.findings.push({ code: 'timeout', severity: 'info', subject: 'objective', message: 'mutating a copy' });
  await cache.run(bundle('a'), plan(1));
  assert.equal(inner.runs, 1);
  assert.equal((await cache.run(bundle('a'), plan(1))).report.findings.length, 0, 'callers get copies');
  await cache.run(bundle('b'), plan(1));
  await cache.run(bundle('a'), plan(2));
  assert.equal(inner.runs, 3);
  await cache.uncached().run(bundle('a'), plan(1));
  assert.equal(inner.runs, 4);
});

test('timeouts and cancelled runs are not remembered, and the size is bounded', async () => {
  const slow = countingRunner([{ code: 'timeout', severity: 'error', subject: 'objective', message: 'too slow' }]);
  const cache = new CachedRunner(() => slow, 2);
  await cache.run(bundle('a'), plan(1));
  await cache.run(bundle('a'), plan(1));
  assert.equal(slow.runs, 2);
  const inner = countingRunner();
  const small = new CachedRunner(() => inner, 2);
  const aborted = new AbortController();
  aborted.abort();
  await small.run(bundle('z'), plan(1), aborted.signal);
  assert.equal(small.size, 0);
  for (const code of ['a', 'b', 'c']) await small.run(bundle(code), plan(1));
  assert.equal(small.size, 2);
  await small.run(bundle('a'), plan(1));
  assert.equal(inner.runs, 5, 'the oldest entry was evicted');
});

test('checkDocument leaves skipped pairs out of the run and lists them', async () => {
  const inner = countingRunner();
  const text = [
    '// slopecheck-skip',
    'export function a(x: [number]) { return x[0]; }',
    'export function aGrad(x: [number]) { return [1]; }',
    'export function b(x: [number]) { return x[0]; }',
    'export function bGrad(x: [number]) { return [1]; }',
  ].join('\n');
  const check = await checkDocument(text, '/tmp/skip.ts', inner, defaultCheckOptions);
  assert.deepEqual(check.skipped.map((p) => p.objective.name), ['a']);
  assert.deepEqual(check.pairs.map((p) => p.pair.objective.name), ['b']);
  assert.equal(inner.runs, 1);
});
