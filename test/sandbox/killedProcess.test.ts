// A sandbox process killed from outside (the OOM killer, a user's `kill -9`) is replaced:
// a request it was running resolves with 'sandbox-crash' instead of hanging, and the next
// request runs on a new process. These run real sandbox processes (dist/sandbox.js).
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { after, describe, test } from 'node:test';
import type { PairReport } from '../../server/src/engine/types';
import { SandboxPool } from '../../server/src/sandbox/pool';
import { sandboxScript } from '../support/paths';
import { roundTripPlan, tempProject, waitFor } from './support';
import { isAlive } from '../support/processes';

const project = tempProject();
after(() => project.remove());

async function runModule(pool: SandboxPool, text: string) {
  const bundle = await project.bundle(text, 'main.js');
  assert.deepEqual(bundle.errors, []);
  return pool.run(bundle, roundTripPlan);
}

const codes = (report: PairReport) => report.findings.map((finding) => finding.code);

/** A full round trip: the module loaded and the runner answered that the plan's export is missing. */
async function assertAnswers(pool: SandboxPool): Promise<void> {
  const { report } = await runModule(pool, 'exports.value = 1;\n');
  assert.deepEqual(codes(report), ['unresolved-target']);
}


/** CPU time the process has used, in clock ticks (Linux /proc/<pid>/stat, fields 14 and 15: utime, stime). */
function cpuTicks(pid: number): number {
  const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
  // The command name (field 2) may hold spaces; the fields after its closing parenthesis do not.
  const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  return Number(fields[11]) + Number(fields[12]);
}

describe('a sandbox process killed from outside', () => {
  test('while idle: it leaves the pool, and the next request runs on a new process', async () => {
    const pool = new SandboxPool({ sandboxScript, timeoutMs: 5000 });
    try {
      await assertAnswers(pool);
      await waitFor(() => pool.spareProcessId() !== undefined);
      const pid = pool.spareProcessId()!;
      process.kill(pid, 'SIGKILL');
      await waitFor(() => !pool.processIds().includes(pid));
      assert.equal(isAlive(pid), false);
      await assertAnswers(pool);
      const [replacement] = pool.processIds();
      assert.ok(replacement !== undefined && replacement !== pid, `a new process: ${replacement} after ${pid}`);
    } finally {
      pool.dispose();
    }
  });

  test('while running a request: the request resolves with sandbox-crash long before the time limit, and the next one succeeds', async () => {
    // A time limit far above the wait below: the answer must come from the kill, not from the deadline.
    const timeoutMs = 60_000;
    const pool = new SandboxPool({ sandboxScript, timeoutMs });
    try {
      await assertAnswers(pool);
      await waitFor(() => pool.spareProcessId() !== undefined);
      const pid = pool.spareProcessId()!;
      const bundle = await project.bundle('for (;;) {}\n', 'main.js');
      const idleTicks = cpuTicks(pid);
      const started = Date.now();
      const stuck = pool.run(bundle, roundTripPlan);
      // Killed only once the process is surely inside the endless loop: 50 ticks (0.5 s at the
      // usual 100 Hz) of CPU more than when idle; loading a module takes a small part of that.
      await waitFor(() => cpuTicks(pid) - idleTicks >= 50, 20_000);
      process.kill(pid, 'SIGKILL');
      const { report } = await stuck;
      assert.ok(Date.now() - started < 10_000, `answered after ${Date.now() - started} ms`);
      assert.equal(report.status, 'error');
      assert.deepEqual(codes(report), ['sandbox-crash']);
      assert.equal(report.findings[0].severity, 'error');
      assert.match(report.findings[0].message, /SIGKILL/);
      await assertAnswers(pool);
      const [replacement] = pool.processIds();
      assert.ok(replacement !== undefined && replacement !== pid, `a new process: ${replacement} after ${pid}`);
    } finally {
      pool.dispose();
    }
  });

  // A request sent after the kill but before the pool has seen the exit reaches a dead process;
  // it must not come back as 'sandbox-crash', blaming code that did nothing wrong.
  test('right after the kill, before the pool has seen the exit: the next request still succeeds', async () => {
    const pool = new SandboxPool({ sandboxScript, timeoutMs: 5000 });
    try {
      await assertAnswers(pool);
      await waitFor(() => pool.processIds().length === 1);
      const bundle = await project.bundle('exports.value = 2;\n', 'main.js');
      const [pid] = pool.processIds();
      process.kill(pid, 'SIGKILL');
      const { report } = await pool.run(bundle, roundTripPlan);
      assert.deepEqual(codes(report), ['unresolved-target']);
    } finally {
      pool.dispose();
    }
  });
});
