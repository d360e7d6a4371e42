// Directional check and group-testing localisation for large dimensions.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { checkPair } from '../../server/src/engine/checkPair';
import { diagnoseDirections } from '../../server/src/engine/diagnosis';
import { defaultCheckOptions, type PairReport } from '../../server/src/engine/types';
import { makeFloat64 } from '../support/problems';

// f = Σ w_i x_i² + sin(x_i) with weights 1..7: separable, gradient by hand.
const objective = (x: ArrayLike<number>) => {
  let sum = 0;
  for (let i = 0; i < x.length; i++) sum += ((i % 7) + 1) * x[i] * x[i] + Math.sin(x[i]);
  return sum;
};
const gradientWith = (wrong: Map<number, (g: number) => number>) => (x: ArrayLike<number>) => {
  const g = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) g[i] = 2 * ((i % 7) + 1) * x[i] + Math.cos(x[i]);
  for (const [index, mutate] of wrong) g[index] = mutate(g[index]);
  return g;
};

function run(n: number, wrong: Map<number, (g: number) => number>): PairReport {
  return checkPair({ objective, gradient: gradientWith(wrong), makeVector: makeFloat64 }, [], { dimension: n, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } });
}

describe('large dimension', () => {
  test('one wrong component is localised at n = 1000 and n = 100000 with similar cost', () => {
    const small = run(1000, new Map([[371, (g) => 2 * g]]));
    const large = run(100000, new Map([[37013, (g) => 2 * g]]));
    for (const [report, index] of [[small, 371], [large, 37013]] as const) {
      assert.equal(report.status, 'fail');
      assert.deepEqual(report.diagnosis, { kind: 'subset', components: [index] });
      assert.equal(report.probes[0].mode, 'directional');
      assert.deepEqual(report.probes[0].components.map((c) => c.index), [index]);
      assert.ok(Math.abs(report.probes[0].components[0].analytic / report.probes[0].components[0].numerical - 2) < 1e-6);
    }
    const ratio = large.evaluations.objective / small.evaluations.objective;
    assert.ok(ratio < 1.5, `objective evaluations ${small.evaluations.objective} → ${large.evaluations.objective}`);
  });

  test('objective evaluations stay flat from n = 100 to n = 100000 with one wrong component', () => {
    const counts: number[] = [];
    for (const n of [100, 1000, 10000, 100000]) {
      const index = Math.floor(0.37 * n);
      const report = run(n, new Map([[index, (g) => 2 * g]]));
      assert.deepEqual(report.diagnosis, { kind: 'subset', components: [index] }, `n = ${n}`);
      counts.push(report.evaluations.objective);
    }
    // Flat: every count within ±10% of the others (bisection would add a round per doubling of n).
    assert.ok(Math.max(...counts) <= 1.1 * Math.min(...counts), `objective evaluations ${counts.join(', ')}`);
  });

  test('two wrong components are both located, with their true derivatives', () => {
    const x = Array.from({ length: 20000 }, (_, i) => 2 * Math.cos(0.1 * i));
    const report = checkPair({ objective, gradient: gradientWith(new Map<number, (g: number) => number>([[123, (g) => g + 1], [15000, (g) => -g]])), makeVector: makeFloat64 }, [x], { dimension: null, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } });
    assert.deepEqual(report.diagnosis, { kind: 'subset', components: [123, 15000] });
    // ∂f/∂x_i = 2·w_i·x_i + cos(x_i), with w_i = (i mod 7) + 1 (by hand).
    const exact = (i: number) => 2 * ((i % 7) + 1) * x[i] + Math.cos(x[i]);
    for (const c of report.probes[0].components) {
      assert.ok(c.mismatch);
      assert.ok(Math.abs(c.numerical - exact(c.index)) <= c.errorBound, `component ${c.index}: ${c.numerical} vs ${exact(c.index)} ± ${c.errorBound}`);
    }
    // Whole pool and its weighted twin (2), a split into four sub-pools (4), one weighted
    // difference in each wrong sub-pool (2): 8, or 13 when both share a sub-pool and it
    // splits again. Bisection of index ranges needs at least 2·⌈log2 20000⌉ = 30 range tests.
    const finding = report.findings.find((f) => f.code === 'gradient-mismatch')!;
    const [, pooled, coordinate] = /Located by (\d+) pooled directional and (\d+) coordinate/.exec(finding.message)!.map(Number);
    assert.ok(pooled === 8 || pooled === 13, finding.message);
    assert.equal(coordinate, 2);
  });

  test('with a noisy objective the wide bounds still place the wrong component', () => {
    // Deterministic rounding-like noise of relative size 1e-9: too coarse to place one
    // component among 10000 from a single pair of differences, so the range is narrowed.
    const noisy = (x: ArrayLike<number>) => {
      let h = 0;
      for (let i = 0; i < x.length; i += 97) h = Math.sin(1e3 * h + 1e7 * x[i]);
      return objective(x) * (1 + 1e-9 * h);
    };
    const report = checkPair({ objective: noisy, gradient: gradientWith(new Map([[777, (g) => 3 * g]])), makeVector: makeFloat64 }, [], { dimension: 10000, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } });
    assert.deepEqual(report.diagnosis, { kind: 'subset', components: [777] });
    assert.ok(report.probes.some((p) => p.components.length === 1 && p.components[0].index === 777 && p.components[0].mismatch));
    const located = report.findings.map((f) => /Located by (\d+) pooled/.exec(f.message)).find((m) => m !== null)!;
    assert.ok(Number(located[1]) > 2, 'more than the whole pool and one weighted difference');
  });

  test('a few wrong components are all found, a permutation is recognised', () => {
    const several = run(5000, new Map<number, (g: number) => number>([[10, (g) => g + 1], [2500, (g) => -g], [4999, (g) => g * 1.5]]));
    assert.deepEqual(several.diagnosis, { kind: 'subset', components: [10, 2500, 4999] });
    const base = gradientWith(new Map());
    const swapped = checkPair(
      { objective, gradient: (x) => { const g = base(x); [g[100], g[900]] = [g[900], g[100]]; return g; }, makeVector: makeFloat64 },
      [Array.from({ length: 1000 }, (_, i) => Math.sin(i))],
      { dimension: 1000, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } },
    );
    assert.deepEqual(swapped.diagnosis, { kind: 'permutation', pairs: [[100, 900]] });
  });

  test('a whole-gradient sign flip or factor is seen from the directions alone', () => {
    const flipped = checkPair({ objective, gradient: (x) => Array.from(gradientWith(new Map())(x), (v) => -v), makeVector: makeFloat64 }, [], { dimension: 2000, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } });
    assert.deepEqual(flipped.diagnosis, { kind: 'sign' });
    const halved = checkPair({ objective, gradient: (x) => Array.from(gradientWith(new Map())(x), (v) => v / 2), makeVector: makeFloat64 }, [], { dimension: 2000, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } });
    assert.deepEqual(halved.diagnosis, { kind: 'factor', factor: 0.5 });
  });

  test('a correct gradient passes at n = 100000 with smoothness estimated', () => {
    const report = run(100000, new Map());
    assert.equal(report.status, 'pass', JSON.stringify(report.findings));
    assert.equal(report.probes[0].directions.length, defaultCheckOptions.directionCount);
    // Hessian is diagonal 2·w_i − sin(x_i) with w_i ∈ 1..7: curvature within [1, 15] (by hand).
    // An unconverged Lanczos estimate is widened upward by its residual, and says so.
    const { lipschitz, widened } = report.smoothness!;
    assert.ok(lipschitz > 13 && (lipschitz <= 15 || (widened === true && lipschitz <= 15.5)), `L̂ ${lipschitz}, widened ${widened}`);
  });
});

