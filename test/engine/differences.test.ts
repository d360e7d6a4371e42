// Finite-difference error orders, Richardson extrapolation, the extrapolated
// derivative with its error bound, and the Moré–Wild noise estimate.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { centralDifference, differentiate, forwardDifference, richardson } from '../../server/src/engine/differences';
import { estimateNoise, noiseFromTable } from '../../server/src/engine/noise';
import { createRandom } from '../../server/src/engine/random';

// φ(t) = e^{sin(1 + t)}: φ'(0) = cos(1)·e^{sin 1}, by hand.
const phi = (t: number) => Math.exp(Math.sin(1 + t));
const exact = Math.cos(1) * Math.exp(Math.sin(1));

describe('difference formulas (Nocedal & Wright, Numerical Optimization, 2nd ed., 2006, §8.1)', () => {
  test('forward difference error is O(h), central O(h²), Richardson O(h⁴)', () => {
    const steps = [1e-2, 5e-3, 2.5e-3];
    const forward = steps.map((h) => Math.abs(forwardDifference(phi, phi(0), h) - exact));
    const central = steps.map((h) => Math.abs(centralDifference(phi, h) - exact));
    const extrapolated = steps.map((h) => Math.abs(richardson(centralDifference(phi, 2 * h), centralDifference(phi, h)) - exact));
    for (let k = 1; k < steps.length; k++) {
      // Halving h halves the forward error, quarters the central one, divides Richardson's by ~16.
      assert.ok(Math.abs(forward[k - 1] / forward[k] - 2) < 0.1, `forward ratio ${forward[k - 1] / forward[k]}`);
      assert.ok(Math.abs(central[k - 1] / central[k] - 4) < 0.1, `central ratio ${central[k - 1] / central[k]}`);
      assert.ok(Math.abs(extrapolated[k - 1] / extrapolated[k] - 16) < 1.5, `Richardson ratio ${extrapolated[k - 1] / extrapolated[k]}`);
      assert.ok(extrapolated[k] < central[k] / 100);
    }
  });

  test('the extrapolated derivative is accurate and its bound covers the true error', () => {
    const estimate = differentiate(phi, phi(0), 0.05, { noise: 1e-16, minLevels: 4, maxLevels: 12 });
    const error = Math.abs(estimate.value - exact);
    assert.ok(error < 1e-12, `error ${error}`);
    assert.ok(estimate.errorBound >= error && estimate.errorBound < 1e-9, `bound ${estimate.errorBound}`);
    assert.equal(estimate.kink, false);
  });

  test('added noise widens the bound so it still covers the error', () => {
    const random = createRandom(7);
    const sigma = 1e-8;
    const noisy = (t: number) => phi(t) + sigma * random.normal();
    const estimate = differentiate(noisy, phi(0), 0.05, { noise: sigma, minLevels: 4, maxLevels: 12 });
    const error = Math.abs(estimate.value - exact);
    assert.ok(estimate.errorBound >= error, `bound ${estimate.errorBound} < error ${error}`);
    assert.ok(estimate.errorBound < 1e-4, `bound ${estimate.errorBound}`);
  });

  test('a kink is recognised, a smooth sharp curve is not', () => {
    const kinked = (t: number) => Math.abs(t) + t * t;
    assert.equal(differentiate(kinked, 0, 0.01, { noise: 1e-17, minLevels: 4, maxLevels: 12 }).kink, true);
    const sharp = (t: number) => Math.sqrt(1e-4 + t * t);
    assert.equal(differentiate(sharp, sharp(0), 0.01, { noise: 1e-18, minLevels: 4, maxLevels: 12 }).kink, false);
  });

  test("the same evaluations bound |φ''(0)| from below, close to it, and never above it", () => {
    // φ''(0) by hand: e^{sin 1}(cos²1 − sin 1) for φ above, 4 for e^{2t}, −9 for cos 3t, 0 for a line.
    const cases: Array<[string, (t: number) => number, number]> = [
      ['e^{sin(1 + t)}', phi, Math.exp(Math.sin(1)) * (Math.cos(1) ** 2 - Math.sin(1))],
      ['e^{2t}', (t) => Math.exp(2 * t), 4],
      ['cos 3t', (t) => Math.cos(3 * t), -9],
      ['3t + 1', (t) => 3 * t + 1, 0],
    ];
    for (const [name, slice, second] of cases) {
      const { curvatureFloor } = differentiate(slice, slice(0), 0.05, { noise: 1e-16, minLevels: 4, maxLevels: 12 });
      assert.ok(curvatureFloor <= Math.abs(second), `${name}: ${curvatureFloor} above |φ''| = ${Math.abs(second)}`);
      assert.ok(curvatureFloor >= Math.abs(second) * (1 - 1e-3), `${name}: ${curvatureFloor} far below |φ''| = ${Math.abs(second)}`);
    }
    // Noise of 10⁻⁶ on a slice of curvature 4: the floor stays below the truth, whatever the draws.
    const random = createRandom(11);
    for (let k = 0; k < 50; k++) {
      const noisy = (t: number) => Math.exp(2 * t) + 1e-6 * random.normal();
      const { curvatureFloor } = differentiate(noisy, 1, 0.05, { noise: 1e-6, minLevels: 4, maxLevels: 12 });
      assert.ok(curvatureFloor <= 4, `draw ${k}: ${curvatureFloor}`);
    }
    // A kink bounds nothing.
    assert.equal(differentiate((t) => Math.abs(t) + t * t, 0, 0.01, { noise: 1e-17, minLevels: 4, maxLevels: 12 }).curvatureFloor, 0);
  });

  test('a first step outside the domain is shrunk instead of failing', () => {
    const logBarrier = (t: number) => Math.log(1e-3 + t);
    const estimate = differentiate(logBarrier, logBarrier(0), 0.05, { noise: 1e-16, minLevels: 4, maxLevels: 12 });
    assert.ok(Math.abs(estimate.value - 1e3) < 1e-6 * 1e3, `value ${estimate.value}`);
  });
});

