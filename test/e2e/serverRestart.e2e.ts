// A language server killed from outside (SIGKILL, as the OOM killer would) is started again by
// the extension, and diagnostics come back after the next edit and save. In a real VS Code
// (code-server in headless chromium) with the packaged extension, in a trusted demo copy.
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import * as path from 'node:path';
import { after, before, describe, test } from 'node:test';
import { screenshot } from './browser';
import { openEditorSession, type EditorSession } from './session';
import { isAlive } from '../support/processes';

const pollMs = 200;

/** Ids of the processes whose command line contains `fragment` (pgrep reads it as a regular expression). */
function processesRunning(fragment: string): number[] {
  const escaped = fragment.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
  const found = spawnSync('pgrep', ['-f', escaped], { encoding: 'utf8' });
  return found.stdout.split('\n').filter(Boolean).map(Number);
}

/** Ids of the direct children of `pid`. */
function childrenOf(pid: number): number[] {
  const found = spawnSync('pgrep', ['-P', String(pid)], { encoding: 'utf8' });
  return found.stdout.split('\n').filter(Boolean).map(Number);
}

function commandLine(pid: number): string {
  try {
    return readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0').join(' ');
  } catch {
    return '';
  }
}


/** Polls `probe` until it returns a value, or fails after `timeoutMs` with `what`. */
async function eventually<T>(probe: () => T | undefined, what: string, timeoutMs = 30_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = probe();
    if (value !== undefined) return value;
    if (Date.now() > deadline) throw new Error(`not within ${timeoutMs} ms: ${what}`);
    await new Promise((resolve) => setTimeout(resolve, pollMs));
  }
}

// A second pair typed at the end of the file, with a sign error in component 1 of its gradient
// (∇(x₀² + x₁²) = (2x₀, 2x₁), common practice). One line each, so auto-indent cannot change it.
const typedPair = [
  'export function ridge(x: [number, number]): number { return x[0] * x[0] + x[1] * x[1]; }',
  'export function ridgeGrad(x: [number, number]): [number, number] { return [2 * x[0], -2 * x[1]]; }',
];

describe('Slopecheck in VS Code: a killed language server', { timeout: 240_000 }, () => {
  let session: EditorSession;
  before(async () => {
    session = await openEditorSession(true);
  });
  after(async () => {
    await session?.close();
  });

  test('is restarted by the extension, and the squiggles come back after an edit and save', async () => {
    const { workbench, demo } = session;
    await workbench.openFile('calibration.ts');
    const wrong = demo.declarationOf('src/calibration.ts', 'thermistorFit_grad');
    await workbench.goTo(wrong.line, wrong.column);
    await workbench.expectVisible(workbench.squiggles().first(), 'a red squiggle in calibration.ts (thermistorFit_grad has a sign error)');

    // Only this session's server: its path lies in this code-server's own state folder.
    const serverScript = path.join(session.installedExtension, 'dist', 'server.js');
    const [first, ...others] = processesRunning(serverScript);
    assert.ok(first !== undefined && others.length === 0, `one language server of this session runs: ${[first, ...others]}`);
    const sandboxes = childrenOf(first).filter((pid) => commandLine(pid).includes(path.join('dist', 'sandbox.js')));
    assert.ok(sandboxes.length > 0, `the server keeps a warm sandbox process after checking (children: ${childrenOf(first).map(commandLine).join(' | ')})`);

    process.kill(first, 'SIGKILL');
    await eventually(() => (isAlive(first) ? undefined : true), `server ${first} to end after SIGKILL`);
    const second = await eventually(() => processesRunning(serverScript).find((pid) => pid !== first), 'a new language server process');
    // The sandbox processes of the killed server see their IPC channel close and end too.
    await eventually(() => (sandboxes.some(isAlive) ? undefined : true), `sandboxes ${sandboxes} of the killed server to end`);
    await screenshot(workbench.page, 'restart-1-after-kill');

    // An edit and a save: a new wrong pair, which only a running server can report.
    await workbench.editor.click();
    await workbench.page.keyboard.press('Control+End');
    await workbench.page.keyboard.insertText(`\n${typedPair.join('\n')}\n`);
    await workbench.page.keyboard.press('Control+S');
    await workbench.showProblems();
    const newRow = workbench.problemRows('ridgeGrad');
    await workbench.expectVisible(newRow.first(), 'a Problems row for ridgeGrad, reported by the restarted server', 60_000);
    assert.match(await newRow.first().innerText(), /gradient-mismatch/);
    await workbench.expectVisible(workbench.problemRows('thermistorFit_grad').first(), 'the Problems row of thermistorFit_grad again');
    const typed = demo.declarationOf('src/calibration.ts', 'ridgeGrad');
    await workbench.goTo(typed.line, typed.column);
    await workbench.expectVisible(workbench.squiggles().first(), 'a red squiggle under ridgeGrad');
    // rackDrying's lens reads the same, further up: only a lens on screen counts, and only ridge's is.
    const lens = workbench.editor.locator('.codelens-decoration', { hasText: 'gradient wrong: component 1 wrong' }).filter({ visible: true });
    await workbench.expectVisible(lens.first(), 'the code lens of ridge with its verdict', 15_000);
    await screenshot(workbench.page, 'restart-2-diagnostics-back');

    const saved = demo.read('src/calibration.ts');
    for (const line of typedPair) assert.ok(saved.includes(line), `the saved file holds the typed line: ${line}`);
    assert.deepEqual(processesRunning(serverScript), [second], 'one server runs: the restarted one');
  });
});
