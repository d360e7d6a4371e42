// Limits the heap cap does not cover: memory outside the V8 heap (touched ArrayBuffers),
// and the network, kept from the sandbox process itself where the platform allows it.
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { once } from 'node:events';
import * as net from 'node:net';
import { after, describe, test } from 'node:test';
import { networkWrapperFor, sandboxLaunch, workingNetworkWrapper } from '../../server/src/sandbox/launch';
import { SandboxPool } from '../../server/src/sandbox/pool';
import { residentBytes } from '../../server/src/sandbox/residentMemory';
import { sandboxScript } from '../support/paths';
import { planFor, tempProject } from './support';

const project = tempProject();
after(() => project.remove());

describe('limits beyond the heap cap', () => {
  test('memory outside the V8 heap counts: touched ArrayBuffers end the check with memory-limit', async () => {
    if (process.platform !== 'linux') {
      // Without a resident-set reading only the heap cap holds; the README says so.
      assert.equal(residentBytes(process.pid), null);
      return;
    }
    assert.ok((residentBytes(process.pid) ?? 0) > 10 * 2 ** 20, 'this process reads its own resident set');
    const pool = new SandboxPool({ sandboxScript, memoryMb: 64, timeoutMs: 20_000 });
    try {
      const hoard = await project.bundle(
        'const kept = [];\nexport const objective = (x) => { for (;;) kept.push(new Uint8Array(32 * 2 ** 20).fill(1)); };\nexport const gradient = (x) => [0];\n',
        'offHeap.js',
      );
      const { report } = await pool.run(hoard, planFor({ probes: [[1]], dimension: 1 }));
      assert.deepEqual(report.findings.map((f) => f.code), ['memory-limit']);
      assert.match(report.findings[0].message, /resident memory passed 64 MB/);
    } finally {
      pool.dispose();
    }
  });

  test('a listener on 127.0.0.1 gets no connection from a sandbox process, where the platform can deny the network', async () => {
    const server = net.createServer((socket) => socket.destroy());
    let connections = 0;
    server.on('connection', () => connections++);
    server.listen(0, '127.0.0.1');
    await once(server, 'listening');
    const port = (server.address() as net.AddressInfo).port;
    try {
      const probe = project.write(
        'dial.js',
        `const socket = require('net').connect(${port}, '127.0.0.1');\nsocket.on('connect', () => process.exit(10));\nsocket.on('error', () => process.exit(20));\n`,
      );
      const launch = sandboxLaunch(probe, 64, 1);
      if (launch.network === 'none') {
        // Nothing to deny with here: the launcher must say so rather than claim a confinement.
        assert.equal(workingNetworkWrapper(), null);
        assert.equal(process.allowedNodeEnvironmentFlags.has('--allow-net'), false);
        return;
      }
      const run = spawnSync(launch.command, launch.args, { timeout: 20_000, env: {} });
      assert.equal(run.status, 20, `the dial was not refused: exit ${run.status}, ${String(run.stderr)}`);
      assert.equal(connections, 0);
    } finally {
      server.close();
    }
  });

  // Only the Linux wrapper is run here (test above); the macOS one is checked for what it asks of
  // sandbox-exec, and is tried once on the machine itself before it is used (workingNetworkWrapper).
  test('each platform gets its own network wrapper, or none', () => {
    const linux = networkWrapperFor('linux');
    assert.deepEqual([linux?.command, ...(linux?.options ?? [])], ['unshare', '--user', '--map-root-user', '--net']);
    const mac = networkWrapperFor('darwin');
    assert.equal(mac?.network, 'profile');
    assert.deepEqual([mac?.command, mac?.options[0]], ['/usr/bin/sandbox-exec', '-p']);
    const profile = mac!.options[1];
    for (const rule of ['(deny network-outbound (remote ip))', '(deny network-inbound (local ip))', '(deny network-bind (local ip))']) {
      assert.ok(profile.includes(rule), rule);
    }
    let depth = 0;
    for (const char of profile) {
      depth += char === '(' ? 1 : char === ')' ? -1 : 0;
      assert.ok(depth >= 0, 'balanced parentheses');
    }
    assert.equal(depth, 0, 'balanced parentheses');
    assert.equal(networkWrapperFor('win32'), null);
  });
});
