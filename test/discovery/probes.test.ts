// Probe points, dimension and argument kind.
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import { discoverPairs, findingCodes, onlyPair, source } from './support';

function pairWith(objectiveHeader: string[], parameter = 'x: number[]', gradientHeader: string[] = [], extra: string[] = []) {
  const text = source(
    ...extra,
    ...objectiveHeader,
    `export function loss(${parameter}) { return x[0]; }`,
    ...gradientHeader,
    `export function lossGrad(${parameter}) { return [1, 0, 0]; }`,
  );
  return { text, pair: onlyPair(discoverPairs(text, 'model.ts')) };
}

test('a literal @probe becomes a probe point and sets the dimension', () => {
  const { text, pair } = pairWith(['/** @probe [1, 2.5, -3] */']);
  assert.deepEqual(pair.plan.probes, [[1, 2.5, -3]]);
  assert.equal(pair.plan.dimension, 3);
  assert.deepEqual(pair.findings, []);
  assert.equal(pair.objective.probeTags.length, 1);
  assert.equal(text.slice(pair.objective.probeTags[0].start, pair.objective.probeTags[0].end), '@probe [1, 2.5, -3]');
});

test('several @probe tags, multi-line JSON and gradient probes merge in order', () => {
  const { pair } = pairWith(
    ['/**', ' * The objective.', ' * @probe [0, 0, 0]', ' * @probe [1e-3,', ' *   2, -1]', ' */'],
    'x: number[]',
    ['/** @probe [4, 5, 6] */'],
  );
  assert.deepEqual(pair.plan.probes, [
    [0, 0, 0],
    [0.001, 2, -1],
    [4, 5, 6],
  ]);
  assert.equal(pair.objective.probeTags.length, 3);
  assert.deepEqual(pair.findings, []);
});

test('@probe naming an exported const goes to probeKeys', () => {
  const { pair } = pairWith(['/** @probe start */'], 'x: number[]', [], ['export const start = [1, 2, 3];']);
  assert.deepEqual(pair.plan.probeKeys, ['start']);
  assert.deepEqual(pair.plan.probes, []);
  assert.deepEqual(pair.findings, []);
});

test('@probe may name a const that is not exported: the scope hook reaches it', () => {
  const { pair } = pairWith(['/** @probe start */'], 'x: number[]', [], ['const start = [1, 2, 3];']);
  assert.deepEqual(pair.plan.probeKeys, ['start']);
  assert.deepEqual(pair.findings, []);
});

test('malformed @probe tags are bad-probe errors that say what is wrong and show the expected form', () => {
  const cases: Array<[string, RegExp]> = [
    ['@probe [1, 2', /not valid JSON/],
    ['@probe {"x": 1}', /neither a point nor a name/],
    ['@probe []', /no coordinates/],
    ['@probe [1, "two", 3]', /coordinate 1 \("two"\) is not a finite number/],
    ['@probe [1, 1e999]', /coordinate 1 .* not a finite number/],
    ['@probe', /empty/],
    ['@probe nowhere', /no const named `nowhere`/],
  ];
  for (const [tag, reason] of cases) {
    const { pair } = pairWith([`/** ${tag} */`]);
    const finding = pair.findings.find((f) => f.code === 'bad-probe');
    assert.ok(finding, `no bad-probe for ${tag}`);
    assert.equal(finding.severity, 'error');
    assert.equal(finding.subject, 'probe');
    assert.match(finding.message, reason, tag);
    assert.match(finding.message, /@probe \[0\.5, -1, 2\]/, tag);
    assert.deepEqual(pair.plan.probes, []);
  }
});

test('probes of different lengths are a bad-probe error', () => {
  const { pair } = pairWith(['/**', ' * @probe [1, 2]', ' * @probe [1, 2, 3]', ' */']);
  assert.deepEqual(findingCodes(pair), ['bad-probe']);
  assert.match(pair.findings[0].message, /different numbers of coordinates/);
});

test('a probe whose length contradicts the tuple type is a bad-probe error', () => {
  const { pair } = pairWith(['/** @probe [1, 2, 3] */'], 'x: [number, number]');
  assert.deepEqual(findingCodes(pair), ['bad-probe']);
  assert.equal(pair.plan.dimension, 2);
});

test('dimension from a tuple, a readonly tuple, Readonly<>, named members and a same-file alias', () => {
  const cases: Array<[string, number, string[]]> = [
    ['x: [number, number]', 2, []],
    ['x: readonly [number, number, number]', 3, []],
    ['x: Readonly<[number, number]>', 2, []],
    ['x: [a: number, b: number]', 2, []],
    ['x: Point', 4, ['type Point = readonly [number, number, number, number];']],
    ['x: Outer', 2, ['type Inner = [number, number];', 'type Outer = Inner;']],
  ];
  for (const [parameter, dimension, extra] of cases) {
    const { pair } = pairWith([], parameter, [], extra);
    assert.equal(pair.plan.dimension, dimension, parameter);
    assert.deepEqual(pair.plan.probes, []);
    assert.deepEqual(pair.findings, [], parameter);
  }
});

test('tuples with optional or rest elements, and cyclic aliases, give no dimension', () => {
  for (const [parameter, extra] of [
    ['x: [number, number?]', []],
    ['x: [number, ...number[]]', []],
    ['x: A', ['type A = B;', 'type B = A;']],
  ] as Array<[string, string[]]>) {
    const { pair } = pairWith([], parameter, [], extra);
    assert.equal(pair.plan.dimension, null, parameter);
    assert.deepEqual(findingCodes(pair), ['unknown-dimension'], parameter);
  }
});

test('@dimension N gives the dimension for an array parameter', () => {
  const { pair } = pairWith(['/** @dimension 12 */']);
  assert.equal(pair.plan.dimension, 12);
  assert.deepEqual(pair.findings, []);
});

test('a malformed @dimension is reported', () => {
  const { pair } = pairWith(['/** @dimension many */']);
  assert.deepEqual(findingCodes(pair), ['bad-probe', 'unknown-dimension']);
  assert.match(pair.findings[0].message, /positive whole number/);
});

test('an unknown dimension is an info finding that explains how to add @probe', () => {
  const { pair } = pairWith([]);
  assert.equal(pair.plan.dimension, null);
  assert.equal(pair.findings.length, 1);
  const [finding] = pair.findings;
  assert.equal(finding.code, 'unknown-dimension');
  assert.equal(finding.severity, 'info');
  assert.equal(finding.subject, 'objective');
  assert.match(finding.message, /`loss`/);
  assert.match(finding.message, /\/\*\* @probe \[0\.5, -1, 2\] \*\//);
});

test('argument kind follows a Float64Array first parameter', () => {
  assert.equal(pairWith([], 'x: Float64Array').pair.plan.argumentKind, 'float64array');
  assert.equal(pairWith([], 'x: Readonly<Float64Array>').pair.plan.argumentKind, 'float64array');
  assert.equal(pairWith([], 'x: Vec', [], ['type Vec = Float64Array;']).pair.plan.argumentKind, 'float64array');
  assert.equal(pairWith([], 'x: number[]').pair.plan.argumentKind, 'array');
  assert.equal(pairWith([], 'x: [number, number]').pair.plan.argumentKind, 'array');
});
