// Cases built to make a gradient check pass a wrong gradient: a pole inside the first
// difference step, a component far below the objective's rounding, a probe at a stationary
// point, exact zeros. No wrong gradient may pass; a correct one passes wherever every
// component can be decided, and is otherwise inconclusive, naming what stayed open and why.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { checkPair } from '../../server/src/engine/checkPair';
import { defaultCheckOptions, type PairReport } from '../../server/src/engine/types';
import { adversarialCases, altered, bowl, checkAt, checkSlow, diagonalQuadratic, pole, slowPair, type Gradient } from '../support/adversarial';
import { brownBadlyScaled, makeArray } from '../support/problems';

const run = (objective: (x: ArrayLike<number>) => number, gradient: Gradient, probes: number[][]) => checkAt(objective, gradient, probes);

const findingOf = (report: PairReport, code: string) => report.findings.find((f) => f.code === code);

describe('a pole inside the first difference step', () => {
  const { f, g, probes: probe } = pole;

  test('the correct gradient passes, from steps that stay on one side of the pole', () => {
    const report = run(f, g, probe);
    assert.equal(report.status, 'pass', JSON.stringify(report.findings));
    const [c0] = report.probes[0].components;
    assert.ok(Math.abs(c0.numerical - -1e8) <= c0.errorBound, `∂f/∂x₀ = ${c0.numerical} ± ${c0.errorBound}`);
  });

  test('a sign flip or a factor of 2 in the component next to the pole fails there', () => {
    for (const wrong of [altered(g, 0, (v) => -v), altered(g, 0, (v) => 2 * v)]) {
      const report = run(f, wrong, probe);
      assert.equal(report.status, 'fail', JSON.stringify(report.findings));
      assert.deepEqual(findingOf(report, 'gradient-mismatch')?.components, [0]);
    }
  });
});

describe('a component far below the objective rounding', () => {
  // Brown badly scaled (Moré, Garbow & Hillstrom 1981, problem 4) at (1, 1): ∂f/∂x₂ = −4·10⁻⁶
  // (derived by hand from the definition) beside f ≈ 10¹², which rounds at about 10⁻⁴.
  const start = [brownBadlyScaled.start];

  test('a sign flip or a factor of 10 in that component is never passed: the pair is inconclusive, naming it', () => {
    for (const wrong of [altered(brownBadlyScaled.g, 1, (v) => -v), altered(brownBadlyScaled.g, 1, (v) => 10 * v)]) {
      const report = run(brownBadlyScaled.f, wrong, start);
      assert.equal(report.status, 'inconclusive', JSON.stringify(report.findings));
      const open = findingOf(report, 'gradient-undecided')!;
      assert.deepEqual(open.components, [1]);
      assert.match(open.message, /component 1: the error bound is as large as the derivative/);
    }
  });

  test('a wrong large component still fails beside it', () => {
    const report = run(brownBadlyScaled.f, altered(brownBadlyScaled.g, 0, (v) => -v), start);
    assert.equal(report.status, 'fail');
    assert.deepEqual(findingOf(report, 'gradient-mismatch')?.components, [0]);
  });

  test('a small component that rounding does resolve is decided: 10⁻⁸·x₀² + x₁²', () => {
    const f = (x: ArrayLike<number>) => 1e-8 * x[0] ** 2 + x[1] ** 2;
    const g: Gradient = (x) => [2e-8 * x[0], 2 * x[1]];
    assert.equal(run(f, g, [[0.7, 1.3]]).status, 'pass');
    const flipped = run(f, altered(g, 0, (v) => -v), [[0.7, 1.3]]);
    assert.equal(flipped.status, 'fail');
    assert.deepEqual(findingOf(flipped, 'gradient-mismatch')?.components, [0]);
  });
});

