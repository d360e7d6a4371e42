// The built language server over stdio, driven as an editor would drive it: diagnostics on
// the demo workspace's planted bugs, hovers, quick fixes applied and re-checked, code lenses,
// custom requests, trust, cancellation and a burst of edits in typing mode.
import assert from 'node:assert/strict';
import { mkdtempSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { after, describe, test } from 'node:test';
import type { CodeAction, CodeLens, Diagnostic, Hover } from 'vscode-languageserver-protocol';
import { pathToFileURL } from 'node:url';
import { fixturesDir, repoRoot } from '../support/paths';
import { applyEdits, messageOf, rangeOf, TestClient } from './client';

const demo = (name: string) => path.join(fixturesDir, 'demo', 'src', name);
const scratch = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-lsp-'));
const pathToUri = (file: string) => pathToFileURL(file).href;
const codes = (diagnostics: Diagnostic[]) => diagnostics.map((d) => d.code).sort();
const fullCapabilities = {
  workspace: { configuration: true, didChangeConfiguration: { dynamicRegistration: true }, codeLens: { refreshSupport: true } },
  textDocument: { publishDiagnostics: { relatedInformation: true } },
  window: { workDoneProgress: true },
};

const clients: TestClient[] = [];
async function startClient(options: Parameters<typeof TestClient.start>[0] = {}): Promise<TestClient> {
  const client = await TestClient.start(options);
  clients.push(client);
  return client;
}
after(async () => {
  await Promise.all(clients.map((c) => c.stop()));
});

async function actionsFor(client: TestClient, uri: string, diagnostic: Diagnostic): Promise<CodeAction[]> {
  return client.request<CodeAction[]>('textDocument/codeAction', { textDocument: { uri }, range: diagnostic.range, context: { diagnostics: [diagnostic] } });
}

/** Applies the action's edit, sends it as an edit and a save, and returns the next diagnostics. */
async function applyAndRecheck(client: TestClient, uri: string, text: string, action: CodeAction) {
  const edits = action.edit?.changes?.[uri];
  assert.ok(edits && edits.length > 0, `action ${action.title} has edits for the document`);
  const fixed = applyEdits(text, edits);
  const published = client.nextDiagnostics(uri);
  client.change(uri, fixed);
  client.save(uri);
  return { fixed, diagnostics: (await published).diagnostics };
}

describe('a client that declares nothing and sends no settings', () => {
  test('gets one merged mismatch diagnostic per wrong pair on open, on the gradient name', async () => {
    const client = await startClient();
    const file = demo('calibration.ts');
    const published = client.nextDiagnostics(pathToUri(file));
    const summary = client.next('slopecheck/documentSummary', (p) => p.uri === pathToUri(file) && p.state === 'done');
    const { uri, text } = client.open(file);
    const { diagnostics } = await published;
    // fixtures/demo/expected.json: thermistorFit (sign) and rackDrying (chain rule, component 1) are wrong.
    assert.deepEqual(codes(diagnostics), ['gradient-mismatch', 'gradient-mismatch']);
    const sign = diagnostics.find((d) => messageOf(d).startsWith('thermistorFit_grad'))!;
    assert.deepEqual(sign.range, rangeOf(text, 'thermistorFit_grad'));
    assert.equal(sign.severity, 1);
    assert.equal(sign.source, 'slopecheck');
    // The link goes to the README beside the running dist/, not to a web page.
    assert.equal(sign.codeDescription!.href, `${pathToFileURL(path.join(repoRoot, 'README.md')).href}#gradient-mismatch`);
    assert.match(messageOf(sign), /sign flipped/);
    assert.match(messageOf(sign), /analytic .*numerical/);
    // The check stops at the first probe with a mismatch, so there is no tally of probes.
    assert.match(messageOf(sign), /at probe 1: sign flipped\. Component 0: /);
    assert.doesNotMatch(messageOf(sign), /Seen at/);
    assert.equal(sign.relatedInformation, undefined, 'no related information unless the client declares it');
    const subset = diagnostics.find((d) => d !== sign)!;
    assert.deepEqual(subset.range, rangeOf(text, 'gradRackDrying'));
    assert.match(messageOf(subset), /component 1 wrong/);
    const done = await summary;
    assert.deepEqual(done.byStatus, { pass: 2, fail: 2, inconclusive: 0, error: 0 });
    assert.ok(!client.serverRequests.includes('workspace/configuration'), 'settings are not pulled from a client that cannot answer');
    assert.ok(!client.serverRequests.includes('window/workDoneProgress/create'));
    void uri;
  });
});

describe('a Jacobian and a Hessian through the built server', () => {
  test('the demo sonde: the Jacobian squiggle names its entries, the misfit gets the Jᵀr note; the raft Hessian its asymmetry', async () => {
    const client = await startClient({ capabilities: fullCapabilities });
    const sonde = demo('sonde.ts');
    const published = client.nextDiagnostics(pathToUri(sonde));
    const { uri, text } = client.open(sonde);
    const { diagnostics } = await published;
    // fixtures/demo/expected.json: the fouling column of sondeJacobian lacks its factor day.
    assert.deepEqual(codes(diagnostics), ['jacobian-mismatch', 'least-squares-inconsistent']);
    const jacobian = diagnostics.find((d) => d.code === 'jacobian-mismatch')!;
    assert.deepEqual(jacobian.range, rangeOf(text, 'sondeJacobian'));
    assert.match(messageOf(jacobian), /^sondeJacobian disagrees with central differences of sondeResiduals at probe 1: column 1 wrong, not by one constant factor .* J\[0\]\[1\]: analytic/);
    assert.deepEqual(jacobian.relatedInformation?.map((r) => r.message), ['residual function sondeResiduals']);
    const note = diagnostics.find((d) => d.code === 'least-squares-inconsistent')!;
    assert.equal(note.severity, 3);
    assert.deepEqual(note.range, rangeOf(text, 'sondeMisfitGrad'));
    const hover = await client.request<Hover>('textDocument/hover', { textDocument: { uri }, position: rangeOf(text, 'sondeJacobian').start });
    assert.match(JSON.stringify(hover.contents), /Jacobian wrong: column 1 wrong/);

    const raft = demo('raft.ts');
    const raftPublished = client.nextDiagnostics(pathToUri(raft));
    const opened = client.open(raft);
    const raftDiagnostics = (await raftPublished).diagnostics;
    assert.deepEqual(codes(raftDiagnostics), ['hessian-mismatch', 'hessian-not-symmetric']);
    for (const d of raftDiagnostics) assert.deepEqual(d.range, rangeOf(opened.text, 'raftEnergyHessian'));
    assert.match(messageOf(raftDiagnostics.find((d) => d.code === 'hessian-mismatch')!), /one entry wrong, H\[1\]\[0\]/);
  });
});

describe('a full client', () => {
  test('rate diagnostic with related information, hover with the safe step, and the safe-rate fix re-checked', async () => {
    const client = await startClient({ capabilities: fullCapabilities });
    const file = demo('pricing.ts');
    const published = client.nextDiagnostics(pathToUri(file));
    const progressEnd = client.next('$/progress', (p) => p.value?.kind === 'end');
    const { uri, text } = client.open(file);
    const { diagnostics } = await published;
    assert.deepEqual(codes(diagnostics), ['rate-aggressive']);
    const rate = diagnostics[0];
    assert.equal(rate.severity, 2);
    assert.deepEqual(rate.range, rangeOf(text, 'stepSize'));
    assert.deepEqual(rate.relatedInformation?.map((r) => r.location.range), [rangeOf(text, 'discountScheduleLoss'), rangeOf(text, 'discountScheduleLossGrad')]);
    await progressEnd;
    assert.ok(client.serverRequests.includes('window/workDoneProgress/create'));
    assert.ok(client.serverRequests.includes('workspace/configuration'));

    const hover = await client.request<Hover>('textDocument/hover', { textDocument: { uri }, position: rangeOf(text, 'stepSize').start });
    const card = (hover.contents as { value: string }).value;
    // fixtures/demo/expected.json: L = 37.215, so 1/L = 0.02687 and 2/L = 0.05374.
    assert.match(card, /safe step 1\/L̂ \| 0\.0269 \|/);
    assert.match(card, /divergence at 2\/λ⁺ \| 0\.0537 \|/);
    assert.match(card, /aggressive/);
    assert.match(card, /local estimates near the probes/);

    const actions = await actionsFor(client, uri, rate);
    const safe = actions.find((a) => a.title.startsWith('Set stepSize'));
    assert.ok(safe, `actions: ${actions.map((a) => a.title).join(' | ')}`);
    assert.equal(safe.isPreferred, true);
    assert.equal(safe.kind, 'quickfix');
    const { fixed, diagnostics: after } = await applyAndRecheck(client, uri, text, safe);
    // 1/L̂ = 0.02687 rounded down to two significant figures.
    assert.match(fixed, /export const stepSize = 0\.026;/);
    assert.deepEqual(after, []);
  });

  test('a factor bug in an array literal is fixed element by element, only once the fix passes', async () => {
    const client = await startClient({ capabilities: fullCapabilities });
    const file = demo('harvest.ts');
    const published = client.nextDiagnostics(pathToUri(file));
    const { uri, text } = client.open(file);
    const { diagnostics } = await published;
    assert.deepEqual(codes(diagnostics), ['gradient-mismatch', 'rate-divergent']);
    const mismatch = diagnostics.find((d) => d.code === 'gradient-mismatch')!;
    assert.deepEqual(mismatch.range, rangeOf(text, 'demandCurveLossGradient'));
    assert.match(messageOf(mismatch), /0\.5× the true gradient/);
    assert.match(messageOf(mismatch), /at probe 1: .*\. Component 0: .*\.$/);
    const divergent = diagnostics.find((d) => d.code === 'rate-divergent')!;
    assert.equal(divergent.severity, 1);
    assert.deepEqual(divergent.range, rangeOf(text, 'splitLearningRate'));

    const rateFix = (await actionsFor(client, uri, divergent)).find((a) => a.title.startsWith('Set splitLearningRate'))!;
    // expected.json: L = 6.068, 1/L = 0.1648 → 0.16.
    assert.equal(rateFix.edit!.changes![uri][0].newText, '0.16');

    const fix = (await actionsFor(client, uri, mismatch)).find((a) => a.title.startsWith('Fix demandCurveLossGradient'));
    assert.ok(fix, 'a verified gradient fix is offered');
    const { fixed, diagnostics: after } = await applyAndRecheck(client, uri, text, fix);
    assert.match(fixed, /return \[dLevel \/ price\.length \* 2, dElasticity \/ price\.length \* 2\];/);
    assert.deepEqual(codes(after), ['rate-divergent']);
  });

  test('a sign flip in a non-literal return is wrapped; a swap in a literal is reordered', async () => {
    const client = await startClient({ capabilities: fullCapabilities });
    for (const [name, gradient, expected] of [
      ['calibration.ts', 'thermistorFit_grad', /return g\.map\(\(v\) => v \/ kiloOhms\.length\)\.map\(\(g\) => -g\);/],
      ['currents.ts', 'buoyPull', /return \[north, east\];/],
    ] as const) {
      const file = demo(name);
      const published = client.nextDiagnostics(pathToUri(file));
      const { uri, text } = client.open(file);
      const mismatch = (await published).diagnostics.find((d) => d.range.start.line === rangeOf(text, gradient).start.line)!;
      assert.ok(mismatch, `a diagnostic on ${gradient}`);
      const fix = (await actionsFor(client, uri, mismatch)).find((a) => a.title.startsWith(`Fix ${gradient}`));
      assert.ok(fix, `a verified fix for ${gradient}`);
      const { fixed, diagnostics: after } = await applyAndRecheck(client, uri, text, fix);
      assert.match(fixed, expected);
      assert.ok(!after.some((d) => d.range.start.line === mismatch.range.start.line), `no diagnostic left on ${gradient}`);
    }
  });

  test('no fix is offered for a subset error, which has no single-edit repair', async () => {
    const client = await startClient({ capabilities: fullCapabilities });
    const file = demo('calibration.ts');
    const published = client.nextDiagnostics(pathToUri(file));
    const { uri, text } = client.open(file);
    const mismatch = (await published).diagnostics.find((d) => d.range.start.line === rangeOf(text, 'gradRackDrying').start.line)!;
    const titles = (await actionsFor(client, uri, mismatch)).map((a) => a.title);
    assert.deepEqual(titles, ['Skip checking rackDrying (// slopecheck-skip)']);
  });

  test('code lenses summarise each pair, and the custom requests answer', async () => {
    const client = await startClient({ capabilities: fullCapabilities });
    const file = demo('calibration.ts');
    const published = client.nextDiagnostics(pathToUri(file));
    const { uri, text } = client.open(file);
    await published;
    const lenses = await client.request<CodeLens[]>('textDocument/codeLens', { textDocument: { uri } });
    const on = (name: string) => lenses.filter((l) => l.range.start.line === rangeOf(text, name).start.line);
    // expected.json: L = 7.3565 for salinityCalibration, 1/L = 0.1359 → 0.13.
    assert.equal(on('salinityCalibration')[0].command!.title, 'gradient matches · step ≤ 0.13 (local estimate)');
    assert.deepEqual(on('salinityCalibration')[0].command!.arguments, [uri, 'salinityCalibration']);
    assert.equal(on('salinityCalibration')[0].command!.command, 'slopecheck.openReport');
    assert.deepEqual(on('salinityCalibration')[1].command, { title: 'check again', command: 'slopecheck.checkAgain', arguments: [uri] });
    assert.equal(on('thermistorFit')[0].command!.title, 'gradient wrong: sign flipped');
    assert.equal(lenses.length, 8);

    const listing = await client.request('slopecheck/listPairs', { uri });
    assert.deepEqual(listing.map((p: any) => [p.objective, p.status]), [
      ['salinityCalibration', 'pass'], ['thermistorFit', 'fail'], ['rackDrying', 'fail'], ['growthCurveValueAndGradient', 'pass'],
    ]);
    const report = await client.request('slopecheck/pairReport', { uri, objective: 'salinityCalibration' });
    assert.equal(report.gradient, 'salinityCalibrationGrad');
    assert.equal(report.line, rangeOf(text, 'salinityCalibration').start.line);
    assert.ok(Math.abs(report.report.smoothness.lipschitz - 7.3565) < 1e-3 * 7.3565, 'L̂ matches expected.json (ml-matrix eigenvalues)');
    assert.equal(report.settings.seed, 1);
    // A passing pair without a learning rate is checked without its curvature; its hover asks for it.
    const growth = await client.request<Hover>('textDocument/hover', { textDocument: { uri }, position: rangeOf(text, 'growthCurveValueAndGradient').start });
    const growthCard = (growth!.contents as { value: string }).value;
    const growthLipschitz = Number(/L̂ \(local Lipschitz estimate\) \| ([\d.e+-]+) \|/.exec(growthCard)?.[1]);
    assert.ok(growthLipschitz > 0, growthCard);
    assert.equal(on('growthCurveValueAndGradient')[0].command!.title, 'gradient matches', 'the lens has no step: the everyday check left the curvature out');

    // The report asks for its plot data, which the everyday check leaves out.
    assert.ok(report.report.probes[0].stepStudy.steps.length > 0, 'a step study for the plot');
    assert.deepEqual(report.report.probes[0].descent.map((r: any) => r.label), ['declared', 'safe', 'limit']);

    const before = client.notifications.length;
    const again = await client.request('slopecheck/checkAgain', { uri });
    assert.equal(again.state, 'done');
    assert.ok(client.notifications.slice(before).some((n) => n.method === 'textDocument/publishDiagnostics'), 'check again publishes');
  });

  test('unknown dimension: a guessed @probe is inserted into the JSDoc and the pair is then checked', async () => {
    const client = await startClient({ capabilities: fullCapabilities });
    const file = path.join(scratch, 'bowl.ts');
    const text = [
      '/** A bowl in five coordinates. */',
      'export function bowl(x: number[]): number {',
      '  return x[0] * x[0] + 3 * x[4] * x[4];',
      '}',
      'export function bowlGrad(x: number[]): number[] {',
      '  return [2 * x[0], 0, 0, 0, 6 * x[4]];',
      '}',
      '',
    ].join('\n');
    const published = client.nextDiagnostics(pathToUri(file));
    const { uri } = client.open(file, text);
    const { diagnostics } = await published;
    assert.deepEqual(codes(diagnostics), ['unknown-dimension']);
    assert.equal(diagnostics[0].severity, 3);
    assert.deepEqual(diagnostics[0].range, rangeOf(text, 'bowl', 1));
    const add = (await actionsFor(client, uri, diagnostics[0])).find((a) => a.title.startsWith('Add a @probe'))!;
    const { fixed, diagnostics: after } = await applyAndRecheck(client, uri, text, add);
    assert.match(fixed, /^\/\*\*\n \* A bowl in five coordinates\.\n \* @probe \[0\.5, 0\.5, 0\.5, 0\.5, 0\.5\]\n \*\/\nexport function bowl/);
    assert.deepEqual(after, []);
  });

  test('the skip directive silences a pair', async () => {
    const client = await startClient({ capabilities: fullCapabilities });
    const file = demo('calibration.ts');
    const published = client.nextDiagnostics(pathToUri(file));
    const { uri, text } = client.open(file);
    const mismatch = (await published).diagnostics.find((d) => d.range.start.line === rangeOf(text, 'thermistorFit_grad').start.line)!;
    const skip = (await actionsFor(client, uri, mismatch)).find((a) => a.title.startsWith('Skip checking thermistorFit'))!;
    const { fixed, diagnostics: after } = await applyAndRecheck(client, uri, text, skip);
    assert.match(fixed, / \*\/\n\/\/ slopecheck-skip\nexport function thermistorFit\(/);
    assert.deepEqual(after.map((d) => d.range), [rangeOf(fixed, 'gradRackDrying')]);
  });
});

describe('trust', () => {
  test('an untrusted workspace runs nothing until trust is granted', async () => {
    const client = await startClient({ initializationOptions: { trusted: false } });
    const file = demo('harvest.ts');
    const untrusted = client.next('slopecheck/documentSummary', (p) => p.uri === pathToUri(file) && p.state === 'untrusted');
    const { uri } = client.open(file);
    await untrusted;
    // A round trip: anything the server sent for the open arrived before this answer.
    await client.request('slopecheck/listPairs', { uri });
    assert.ok(!client.notifications.some((n) => n.method === 'textDocument/publishDiagnostics' && n.params.diagnostics.length > 0));
    const published = client.nextDiagnostics(uri, (d) => d.length > 0);
    client.notify('slopecheck/setTrust', { trusted: true });
    assert.deepEqual(codes((await published).diagnostics), ['gradient-mismatch', 'rate-divergent']);
    const cleared = client.nextDiagnostics(uri, (d) => d.length === 0);
    client.notify('slopecheck/setTrust', { trusted: false });
    await cleared;
  });
});

describe('cancellation and typing', () => {
  const correct = (extra = '') => [
    `/** @probe [0.5, -1, 3] */`,
    `export function spread(x: number[]): number { ${extra}return x.reduce((s, v, i) => s + (v - i) ** 2, 0); }`,
    `export function spreadGrad(x: number[]): number[] { return x.map((v, i) => 2 * (v - i)); }`,
    '',
  ].join('\n');
  // ∇ Σ (x_i − i)² = 2(x − i) (common practice); the flipped sign is the planted bug.
  const flipped = correct().replace('2 * (v - i)', '-2 * (v - i)');

  test('a newer edit cancels a check in flight and the stale result never arrives', async () => {
    // A long time limit: if the stuck check were not cancelled, the next one would wait behind it.
    const client = await startClient({ capabilities: fullCapabilities, settings: { timeoutMs: 120000 } });
    const file = path.join(scratch, 'stuck.ts');
    const uri = pathToUri(file);
    const checking = client.next('slopecheck/documentSummary', (p) => p.uri === uri && p.state === 'checking');
    client.open(file, correct('for (;;) {} '));
    await checking;
    const published = client.nextDiagnostics(uri, undefined, 20000);
    client.change(uri, flipped);
    client.save(uri);
    const { diagnostics, version } = await published;
    assert.equal(version, 2);
    assert.deepEqual(codes(diagnostics), ['gradient-mismatch']);
    assert.deepEqual(diagnostics[0].range, rangeOf(flipped, 'spreadGrad'));
    await client.request('slopecheck/checkAgain', { uri });
    const all = client.notifications.filter((n) => n.method === 'textDocument/publishDiagnostics' && n.params.uri === uri);
    assert.ok(all.every((n) => n.params.version === 2 && codes(n.params.diagnostics).join() === 'gradient-mismatch'), JSON.stringify(all).slice(0, 500));
  });

  test('200 rapid edits in typing mode: the server stays responsive and ends on the final text', async () => {
    const client = await startClient({ capabilities: fullCapabilities, settings: { checkWhen: 'typing', typingDelayMs: 50 } });
    const file = path.join(scratch, 'typing.ts');
    const uri = pathToUri(file);
    const first = client.nextDiagnostics(uri);
    client.open(file, correct());
    assert.deepEqual((await first).diagnostics, []);
    const final = client.nextDiagnostics(uri, (d) => d.length > 0, 30000);
    for (let i = 1; i < 200; i++) client.change(uri, correct(`/* edit ${i} */ `));
    client.change(uri, flipped);
    const listing = await client.request('slopecheck/listPairs', { uri });
    assert.deepEqual(listing.map((p: any) => p.objective), ['spread']);
    const { diagnostics, version } = await final;
    assert.equal(version, 201);
    assert.deepEqual(diagnostics.map((d) => d.range), [rangeOf(flipped, 'spreadGrad')]);
    assert.ok(client.alive);
  });
});
