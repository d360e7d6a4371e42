// Routes out of the vm context that a hostile module has tried: an error made in the sandbox
// process's own realm (from a dynamic import), and a user Error.prepareStackTrace that the host
// would run with host call sites when it reads a stack. Each module reports what it reached;
// none may reach the process behind the context, and the next check must be right.
import assert from 'node:assert/strict';
import { after, describe, test } from 'node:test';
import { SandboxPool } from '../../server/src/sandbox/pool';
import { sandboxScript } from '../support/paths';
import { isAlive } from '../support/processes';
import { planFor, tempProject, waitFor } from './support';

const project = tempProject();
const pool = new SandboxPool({ sandboxScript, timeoutMs: 5000 });
after(() => {
  pool.dispose();
  project.remove();
});

// A correct pair after the attempt, so the check itself runs (∇(x₀²) = 2x₀, common practice).
const pair = 'export const objective = (x) => x[0] * x[0];\nexport const gradient = (x) => [2 * x[0]];\n';
const plan = planFor({ probes: [[1.5]], dimension: 1 });

/** Anything that looks like the host's process object. */
const reachedProcess = `const isHostProcess = (p) => !!p && typeof p === 'object' && typeof p.pid === 'number' && typeof p.binding === 'function';`;

async function attempt(name: string, text: string) {
  return pool.run(await project.bundle(`${reachedProcess}\n${text}\n${pair}`, `${name}.js`), plan);
}

describe('escape routes from the vm context', () => {
  test("a dynamic import's rejection never reaches user code: the check is over, and its process gone, before it could", async () => {
    // The rejection is made in the sandbox's realm (worker.ts) and delivered on a later turn of the
    // process's event loop; the whole check runs in one turn and the process exits after replying.
    // In a reused process the handler below would have run during a later check, with whatever
    // realm the error came from.
    const running = attempt(
      'dynamicImport',
      [
        "export const probe = import(['f', 's'].join('')).catch((error) => {",
        "  const realm = error.constructor.constructor === Function ? 'sandbox realm' : 'host realm';",
        '  let reached = false;',
        '  try { reached = isHostProcess(error.constructor.constructor("return process")()); } catch {}',
        "  console.log('handler ran: ' + realm + ', host process reached: ' + reached);",
        '});',
      ].join('\n'),
    );
    await waitFor(() => pool.processIds().length >= 1);
    const [used] = pool.processIds();
    const result = await running;
    assert.equal(result.report.status, 'pass', JSON.stringify(result.report.findings));
    assert.deepEqual(result.console, []);
    await waitFor(() => !isAlive(used));
  });

  test('a user Error.prepareStackTrace sees no host function in any call site, and the host never formats user stacks', async () => {
    const result = await attempt(
      'stackHook',
      [
        'let hostFunctions = 0;',
        'Error.prepareStackTrace = (error, sites) => {',
        '  for (const site of sites) { const f = site.getFunction(); if (f && f.constructor !== Function) hostFunctions++; }',
        "  return 'formatted';",
        '};',
        "Promise.reject(new Error('unhandled on purpose'));",
        "try { null.x; } catch (error) { void error.stack; }",
        "console.log('host functions seen: ' + hostFunctions);",
      ].join('\n'),
    );
    assert.equal(result.report.status, 'pass', JSON.stringify(result.report.findings));
    assert.deepEqual(result.console, ['host functions seen: 0']);
  });

  test('after both attempts the next, unrelated check is right', async () => {
    const { report } = await pool.run(await project.bundle(pair, 'plain.js'), plan);
    assert.equal(report.status, 'pass');
  });
});
