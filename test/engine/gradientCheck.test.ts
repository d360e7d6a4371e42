// Gradient check on published test functions: correct gradients pass (no false
// alarms, including badly scaled and float32 objectives), mutated ones fail
// with the right diagnosis.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { checkPair, type PairFunctions } from '../../server/src/engine/checkPair';
import { defaultCheckOptions, type PairReport } from '../../server/src/engine/types';
import { freudensteinRoth, makeArray, makeFloat64, engineCoreSet as moreGarbowHillstrom, rosenbrock, type Gradient, type Objective } from '../support/problems';

const plan = (dimension: number | null = null) => ({ dimension, learningRate: null, options: { ...defaultCheckOptions } });

function check(f: Objective, g: Gradient, probes: number[][], makeVector: PairFunctions['makeVector'] = makeArray, dimension: number | null = null): PairReport {
  return checkPair({ objective: (x) => f(x), gradient: (x) => g(x), makeVector }, probes, plan(dimension));
}

function assertNoMismatch(report: PairReport, label: string): void {
  assert.equal(report.status, 'pass', `${label}: ${JSON.stringify(report.findings)}`);
  assert.equal(report.findings.filter((f) => f.code === 'gradient-mismatch').length, 0, label);
}

describe('Rosenbrock at its standard start', () => {
  // Rosenbrock, "An automatic method for finding the greatest or least value of a function",
  // Computer Journal 3, 1960: f(−1.2, 1) = 24.2, ∇f = (−215.6, −88).
  test('published value and gradient, numerical components agree', () => {
    assert.ok(Math.abs(rosenbrock.f(rosenbrock.start) - 24.2) < 1e-12);
    const report = check(rosenbrock.f, rosenbrock.g, [rosenbrock.start]);
    assertNoMismatch(report, 'rosenbrock');
    const [c0, c1] = report.probes[0].components;
    assert.ok(Math.abs(c0.numerical - -215.6) < 1e-8, `∂f/∂x0 = ${c0.numerical}`);
    assert.ok(Math.abs(c1.numerical - -88) < 1e-8, `∂f/∂x1 = ${c1.numerical}`);
    assert.ok(c0.errorBound < 1e-6 && c0.errorBound >= Math.abs(c0.numerical - -215.6), 'bound covers the true error');
    assert.ok(Math.abs(report.probes[0].value - 24.2) < 1e-12);
  });
});

/**
 * Components no finite difference of f can confirm at x0, derived by hand from the definitions
 * in Moré, Garbow & Hillstrom 1981, §3. Brown badly scaled at (1, 1): ∂f/∂x₂ = 2(x₂ − 2·10⁻⁶) +
 * 2(x₁x₂ − 2)x₁ = −4·10⁻⁶, while f ≈ 10¹² rounds at about 10⁻⁴. Helical valley at (−1, 0, 0):
 * ∂f/∂x₁ = 0 exactly (r = 1 and ∂θ/∂x₁ = −x₂/(2πr²) = 0). A wrong formula for those components
 * would show nothing there, so the check may not pass them: it names them instead.
 */
const undecidableAtStart: Record<string, number[]> = { 'Brown badly scaled (MGH 4)': [1], 'helical valley (MGH 7)': [0] };

function assertPassOrNamedUndecided(report: PairReport, label: string, undecidable: number[] | undefined): void {
  if (!undecidable) return assertNoMismatch(report, label);
  assert.equal(report.status, 'inconclusive', `${label}: ${JSON.stringify(report.findings)}`);
  assert.deepEqual(report.findings.map((f) => [f.code, f.components]), [['gradient-undecided', undecidable]], label);
}

