// Directional check and group-testing localisation for large dimensions.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { checkPair } from '../../server/src/engine/checkPair';
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
  return checkPair({ objective, gradient: gradientWith(wrong), makeVector: makeFloat64 }, [], { dimension: n, learningRate: null, options: defaultCheckOptions });
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

  test('a few wrong components are all found, a permutation is recognised', () => {
    const several = run(5000, new Map<number, (g: number) => number>([[10, (g) => g + 1], [2500, (g) => -g], [4999, (g) => g * 1.5]]));
    assert.deepEqual(several.diagnosis, { kind: 'subset', components: [10, 2500, 4999] });
    const base = gradientWith(new Map());
    const swapped = checkPair(
      { objective, gradient: (x) => { const g = base(x); [g[100], g[900]] = [g[900], g[100]]; return g; }, makeVector: makeFloat64 },
      [Array.from({ length: 1000 }, (_, i) => Math.sin(i))],
      { dimension: 1000, learningRate: null, options: defaultCheckOptions },
    );
    assert.deepEqual(swapped.diagnosis, { kind: 'permutation', pairs: [[100, 900]] });
  });

  test('a whole-gradient sign flip or factor is seen from the directions alone', () => {
    const flipped = checkPair({ objective, gradient: (x) => Array.from(gradientWith(new Map())(x), (v) => -v), makeVector: makeFloat64 }, [], { dimension: 2000, learningRate: null, options: defaultCheckOptions });
    assert.deepEqual(flipped.diagnosis, { kind: 'sign' });
    const halved = checkPair({ objective, gradient: (x) => Array.from(gradientWith(new Map())(x), (v) => v / 2), makeVector: makeFloat64 }, [], { dimension: 2000, learningRate: null, options: defaultCheckOptions });
    assert.deepEqual(halved.diagnosis, { kind: 'factor', factor: 0.5 });
  });

  test('a correct gradient passes at n = 100000 with smoothness estimated', () => {
    const report = run(100000, new Map());
    assert.equal(report.status, 'pass', JSON.stringify(report.findings));
    assert.equal(report.probes[0].directions.length, defaultCheckOptions.directionCount);
    // Hessian is diagonal 2·w_i − sin(x_i) with w_i ∈ 1..7: curvature within [1, 15] (by hand).
    assert.ok(report.smoothness!.lipschitz > 13 && report.smoothness!.lipschitz <= 15, `L̂ ${report.smoothness!.lipschitz}`);
  });
});