describe('noise estimate (Moré & Wild, "Estimating computational noise", SIAM J. Sci. Comput. 33(3), 2011)', () => {
  const smooth = (t: number) => Math.exp(Math.cos(0.3 + t)) + 2;
  for (const sigma of [1e-3, 1e-6, 1e-9]) {
    test(`f + σ·N(0,1) with σ = ${sigma} is estimated within a factor 3`, () => {
      // Several seeds, since each estimate uses only 9 values.
      for (let seed = 1; seed <= 5; seed++) {
        const random = createRandom(seed);
        const f0 = smooth(0) + sigma * random.normal();
        const estimate = estimateNoise((t) => smooth(t) + sigma * random.normal(), f0);
        assert.ok(estimate > sigma / 3 && estimate < sigma * 3, `σ = ${sigma}, seed ${seed}: estimate ${estimate}`);
      }
    });
  }

  test('a smooth double-precision function gives noise at machine-precision level', () => {
    const estimate = estimateNoise(smooth, smooth(0));
    const relative = estimate / smooth(0);
    assert.ok(relative >= 2 ** -53 && relative < 1e-14, `relative noise ${relative}`);
  });

  test('float32 rounding shows as noise near 2^-24 relative', () => {
    const rounded = (t: number) => Math.fround(smooth(t));
    const relative = estimateNoise(rounded, rounded(0)) / rounded(0);
    // Uniform rounding error of half an ulp has σ = ulp/√12 ≈ 2^-24/√3 relative at most (common practice).
    assert.ok(relative > 1e-9 && relative < 1e-7, `relative noise ${relative}`);
  });

  test('γ_k = (k!)²/(2k)! scaling: pure white noise gives the same σ at every level', () => {
    const random = createRandom(3);
    const values = Array.from({ length: 200 }, () => random.normal());
    const result = noiseFromTable(values.map((v) => 1 + 1e-6 * v));
    assert.equal(result.verdict, 'found');
    for (const level of result.levels.slice(0, 6)) assert.ok(level > 0.8e-6 && level < 1.25e-6, `level ${level}`);
  });
});