describe('Moré–Garbow–Hillstrom functions at their standard starting points', () => {
  for (const fn of moreGarbowHillstrom) {
    test(`${fn.name}: published f(x0), correct gradient passes, or names the components x0 cannot decide (arrays and Float64Array)`, () => {
      // f(x0) values from Moré, Garbow & Hillstrom 1981, §3 (see testFunctions.ts for the ones derived by hand).
      assert.ok(Math.abs(fn.f(fn.start) - fn.startValue!) <= 1e-4 * Math.abs(fn.startValue!), `${fn.name} f(x0) = ${fn.f(fn.start)}`);
      assertPassOrNamedUndecided(check(fn.f, fn.g, [fn.start]), fn.name, undecidableAtStart[fn.name]);
      assertPassOrNamedUndecided(check(fn.f, fn.g, [fn.start], makeFloat64), `${fn.name} (Float64Array)`, undecidableAtStart[fn.name]);
    });

    test(`${fn.name}: sign flip, factor 2, swap and a 1e-6 perturbation fail with the right diagnosis`, () => {
      const sign = check(fn.f, (x) => fn.g(x).map((v) => -v), [fn.start]);
      assert.equal(sign.status, 'fail');
      assert.deepEqual(sign.diagnosis, { kind: 'sign' });

      const doubled = check(fn.f, (x) => fn.g(x).map((v) => 2 * v), [fn.start]);
      assert.equal(doubled.status, 'fail');
      assert.deepEqual(doubled.diagnosis, { kind: 'factor', factor: 2 });

      // Swap the two components that differ most, so the swap is visible.
      const g0 = fn.g(fn.start);
      const order = g0.map((v, i) => [v, i]).sort((a, b) => a[0] - b[0]);
      const [low, high] = [order[0][1], order[order.length - 1][1]].sort((a, b) => a - b);
      const swapped = check(fn.f, (x) => { const g = fn.g(x); [g[low], g[high]] = [g[high], g[low]]; return g; }, [fn.start]);
      assert.equal(swapped.status, 'fail');
      assert.deepEqual(swapped.diagnosis, { kind: 'permutation', pairs: [[low, high]] });

      const largest = g0.reduce((best, v, i) => (Math.abs(v) > Math.abs(g0[best]) ? i : best), 0);
      const nudged = check(fn.f, (x) => { const g = fn.g(x); g[largest] *= 1 + 1e-6; return g; }, [fn.start]);
      assert.equal(nudged.status, 'fail', `${fn.name}: 1e-6 relative error in component ${largest} not caught`);
      assert.deepEqual(nudged.diagnosis, { kind: 'subset', components: [largest] });
      const finding = nudged.findings.find((f) => f.code === 'gradient-mismatch')!;
      assert.deepEqual(finding.components, [largest]);
      assert.equal(finding.subject, 'gradient');
      assert.match(finding.message, new RegExp(`[Cc]omponent ${largest}: analytic .* numerical .* ± `));
    });
  }
});

describe('no false alarms', () => {
  test('every MGH function at 20 seeded random points near its start', () => {
    let state = 12345;
    const uniform = () => ((state = (Math.imul(state, 1103515245) + 12345) >>> 0) / 2 ** 32);
    for (const fn of moreGarbowHillstrom) {
      const probes = Array.from({ length: 20 }, () => fn.start.map((v) => v + (uniform() - 0.5) * Math.max(Math.abs(v), 1)));
      const report = check(fn.f, fn.g, probes);
      assert.ok(report.status === 'pass' || report.status === 'inconclusive', `${fn.name}: ${report.status} ${JSON.stringify(report.findings)}`);
      assert.equal(report.findings.filter((f) => f.code === 'gradient-mismatch').length, 0, fn.name);
    }
  });

  test('coordinates near 1e6 and objective values near 1e-10', () => {
    const big = check((x) => 1e-3 * (x[0] - 1.5e6) ** 2 + Math.sin(x[1] / 1e6), (x) => [2e-3 * (x[0] - 1.5e6), Math.cos(x[1] / 1e6) / 1e6], [[1e6, -2e6], [1.2e6, 3e6]]);
    assertNoMismatch(big, 'large coordinates');
    const tiny = check((x) => 1e-10 * (x[0] ** 2 + Math.exp(x[1])), (x) => [2e-10 * x[0], 1e-10 * Math.exp(x[1])], [[0.3, -0.2], [-1, 2]]);
    assertNoMismatch(tiny, 'tiny objective');
    const nearMinimum = check((x) => (x[0] - 1) ** 2 + 3 * (x[1] - 2) ** 2, (x) => [2 * (x[0] - 1), 6 * (x[1] - 2)], [[1 + 1e-5, 2 - 1e-5], [1, 2]]);
    assertNoMismatch(nearMinimum, 'at and near the minimum');
  });

  test('objectives computed in float32 (Math.fround) with float32 gradients', () => {
    const f32 = Math.fround;
    const f = (x: ArrayLike<number>) => {
      const a = f32(x[1] - f32(x[0] * x[0]));
      const b = f32(1 - x[0]);
      return f32(f32(100 * f32(a * a)) + f32(b * b));
    };
    const g = (x: ArrayLike<number>) => {
      const a = f32(x[1] - f32(x[0] * x[0]));
      return [f32(f32(-400 * f32(x[0] * a)) - f32(2 * f32(1 - x[0]))), f32(200 * a)];
    };
    const report = check(f, g, [[-1.2, 1], [0.3, 0.7], [2, -1]]);
    assertNoMismatch(report, 'float32 Rosenbrock');
    // Float32 rounding is seen as noise far above double precision (unit roundoff 2^-24 ≈ 6e-8).
    assert.ok(report.probes[0].noise > 1e-10, `noise ${report.probes[0].noise}`);
    // A factor-2 error is still far outside float32 noise.
    assert.equal(check(f, (x) => g(x).map((v) => 2 * v), [[-1.2, 1]]).status, 'fail');
  });

  test('Brown badly scaled: the tiny second component is left undecided rather than flagged', () => {
    const brown = moreGarbowHillstrom.find((fn) => fn.name.startsWith('Brown'))!;
    const report = check(brown.f, brown.g, [brown.start]);
    const second = report.probes[0].components[1];
    // ∂f/∂x1 ≈ −4e-6 while f ≈ 1e12 carries noise ~1e-4: the bound must admit that.
    assert.ok(second.errorBound > Math.abs(second.analytic), `bound ${second.errorBound}`);
    assert.equal(second.mismatch, false);
  });
});

