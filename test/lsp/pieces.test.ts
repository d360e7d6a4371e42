// The pure pieces of the server: numbers, hover cards, lens titles, diagnostics, edits.
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import type { DocumentCheck, PairOutcome } from '../../server/src/check/checkDocument';
import { discoverPairs } from '../../server/src/discovery/discover';
import { checkPair } from '../../server/src/engine/checkPair';
import { defaultCheckOptions, type PairReport, type ProbeReport } from '../../server/src/engine/types';
import { lensTitle, pairLenses } from '../../server/src/lsp/codeLens';
import { toDiagnostics } from '../../server/src/lsp/diagnostics';
import { gradientPatch, type FixableDiagnosis } from '../../server/src/lsp/gradientPatch';
import { hoverMarkdown } from '../../server/src/lsp/hover';
import { probeInsertion } from '../../server/src/lsp/probeGuess';
import { applyReplacements, parseSource } from '../../server/src/lsp/sourceEdits';
import { floorToSignificant } from '../../server/src/shared/wording';
import { errorReport } from '../../server/src/sandbox/reports';

test('the safe rate is 1/L̂ rounded down to two significant figures', () => {
  // fixtures/demo/expected.json: L = 37.215 (pricing) and 6.068 (harvest), from ml-matrix eigenvalues.
  assert.equal(floorToSignificant(1 / 37.215), 0.026);
  assert.equal(floorToSignificant(1 / 6.068), 0.16);
  assert.equal(floorToSignificant(0.02687), 0.026);
  assert.equal(floorToSignificant(0.026), 0.026, 'an exact value is kept, not floored to 0.025');
  assert.equal(floorToSignificant(6.69e-5), 6.6e-5);
  assert.equal(floorToSignificant(123.9), 120);
  assert.ok(floorToSignificant(0.099999) <= 0.099999);
});

function report(overrides: Partial<PairReport>): PairReport {
  return { ...errorReport([]), status: 'pass', ...overrides };
}

function probe(point: number[], components: ProbeReport['components'] = [], maxRelError = 0): ProbeReport {
  return { point, dimension: point.length, value: 1, mode: 'full', components, directions: [], noise: 1e-16, maxRelError, stepStudy: null, smoothness: null, descent: [] };
}

const pairText = [
  '/**',
  ' * @probe [25, -20, 1.5]',
  ' * @probe [24, -23, 0.5]',
  ' */',
  'export function fit(c: number[]): number { return c[0] * c[0] + c[1] * c[1] + c[2] * c[2]; }',
  'export function fitGrad(c: number[]): number[] { return [-2 * c[0], -2 * c[1], -2 * c[2]]; }',
  'export const lr = 0.9;',
  '',
].join('\n');

function outcomeOf(text: string, r: PairReport): PairOutcome {
  return { pair: discoverPairs(text, '/w/fit.ts').pairs[0], report: r, console: [] };
}

test('hover card: verdict, error, local steps, probes and cost, with the caution', () => {
  const card = hoverMarkdown(
    outcomeOf(pairText, report({})).pair,
    outcomeOf(pairText, report({
      maxRelError: 2.5e-12,
      smoothness: { lipschitz: 37.215, mu: 2.5, kappa: 14.886, safeStep: 1 / 37.215, divergenceStep: 2 / 37.215 },
      learningRate: { name: 'lr', value: 0.036, status: 'aggressive', decreased: [true, true] },
      probes: [probe([25, -20, 1.5]), probe([24, -23, 0.5]), probe([1, 2, 3])],
      dimension: 3,
      evaluations: { objective: 120, gradient: 40 },
      elapsedMs: 12.4,
    })),
    false,
  );
  assert.match(card, /^\*\*`fit` → `fitGrad`\*\* · gradient matches/);
  assert.match(card, /max relative error \| 2\.5e-12 \|/);
  assert.match(card, /safe step 1\/L̂ \| 0\.0269 \|/);
  assert.match(card, /divergence at 2\/λ⁺ \| 0\.0537 \|/);
  assert.match(card, /κ̂ = L̂\/μ̂ \| 14\.9 \|/);
  assert.match(card, /learning rate `lr` = 0\.036 \| aggressive/);
  assert.match(card, /probes \| 3 in dimension 3: \[25, -20, 1\.5\], \[24, -23, 0\.5\], and 1 more \|/);
  assert.match(card, /120 objective and 40 gradient evaluations in 12 ms/);
  assert.match(card, /local estimates near the probes/);
});

