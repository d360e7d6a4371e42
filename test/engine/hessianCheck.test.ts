// The Hessian and Hessian-vector-product kinds, checked against differences of the gradient, on
// the problems of Moré, Garbow & Hillstrom (ACM TOMS 7(1), 1981) whose exact Hessians are written
// out in test/support/problems (each derived by hand and cross-checked there against independent
// differences of the gradient), and the least-squares figures against ml-matrix's SVD.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { Matrix, SingularValueDecomposition } from 'ml-matrix';
import { checkByKind } from '../../server/src/engine/kinds';
import { defaultCheckOptions, type PairReport } from '../../server/src/engine/types';
import { extendedRosenbrock, makeArray, moreGarbowHillstromSet, type TestProblem } from '../support/problems';

type HessianMutant = (H: number[][], x: number[]) => unknown;

const withHessian = moreGarbowHillstromSet.filter((p) => p.hessian && p.start.length <= 64);

function checkHessian(p: TestProblem, mutate: HessianMutant = (H) => H, probes: number[][] = [p.start]): PairReport {
  // With the curvature asked for, as the hover asks.
  return checkByKind.hessian(
    { objective: (x) => p.g(x as number[]), gradient: (x) => mutate(p.hessian!(x as number[]).map((row) => row.slice()), x as number[]), makeVector: makeArray },
    probes,
    { dimension: null, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } },
  );
}

function checkProduct(p: TestProblem, product: (H: number[][], v: number[]) => number[], probes: number[][] = [p.start]): PairReport {
  return checkByKind.hessianVectorProduct(
    { objective: (x) => p.g(x as number[]), gradient: (x, v) => product(p.hessian!(x as number[]), v as number[]), makeVector: makeArray },
    probes,
    { dimension: null, learningRate: null, options: defaultCheckOptions },
  );
}

const times = (H: number[][], v: number[]) => H.map((row) => row.reduce((sum, h, j) => sum + h * v[j], 0));

describe('Hessian kind', () => {
  test('there are at least five problems with exact Hessians', () => {
    assert.ok(withHessian.length >= 5, withHessian.map((p) => p.name).join(', '));
  });

  for (const p of withHessian) {
    test(`${p.name}: the exact Hessian passes at x0, and L̂ is its largest |eigenvalue|`, () => {
      const report = checkHessian(p);
      assert.equal(report.status, 'pass', report.findings.map((f) => f.message).join('\n'));
      assert.equal(report.kind, 'hessian');
      // Reference: ml-matrix's SVD of the exact Hessian (singular values of a symmetric matrix are |λ|).
      const largest = new SingularValueDecomposition(new Matrix(p.hessian!(p.start))).diagonal[0];
      assert.ok(Math.abs(report.smoothness!.lipschitz - largest) <= 1e-9 * largest, `${report.smoothness!.lipschitz} vs ${largest}`);
    });
  }

  test('a doubled diagonal is named (Wood)', () => {
    const wood = withHessian.find((p) => p.name.startsWith('Wood'))!;
    const report = checkHessian(wood, (H) => H.map((row, i) => row.map((h, j) => (i === j ? 2 * h : h))));
    assert.equal(report.status, 'fail');
    assert.deepEqual(report.matrix?.diagnosis, { kind: 'diagonalFactor', factor: 2 });
    assert.match(report.findings.find((f) => f.code === 'hessian-mismatch')!.message, /the diagonal alone is wrong: 2×/);
  });

  test('one mirrored entry wrong is both a mismatch and an asymmetry (Powell singular)', () => {
    const powell = withHessian.find((p) => p.name.startsWith('Powell singular'))!;
    const report = checkHessian(powell, (H) => {
      H[0][1] += 0.5;
      return H;
    });
    assert.equal(report.status, 'fail');
    assert.deepEqual(report.matrix?.diagnosis, { kind: 'entry', row: 0, column: 1 });
    const asymmetry = report.findings.find((f) => f.code === 'hessian-not-symmetric')!;
    assert.deepEqual(asymmetry.entries, [[0, 1], [1, 0]]);
  });

  test('a Hessian that is not square is a shape finding', () => {
    const report = checkHessian(withHessian[0], (H) => H.map((row) => [...row, 0]));
    assert.equal(report.status, 'error');
    assert.match(report.findings[0].message, /2 × 3.*must be 2 × 2/);
  });
});

