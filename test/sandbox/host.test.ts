// The host's guard rails, tested with stand-in sandbox scripts that misbehave
// in the process itself (past the vm layer): the permission model must still
// hold, and the pool must survive silence and sudden exits.
import assert from 'node:assert/strict';
import { existsSync } from 'node:fs';
import * as path from 'node:path';
import { after, describe, test } from 'node:test';
import { emptyReport } from '../../server/src/engine/emptyReport';
import { SandboxPool } from '../../server/src/sandbox/pool';
import { roundTripPlan, tempProject, waitFor } from './support';

const project = tempProject();
after(() => project.remove());

/** A stand-in sandbox script: `onRequest` is the body of a message handler with `request` in scope. */
function standIn(name: string, onRequest: string): string {
  return project.write(name, `process.on('message', (request) => {\n${onRequest}\n});\n`);
}

/** A complete, empty report, as the host's validation requires (emptyReport's shape). */
const passReport = JSON.stringify(emptyReport('pass'));

/** Stand-in reply carrying `lines` as console output. */
const replyWith = (lines: string) => `process.send({ id: request.id, report: ${passReport}, console: ${lines}, consoleTruncated: false });`;

async function runOn(pool: SandboxPool) {
  return pool.run(await project.bundle('exports.value = 1;\n', 'main.js'), roundTripPlan);
}

