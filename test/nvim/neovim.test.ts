// Neovim as a second LSP client: headless nvim runs test/nvim/driver.lua, which starts the built
// server over stdio with Neovim's own LSP client, opens demo files with planted bugs and correct
// pairs, asks for hovers and code lenses, applies a quick fix with Neovim's edit code and saves.
// Neovim sends no settings, so everything here runs on the server's defaults.
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { readFileSync } from 'node:fs';
import * as path from 'node:path';
import { pathToFileURL } from 'node:url';
import { fixturesDir } from '../support/paths';
import { gradientAt } from './savedModule';
import { declaredName, type Range } from './sourceText';
import { runDriver, type DriverResult, type NeovimRun, type PlanRequest, startNeovimRun } from './neovimRun';

interface ExpectedPair {
  file: string;
  objective: string;
  gradient: string | null;
  status: 'pass' | 'fail' | 'inconclusive';
  diagnosis: string | null;
  components?: number[];
  learningRate?: { name: string; status: 'safe' | 'aggressive' | 'divergent'; value: number; lipschitz: number };
}

interface LspDiagnostic {
  range: Range;
  code: string;
  severity: number;
  source: string;
  message: string;
  data?: { objective?: string };
  relatedInformation?: Array<{ location: { uri: string; range: Range }; message: string }>;
}

// The truth the demo workspace was built with (fixtures/demo/expected.json: Lipschitz constants
// from ml-matrix EigenvalueDecomposition, bugs planted by construction).
const truth: ExpectedPair[] = JSON.parse(readFileSync(path.join(fixturesDir, 'demo', 'expected.json'), 'utf8')).pairs;
const pairsOf = (file: string) => truth.filter((p) => p.file === `src/${file}`);
const pair = (objective: string) => truth.find((p) => p.objective === objective)!;

// Severities the README gives each code: 1 error, 2 warning (LSP DiagnosticSeverity).
const severityOf: Record<string, number> = { 'gradient-mismatch': 1, 'rate-divergent': 1, 'rate-aggressive': 2 };

/** The diagnostics expected.json implies for a file: each wrong gradient, each unsafe declared rate. */
function expectedDiagnostics(file: string, text: string): Array<{ code: string; range: Range }> {
  return pairsOf(file).flatMap((p) => [
    ...(p.status === 'fail' ? [{ code: 'gradient-mismatch', range: declaredName(text, p.gradient!) }] : []),
    ...(p.learningRate && p.learningRate.status !== 'safe' ? [{ code: `rate-${p.learningRate.status}`, range: declaredName(text, p.learningRate.name) }] : []),
  ]);
}

const byPosition = (a: { range: Range }, b: { range: Range }) => a.range.start.line - b.range.start.line || a.range.start.character - b.range.start.character;
const codesAndRanges = (diagnostics: LspDiagnostic[]) => diagnostics.map((d) => ({ code: d.code, range: d.range })).sort(byPosition);

// The demo files opened: wrong and correct pairs side by side, safe, aggressive and divergent rates.
const opened = ['calibration.ts', 'pricing.ts', 'harvest.ts'];
const fixFile = 'calibration.ts';
const fixed = pair('thermistorFit');

let run: NeovimRun;
let result: Promise<DriverResult>;

before(() => {
  run = startNeovimRun();
  const file = (name: string) => path.join(run.workspace, 'src', name);
  const nameAt = (name: string, objective: string, offset = 0): PlanRequest => {
    const { start } = declaredName(run.original(name), objective);
    return { file: file(name), line: start.line, character: start.character + offset };
  };
  result = runDriver(run, {
    open: opened.map(file),
    // In the middle of the name: a hover anywhere on it must find the pair.
    hovers: [nameAt('calibration.ts', 'salinityCalibration', 5), nameAt('pricing.ts', 'stepSize', 3)],
    lenses: [file('calibration.ts')],
    fix: { ...nameAt(fixFile, fixed.gradient!), code: 'gradient-mismatch', titlePrefix: `Fix ${fixed.gradient}` },
  });
});
after(() => run?.dispose());