describe('stationary probes and exact zeros', () => {
  const { f, g } = bowl;
  const doubled: Gradient = (x) => g(x).map((v) => 2 * v);

  test('at the minimum alone, neither the correct nor a doubled gradient passes: the probe is reported stationary', () => {
    for (const gradient of [g, doubled]) {
      const report = run(f, gradient, [[1, 1, 1]]);
      assert.equal(report.status, 'inconclusive', JSON.stringify(report.findings));
      assert.match(findingOf(report, 'stationary-probe')!.message, /probe 1 is a stationary point.*no probe could decide/);
      assert.ok(report.probes[0].components.every((c) => c.undecided === 'stationary'));
    }
  });

  test('another probe decides: the doubled gradient fails there, the correct one passes with the stationary probe noted', () => {
    const probes = [[1, 1, 1], [2, 0, 1.5]];
    const wrong = run(f, doubled, probes);
    assert.equal(wrong.status, 'fail');
    assert.equal(findingOf(wrong, 'gradient-mismatch')?.probeIndex, 1);
    const right = run(f, g, probes);
    assert.equal(right.status, 'pass', JSON.stringify(right.findings));
    assert.match(findingOf(right, 'stationary-probe')!.message, /the other probes decide/);
  });

  test('a component that is zero at one probe is confirmed at another; zero at every probe, it is named', () => {
    // ∂f/∂x₂ = 0 wherever x₂ = 1.
    const right = run(f, g, [[2, 0, 1], [0.5, 3, 2]]);
    assert.equal(right.status, 'pass', JSON.stringify(right.findings));
    const open = run(f, g, [[2, 0, 1], [0.5, 3, 1]]);
    assert.equal(open.status, 'inconclusive');
    assert.deepEqual(findingOf(open, 'gradient-undecided')?.components, [2]);
    // A wrong formula for x₂ that is also zero at x₂ = 1 (4(x₂ − 1) instead of 2(x₂ − 1)) is exactly what that cannot rule out.
    assert.equal(run(f, altered(g, 2, (v) => 2 * v), [[2, 0, 1], [0.5, 3, 1]]).status, 'inconclusive');
  });

  test('a parameter the objective ignores, with a zero gradient component, agrees exactly', () => {
    const ignoring = (x: ArrayLike<number>) => (x[0] - 1) ** 2 + (x[1] - 1) ** 2;
    const report = run(ignoring, (x) => [2 * (x[0] - 1), 2 * (x[1] - 1), 0], [[2, 0, 5]]);
    assert.equal(report.status, 'pass', JSON.stringify(report.findings));
  });
});

describe('large dimension (directional check)', () => {
  // f = Σ cᵢ xᵢ² with every third coefficient 0: the gradient has exact zeros, which random
  // directions decide together with the rest.
  const n = 120;
  const coefficient = (i: number) => (i % 3 === 0 ? 0 : 1 + (i % 7));
  const f = (x: ArrayLike<number>) => { let s = 0; for (let i = 0; i < n; i++) s += coefficient(i) * x[i] ** 2; return s; };
  const g: Gradient = (x) => Array.from({ length: n }, (_, i) => 2 * coefficient(i) * x[i]);
  const probe = [Array.from({ length: n }, (_, i) => 0.5 + Math.cos(i))];

  test('passes with zero components, and a doubled gradient fails', () => {
    const right = run(f, g, probe);
    assert.equal(right.probes[0].mode, 'directional');
    assert.equal(right.status, 'pass', JSON.stringify(right.findings));
    assert.equal(run(f, (x) => g(x).map((v) => 2 * v), probe).status, 'fail');
  });
});

