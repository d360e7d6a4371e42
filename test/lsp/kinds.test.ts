// What a user reads about a Jacobian or Hessian target: the diagnostic on the derivative's name
// naming the wrong entries, the hover's least-squares figures, the lens, and the report's heat
// map, each from a real check by the engine (no hand-made report).
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import { errorHeatMap } from '../../client/src/report/heatMap';
import { renderReport } from '../../client/src/report/render';
import type { DocumentCheck, PairOutcome } from '../../server/src/check/checkDocument';
import { discoverPairs } from '../../server/src/discovery/discover';
import { checkByKind } from '../../server/src/engine/kinds';
import { defaultCheckOptions, type PairReport } from '../../server/src/engine/types';
import { lensTitle, pairLenses } from '../../server/src/lsp/codeLens';
import { toDiagnostics } from '../../server/src/lsp/diagnostics';
import { hoverMarkdown } from '../../server/src/lsp/hover';
import { shortNumber } from '../../server/src/shared/wording';
import { byClass, parseXml } from '../client/xml';

// An invented kiln: temperature readings against a two-rate heating model.
const times = [1, 2, 4, 6, 9];
const readings = [140, 250, 410, 520, 640];
const kilnText = (swapped: boolean) =>
  [
    'const times = [1, 2, 4, 6, 9];',
    'const readings = [140, 250, 410, 520, 640];',
    'export function kilnResiduals(p: number[]): number[] {',
    '  return times.map((t, i) => p[0] * (1 - Math.exp(-p[1] * t)) - readings[i]);',
    '}',
    'export function kilnJacobian(p: number[]): number[][] {',
    `  return times.map((t) => ${swapped ? '[p[0] * t * Math.exp(-p[1] * t), 1 - Math.exp(-p[1] * t)]' : '[1 - Math.exp(-p[1] * t), p[0] * t * Math.exp(-p[1] * t)]'});`,
    '}',
    'export const kilnStart = [900, 0.1];',
    '',
  ].join('\n');

function kilnOutcome(swapped: boolean): PairOutcome {
  const text = kilnText(swapped);
  const pair = discoverPairs(text, '/w/kiln.ts').pairs[0];
  const residuals = (p: ArrayLike<number>) => times.map((t, i) => p[0] * (1 - Math.exp(-p[1] * t)) - readings[i]);
  const jacobian = (p: ArrayLike<number>) => times.map((t) => (swapped ? [p[0] * t * Math.exp(-p[1] * t), 1 - Math.exp(-p[1] * t)] : [1 - Math.exp(-p[1] * t), p[0] * t * Math.exp(-p[1] * t)]));
  const report: PairReport = checkByKind.jacobian({ objective: residuals, gradient: jacobian, makeVector: (v) => Array.from(v) }, [[900, 0.1]], { dimension: null, learningRate: null, options: defaultCheckOptions });
  return { pair, report: { ...report, findings: [...pair.findings, ...report.findings] }, console: [] };
}

test('a Jacobian with swapped columns: one diagnostic on its name, in the user\'s names, naming the entries', () => {
  const outcome = kilnOutcome(true);
  assert.equal(outcome.pair.kind, 'jacobian');
  const check: DocumentCheck = { fileName: '/w/kiln.ts', pairs: [outcome], fileFindings: [], skipped: [] };
  const diagnostics = toDiagnostics(check, { uri: 'file:///w/kiln.ts', text: kilnText(true), relatedInformation: true, readme: 'file:///ext/README.md' });
  assert.equal(diagnostics.length, 1);
  const [diagnostic] = diagnostics;
  assert.equal(diagnostic.code, 'jacobian-mismatch');
  assert.match(String(diagnostic.message), /^kilnJacobian disagrees with central differences of kilnResiduals at probe 1: columns swapped \(0 ↔ 1\)\. J\[0\]\[0\]: analytic/);
  // On `kilnJacobian` (line 5, 0-based), with the residual function as related information.
  assert.equal(diagnostic.range.start.line, 5);
  assert.deepEqual(diagnostic.relatedInformation?.map((r) => r.message), ['residual function kilnResiduals']);
  assert.deepEqual(diagnostic.data, { objective: 'kilnJacobian' });
  assert.equal(lensTitle(outcome, false), 'Jacobian wrong: columns swapped (0 ↔ 1)');
});

test('a Jacobian that holds: the hover gives σmax(J)², cond(JᵀJ) and the steps for gradient descent on ½‖r‖²', () => {
  const outcome = kilnOutcome(false);
  assert.equal(outcome.report.status, 'pass', outcome.report.findings.map((f) => f.message).join('\n'));
  const figures = outcome.report.matrix!.leastSquares!;
  const card = hoverMarkdown(outcome.pair, outcome, false);
  assert.match(card, /^\*\*`kilnResiduals` → `kilnJacobian`\*\* · Jacobian matches/);
  // σmax² of the check's own JᵀJ, as the report holds it (the engine test holds it to ml-matrix's SVD).
  assert.ok(card.includes(`σmax(J)², L of the Gauss–Newton model of ½‖r‖² | ${shortNumber(figures.sigmaMaxSquared)} |`), card);
  assert.match(card, /cond\(JᵀJ\) \| /);
  assert.match(card, /gradient descent on ½‖r‖², on that model \| safe at steps ≤ 1\/σmax² = /);
  assert.match(card, /residual function and \d+ Jacobian evaluations/);
});

test('the report of a wrong Jacobian draws the heat map with the swapped entries marked', () => {
  const outcome = kilnOutcome(true);
  const svg = errorHeatMap('jacobian', outcome.report.probes[0], 0);
  const cells = byClass(parseXml(svg), 'heat-cell').filter((cell) => cell.attributes['data-row'] !== undefined);
  assert.equal(cells.length, times.length * 2);
  const wrong = cells.filter((cell) => cell.attributes.class.includes('heat-wrong'));
  const expected = outcome.report.probes[0].entries!.filter((e) => e.mismatch).map((e) => `${e.row},${e.column}`).sort();
  assert.deepEqual(wrong.map((cell) => `${cell.attributes['data-row']},${cell.attributes['data-column']}`).sort(), expected);
  const html = renderReport({ uri: 'file:///w/kiln.ts', objective: 'kilnJacobian', value: 'kilnResiduals', gradient: 'kilnJacobian', line: 5, report: outcome.report, console: [], settings: { seed: 1, timeoutMs: 10_000, probeCount: 3 } });
  assert.match(html, /<h1>kilnResiduals \/ kilnJacobian<\/h1>/);
  assert.match(html, /Jacobian wrong/);
  assert.match(html, /data-plot="heat-map"/);
  assert.match(html, /J\[0\]\[1\]/);
  assert.match(html, /Shape of the matrix<\/th><td>5 × 2/);
});

test('a Hessian\'s code lens sits on the Hessian, not on the gradient it shares with its pair', () => {
  const text = [
    'export function energy(x: number[]) { return x[0] * x[0]; }',
    'export function energyGrad(x: number[]) { return [2 * x[0]]; }',
    'export function energyHessian(x: number[]) { return [[2]]; }',
    '',
  ].join('\n');
  const lines = discoverPairs(text, '/w/e.ts').pairs.map((pair) => [pair.kind, pairLenses('file:///w/e.ts', pair, null, false)[0].range.start.line]);
  assert.deepEqual(lines, [['gradient', 0], ['hessian', 2]]);
});
