// A warm sandbox process is replaced after its run limit or once its resident memory
// passes the limit, between runs only; every run still gets its answer.
import assert from 'node:assert/strict';
import { after, describe, test } from 'node:test';
import { SandboxPool } from '../../server/src/sandbox/pool';
import { sandboxScript } from '../support/paths';
import { roundTripPlan, tempProject, waitFor } from './support';

const project = tempProject();
after(() => project.remove());

const isAlive = (pid: number) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
};

/** Runs the round-trip plan `count` times; returns the sandbox process of each run, read after it. */
async function processesOfRuns(pool: SandboxPool, count: number): Promise<number[]> {
  const bundle = await project.bundle('export const value = 1;\n');
  const seen: number[] = [];
  for (let k = 0; k < count; k++) {
    const before = pool.processIds();
    const { report } = await pool.run(bundle, roundTripPlan);
    // The runner's answer for an export no module has: proof the run went through a sandbox.
    assert.deepEqual(report.findings.map((f) => f.code), ['unresolved-target']);
    seen.push(before[0] ?? -1);
  }
  return seen;
}

describe('sandbox recycling', () => {
  test('the process is replaced after its run limit, and the old one ends', async () => {
    const pool = new SandboxPool({ sandboxScript, recycleAfterRuns: 2 });
    try {
      const bundle = await project.bundle('export const value = 1;\n');
      await pool.run(bundle, roundTripPlan);
      const [first] = pool.processIds();
      assert.ok(first !== undefined);
      await pool.run(bundle, roundTripPlan);
      assert.deepEqual(pool.processIds(), [], 'retired after its second run');
      await waitFor(() => !isAlive(first));
      await pool.run(bundle, roundTripPlan);
      const [second] = pool.processIds();
      assert.ok(second !== undefined && second !== first, 'the next run gets a fresh process');
      // Runs 3 and 4 share the fresh process; run 5 gets a third one, which run 6 reuses.
      const seen = await processesOfRuns(pool, 3);
      assert.equal(seen[0], second);
      assert.equal(seen[1], -1, 'run 5 starts on no process: run 4 retired the second');
      assert.ok(seen[2] !== -1 && seen[2] !== second);
    } finally {
      pool.dispose();
    }
  });

  test('the real sandbox reports its memory, and a process above the memory limit is replaced', async () => {
    // Any Node process is above 1 MB, so each run retires its process.
    const strict = new SandboxPool({ sandboxScript, recycleAboveRssMb: 1 });
    // The defaults (200 runs, 150 MB) keep one warm process across these few runs.
    const relaxed = new SandboxPool({ sandboxScript });
    try {
      const bundle = await project.bundle('export const value = 1;\n');
      for (let k = 0; k < 3; k++) {
        await strict.run(bundle, roundTripPlan);
        assert.deepEqual(strict.processIds(), []);
      }
      const kept = new Set<number>();
      for (let k = 0; k < 3; k++) {
        await relaxed.run(bundle, roundTripPlan);
        for (const pid of relaxed.processIds()) kept.add(pid);
      }
      assert.equal(kept.size, 1);
    } finally {
      strict.dispose();
      relaxed.dispose();
    }
  });

  test('a reported size is judged against the limit in megabytes', async () => {
    const reply = (rssBytes: number) =>
      `process.on('message', (request) => process.send({ id: request.id, report: { status: 'pass', findings: [] }, console: [], consoleTruncated: false, rssBytes: ${rssBytes} }));\n`;
    const big = new SandboxPool({ sandboxScript: project.write('big.js', reply(151 * 1024 * 1024)) });
    const small = new SandboxPool({ sandboxScript: project.write('small.js', reply(149 * 1024 * 1024)) });
    try {
      const bundle = await project.bundle('exports.value = 1;\n', 'main.js');
      assert.equal((await big.run(bundle, roundTripPlan)).report.status, 'pass');
      assert.deepEqual(big.processIds(), []);
      assert.equal((await small.run(bundle, roundTripPlan)).report.status, 'pass');
      assert.equal(small.processIds().length, 1);
    } finally {
      big.dispose();
      small.dispose();
    }
  });
});
