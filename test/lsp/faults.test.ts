// Faults in user code seen through the built language server over stdio: a pair that hangs,
// one that exhausts the sandbox's memory and one that calls process.exit each get their own
// diagnostic, the correct pairs around them still get their verdict, and the server answers
// afterwards. Prototype pollution in user code stays in the sandbox.
import assert from 'node:assert/strict';
import { mkdtempSync, rmSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { pathToFileURL } from 'node:url';
import { after, describe, test } from 'node:test';
import type { Diagnostic, Hover } from 'vscode-languageserver-protocol';
import { fixturesDir } from '../support/paths';
import { messageOf, rangeOf, TestClient } from './client';

const scratch = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-lsp-faults-'));
const uriOf = (file: string) => pathToFileURL(file).href;
const capabilities = { workspace: { configuration: true } };
// The smallest memory cap makes the allocation fail within a second, and a time limit several
// times that keeps a busy machine from turning the memory-limit into a timeout (the hang waits it out).
const settings = { timeoutMs: 8000, memoryMb: 128 };

const clients: TestClient[] = [];
async function startClient(): Promise<TestClient> {
  const client = await TestClient.start({ capabilities, settings });
  clients.push(client);
  return client;
}
after(async () => {
  await Promise.all(clients.map((c) => c.stop()));
  rmSync(scratch, { recursive: true, force: true });
});

// A correct pair (derivatives by hand, common practice).
const bowlPair = [
  '/** @probe [0.5, -1] */',
  'export function bowl(x: [number, number]): number {',
  '  return x[0] * x[0] + 3 * x[1] * x[1];',
  '}',
  'export function bowlGrad(x: [number, number]): [number, number] {',
  '  return [2 * x[0], 6 * x[1]];',
  '}',
];

// Correct pairs around three faulty ones.
const mixedDocument = [
  ...bowlPair,
  '',
  'export function stalled(x: [number, number]): number {',
  '  let total = 0;',
  '  for (let i = 0; i < 2; i--) total += x[0];',
  '  return total;',
  '}',
  'export function stalledGrad(x: [number, number]): [number, number] {',
  '  return [1, 0];',
  '}',
  '',
  'export function hoarding(x: [number, number]): number {',
  '  const kept: number[][] = [];',
  '  for (;;) kept.push(new Array<number>(1_000_000).fill(x[0]));',
  '}',
  'export function hoardingGrad(x: [number, number]): [number, number] {',
  '  return [1, 0];',
  '}',
  '',
  'declare const process: any;',
  'export function quitting(x: [number, number]): number {',
  '  if (x[0] !== 123456) process.exit(3);',
  '  return x[0];',
  '}',
  'export function quittingGrad(x: [number, number]): [number, number] {',
  '  return [1, 0];',
  '}',
  '',
  '/** @probe [1, 2] */',
  'export function tilted(x: [number, number]): number {',
  '  return x[0] * x[0] + x[0] * x[1];',
  '}',
  'export function tiltedGrad(x: [number, number]): [number, number] {',
  '  return [2 * x[0] + x[1], x[0]];',
  '}',
  '',
].join('\n');

// ∇ Σ (x_i − i)² = 2(x − i) (common practice); the flipped sign is the planted bug.
const signFlipped = [
  '/** @probe [0.5, -1, 3] */',
  'export function spread(x: number[]): number { return x.reduce((s, v, i) => s + (v - i) ** 2, 0); }',
  'export function spreadGrad(x: number[]): number[] { return x.map((v, i) => -2 * (v - i)); }',
  '',
].join('\n');

const byLine = (diagnostics: Diagnostic[]) => [...diagnostics].sort((a, b) => a.range.start.line - b.range.start.line);

describe('faulty pairs next to correct ones, through the language server', () => {
  test('hang, memory blow-up and process.exit each get their diagnostic; the correct pairs pass; the server answers afterwards', async () => {
    const client = await startClient();
    const file = path.join(scratch, 'mixed.ts');
    const published = client.nextDiagnostics(uriOf(file), undefined, 60_000);
    const { uri, text } = client.open(file, mixedDocument);
    const diagnostics = byLine((await published).diagnostics);

    assert.deepEqual(diagnostics.map((d) => d.code), ['timeout', 'memory-limit', 'runtime-error'], diagnostics.map(messageOf).join('\n'));
    const [timeout, memory, exit] = diagnostics;
    // A hang and heap exhaustion have no user stack: they sit on the objective's name.
    assert.deepEqual(timeout.range, rangeOf(text, 'stalled'));
    assert.match(messageOf(timeout), new RegExp(`${settings.timeoutMs} ms`));
    assert.deepEqual(memory.range, rangeOf(text, 'hoarding'));
    assert.match(messageOf(memory), /128 MB/);
    // process.exit throws where it is called: the diagnostic covers that line, without its indentation.
    assert.deepEqual(exit.range, rangeOf(text, 'if (x[0] !== 123456) process.exit(3);'));
    assert.match(messageOf(exit), /process\.exit is not available in the sandbox/);
    for (const d of diagnostics) assert.equal(d.severity, 1, `${d.code} is an error`);

    const listing = await client.request('slopecheck/listPairs', { uri });
    assert.deepEqual(listing.map((p: any) => [p.objective, p.status]), [
      ['bowl', 'pass'], ['stalled', 'error'], ['hoarding', 'error'], ['quitting', 'error'], ['tilted', 'pass'],
    ]);
    // The pair after all three faults is checked in full: verdict on hover, and local smoothness.
    // Its Hessian is [[2, 1], [1, 0]], largest eigenvalue 1 + √2 (worked by hand).
    const hover = await client.request<Hover>('textDocument/hover', { textDocument: { uri }, position: rangeOf(text, 'tilted').start });
    assert.match((hover.contents as { value: string }).value, /gradient matches/);
    const tilted = await client.request('slopecheck/pairReport', { uri, objective: 'tilted' });
    const lipschitz = tilted.report.smoothness.lipschitz;
    assert.ok(Math.abs(lipschitz - (1 + Math.SQRT2)) < 1e-6 * (1 + Math.SQRT2), `L̂ ${lipschitz} ≈ 1 + √2`);

    // Still answering, with a working sandbox: a second document is checked and its bug found.
    const other = path.join(scratch, 'after.ts');
    const next = client.nextDiagnostics(uriOf(other));
    const afterwards = client.open(other, signFlipped);
    const { diagnostics: found } = await next;
    assert.deepEqual(found.map((d) => [d.code, d.range]), [['gradient-mismatch', rangeOf(afterwards.text, 'spreadGrad')]]);
    assert.ok(client.alive, 'the server process is still running');
  });
});

describe('prototype pollution in user code', () => {
  test('a polluting module with a correct pair passes, and the server answers as before', async () => {
    const client = await startClient();
    const file = path.join(fixturesDir, 'faults', 'prototypePollution.ts');
    const published = client.nextDiagnostics(uriOf(file));
    const { uri } = client.open(file);
    assert.deepEqual((await published).diagnostics, []);
    const listing = await client.request('slopecheck/listPairs', { uri });
    assert.deepEqual(listing.map((p: any) => [p.objective, p.status]), [['pollutingLoss', 'pass']]);
  });

  test('pollution that would break the server if it got there does not reach it', async () => {
    const client = await startClient();
    // If these reached the server: an object-valued `then` makes every promise resolved with an
    // object wait forever (ECMA-262, Promise Resolve Functions, §27.2.1.3.2; from memory), so no async
    // request would be answered; an inherited `toJSON` replaces every object and array in the
    // JSON-RPC messages it writes (ECMA-262, SerializeJSONProperty, §25.5.2.2; from memory).
    const polluter = [
      '(Object.prototype as any).then = function () {};',
      "(Object.prototype as any).toJSON = function () { return 'polluted'; };",
      "(Array.prototype as any).toJSON = function () { return 'polluted'; };",
      '(Object.prototype as any).severity = 4;',
      ...bowlPair,
      '',
    ].join('\n');
    const pollutingFile = path.join(scratch, 'polluter.ts');
    const polluted = client.next('slopecheck/documentSummary', (p) => p.uri === uriOf(pollutingFile) && p.state === 'done');
    const { uri: pollutingUri } = client.open(pollutingFile, polluter);
    await polluted;
    // The module ran: its check is finished (whatever the pollution did to the verdict inside the sandbox).
    const [pollutingPair] = await client.request('slopecheck/listPairs', { uri: pollutingUri });
    assert.notEqual(pollutingPair.status, 'pending');

    // Afterwards an async request that resolves with an object is answered, intact.
    const cleanFile = path.join(scratch, 'clean.ts');
    const published = client.nextDiagnostics(uriOf(cleanFile));
    const { uri, text } = client.open(cleanFile, signFlipped);
    const { diagnostics } = await published;
    assert.equal(diagnostics.length, 1);
    assert.equal(diagnostics[0].code, 'gradient-mismatch');
    assert.equal(diagnostics[0].severity, 1, 'severity comes from the server, not from a polluted prototype');
    assert.deepEqual(diagnostics[0].range, rangeOf(text, 'spreadGrad'));
    assert.match(messageOf(diagnostics[0]), /sign flipped/);
    const again = await client.request('slopecheck/checkAgain', { uri });
    assert.equal(again.state, 'done');
    assert.deepEqual(again.byStatus, { pass: 0, fail: 1, inconclusive: 0, error: 0 });
    assert.deepEqual(await client.request('slopecheck/listPairs', { uri }), [{ objective: 'spread', kind: 'gradient', value: 'spread', gradient: 'spreadGrad', line: 1, status: 'fail' }]);
  });
});
