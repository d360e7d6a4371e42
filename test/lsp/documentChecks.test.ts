// Scheduling of document checks in-process, with a sandbox stand-in whose runs finish on command:
// cancellation by newer edits, debounce in typing mode, the cache on reopen, trust.
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import type { PairRunner } from '../../server/src/check/checkDocument';
import { CachedRunner } from '../../server/src/check/runCache';
import { DocumentChecks, type DocumentChecksHost } from '../../server/src/lsp/documentChecks';
import type { DocumentSummaryParams } from '../../server/src/shared/protocol';
import { defaultSettings, type SlopecheckSettings } from '../../server/src/shared/settings';
import { errorReport } from '../../server/src/sandbox/reports';

const text = (tag: string) => `/** @probe [1] */\nexport function f(x: number[]) { return x[0]; /* ${tag} */ }\nexport function fGrad(x: number[]) { return [1]; }\n`;

/** Runs wait until released; each records whether it was aborted. */
function heldRunner() {
  const runs: Array<{ signal?: AbortSignal; release(): void }> = [];
  const runner: PairRunner = {
    run: (_bundle, _plan, signal) =>
      new Promise((resolve) => {
        const done = () => resolve({ report: { ...errorReport([]), status: 'pass' }, console: [], consoleTruncated: false });
        runs.push({ signal, release: done });
        signal?.addEventListener('abort', done, { once: true });
      }),
  };
  return { runner, runs };
}

function setup(settings: Partial<SlopecheckSettings> = {}) {
  const held = heldRunner();
  const published: Array<{ uri: string; version: number | null }> = [];
  const summaries: DocumentSummaryParams[] = [];
  let trusted = true;
  const host: DocumentChecksHost = {
    runner: new CachedRunner(() => held.runner),
    settings: () => ({ ...defaultSettings, ...settings }),
    trusted: () => trusted,
    publish: (uri, result) => published.push({ uri, version: result?.version ?? null }),
    summary: (s) => summaries.push(s),
    progress: null,
    log: () => undefined,
  };
  const checks = new DocumentChecks(host);
  /** Resolves once `count` runs have reached the sandbox stand-in. */
  const runsReach = async (count: number) => {
    // Yields to the event loop until the runs arrive; the test's own timeout bounds the wait.
    while (held.runs.length < count) await new Promise<void>((resolve) => setImmediate(resolve));
  };
  return { checks, held, published, summaries, host, runsReach, setTrust: (t: boolean) => (trusted = t) };
}

test('a save during a run aborts it, and only the newer result is published', async () => {
  const { checks, held, published, runsReach } = setup();
  checks.opened('file:///a.ts', '/a.ts', text('one'), 1);
  await runsReach(1);
  checks.changed('file:///a.ts', text('two'), 2);
  assert.equal(held.runs[0].signal?.aborted, false, 'in open-and-save mode an edit alone does not cancel');
  checks.saved('file:///a.ts');
  assert.equal(held.runs[0].signal?.aborted, true);
  await runsReach(2);
  held.runs[1].release();
  await checks.settled('file:///a.ts');
  assert.deepEqual(published, [{ uri: 'file:///a.ts', version: 2 }]);
});

test('typing mode: edits cancel the run and only the last edit is checked after the pause', async () => {
  const { checks, held, published, runsReach } = setup({ checkWhen: 'typing', typingDelayMs: 5 });
  checks.opened('file:///b.ts', '/b.ts', text('0'), 1);
  await runsReach(1);
  for (let i = 1; i <= 50; i++) checks.changed('file:///b.ts', text(String(i)), i + 1);
  assert.equal(held.runs[0].signal?.aborted, true);
  await runsReach(2);
  held.runs[1].release();
  await checks.settled('file:///b.ts');
  assert.equal(held.runs.length, 2, 'fifty edits within the pause gave one check');
  assert.deepEqual(published, [{ uri: 'file:///b.ts', version: 51 }]);
});

test('reopening unchanged text is answered from the cache; check again runs anew', async () => {
  const { checks, held, published, runsReach } = setup();
  checks.opened('file:///c.ts', '/c.ts', text('same'), 1);
  await runsReach(1);
  held.runs[0].release();
  await checks.settled('file:///c.ts');
  checks.closed('file:///c.ts');
  checks.opened('file:///c.ts', '/c.ts', text('same'), 1);
  await checks.settled('file:///c.ts');
  assert.equal(held.runs.length, 1);
  assert.deepEqual(published.map((p) => p.version), [1, null, 1]);
  const again = checks.checkAgain('file:///c.ts');
  await runsReach(2);
  held.runs[1].release();
  assert.equal((await again)?.state, 'done');
});

test('untrusted: nothing runs and the summary says so; trust then checks', async () => {
  const { checks, held, summaries, runsReach, setTrust } = setup();
  setTrust(false);
  checks.opened('file:///d.ts', '/d.ts', text('x'), 1);
  assert.equal(held.runs.length, 0);
  assert.equal(summaries.at(-1)?.state, 'untrusted');
  setTrust(true);
  checks.checkAll();
  await runsReach(1);
  held.runs[0].release();
  await checks.settled('file:///d.ts');
  assert.equal(summaries.at(-1)?.state, 'done');
});

test("a hover's detailed check is stopped by an edit or a new check, so the pool is free for the document's own check", async () => {
  const { checks, held, runsReach } = setup();
  checks.opened('file:///a.ts', '/a.ts', text('one'), 1);
  await runsReach(1);
  held.runs[0].release();
  await checks.settled('file:///a.ts');
  const detailed = checks.detailedOutcome('file:///a.ts', 'f', { smoothness: true });
  await runsReach(2);
  assert.equal(held.runs[1].signal?.aborted, false);
  checks.changed('file:///a.ts', text('two'), 2);
  assert.equal(held.runs[1].signal?.aborted, true, 'the edit stops it');
  assert.equal(await detailed, null);

  const again = checks.detailedOutcome('file:///a.ts', 'f', { smoothness: true });
  await runsReach(3);
  checks.saved('file:///a.ts');
  assert.equal(held.runs[2].signal?.aborted, true, 'the save\'s check stops it');
  assert.equal(await again, null);
  // The save's own check runs on (its bundle is the first one's, so the cache answers it).
  await checks.settled('file:///a.ts');
  assert.equal(checks.isChecking('file:///a.ts'), false);
});