describe('a time budget', () => {
  const check = checkSlow;
  const budgetMessages = (report: PairReport) => report.findings.filter((f) => f.code === 'budget-spent').map((f) => f.message);
  const callsOf = (r: PairReport) => r.evaluations.objective + r.evaluations.gradient;
  // The cheapest honest check: a central difference per component, 2n + 1 calls (common practice);
  // the engine is allowed four times that plus 40, flat above n = 64.
  const callTarget = (n: number) => 4 * (2 * Math.min(n, 64) + 1) + 40;

  for (const n of [3, 20, 100]) {
    for (const costMs of [10, 50, 200]) {
      test(`n = ${n} at ${costMs} ms per call: within a 10 s budget the correct gradient passes and a wrong component fails`, () => {
        const right = check(n, null, 10_000, () => costMs);
        assert.equal(right.report.status, 'pass', JSON.stringify(right.report.findings));
        assert.ok(right.spentMs <= 10_000, `ended at ${right.spentMs} ms`);
        assert.ok(callsOf(right.report) <= callTarget(n), `${callsOf(right.report)} calls`);
        const wrong = check(n, 1, 10_000, () => costMs);
        assert.equal(wrong.report.status, 'fail', JSON.stringify(wrong.report.findings));
        assert.ok(wrong.spentMs <= 10_000, `ended at ${wrong.spentMs} ms`);
        assert.equal(wrong.report.probes.length, 1, 'no probe is checked after a mismatch');
        const named = wrong.report.findings.find((f) => f.code === 'gradient-mismatch')?.components;
        // Where the budget left time to locate it, the wrong component is named, and only it.
        if (named) assert.deepEqual(named, [1]);
        if (costMs <= 50) assert.deepEqual(named, [1]);
      });
    }
  }

  test('at n = 20 and 50 ms per call, random directions replace components: 8 differences per component would not fit', () => {
    const { report } = check(20, null, 10_000);
    assert.equal(report.probes[0].mode, 'directional');
    assert.equal(report.probes[0].directions.length, defaultCheckOptions.directionCount);
    assert.deepEqual(report.probes.slice(1).map((p) => p.mode), ['spot', 'spot']);
    assert.deepEqual(budgetMessages(report), []);
    // The same pair at 1 ms per call is checked component by component.
    assert.equal(check(20, null, 10_000, () => 1).report.probes[0].mode, 'full');
  });

  test('an objective that slows down after the plan was made: components checked before the budget ran out still decide', () => {
    const slowing = (call: number) => (call < 12 ? 10 : 150);
    const wrong = check(20, 1, 5_000, slowing);
    assert.equal(wrong.report.status, 'fail');
    const right = check(20, null, 5_000, slowing);
    assert.equal(right.report.status, 'inconclusive');
    const open = right.report.findings.find((f) => f.code === 'gradient-undecided')!;
    assert.match(open.message, /the time budget ran out before it was checked/);
    assert.ok(open.components!.includes(19));
    assert.ok(right.spentMs <= 5_000);
    assert.match(budgetMessages(right.report)[0], /the time budget ran out after probe 1 of 3/);
  });

  test('a tight budget trims the random directions and says how many were tested', () => {
    const { report } = check(100, null, 2_000);
    assert.equal(report.status, 'pass');
    assert.equal(report.probes[0].directions.length, 1);
    assert.ok(budgetMessages(report).some((m) => /allowed 1 of 6 random directions at probe 1/.test(m)), JSON.stringify(budgetMessages(report)));
  });

  test('without time for one probe the check says so, with the calls made and their cost', () => {
    const { report } = check(100, null, 500);
    assert.equal(report.status, 'inconclusive');
    assert.match(budgetMessages(report)[0], /before probe 1 was decided; no verdict \(\d+ calls .* about 5e1 ms each\)/);
  });

  test('with time to spare nothing is cut short: probe 1 whole, the others spot-checked', () => {
    const { report } = check(3, null, 1e9);
    assert.equal(report.status, 'pass');
    assert.deepEqual(budgetMessages(report), []);
    assert.deepEqual(report.probes.map((p) => p.mode), ['full', 'spot', 'spot']);
  });

  test('a gradient wrong only away from probe 1 is found by a spot check, then checked whole there', () => {
    // ∂f/∂x₁ wrong where x₁ < 0 only: probe 1 (the start, x₁ = 0.5) cannot see it.
    const f = (x: ArrayLike<number>) => x[0] ** 2 + Math.exp(x[1]);
    const g = (x: ArrayLike<number>) => [2 * x[0], x[1] < 0 ? 2 * Math.exp(x[1]) : Math.exp(x[1])];
    const report = checkPair({ objective: f, gradient: g, makeVector: makeArray }, [[1, 0.5], [0.3, -1], [2, 1]], { dimension: null, learningRate: null, options: defaultCheckOptions });
    assert.equal(report.status, 'fail');
    assert.deepEqual(report.probes.map((p) => p.mode), ['full', 'full']);
    assert.deepEqual(report.findings.find((f) => f.code === 'gradient-mismatch')?.components, [1]);
  });

  test('without a learning rate the curvature is left out unless asked for: fewer calls for the same verdict', () => {
    const plain = check(3, null, 1e9).report;
    assert.equal(plain.smoothness, null);
    const { clock, fns } = slowPair(3, null, () => 50);
    const asked = checkPair(fns, [], { dimension: 3, learningRate: null, options: { ...defaultCheckOptions, smoothness: true }, endsAt: null }, () => clock.now);
    assert.equal(asked.status, plain.status);
    assert.ok(asked.smoothness !== null && asked.smoothness.lipschitz > 0);
    assert.ok(callsOf(plain) < callsOf(asked), `${callsOf(plain)} calls against ${callsOf(asked)}`);
  });
});

