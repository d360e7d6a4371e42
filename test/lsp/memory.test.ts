// What the language server keeps between checks: every cache stays within its bounds,
// a closed document leaves nothing behind, and no progress reporter outlives its check.
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import type { PairRunner } from '../../server/src/check/checkDocument';
import { CachedRunner } from '../../server/src/check/runCache';
import type { DiscoveredPair } from '../../server/src/discovery/types';
import { defaultCheckOptions, type CheckPlan, type PairReport } from '../../server/src/engine/types';
import { DiscoveryCache } from '../../server/src/lsp/discoveryCache';
import { DocumentChecks } from '../../server/src/lsp/documentChecks';
import { PatchVerifier } from '../../server/src/lsp/patchVerifier';
import { CheckProgress, type ProgressReporter } from '../../server/src/lsp/progress';
import { planOf, recipeOf } from '../support/plans';
import type { Bundle } from '../../server/src/sandbox/bundle';
import { errorReport } from '../../server/src/sandbox/reports';
import { defaultSettings } from '../../server/src/shared/settings';

const bundle = (code: string): Bundle => ({ code, fileName: '/x/a.ts', sourceRoot: '/x', builtinImports: [], builtinImportSites: [], errors: [] });
const plan: CheckPlan = planOf({ recipe: recipeOf('f', 'g'), probes: [[1]], dimension: null });

/** A runner whose report carries `findingCount` findings of about 100 characters each. */
function runnerWithReports(findingCount: number): PairRunner & { runs: number } {
  const runner = {
    runs: 0,
    run: async () => {
      runner.runs++;
      const findings = Array.from({ length: findingCount }, (_, k) => ({
        code: 'gradient-mismatch' as const, severity: 'error' as const, subject: 'gradient' as const, message: `component ${k} differs from its central difference`.padEnd(100, '.'),
      }));
      const report: PairReport = { ...errorReport(findings), status: 'fail' };
      return { report, console: [], consoleTruncated: false };
    },
  };
  return runner;
}

test('the run cache never holds more entries or bytes than its bounds, evicting the oldest', async () => {
  const byEntries = new CachedRunner(() => runnerWithReports(1), 50, 1_000_000);
  const byBytes = new CachedRunner(() => runnerWithReports(10), 1000, 20_000);
  for (let k = 0; k < 300; k++) {
    await byEntries.run(bundle(`code ${k}`), plan);
    await byBytes.run(bundle(`code ${k}`), plan);
    assert.ok(byEntries.size <= 50);
    assert.ok(byBytes.bytes <= 20_000, `${byBytes.bytes} bytes stored`);
  }
  assert.equal(byEntries.size, 50);
  // All reports have the same size, so the byte bound holds exactly as many as fit.
  const one = new CachedRunner(() => runnerWithReports(10));
  await one.run(bundle('code 0'), plan);
  assert.ok(one.bytes > 1000);
  assert.equal(byBytes.size, Math.floor(20_000 / one.bytes));
  assert.equal(byBytes.bytes, byBytesOfEntries(byBytes));

  // The newest result is remembered, the oldest was evicted.
  const inner = runnerWithReports(10);
  const probe = new CachedRunner(() => inner, 1000, 20_000);
  for (let k = 0; k < 100; k++) await probe.run(bundle(`code ${k}`), plan);
  const runs = inner.runs;
  await probe.run(bundle('code 99'), plan);
  assert.equal(inner.runs, runs, 'the newest is a hit');
  await probe.run(bundle('code 0'), plan);
  assert.equal(inner.runs, runs + 1, 'the oldest was evicted');
});

test('a result larger than the whole byte bound is returned but not stored', async () => {
  const cache = new CachedRunner(() => runnerWithReports(100), 200, 5_000);
  const result = await cache.run(bundle('huge'), plan);
  assert.equal(result.report.findings.length, 100);
  assert.equal(cache.size, 0);
  assert.equal(cache.bytes, 0);
});

test('after many checks and closing every document, no document state is left', async () => {
  const runner = runnerWithReports(1);
  const published: string[] = [];
  const checks = new DocumentChecks({
    runner: new CachedRunner(() => runner),
    settings: () => defaultSettings,
    trusted: () => true,
    publish: (uri, result) => published.push(`${uri}:${result?.version ?? 'cleared'}`),
    summary: () => undefined,
    progress: null,
    log: () => undefined,
  });
  const uris = Array.from({ length: 6 }, (_, k) => `file:///doc${k}.ts`);
  const text = (version: number) => `/** @probe [1] */\nexport function f(x: number[]) { return x[0]; }\nexport function fGrad(x: number[]) { return [1]; }\nexport const v = ${version};\n`;
  for (const [k, uri] of uris.entries()) {
    checks.opened(uri, `/doc${k}.ts`, text(1), 1);
    await checks.settled(uri);
  }
  for (let version = 2; version <= 20; version++) {
    for (const uri of uris) {
      checks.changed(uri, text(version), version);
      checks.saved(uri);
      await checks.settled(uri);
    }
  }
  assert.equal(checks.openCount, 6);
  assert.equal(runner.runs, 6 * 20, 'every open and save ran');
  for (const uri of uris) checks.closed(uri);
  assert.equal(checks.openCount, 0);
  assert.equal(checks.outcome(uris[0], 'f'), null);
  assert.deepEqual(published.slice(-6), uris.map((uri) => `${uri}:cleared`));
});

test('the discovery cache keeps one version per open document and forgets closed ones', () => {
  const cache = new DiscoveryCache();
  let discoveries = 0;
  const discover = (): DiscoveredPair[] => {
    discoveries++;
    return [];
  };
  for (let version = 1; version <= 50; version++) {
    cache.pairs('file:///a.ts', version, discover);
    cache.pairs('file:///a.ts', version, discover);
    cache.pairs('file:///b.ts', version, discover);
  }
  assert.equal(discoveries, 100, 'a repeated version is a hit');
  assert.equal(cache.size, 2);
  cache.forget('file:///a.ts');
  cache.forget('file:///b.ts');
  assert.equal(cache.size, 0);
});

test('patch verdicts stay within their bound', async () => {
  const verifier = new PatchVerifier(() => runnerWithReports(0), { capacity: 10 });
  const text = (k: number) => `/** @probe [1] */\nexport function f(x: number[]) { return x[0] * ${k}; }\nexport function fGrad(x: number[]) { return [${k}]; }\n`;
  for (let k = 0; k < 30; k++) {
    // The stand-in's report fails, so no patch passes.
    assert.equal(await verifier.passes(text(k), '/tmp/patched.ts', 'f', defaultCheckOptions), false);
    assert.ok(verifier.size <= 10);
  }
  assert.equal(verifier.size, 10);
});

test('a progress token that arrives after its check ended is closed at once, never begun', async () => {
  const calls: string[] = [];
  let deliver!: (reporter: ProgressReporter) => void;
  const progress = new CheckProgress(
    () => new Promise<ProgressReporter>((resolve) => (deliver = resolve)),
    'checking a.ts',
  );
  progress.pairChecked(1, 1, 'f');
  progress.end();
  deliver({ begin: () => calls.push('begin'), report: () => calls.push('report'), done: () => calls.push('done') });
  await new Promise<void>((resolve) => setImmediate(resolve));
  assert.deepEqual(calls, ['done']);
});

/** The stored JSON summed afresh, to hold the cache's running count against. */
function byBytesOfEntries(cache: CachedRunner): number {
  const entries = (cache as unknown as { entries: Map<string, string> }).entries;
  return [...entries.values()].reduce((sum, json) => sum + json.length, 0);
}