describe('Neovim 0.7 as the LSP client, with no settings sent', () => {
  test('Neovim declares neither settings nor code lenses, and the server asks for no settings', async () => {
    const r = await result;
    assert.equal(r.clientCapabilities.workspace?.configuration, undefined);
    assert.equal(r.clientCapabilities.textDocument?.codeLens, undefined);
    assert.ok(!r.serverRequests.includes('workspace/configuration'), `server asked: ${r.serverRequests.join(', ')}`);
    assert.equal(r.offsetEncoding, 'utf-16');
    assert.ok(r.serverCapabilities.codeLensProvider, 'the server offers code lenses anyway');
  });

  for (const file of opened) {
    test(`${file}: one diagnostic per wrong gradient and unsafe rate, on its name, none on correct pairs`, async () => {
      const r = await result;
      const text = run.original(file);
      const uri = pathToFileURL(path.join(run.workspace, 'src', file)).href;
      const first = r.published.find((p) => p.uri === uri);
      assert.ok(first, `diagnostics for ${uri}; got ${r.published.map((p) => p.uri).join(', ')}`);
      const diagnostics = first.diagnostics as LspDiagnostic[];
      assert.deepEqual(codesAndRanges(diagnostics), expectedDiagnostics(file, text).sort(byPosition));
      for (const d of diagnostics) {
        assert.equal(d.source, 'slopecheck');
        assert.equal(d.severity, severityOf[d.code], `${d.code} severity`);
      }
      // Neovim stored them where the server put them (ASCII text: bytes and UTF-16 units agree).
      const shown = r.documents.find((d) => d.file.endsWith(file))!.shown;
      assert.deepEqual(
        shown.map((s) => ({ code: s.code, range: { start: { line: s.lnum, character: s.col }, end: { line: s.end_lnum, character: s.end_col } } })).sort(byPosition),
        codesAndRanges(diagnostics),
      );
    });
  }

  test('a mismatch names the wrong components and links back to its objective', async () => {
    const r = await result;
    const text = run.original('calibration.ts');
    const uri = pathToFileURL(path.join(run.workspace, 'src', 'calibration.ts')).href;
    const diagnostics = r.published.find((p) => p.uri === uri)!.diagnostics as LspDiagnostic[];
    const sign = diagnostics.find((d) => d.message.startsWith(`${fixed.gradient} `))!;
    assert.match(sign.message, /sign flipped/);
    assert.deepEqual(sign.data, { objective: 'thermistorFit' });
    // Neovim declares relatedInformation, so the objective's name comes with the diagnostic.
    assert.deepEqual(sign.relatedInformation?.[0].location, { uri, range: declaredName(text, 'thermistorFit') });
    const subset = diagnostics.find((d) => d.message.startsWith('gradRackDrying '))!;
    assert.match(subset.message, new RegExp(`component ${pair('rackDrying').components!.join(', ')} wrong`));
  });

  test('hover shows the safe step 1/L̂ and the divergence threshold 2/λ⁺', async () => {
    const r = await result;
    const cards = r.hovers.map((h) => h.result as { contents: { kind: string; value: string }; range: Range });
    for (const [card, objective, name] of [
      [cards[0], 'salinityCalibration', 'salinityCalibration'],
      [cards[1], 'discountScheduleLoss', 'stepSize'],
    ] as const) {
      assert.equal(card.contents.kind, 'markdown');
      const text = card.contents.value;
      const { lipschitz, status, value, name: rateName } = pair(objective).learningRate!;
      // Gradient descent on an L-smooth function: safe at 1/L, diverging on a quadratic at 2/λmax
      // (Nesterov, Introductory Lectures on Convex Optimization, 2004, §1.2.3; from memory). Both
      // objectives are convex near their probes, so the largest positive curvature λ⁺ is L.
      // The card shows three significant digits of a local estimate: allow 0.6 % either way.
      assertNear(cardNumber(text, 'safe step 1/L̂'), 1 / lipschitz, 6e-3, `${objective} safe step`);
      assertNear(cardNumber(text, 'divergence at 2/λ⁺'), 2 / lipschitz, 6e-3, `${objective} divergence step`);
      assert.match(text, new RegExp(`learning rate \`${rateName}\` = ${value} \\| ${status}`));
      const file = pair(objective).file.replace('src/', '');
      assert.deepEqual(card.range, declaredName(run.original(file), name), 'the hover covers the name');
    }
  });

  test('textDocument/codeLens answers although Neovim does not advertise it: two lenses per pair', async () => {
    const r = await result;
    const text = run.original('calibration.ts');
    const uri = pathToFileURL(path.join(run.workspace, 'src', 'calibration.ts')).href;
    const lenses = r.lenses[0].result as Array<{ range: Range; command: { title: string; command: string; arguments?: unknown[] } }>;
    const pairs = pairsOf('calibration.ts');
    assert.equal(lenses.length, 2 * pairs.length);
    for (const p of pairs) {
      const range = declaredName(text, p.objective);
      const [summary, again] = lenses.filter((l) => l.range.start.line === range.start.line);
      assert.deepEqual(summary.range, range);
      assert.equal(summary.command.command, 'slopecheck.openReport');
      assert.deepEqual(summary.command.arguments, [uri, p.objective]);
      assert.deepEqual(again.command, { title: 'check again', command: 'slopecheck.checkAgain', arguments: [uri] });
      if (p.status === 'fail') {
        const shape = p.diagnosis === 'sign' ? 'sign flipped' : `component ${p.components!.join(', ')} wrong`;
        assert.equal(summary.command.title, `gradient wrong: ${shape}`);
      } else if (p.learningRate) {
        assert.match(summary.command.title, /^gradient matches · step ≤ [\d.e-]+ \(local estimate\)$/);
      } else {
        // Without a learning rate the everyday check leaves the curvature out: the hover asks for it.
        assert.equal(summary.command.title, 'gradient matches');
      }
    }
    // 1/L = 0.1359 for salinityCalibration (expected.json), rounded down to two figures.
    const salinity = lenses.find((l) => l.command.arguments?.[1] === 'salinityCalibration')!;
    assert.equal(salinity.command.title, 'gradient matches · step ≤ 0.13 (local estimate)');
  });

  test('the sign fix, applied by Neovim and saved, clears its diagnostic and makes the gradient right', async () => {
    const r = await result;
    const fix = r.fix;
    const original = run.original(fixFile);
    // The diagnostic went through Neovim's own store (byte columns and back) and kept its data.
    assert.equal(fix.sent.length, 1);
    assert.deepEqual(fix.sent[0].data, { objective: 'thermistorFit' });
    assert.match(fix.chosen.title, /sign flipped \(checked in the sandbox\)/);
    assert.equal(fix.diskText, fix.bufferText, ':write saved what Neovim applied');
    assert.notEqual(fix.diskText, original);
    assertOnlyChangedInside(original, fix.diskText, fixed.gradient!);

    // The re-check on save: the fixed pair is gone, the other planted bug is still reported.
    const others = expectedDiagnostics(fixFile, fix.diskText).filter((d) => d.range.start.line !== declaredName(fix.diskText, fixed.gradient!).start.line);
    assert.deepEqual(codesAndRanges(fix.after.diagnostics as LspDiagnostic[]), others.sort(byPosition));
    assert.equal(others.length, pairsOf(fixFile).filter((p) => p.status === 'fail').length - 1);

    // Outside the server: the saved gradient matches central differences of the objective.
    // Central difference (f(x+h) − f(x−h)) / 2h, error O(h²) (Nocedal & Wright, Numerical
    // Optimization, 2nd ed., 2006, §8.1; from memory).
    const { objective, gradient } = await gradientAt(path.join(run.workspace, 'src', fixFile), fixed.objective, fixed.gradient!);
    for (const probe of [[25, -20, 1.5], [24, -23, 0.5]]) {
      const analytic = gradient(probe);
      probe.forEach((_, i) => {
        const h = 1e-5 * Math.max(1, Math.abs(probe[i]));
        const shifted = (delta: number) => objective(probe.map((v, j) => (j === i ? v + delta : v)));
        const numerical = (shifted(h) - shifted(-h)) / (2 * h);
        assertNear(analytic[i], numerical, 1e-6, `component ${i} at [${probe}]`);
      });
    }
  });
});

function cardNumber(markdown: string, row: string): number {
  const match = new RegExp(`\\| ${row.replace(/[/^$.*+?()[\]{}|\\]/g, '\\$&')} \\| ([^|]+) \\|`).exec(markdown);
  assert.ok(match, `row "${row}" in the hover card:\n${markdown}`);
  return Number(match[1]);
}

function assertNear(actual: number, expected: number, relative: number, what: string): void {
  assert.ok(Math.abs(actual - expected) <= relative * Math.abs(expected), `${what}: ${actual} vs ${expected}`);
}

/** Every changed line lies between the gradient's declaration and the next export. */
function assertOnlyChangedInside(before: string, after: string, gradient: string): void {
  const a = before.split('\n');
  const b = after.split('\n');
  assert.equal(b.length, a.length, 'the fix keeps the line count');
  const first = declaredName(before, gradient).start.line;
  const next = a.findIndex((line, i) => i > first && line.startsWith('export '));
  const changed = a.flatMap((line, i) => (line === b[i] ? [] : [i]));
  assert.ok(changed.length > 0);
  assert.ok(changed.every((i) => i > first && (next < 0 || i < next)), `changed lines ${changed} outside ${gradient}`);
}