describe('curvature and learning rates', () => {
  const withRate = (value: number, options = defaultCheckOptions) => ({ dimension: null, learningRate: { name: 'rate', value }, options });

  test('mixed coordinate scales: x₀ near 10⁶ beside x₁ near 0 give the true curvatures, and a safe rate stays safe', () => {
    // f = x₀² + 50·x₁²: Hessian diag(2, 100) (elementary calculus).
    const f = (x: ArrayLike<number>) => x[0] ** 2 + 50 * x[1] ** 2;
    const g: Gradient = (x) => [2 * x[0], 100 * x[1]];
    const report = checkPair({ objective: f, gradient: g, makeVector: makeArray }, [[1e6, 0.3]], withRate(0.009));
    assert.equal(report.status, 'pass', JSON.stringify(report.findings));
    assert.ok(Math.abs(report.smoothness!.lipschitz - 100) < 0.1, `L̂ ${report.smoothness!.lipschitz}`);
    assert.equal(report.learningRate?.status, 'safe');
  });

  test('negative curvature counts toward the safe step, not toward divergence', () => {
    // f = ½x₀² − 2x₁²: curvatures 1 and −4. Gradient descent multiplies x₀ by (1 − α) and x₁ by
    // (1 + 4α), so f keeps decreasing for α < 2 and x₀ diverges only from α ≥ 2 (by hand).
    const f = (x: ArrayLike<number>) => 0.5 * x[0] ** 2 - 2 * x[1] ** 2;
    const g: Gradient = (x) => [x[0], -4 * x[1]];
    const probes = [[0.7, 0.4]];
    const moderate = checkPair({ objective: f, gradient: g, makeVector: makeArray }, probes, withRate(0.8));
    assert.ok(Math.abs(moderate.smoothness!.lipschitz - 4) < 1e-3, `L̂ ${moderate.smoothness!.lipschitz}`);
    assert.ok(Math.abs(moderate.smoothness!.divergenceStep! - 2) < 1e-3, `2/λ⁺ ${moderate.smoothness!.divergenceStep}`);
    assert.equal(moderate.learningRate?.status, 'aggressive');
    assert.equal(moderate.findings.some((x) => x.code === 'rate-divergent'), false);
    assert.equal(checkPair({ objective: f, gradient: g, makeVector: makeArray }, probes, withRate(2.5)).learningRate?.status, 'divergent');
  });

  test('only negative curvature: no divergence threshold at all', () => {
    // f = −x₀² − x₁²: every step of gradient descent decreases f (by hand).
    const f = (x: ArrayLike<number>) => -(x[0] ** 2) - x[1] ** 2;
    const report = checkPair({ objective: f, gradient: (x) => [-2 * x[0], -2 * x[1]], makeVector: makeArray }, [[0.5, -0.8]], withRate(5));
    assert.equal(report.smoothness!.divergenceStep, null);
    assert.equal(report.learningRate?.status, 'aggressive');
    assert.match(report.findings.find((x) => x.code === 'rate-aggressive')!.message, /no positive curvature found, so no divergence threshold/);
  });

  test('Hessian-vector products with a visible step error widen L̂ by it: a float32 gradient of a steep cosine', () => {
    // f = −Σ cos(20·xᵢ): curvature 400·cos(20·xᵢ) and fourth derivative −160000·cos(20·xᵢ)
    // (elementary calculus), so central differences of the gradient at float32 steps fall short of
    // the true curvature by about t²·400/6 of it.
    const a = 20;
    const f = (x: ArrayLike<number>) => -Math.cos(a * x[0]) - Math.cos(a * x[1]);
    const g: Gradient = (x) => [Math.fround(a * Math.sin(a * x[0])), Math.fround(a * Math.sin(a * x[1]))];
    const probe = [0.02, 0.05];
    const lambdaMax = a * a * Math.cos(a * probe[0]);
    const report = checkPair({ objective: f, gradient: g, makeVector: makeArray }, [probe], withRate(1.5 / lambdaMax));
    assert.equal(report.status, 'pass', JSON.stringify(report.findings));
    const ritz = report.probes[0].smoothness!.lambdaMax;
    assert.ok(ritz < lambdaMax, `the products underestimate: Ritz value ${ritz} against ${lambdaMax}`);
    assert.ok(report.smoothness!.productError! > lambdaMax - ritz, `error estimate ${report.smoothness!.productError} covers the shortfall ${lambdaMax - ritz}`);
    assert.ok(report.smoothness!.lipschitz >= lambdaMax, `L̂ ${report.smoothness!.lipschitz} ≥ ${lambdaMax}`);
    assert.ok(report.smoothness!.lipschitz < 1.1 * lambdaMax, `L̂ ${report.smoothness!.lipschitz} stays near ${lambdaMax}`);
    assert.match(report.findings.find((x) => x.code.startsWith('rate-'))!.message, /widened by the Hessian-vector products' error/);
  });

  const quadratic = (diagonal: number[]) => {
    const { f, g, probe } = diagonalQuadratic(diagonal);
    return (rate: number, lanczosSteps = defaultCheckOptions.lanczosSteps) => checkAt(f, g, [probe], rate, { lanczosSteps });
  };
  const spectra = {
    'a cluster at the top': Array.from({ length: 50 }, (_, i) => (i < 40 ? 100 * (1 - 1e-3 * i) : 1 + i / 10)),
    'a cluster at the bottom under one large eigenvalue': Array.from({ length: 50 }, (_, i) => (i === 17 ? 100 : 1 + 1e-3 * i)),
    'evenly crowded over two decades': Array.from({ length: 50 }, (_, i) => 100 * 0.9 ** i),
  };
  for (const [name, diagonal] of Object.entries(spectra)) {
    test(`crowded spectrum, ${name}: no false alarm and no false "safe", with few Lanczos steps or many`, () => {
      const check = quadratic(diagonal);
      const lambdaMax = Math.max(...diagonal);
      for (const steps of [5, defaultCheckOptions.lanczosSteps]) {
        const safe = check(0.9 / lambdaMax, steps);
        assert.equal(safe.status, 'pass', JSON.stringify(safe.findings));
        assert.ok(safe.smoothness!.lipschitz >= lambdaMax * (1 - 1e-6), `L̂ ${safe.smoothness!.lipschitz} at ${steps} steps`);
        assert.notEqual(safe.learningRate?.status, 'divergent');
        assert.notEqual(check(1.1 / lambdaMax, steps).learningRate?.status, 'safe');
        assert.notEqual(check(1.9 / lambdaMax, steps).learningRate?.status, 'divergent', `1.9/λmax at ${steps} steps`);
        assert.equal(check(2.2 / lambdaMax, steps).learningRate?.status, 'divergent', `2.2/λmax at ${steps} steps`);
      }
    });
  }

  test('an unconverged Lanczos estimate widens L̂ upward and says so', () => {
    // ½xᵀAx with A = Q·diag(1, 2, …, 60)·Q, Q = I − 2uuᵀ for u = (1, …, 1)/√60 (a reflection): λmax = 60,
    // while every diagonal entry of A stays below 59, so the check's own second differences (Aᵢᵢ)
    // cannot reach λmax either. Three Lanczos steps cannot converge on it.
    const n = 60;
    const d = Array.from({ length: n }, (_, i) => i + 1);
    const reflect = (x: ArrayLike<number>) => {
      const mean = Array.from(x).reduce((s, v) => s + v, 0) / n;
      return Array.from(x, (v) => v - 2 * mean);
    };
    const g: Gradient = (x) => reflect(reflect(x).map((v, i) => d[i] * v));
    const f = (x: ArrayLike<number>) => reflect(x).reduce((s, v, i) => s + 0.5 * d[i] * v * v, 0);
    const probe = [Array.from({ length: n }, (_, i) => 1 + Math.sin(i))];
    const report = checkPair({ objective: f, gradient: g, makeVector: makeArray }, probe, withRate(0.0175, { ...defaultCheckOptions, lanczosSteps: 3 }));
    const ritz = report.probes[0].smoothness!.lambdaMax;
    assert.ok(ritz < 59, `the Ritz value ${ritz} has not reached 60`);
    assert.equal(report.smoothness!.widened, true);
    assert.ok(report.smoothness!.lipschitz > ritz, `L̂ ${report.smoothness!.lipschitz} above the Ritz value ${ritz}`);
    // 0.0175 > 1/60: the widened L̂ keeps it from being called safe.
    assert.notEqual(report.learningRate?.status, 'safe');
    assert.match(report.findings.find((x) => x.code.startsWith('rate-'))!.message, /widened by the residual of a Lanczos estimate that had not converged/);
  });
});

describe('the adversarial table (bench/adversarial.ts prints it)', () => {
  for (const c of adversarialCases) {
    test(`${c.name}: ${c.status}${c.rate ? `, rate ${c.rate}` : ''}`, () => {
      const report = c.run();
      assert.equal(report.status, c.status, JSON.stringify(report.findings));
      if (c.rate) assert.equal(report.learningRate?.status, c.rate);
    });
  }
});