describe('Hessian-vector product kind', () => {
  const rosenbrock = withHessian.find((p) => p.name.startsWith('Rosenbrock'))!;

  test('exact products pass, and a product off by a factor of 2 is named', () => {
    assert.equal(checkProduct(rosenbrock, times).status, 'pass');
    const doubled = checkProduct(rosenbrock, (H, v) => times(H, v).map((y) => 2 * y));
    assert.equal(doubled.status, 'fail');
    assert.deepEqual(doubled.matrix?.diagnosis, { kind: 'matrixFactor', factor: 2 });
    assert.ok(doubled.findings.some((f) => f.code === 'hessian-vector-product-mismatch'));
  });

  test('above 64 coordinates: random directions, then the wrong column located (extended Rosenbrock, n = 100)', () => {
    const p = extendedRosenbrock(100);
    const exact = checkProduct(p, times);
    assert.equal(exact.status, 'pass', exact.findings.map((f) => f.message).join('\n'));
    assert.equal(exact.probes[0].mode, 'directional');
    // H[40][41] and H[41][40] both dropped: the coupling of the 21st pair is missing from the product.
    const wrong = checkProduct(p, (H, v) => times(H.map((row, i) => row.map((h, j) => ((i === 40 && j === 41) || (i === 41 && j === 40) ? 0 : h))), v));
    assert.equal(wrong.status, 'fail');
    const located = wrong.findings.find((f) => f.code === 'hessian-vector-product-mismatch')!;
    assert.ok(located.entries?.some(([i, j]) => i === 40 && j === 41), JSON.stringify(located.entries));
  });
});

describe('least-squares figures of a Jacobian that holds', () => {
  for (const prefix of ['Bard', 'Meyer', 'Kowalik', 'Biggs']) {
    test(`${prefix}: σmax(J)² and cond(JᵀJ) agree with ml-matrix's SVD of J at x0`, () => {
      const p = moreGarbowHillstromSet.find((q) => q.name.startsWith(prefix))!;
      const model = p.residuals!;
      const report = checkByKind.jacobian({ objective: (x) => model(x as number[]).r, gradient: (x) => model(x as number[]).J, makeVector: makeArray }, [p.start], { dimension: null, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } });
      assert.equal(report.status, 'pass', report.findings.map((f) => f.message).join('\n'));
      const sigma = new SingularValueDecomposition(new Matrix(model(p.start).J)).diagonal;
      const figures = report.matrix!.leastSquares!;
      const [largest, smallest] = [sigma[0] ** 2, sigma[sigma.length - 1] ** 2];
      assert.ok(Math.abs(figures.sigmaMaxSquared - largest) <= 1e-9 * largest, `σmax² ${figures.sigmaMaxSquared} vs ${largest}`);
      // cond(JᵀJ) = (σmax/σmin)²; Meyer's is near 10¹⁸ at x0, where JᵀJ is singular to rounding.
      if (figures.conditionNumber !== null) assert.ok(Math.abs(figures.conditionNumber - largest / smallest) <= 1e-4 * (largest / smallest), `cond ${figures.conditionNumber} vs ${largest / smallest}`);
      else assert.ok(largest / smallest > 1e13, `cond ${largest / smallest} was called singular`);
    });
  }

  for (const prefix of ['Rosenbrock', 'Wood', 'Powell singular']) {
    test(`${prefix}: L̂ for gradient descent on ½‖r‖² is the largest curvature of its true Hessian, not of the Gauss–Newton model`, () => {
      const p = moreGarbowHillstromSet.find((q) => q.name.startsWith(prefix))!;
      const model = p.residuals!;
      const report = checkByKind.jacobian({ objective: (x) => model(x as number[]).r, gradient: (x) => model(x as number[]).J, makeVector: makeArray }, [p.start], { dimension: null, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } });
      // ½‖r‖² is half the MGH objective f = Σ rᵢ², so its Hessian is ½∇²f (exact, written out in mgh.ts); reference: ml-matrix's SVD.
      const half = new Matrix(p.hessian!(p.start)).mul(0.5);
      const largest = new SingularValueDecomposition(half).diagonal[0];
      assert.ok(Math.abs(report.smoothness!.lipschitz - largest) <= 1e-4 * largest, `L̂ ${report.smoothness!.lipschitz} vs ${largest}`);
      assert.ok(report.matrix!.leastSquares!.sigmaMaxSquared > 0);
    });
  }
});