describe('report contents', () => {
  test('seeded random probes when only the dimension is known; repeatable', () => {
    const f = (x: ArrayLike<number>) => Math.exp(x[0]) + x[0] * x[1] + x[2] ** 4;
    const g = (x: ArrayLike<number>) => [Math.exp(x[0]) + x[1], x[0], 4 * x[2] ** 3];
    const first = check(f, g, [], makeArray, 3);
    const second = check(f, g, [], makeArray, 3);
    assert.equal(first.probes.length, defaultCheckOptions.probeCount);
    assert.deepEqual(first.probes.map((p) => p.point), second.probes.map((p) => p.point));
    assert.equal(first.status, 'pass');
    assert.equal(first.dimension, 3);
    assert.ok(first.evaluations.objective > 0 && first.evaluations.gradient > 0);
    assert.ok(first.maxRelError !== null && first.maxRelError < 1e-8);
  });

  test('full check costs O(n) objective evaluations per probe', () => {
    const f = (x: ArrayLike<number>) => { let s = 0; for (let i = 0; i < x.length; i++) s += Math.cosh(x[i]) * (i + 1); return s; };
    const g = (x: ArrayLike<number>) => Array.from(x, (v, i) => Math.sinh(v) * (i + 1));
    const perComponent = (n: number) => {
      // No coordinate at 0, where sinh's derivative term would vanish and stay undecided.
      const report = check(f, g, [Array.from({ length: n }, (_, i) => 1.5 + Math.sin(i))]);
      assert.equal(report.status, 'pass');
      return report.evaluations.objective / n;
    };
    assert.ok(perComponent(40) < 30, 'at most ~30 evaluations per component');
    assert.ok(perComponent(40) < 1.5 * perComponent(10));
  });

  test('step study of the worst component shows the truncation/noise trade-off', () => {
    const report = checkPair({ objective: rosenbrock.f, gradient: (x) => { const g = rosenbrock.g(x); g[0] += 1; return g; }, makeVector: makeArray }, [rosenbrock.start], { ...plan(), options: { ...defaultCheckOptions, plots: true } });
    const study = report.probes[0].stepStudy!;
    assert.equal(study.component, 0);
    assert.equal(study.steps.length, study.errors.length);
    const smallest = Math.min(...study.errors);
    // Error falls from large steps and rises again for tiny ones (Nocedal & Wright 2006, §8.1).
    assert.ok(study.errors[0] > 100 * smallest && study.errors[study.errors.length - 1] > 100 * smallest);
    assert.ok(study.chosenStep > 0);
  });

  test('mismatch message names components, values and the diagnosed shape', () => {
    const report = check((x) => x[0] ** 2 + x[1] ** 2 + x[2] ** 2, (x) => [4 * x[0], 4 * x[1], 4 * x[2]], [[1, 2, 3]]);
    const finding = report.findings.find((f) => f.code === 'gradient-mismatch')!;
    assert.equal(finding.severity, 'error');
    assert.equal(finding.probeIndex, 0);
    assert.match(finding.message, /off by a constant factor \(2× the true gradient\)/);
    assert.match(finding.message, /Component 0: analytic 4, numerical 2 ± /);
  });
});

test('correct gradients near a zero-residual minimum still pass (the noise of an f near 0 is not overestimated)', () => {
  // Freudenstein–Roth (MGH 2) has f = 0 at (5, 4) (Moré, Garbow & Hillstrom 1981, from memory); a probe 1e-9 away.
  const p = freudensteinRoth;
  const report = check(p.f, p.g, [[5 + 3e-9, 4 - 2e-9]]);
  assert.equal(report.status, 'pass', report.findings.map((f) => f.message).join('\n'));
  assert.ok(!report.findings.some((f) => f.code === 'noisy-objective'));
});