describe('sandbox host', () => {
  test('the sandbox process may not write files, read other files, or start processes or threads', async () => {
    const canary = path.join(project.dir, 'host-canary.txt');
    const script = standIn(
      'escaped.js',
      `const outcomes = [];
const attempt = (name, run) => {
  try { run(); outcomes.push(name + ': allowed'); } catch (error) { outcomes.push(name + ': ' + error.code); }
};
attempt('write', () => require('fs').writeFileSync(${JSON.stringify(canary)}, 'written'));
attempt('read', () => require('fs').readFileSync(${JSON.stringify(path.join(project.dir, 'main.js'))}));
attempt('spawn', () => require('child_process').spawnSync(process.execPath, ['-e', '0']));
attempt('thread', () => new (require('worker_threads').Worker)('0', { eval: true }));
attempt('eval', () => new Function('return 1')());
${replyWith('outcomes')}`,
    );
    project.write('main.js', 'exports.value = 1;\n');
    const pool = new SandboxPool({ sandboxScript: script });
    try {
      const result = await runOn(pool);
      assert.deepEqual(result.console.slice(0, 4), ['write: ERR_ACCESS_DENIED', 'read: ERR_ACCESS_DENIED', 'spawn: ERR_ACCESS_DENIED', 'thread: ERR_ACCESS_DENIED']);
      // --disallow-code-generation-from-strings: an EvalError has no code.
      assert.equal(result.console[4], 'eval: undefined');
      assert.equal(existsSync(canary), false);
    } finally {
      pool.dispose();
    }
  });

  test('a process that never answers is killed after the budget, and the next request gets a fresh one', async () => {
    const script = standIn('silent.js', 'if (request.code.includes("answer")) { ' + replyWith("['answered']") + ' }');
    const pool = new SandboxPool({ sandboxScript: script, timeoutMs: 200 });
    try {
      const running = runOn(pool);
      // The silent check's process alone: no spare boots while a check runs.
      await waitFor(() => pool.processIds().length === 1);
      const [silentPid] = pool.processIds();
      const silent = await running;
      assert.deepEqual(silent.report.findings.map((f) => [f.code, f.severity]), [['timeout', 'error']]);
      assert.ok(!pool.processIds().includes(silentPid), 'the silent process is gone');
      // Then only the spare, started once the pool is idle.
      await waitFor(() => pool.processIds().length === 1);
      const answered = await pool.run(await project.bundle("exports.answer = 1;\n", 'main.js'), roundTripPlan);
      assert.deepEqual(answered.console, ['answered']);
      // The answering process ends once no other target of its file follows; the spare stays.
      await waitFor(() => pool.processIds().length === 1);
    } finally {
      pool.dispose();
    }
  });

  test('a process that dies mid-request gives sandbox-crash with its last words', async () => {
    const script = standIn('dying.js', "process.stderr.write('something broke inside\\n');\nprocess.exit(7);");
    const pool = new SandboxPool({ sandboxScript: script });
    try {
      const { report } = await runOn(pool);
      assert.equal(report.status, 'error');
      assert.equal(report.findings[0].code, 'sandbox-crash');
      assert.match(report.findings[0].message, /exit code 7/);
      assert.match(report.findings[0].message, /something broke inside/);
      // No restart loop: one spare waits, as after any check, and nothing else is started.
      await waitFor(() => pool.processIds().length === 1);
      const spare = pool.processIds();
      await new Promise((resolve) => setTimeout(resolve, 300));
      assert.deepEqual(pool.processIds(), spare);
    } finally {
      pool.dispose();
    }
  });

  test('a sandbox that cannot boot is not started again and again', async () => {
    const script = project.write('unbootable.js', "process.stderr.write('bad flags\\n');\nprocess.exit(9);\n");
    const pool = new SandboxPool({ sandboxScript: script });
    try {
      const { report } = await runOn(pool);
      assert.equal(report.findings[0].code, 'sandbox-crash');
      assert.match(report.findings[0].message, /bad flags/);
      // The spare started after the crash dies at boot as well, and is not replaced until a check asks.
      await new Promise((resolve) => setTimeout(resolve, 600));
      assert.deepEqual(pool.processIds(), []);
      await new Promise((resolve) => setTimeout(resolve, 300));
      assert.deepEqual(pool.processIds(), []);
      const again = await runOn(pool);
      assert.equal(again.report.findings[0].code, 'sandbox-crash', 'the next check still gets a plain answer');
    } finally {
      pool.dispose();
    }
  });

  test('a sandbox that cannot even be spawned is not tried again and again either', async () => {
    // Its folder does not exist, so spawning fails with ENOENT before any process runs.
    const pool = new SandboxPool({ sandboxScript: path.join(path.dirname(project.write('placeholder.js', '')), 'missing', 'sandbox.js') });
    try {
      const { report } = await runOn(pool);
      assert.equal(report.findings[0].code, 'sandbox-crash');
      await new Promise((resolve) => setTimeout(resolve, 300));
      const tried = pool.spawned;
      await new Promise((resolve) => setTimeout(resolve, 300));
      assert.equal(pool.spawned, tried, 'no spare is tried while the pool sits idle');
      assert.ok(tried <= 3, `${tried} processes tried: the check, its one resend and one spare`);
    } finally {
      pool.dispose();
    }
  });

  test('an out-of-memory death is told apart from other crashes', async () => {
    const script = standIn('oom.js', "process.stderr.write('FATAL ERROR: Reached heap limit Allocation failed - JavaScript heap out of memory\\n');\nprocess.exit(134);");
    const pool = new SandboxPool({ sandboxScript: script, memoryMb: 64 });
    try {
      const { report } = await runOn(pool);
      assert.equal(report.findings[0].code, 'memory-limit');
      assert.match(report.findings[0].message, /64 MB/);
    } finally {
      pool.dispose();
    }
  });

  test('a malformed report is refused as a whole: sandbox-crash saying what was wrong, and nothing of it used', async () => {
    const script = standIn('malformed.js', "process.send({ id: request.id, report: { status: '__proto__', findings: [null] }, console: ['from a bad report'], consoleTruncated: false });");
    const pool = new SandboxPool({ sandboxScript: script });
    try {
      const { report, console: lines } = await runOn(pool);
      assert.deepEqual(report.findings.map((f) => f.code), ['sandbox-crash']);
      assert.match(report.findings[0].message, /malformed report/);
      assert.deepEqual(lines, []);
    } finally {
      pool.dispose();
    }
  });

  test('replies to another request id are ignored', async () => {
    const script = standIn('forger.js', `process.send({ id: request.id + 1, report: ${passReport}, console: ['forged'], consoleTruncated: false });`);
    const pool = new SandboxPool({ sandboxScript: script, timeoutMs: 100 });
    try {
      const { report, console: lines } = await runOn(pool);
      assert.deepEqual(lines, []);
      assert.equal(report.findings[0].code, 'timeout');
    } finally {
      pool.dispose();
    }
  });
});
