// Probes around the user's own start point, and the learning-rate verdict taken there.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { checkPair } from '../../server/src/engine/checkPair';
import { createRandom } from '../../server/src/engine/random';
import { coordinateScales, probesAroundStart } from '../../server/src/engine/startProbes';
import { defaultCheckOptions } from '../../server/src/engine/types';
import { makeArray } from '../support/problems';

describe('probes around the start', () => {
  test('probe 1 is the start; the others move each coordinate by at most 10 % (near) or 50 % (the last) of |xᵢ|', () => {
    const start = Float64Array.from([1e6, 2, -3e-4]);
    const points = probesAroundStart(start, 4, createRandom(7, 1));
    assert.equal(points.length, 4);
    assert.deepEqual(Array.from(points[0]), Array.from(start));
    points.slice(1).forEach((point, k) => {
      const radius = k === 2 ? 0.5 : 0.1;
      for (let i = 0; i < start.length; i++) {
        const moved = Math.abs(point[i] - start[i]) / Math.abs(start[i]);
        assert.ok(moved <= radius && moved > 0, `probe ${k + 2}, coordinate ${i}: moved ${moved}`);
        // Scaled per coordinate: a coordinate near 0 stays near 0, and the sign is kept.
        assert.equal(Math.sign(point[i]), Math.sign(start[i]));
      }
    });
    // The far probe is farther than the near ones, relative to the scales.
    const distance = (p: Float64Array) => Math.hypot(...Array.from(p, (v, i) => (v - start[i]) / Math.abs(start[i])));
    assert.ok(distance(points[3]) > Math.max(distance(points[1]), distance(points[2])));
  });

  test('at least two probes, so one is always away from the start', () => {
    assert.equal(probesAroundStart(Float64Array.from([1, 2]), 1, createRandom(1, 1)).length, 2);
  });

  test('a zero coordinate borrows the typical size of the others; an all-zero start uses 1', () => {
    assert.deepEqual(Array.from(coordinateScales(Float64Array.from([0, 3, -4]))), [Math.sqrt(12.5), 3, 4]);
    assert.deepEqual(Array.from(coordinateScales(Float64Array.from([0, 0]))), [1, 1]);
  });

  test("a start of another length than the declared dimension is a bad-probe error", () => {
    const report = checkPair(
      { objective: (x) => x[0], gradient: () => [1], makeVector: makeArray },
      [],
      { dimension: 2, learningRate: null, options: defaultCheckOptions, startPoint: [1, 2, 3] },
    );
    assert.equal(report.status, 'error');
    assert.match(report.findings[0].message, /starting point has 3 coordinates but the objective takes 2/);
  });

  test("the learning-rate verdict is the start's: steeper curvature at the other probes does not change it", () => {
    // f(x) = x²/2 + 100(x − 1)⁴/3: f'' = 1 + 400(x − 1)², so λ = 1 at the start x = 1 and grows
    // away from it (derivatives by hand, common practice). α = 1.5 is aggressive there (1 < α < 2).
    const rate = 1.5;
    const report = checkPair(
      { objective: (x) => x[0] ** 2 / 2 + (100 * (x[0] - 1) ** 4) / 3, gradient: (x) => [x[0] + (400 * (x[0] - 1) ** 3) / 3], makeVector: makeArray },
      [],
      { dimension: null, learningRate: { name: 'lr', value: rate }, options: defaultCheckOptions, startPoint: [1] },
    );
    assert.equal(report.status, 'pass');
    assert.equal(report.probes.length, 3);
    // Secants between nearby points see a little of the growth: within 1 %.
    assert.ok(Math.abs(report.smoothness!.lipschitz - 1) < 1e-2, `L̂ = ${report.smoothness!.lipschitz}`);
    assert.equal(report.learningRate!.status, 'aggressive');
    // The curvature is measured at the start alone.
    assert.ok(report.probes.slice(1).every((probe) => probe.smoothness === null));
    // The test means something only if another probe would have called the rate divergent: λ there is 1 + 400(x − 1)².
    assert.ok(report.probes.slice(1).some((probe) => rate * (1 + 400 * (probe.point[0] - 1) ** 2) >= 2));
  });
});
