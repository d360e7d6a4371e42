// One module per sandbox process: a check never runs in a process that has run another file's
// code; the targets of one file may share a process, which ends once they are done; a spare is
// started ahead, and nothing is left behind.
import assert from 'node:assert/strict';
import { after, describe, test } from 'node:test';
import { SandboxPool } from '../../server/src/sandbox/pool';
import { sandboxScript } from '../support/paths';
import { isAlive } from '../support/processes';
import { planFor, roundTripPlan, tempProject, waitFor } from './support';

const project = tempProject();
after(() => project.remove());

describe('one check per sandbox process', () => {
  test("each file's bundle gets a process that has run no other; it ends once its checks are done; a spare waits", async () => {
    const pool = new SandboxPool({ sandboxScript });
    try {
      const used: number[] = [];
      for (let k = 0; k < 3; k++) {
        const bundle = await project.bundle(`export const value = ${k};\n`, `file${k}.js`);
        const [ready] = pool.processIds().filter((pid) => !used.includes(pid));
        const { report } = await pool.run(bundle, roundTripPlan);
        // The runner's answer for a value no module has: proof the run went through a sandbox.
        assert.deepEqual(report.findings.map((f) => f.code), ['unresolved-target']);
        if (ready !== undefined) used.push(ready);
      }
      assert.equal(new Set(used).size, used.length, 'no process served two files');
      // Each used process ends once no other target of its file follows; the spare stays.
      await waitFor(() => used.every((pid) => !isAlive(pid)));
      await waitFor(() => pool.processIds().length === 1);
    } finally {
      const left = pool.processIds();
      pool.dispose();
      await waitFor(() => left.every((pid) => !isAlive(pid)));
    }
  });

  test('the targets of one file, checked back to back, share its process', async () => {
    const pool = new SandboxPool({ sandboxScript });
    try {
      const bundle = await project.bundle('export const value = 1;\n', 'oneFile.js');
      const first = pool.run(bundle, roundTripPlan);
      await waitFor(() => pool.processIds().length >= 1);
      const [owner] = pool.processIds();
      await first;
      await pool.run(bundle, roundTripPlan);
      assert.ok(pool.processIds().includes(owner), 'the second target ran where the first did');
      // The spare boots once the pool is idle, while the file's process waits for more targets.
      await waitFor(() => new Set(pool.processIds()).size === 2);
      assert.ok(pool.processIds().includes(owner), 'that process and one spare');
    } finally {
      pool.dispose();
    }
  });

  test('state of one check never reaches the next: a global set by one module is gone for the next', async () => {
    const pool = new SandboxPool({ sandboxScript });
    try {
      const setter = await project.bundle('globalThis.leftBehind = 42;\nexport const objective = (x) => x[0] * x[0];\nexport const gradient = (x) => [2 * x[0]];\n', 'setter.js');
      const reader = await project.bundle(
        'export const objective = (x) => (typeof globalThis.leftBehind === "undefined" ? x[0] * x[0] : NaN);\nexport const gradient = (x) => [2 * x[0]];\n',
        'reader.js',
      );
      const plan = planFor({ probes: [[1.5]], dimension: 1 });
      assert.equal((await pool.run(setter, plan)).report.status, 'pass');
      assert.equal((await pool.run(reader, plan)).report.status, 'pass');
    } finally {
      pool.dispose();
    }
  });

  test('work a module leaves behind cannot outlive its check: no FinalizationRegistry or WeakRef, and the next check is on time', async () => {
    const pool = new SandboxPool({ sandboxScript, timeoutMs: 3000 });
    try {
      const lingering = await project.bundle(
        [
          'console.log(typeof FinalizationRegistry, typeof WeakRef);',
          'Error.prepareStackTrace = () => { for (;;) {} };',
          'export const objective = (x) => x[0] * x[0];',
          'export const gradient = (x) => [2 * x[0]];',
        ].join('\n'),
        'lingering.js',
      );
      const plan = planFor({ probes: [[1.5]], dimension: 1 });
      const first = await pool.run(lingering, plan);
      assert.deepEqual(first.console, ['undefined undefined']);
      // In a reused process the spinning hook would have turned this into a false timeout.
      const next = await pool.run(await project.bundle('export const objective = (x) => x[0] ** 2;\nexport const gradient = (x) => [2 * x[0]];\n', 'next.js'), plan);
      assert.equal(next.report.status, 'pass', JSON.stringify(next.report.findings));
    } finally {
      pool.dispose();
    }
  });
});