test('one wrong component of a float32 objective at n = 5000 is localised, not called a factor', () => {
  const n = 5000;
  const objective = (x: ArrayLike<number>) => {
    let s = 0;
    for (let i = 0; i < n; i++) s = Math.fround(s + Math.fround(Math.fround(x[i] * x[i]) * Math.fround(1 + (i % 7))));
    return s;
  };
  const gradient = (x: ArrayLike<number>) => Array.from({ length: n }, (_, i) => 2 * (1 + (i % 7)) * x[i] * (i === 1234 ? 3 : 1));
  // The wrong component sits where the objective is steep, so float32 rounding cannot hide it.
  const probe = Array.from({ length: n }, (_, i) => (i === 1234 ? 20 : Math.sin(i + 1)));
  const report = checkPair({ objective, gradient, makeVector: (v) => Array.from(v) }, [probe], { dimension: null, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } });
  assert.equal(report.status, 'fail');
  assert.notEqual(report.diagnosis?.kind, 'factor');
  assert.notEqual(report.diagnosis?.kind, 'sign');
  const mismatch = report.findings.find((f) => f.code === 'gradient-mismatch');
  assert.ok(mismatch?.components?.includes(1234), JSON.stringify(report.diagnosis));
});

// Regression: a float32 objective with one component tripled was once reported as a 1.007×
// factor of the whole gradient, from the one random direction whose bound was tight enough to see it.
test('a ratio seen along only some random directions is not a whole-gradient factor', () => {
  const direction = (analytic: number, numerical: number, errorBound: number, mismatch: boolean) => ({ analytic, numerical, errorBound, mismatch });
  const oneSeen = [direction(10.07, 10, 1e-4, true), ...[5, -3, 8, 2, -6].map((v) => direction(v * 1.007, v, 0.1, false))];
  assert.equal(diagnoseDirections(oneSeen), null);
  const allSigns = [4, -2, 7, 1, -5, 3].map((v) => direction(-v, v, 1e-9, true));
  assert.deepEqual(diagnoseDirections(allSigns), { kind: 'sign' });
  const allHalved = [4, -2, 7, 1, -5, 3].map((v) => direction(v / 2, v, 1e-9, true));
  assert.deepEqual(diagnoseDirections(allHalved), { kind: 'factor', factor: 0.5 });
});