test('hover card: how the target is called, its start, and a momentum next to the rate', () => {
  const text = [
    'class Fit { loss(w: number[], X: number[][]): number { return w[0] * X[0][0]; } lossGrad(w: number[], X: number[][]): number[] { return [X[0][0]]; } }',
    'export const model = new Fit();',
    'const trainX = [[2]];',
    'const w0 = [0.5];',
    'model.lossGrad(w0, trainX);',
  ].join('\n');
  const pair = discoverPairs(text, '/w/fit.ts').pairs[0];
  const card = hoverMarkdown(pair, { pair, console: [], report: report({
    learningRate: { name: 'opts.lr', value: 0.1, status: 'safe', decreased: [true], momentum: { name: 'opts.beta', value: 0.9 } },
    probes: [probe([0.5])],
    dimension: 1,
  }) }, false);
  assert.match(card, /called as \| `model\.loss\(x, trainX\) and model\.lossGrad\(x, trainX\)` \|/);
  assert.match(card, /probe 1 \| your start `w0`; the others perturb it \|/);
  assert.match(card, /learning rate `opts\.lr` = 0\.1 \| safe \(at or below 1\/L̂\); used with momentum `opts\.beta` = 0\.9, not taken into account \|/);
});

test('lens titles', () => {
  const pass = outcomeOf(pairText, report({ smoothness: { lipschitz: 37.215, mu: 1, kappa: 37, safeStep: 1 / 37.215, divergenceStep: 2 / 37.215 } }));
  assert.equal(lensTitle(pass, false), 'gradient matches · step ≤ 0.026 (local estimate)');
  assert.equal(lensTitle(outcomeOf(pairText, report({ status: 'fail', diagnosis: { kind: 'sign' } })), false), 'gradient wrong: sign flipped');
  assert.equal(lensTitle(outcomeOf(pairText, report({ status: 'fail', diagnosis: { kind: 'permutation', pairs: [[0, 1]] } })), false), 'gradient wrong: components swapped (0 ↔ 1)');
  assert.equal(lensTitle(null, true), 'checking…');
  const untrusted = pairLenses('file:///x.ts', outcomeOf(pairText, report({})).pair, null, false, false);
  assert.deepEqual(untrusted.map((lens) => lens.command?.title), ['not checked: the workspace is not trusted']);
  assert.equal(lensTitle(outcomeOf(pairText, errorReport([{ code: 'timeout', severity: 'error', subject: 'objective', message: 'slow' }])), false), 'not checked: timeout');
});

test('per-probe mismatches merge into one diagnostic with the worst probe; runtime errors sit on their line', () => {
  const mismatch = (probeIndex: number) => ({ code: 'gradient-mismatch' as const, severity: 'error' as const, subject: 'gradient' as const, message: `probe ${probeIndex}`, probeIndex, components: [0] });
  const component = (analytic: number) => [{ index: 0, analytic, numerical: -analytic, errorBound: 1e-12, relError: 2, mismatch: true }];
  const outcome = outcomeOf(pairText, report({
    status: 'fail',
    diagnosis: { kind: 'sign' },
    probes: [probe([25, -20, 1.5], component(50), 1.5), probe([24, -23, 0.5], component(48), 2)],
    findings: [
      mismatch(0),
      mismatch(1),
      { code: 'runtime-error', severity: 'error', subject: 'objective', message: 'boom', location: { file: '/w/fit.ts', line: 5, column: 3 } },
    ],
  }));
  const check: DocumentCheck = { fileName: '/w/fit.ts', pairs: [outcome], fileFindings: [], skipped: [] };
  const diagnostics = toDiagnostics(check, { uri: 'file:///w/fit.ts', text: pairText, relatedInformation: true, readme: 'file:///ext/README.md' });
  assert.equal(diagnostics.length, 2);
  const [merged, thrown] = diagnostics;
  assert.equal(merged.message, 'fitGrad disagrees with central differences of fit at probe 2: sign flipped. Component 0: analytic 48, numerical -48 ± 1e-12. Seen at 2 of 2 probes.');
  assert.deepEqual(merged.range, { start: { line: 5, character: 16 }, end: { line: 5, character: 23 } });
  assert.deepEqual(merged.relatedInformation?.map((r) => [r.message, r.location.range.start.line]), [['objective fit', 4], ['probe 2', 2]]);
  assert.deepEqual(merged.data, { objective: 'fit' });
  assert.deepEqual(thrown.range, { start: { line: 4, character: 0 }, end: { line: 4, character: pairText.split('\n')[4].length } });
  assert.equal(thrown.code, 'runtime-error');
});

function patched(text: string, diagnosis: FixableDiagnosis): string {
  const pair = discoverPairs(text, '/w/p.ts').pairs[0];
  const replacements = gradientPatch(parseSource(text, '/w/p.ts'), pair.gradient!.returnExpressions, diagnosis);
  assert.ok(replacements);
  return applyReplacements(text, replacements);
}

