// In a workspace that is not trusted (Restricted Mode), nothing is run, and the
// user is told why: a fresh browser profile, with Workspace Trust left on.
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { restrictedModeExplanation } from '../../client/src/statusText';
import { screenshot } from './browser';
import { openEditorSession, type EditorSession } from './session';

/** Longer than the 2-4 s a squiggle takes in a trusted workspace, with room for a slow machine. */
const quietPeriodMs = 10_000;

describe('Slopecheck in VS Code, Restricted Mode', { timeout: 180_000 }, () => {
  let session: EditorSession;
  before(async () => {
    session = await openEditorSession(false);
  });
  after(async () => {
    await session?.close();
  });

  test('the buggy file gets no squiggle, and the status bar and a notification say Slopecheck is off', async () => {
    const { workbench, demo } = session;
    const page = workbench.page;
    await workbench.expectVisible(page.locator('.statusbar-item', { hasText: 'Restricted Mode' }).first(), 'the workbench\'s "Restricted Mode" status item');

    await workbench.openFile('calibration.ts');
    const gradient = demo.declarationOf('src/calibration.ts', 'thermistorFit_grad');
    await workbench.goTo(gradient.line, gradient.column);
    await workbench.expectVisible(workbench.statusItem('Slopecheck: off in Restricted Mode'), 'the status bar item "Slopecheck: off in Restricted Mode"');
    await workbench.expectVisible(workbench.notification(restrictedModeExplanation.slice(0, 60)), `the notification "${restrictedModeExplanation}"`);
    await screenshot(page, '5-restricted-mode');

    // In a trusted workspace this line is squiggled within seconds (see vscode.e2e.ts).
    await workbench.expectAbsentFor(workbench.squiggles(), 'red squiggle in calibration.ts', quietPeriodMs);
    await workbench.showProblems();
    assert.equal(await workbench.problemRows('slopecheck').count(), 0, 'no Slopecheck entry in the Problems panel');
    await screenshot(page, '5-restricted-mode-quiet');
  });
});
