// What a user sees in a real VS Code (code-server in headless chromium) with the
// packaged extension, in a trusted copy of the demo workspace.
import assert from 'node:assert/strict';
import { copyFileSync, mkdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import * as path from 'node:path';
import { after, before, describe, test } from 'node:test';
import { repoRoot } from '../support/paths';
import { screenshot } from './browser';
import { expectedPair } from './demoWorkspace';
import { openEditorSession, type EditorSession } from './session';
import { normalizeSpaces } from './workbench';

const plots = ['gradient', 'step-error', 'eigenvalues', 'descent'];

/** Copies a screenshot of this run to docs/ when SLOPECHECK_E2E_DOCS is set (how the README's pictures are made). */
function publish(file: string, docsName: string): void {
  if (!process.env.SLOPECHECK_E2E_DOCS) return;
  mkdirSync(path.join(repoRoot, 'docs'), { recursive: true });
  copyFileSync(file, path.join(repoRoot, 'docs', docsName));
}

/** The first number after `label` in `text`. */
function numberAfter(text: string, label: string): number {
  const match = text.slice(text.indexOf(label) + label.length).match(/-?\d+(\.\d+)?(e-?\d+)?/);
  assert.ok(text.includes(label) && match, `"${label}" followed by a number in: ${text}`);
  return Number(match[0]);
}

describe('Slopecheck in VS Code, trusted workspace', { timeout: 240_000 }, () => {
  let session: EditorSession;
  before(async () => {
    session = await openEditorSession(true);
  });
  after(async () => {
    await session?.close();
  });

  test('the installed extension carries esbuild with its platform binary, and it bundles TypeScript', () => {
    // Resolved as dist/server.js resolves it: from inside the installed extension, never the repository.
    const requireFromServer = createRequire(path.join(session.installedExtension, 'dist', 'server.js'));
    const resolved = requireFromServer.resolve('esbuild');
    assert.ok(resolved.startsWith(session.installedExtension + path.sep), `esbuild resolves inside the installed extension: ${resolved}`);
    const esbuild = requireFromServer('esbuild') as typeof import('esbuild');
    const result = esbuild.buildSync({ stdin: { contents: 'export const twice = (x: number): number => 2 * x;', loader: 'ts' }, write: false, format: 'cjs' });
    assert.match(result.outputFiles[0].text, /twice = \(x\) => 2 \* x/);
  });

  test('a wrong gradient gets a squiggle, a Problems entry with our source and code, and a hover that names the error', async () => {
    const { workbench, demo } = session;
    await workbench.openFile('calibration.ts');
    const gradient = demo.declarationOf('src/calibration.ts', 'thermistorFit_grad');
    await workbench.goTo(gradient.line, gradient.column);
    await workbench.expectVisible(workbench.squiggles().first(), 'a red squiggle in calibration.ts (thermistorFit_grad has a sign error)');

    const problems = await workbench.showProblems();
    const row = workbench.problemRows('gradient-mismatch').first();
    await workbench.expectVisible(row, 'a Problems row with the code gradient-mismatch');
    const rowText = normalizeSpaces(await row.innerText());
    assert.match(rowText, /slopecheck/i, `the Problems row names the source "slopecheck": ${rowText}`);
    assert.ok(await problems.isVisible());
    await screenshot(workbench.page, '1-problems');

    const card = await workbench.hoverText('thermistorFit_grad', 'gradient wrong: sign flipped');
    assert.match(card, /gradient wrong: sign flipped/, `the hover card says what is wrong: ${card}`);
    publish(await screenshot(workbench.page, '1-squiggle-hover'), 'squiggle-hover.png');
  });

  test('the hover card of a passing objective shows the safe step 1/L̂', async () => {
    const { workbench, demo } = session;
    const objective = demo.declarationOf('src/calibration.ts', 'salinityCalibration');
    await workbench.goTo(objective.line, objective.column);
    const card = await workbench.hoverText('salinityCalibration', 'safe step 1/L̂');
    assert.match(card, /gradient matches/, `the card gives the verdict: ${card}`);
    // L = 7.3565 for this quadratic objective: largest Hessian eigenvalue, computed with ml-matrix
    // EigenvalueDecomposition when the demo was built (fixtures/demo/expected.json).
    const lipschitz = expectedPair('salinityCalibration').learningRate!.lipschitz;
    const shown = numberAfter(card, 'safe step 1/L̂');
    assert.ok(Math.abs(shown - 1 / lipschitz) <= 0.01 * (1 / lipschitz), `safe step on the card ${shown} ≈ 1/L = ${1 / lipschitz}`);
    await screenshot(workbench.page, '2-hover-safe-step');
  });

  test('the learning-rate quick fix applies, and the divergence diagnostic goes away after the re-check', async () => {
    const { workbench, demo } = session;
    await workbench.openFile('harvest.ts');
    await workbench.showProblems();
    const divergent = workbench.problemRows('rate-divergent');
    await workbench.expectVisible(divergent.first(), 'a Problems row with rate-divergent for splitLearningRate = 0.6');
    // Last, so the focus is back in the editor (opening Problems moves it there) when Ctrl+. is pressed.
    const rate = demo.declarationOf('src/harvest.ts', 'splitLearningRate');
    await workbench.goTo(rate.line, rate.column);

    publish(await workbench.applyQuickFix('Set splitLearningRate to', '3-quick-fix-menu'), 'quick-fix.png');
    await workbench.page.keyboard.press('Control+S');
    await workbench.expectHidden(divergent, 'the rate-divergent Problems row to disappear after saving the fixed rate', 30_000);
    await screenshot(workbench.page, '3-after-fix');

    const saved = demo.read('src/harvest.ts').match(/export const splitLearningRate = ([\d.e-]+);/);
    assert.ok(saved, 'harvest.ts on disk still declares splitLearningRate');
    // L = 6.068 (fixtures/demo/expected.json, ml-matrix EigenvalueDecomposition): the new rate is at or
    // below 1/L, and not needlessly small (the fix rounds 1/L̂ down to two significant figures).
    const lipschitz = expectedPair('harvestRisk').learningRate!.lipschitz;
    const value = Number(saved[1]);
    assert.ok(value <= 1 / lipschitz && value >= 0.9 / lipschitz, `saved rate ${value} lies in [0.9/L, 1/L] with 1/L = ${1 / lipschitz}`);
  });

  test('the code lens shows a summary, and "check this objective" opens the report with its plots', async () => {
    const { workbench, demo } = session;
    await workbench.openFile('calibration.ts');
    const objective = demo.declarationOf('src/calibration.ts', 'salinityCalibration');
    await workbench.goTo(objective.line, objective.column);
    await workbench.expectVisible(workbench.codeLens('gradient matches · step ≤'), 'the code lens "gradient matches · step ≤ …" above salinityCalibration');

    await workbench.runCommand("Slopecheck: Check This Objective's Gradient");
    await workbench.expectVisible(workbench.page.locator('.tab', { hasText: 'Slopecheck report: salinityCalibration' }), 'the tab "Slopecheck report: salinityCalibration"');
    const report = await workbench.webviewFrame('#report-root .figures-table', 'the report of salinityCalibration with its figures table');
    for (const plot of plots) {
      const svg = report.locator(`.plot[data-plot="${plot}"]`);
      assert.equal(await svg.count(), 1, `one ${plot} plot in the report`);
      assert.equal(await svg.locator('.empty-note').count(), 0, `the ${plot} plot has data, not an empty note`);
    }
    const figures = normalizeSpaces(await report.locator('.figures-table').innerText());
    // The same L = 7.3565 as above (fixtures/demo/expected.json, ml-matrix).
    const lipschitz = expectedPair('salinityCalibration').learningRate!.lipschitz;
    const shown = numberAfter(figures, 'L̂ (local Lipschitz estimate)');
    assert.ok(Math.abs(shown - lipschitz) <= 0.01 * lipschitz, `L̂ in the figures table ${shown} ≈ ${lipschitz}`);
    await screenshot(workbench.page, '4-report');

    // For the picture: the report alone, at its figures, with the plots below them.
    await workbench.hidePanel();
    await workbench.hideSideBar();
    await workbench.maximizeGroupOf('Slopecheck report: salinityCalibration');
    await report.locator('.figures').scrollIntoViewIfNeeded();
    publish(await screenshot(workbench.page, '4-report-maximized'), 'report.png');
  });
});