test('gradient patches edit array literals element by element', () => {
  const text = (ret: string) => `export function f(x: [number, number]) { return x[0] * x[1]; }\nexport function fGrad(x: [number, number]) { return ${ret}; }\n`;
  assert.match(patched(text('[x[1], -x[0] + 1]'), { kind: 'sign' }), /return \[-x\[1\], -\(-x\[0\] \+ 1\)\];/);
  assert.match(patched(text('[-x[1], -x[0]]'), { kind: 'sign' }), /return \[x\[1\], x\[0\]\];/);
  assert.match(patched(text('[x[1] / 2, x[0] + 0]'), { kind: 'factor', factor: 0.5 }), /return \[x\[1\] \/ 2 \* 2, \(x\[0\] \+ 0\) \* 2\];/);
  assert.match(patched(text('[3 * x[1], 3 * x[0]]'), { kind: 'factor', factor: 3 }), /return \[3 \* x\[1\] \/ 3, 3 \* x\[0\] \/ 3\];/);
  assert.match(patched(text('[x[0], x[1]]'), { kind: 'permutation', pairs: [[0, 1]] }), /return \[x\[1\], x\[0\]\];/);
});

test('other return expressions are wrapped, every return statement and arrow bodies included', () => {
  const text = [
    'export function f(x: number[]) { return x[0] ** 2; }',
    'export function fGrad(x: number[]) { if (x[0] > 0) return x.map((v) => v); return a ? b : c; }',
    '',
  ].join('\n');
  const sign = patched(text, { kind: 'sign' });
  assert.match(sign, /return x\.map\(\(v\) => v\)\.map\(\(g\) => -g\); return \(a \? b : c\)\.map\(\(g\) => -g\);/);
  assert.match(patched(text, { kind: 'factor', factor: 0.5 }), /return x\.map\(\(v\) => v\)\.map\(\(g\) => g \* 2\);/);
  const arrow = 'export const f = (x: number[]) => x[0];\nexport const fGrad = (x: number[]) => x.slice();\n';
  assert.match(patched(arrow, { kind: 'permutation', pairs: [[0, 2]] }), /=> \(\(g\) => \{ \[g\[0\], g\[2\]\] = \[g\[2\], g\[0\]\]; return g; \}\)\(x\.slice\(\)\);/);
  // The wrapped swap, evaluated: entries 0 and 2 trade places (common practice).
  const swap = ((g: number[]) => { [g[0], g[2]] = [g[2], g[0]]; return g; })([1, 2, 3]);
  assert.deepEqual(swap, [3, 2, 1]);
});

test('the guessed @probe takes the largest literal index, into the JSDoc or a new one', () => {
  const insert = (text: string) => {
    const pair = discoverPairs(text, '/w/q.ts').pairs[0];
    const { replacement, dimension } = probeInsertion(parseSource(text, '/w/q.ts'), pair);
    return { text: applyReplacements(text, [replacement]), dimension };
  };
  const grad = 'export function fGrad(x: number[]) { return [0]; }\n';
  const bare = insert('export function f(x: number[]) { return x[3] + x[1]; }\n' + grad);
  assert.equal(bare.dimension, 4);
  assert.match(bare.text, /^\/\*\* @probe \[0\.5, 0\.5, 0\.5, 0\.5\] \*\/\nexport function f/);
  const multi = insert('/**\n * The cost.\n */\nexport const f = (p: number[]) => { const [a, b] = p; return a * b; };\n' + grad);
  assert.equal(multi.dimension, 2);
  assert.match(multi.text, /^\/\*\*\n \* The cost\.\n \* @probe \[0\.5, 0\.5\]\n \*\/\nexport const f/);
  const unknown = insert('// header\nexport function f(x: number[]) { return x.reduce((s, v) => s + v, 0); }\n' + grad);
  assert.equal(unknown.dimension, 3);
  assert.match(unknown.text, /^\/\/ header\n\/\*\* @probe \[0\.5, 0\.5, 0\.5\] \*\/\nexport function f/);
});

test('the CLI and the editor word a mismatch alike: the engine\'s finding and the diagnostic differ only by the names', () => {
  // f = ½(x₀² + x₁² + x₂²) with gradient 2x: a factor of 2, the same error in every component.
  for (const [gradient, shape] of [[(x: ArrayLike<number>) => [2 * x[0], 2 * x[1], 2 * x[2]], /off by a constant factor \(2× the true gradient\)/], [(x: ArrayLike<number>) => [-x[0], -x[1], -x[2]], /sign flipped/]] as const) {
    const checked = checkPair({ objective: (x) => 0.5 * (x[0] ** 2 + x[1] ** 2 + x[2] ** 2), gradient, makeVector: (v) => Array.from(v) }, [[1, 2, 3]], { dimension: null, learningRate: null, options: defaultCheckOptions });
    const cli = checked.findings.find((f) => f.code === 'gradient-mismatch')!.message;
    assert.match(cli, shape);
    const [editor] = toDiagnostics({ fileName: '/w/fit.ts', pairs: [outcomeOf(pairText, checked)], fileFindings: [], skipped: [] }, { uri: 'file:///w/fit.ts', text: pairText, relatedInformation: false, readme: 'file:///ext/README.md' });
    assert.equal(editor.message, cli.replace('the gradient disagrees with central differences', 'fitGrad disagrees with central differences of fit'));
    const outcome = outcomeOf(pairText, checked);
    assert.match(hoverMarkdown(outcome.pair, outcome, false), shape);
  }
});