describe('what a wrong Hessian looks like, named', () => {
  const wood = withHessian.find((p) => p.name.startsWith('Wood'))!;

  test('a ridge term λ·I missing from the diagonal', () => {
    const report = checkHessian(wood, (H) => H.map((row, i) => row.map((h, j) => (i === j ? h - 0.1 : h))));
    assert.ok(report.matrix?.diagnosis?.kind === 'diagonalOffset' && Math.abs(report.matrix.diagnosis.offset + 0.1) < 1e-6);
    assert.match(report.findings.find((f) => f.code === 'hessian-mismatch')!.message, /the diagonal alone is off, every entry by -0\.1/);
  });

  test('the lower triangle left at zero, the upper right: terms added on one side only, and asymmetric', () => {
    const report = checkHessian(wood, (H) => H.map((row, i) => row.map((h, j) => (i > j ? 0 : h))));
    assert.deepEqual(report.matrix?.diagnosis, { kind: 'oneSided', side: 'lower' });
    assert.match(report.findings.find((f) => f.code === 'hessian-mismatch')!.message, /every wrong entry's mirror image is right \(all below the diagonal\)/);
    assert.ok(report.findings.some((f) => f.code === 'hessian-not-symmetric'));
  });

  test('without a rate or a request, a Hessian that holds adds no step size; the hover asks for it', () => {
    const quiet = checkByKind.hessian({ objective: (x) => wood.g(x as number[]), gradient: (x) => wood.hessian!(x as number[]), makeVector: makeArray }, [wood.start], { dimension: null, learningRate: null, options: defaultCheckOptions });
    assert.equal(quiet.status, 'pass');
    assert.equal(quiet.smoothness, null);
    assert.ok(checkHessian(wood).smoothness!.lipschitz > 0);
  });
});

describe('review cases', () => {
  test('a product function whose Hessian is not symmetric is told so', () => {
    const rosenbrock = withHessian.find((p) => p.name.startsWith('Rosenbrock'))!;
    const report = checkProduct(rosenbrock, (H, v) => times([[H[0][0], H[0][1] + 3], [H[1][0], H[1][1]]], v));
    assert.ok(report.findings.some((f) => f.code === 'hessian-not-symmetric' && /the Hessian its products give is not symmetric/.test(f.message)));
  });

  test('the figures of a wide Jacobian (10 × 400) come from Lanczos on JᵀJ·v and agree with ml-matrix', () => {
    // Invented: ten smooth residuals of 400 coordinates; truth by construction, reference ml-matrix's SVD.
    const n = 400;
    const rowOf = (i: number) => Array.from({ length: n }, (_, j) => Math.cos((i + 1) * (j + 1) * 0.01) / (1 + i));
    const rows = Array.from({ length: 10 }, (_, i) => rowOf(i));
    const report = checkByKind.jacobian(
      { objective: (x) => rows.map((row) => row.reduce((s, a, j) => s + a * (x as number[])[j], 0) + 0.1 * (x as number[])[0] ** 2), gradient: (x) => rows.map((row) => row.map((a, j) => a + (j === 0 ? 0.2 * (x as number[])[0] : 0))), makeVector: makeArray },
      [Array.from({ length: n }, () => 0)],
      { dimension: null, learningRate: null, options: { ...defaultCheckOptions, fullCheckMaxDimension: n } },
    );
    assert.equal(report.status, 'pass', report.findings.map((f) => f.message).join('\n'));
    const sigma = new SingularValueDecomposition(new Matrix(rows)).diagonal[0];
    assert.ok(Math.abs(report.matrix!.leastSquares!.sigmaMaxSquared - sigma ** 2) <= 1e-6 * sigma ** 2, `${report.matrix!.leastSquares!.sigmaMaxSquared} vs ${sigma ** 2}`);
  });
});
