// A host that dies mid-check leaves no sandbox behind: the running one stops at its own
// deadline (vm's timeout) and exits when its reply finds no one listening; the spare exits
// as soon as its channel closes.
import assert from 'node:assert/strict';
import { spawn } from 'node:child_process';
import { after, test } from 'node:test';
import { cliScript } from '../support/paths';
import { childrenOf, isAlive } from '../support/processes';
import { tempProject, waitFor } from './support';

const project = tempProject();
after(() => project.remove());

test('killing the CLI mid-check leaves no sandbox process running', async () => {
  project.write('spin.ts', '/** @probe [1] */\nexport function spin(x: number[]): number { for (;;) {} }\nexport function spinGrad(x: number[]): number[] { return [0]; }\n');
  const host = spawn(process.execPath, [cliScript, '--timeout-ms', '2000', 'spin.ts'], { cwd: project.dir, stdio: 'ignore' });
  try {
    // The spinning check's process (no spare boots while a check runs).
    await waitFor(() => childrenOf(host.pid!).length >= 1, 15_000);
    const sandboxes = childrenOf(host.pid!);
    host.kill('SIGKILL');
    await waitFor(() => sandboxes.every((pid) => !isAlive(pid)), 15_000);
    assert.ok(sandboxes.length >= 1);
  } finally {
    if (host.exitCode === null) host.kill('SIGKILL');
  }
});
