// The shared test problems are checked against the literature and against differences
// that do not use the engine: f(x0) values, gradients against a fourth-order central
// difference with one Richardson step, Hessians against differences of the gradient,
// and the published minima reached by a damped Newton iteration on our own gradient.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { Matrix, solve } from 'ml-matrix';
import {
  extendedPowell, extendedRosenbrock, geometricSpectrum, irisLogistic, irisSoftmax, moreGarbowHillstromSet, quadraticWithSpectrum, seededUniform, type TestProblem,
} from './index';

const byName = (prefix: string) => moreGarbowHillstromSet.find((p) => p.name.startsWith(prefix))!;

/** (−f(x+2h) + 8f(x+h) − 8f(x−h) + f(x−2h)) / 12h, then Richardson with h/2: error O(h⁶) (Burden & Faires, Numerical Analysis, §4.1–4.2). */
function referenceDerivative(f: (x: number[]) => number, x: number[], i: number): number {
  const fourth = (h: number) => {
    const at = (s: number) => { const y = x.slice(); y[i] += s; return f(y); };
    return (-at(2 * h) + 8 * at(h) - 8 * at(-h) + at(-2 * h)) / (12 * h);
  };
  const h = 1e-3 * Math.max(1, Math.abs(x[i]));
  return (16 * fourth(h / 2) - fourth(h)) / 15;
}

const allProblems: TestProblem[] = [...moreGarbowHillstromSet, extendedRosenbrock(100), extendedPowell(100), irisLogistic(), irisSoftmax(), quadraticWithSpectrum('quadratic, 20 geometric eigenvalues', geometricSpectrum(20, 1, 100), 3)];

function nearbyPoints(p: TestProblem, count: number): number[][] {
  const uniform = seededUniform(17);
  return [p.start, ...Array.from({ length: count }, () => p.start.map((v) => v + (uniform() - 0.5) * 0.2 * Math.max(1, Math.abs(v))))];
}

describe('test problems', () => {
  test('at least 15 Moré–Garbow–Hillstrom problems', () => {
    assert.ok(moreGarbowHillstromSet.length >= 15, `${moreGarbowHillstromSet.length}`);
  });

  for (const p of allProblems) {
    test(`${p.name}: f(x0), gradient and Hessian`, () => {
      // f(x0): Moré, Garbow & Hillstrom 1981 (values quoted from memory, or derived by hand as each problem's comment says).
      if (p.startValue !== null) assert.ok(Math.abs(p.f(p.start) - p.startValue) <= 1e-5 * Math.abs(p.startValue), `f(x0) = ${p.f(p.start)}, expected ${p.startValue}`);
      for (const x of nearbyPoints(p, 2)) {
        const g = p.g(x);
        assert.equal(g.length, x.length);
        const scale = Math.max(...g.map(Math.abs));
        // Brown badly scaled has f ≈ 1e12, so the reference difference itself carries ~1e-7 relative error.
        x.forEach((_, i) => assert.ok(Math.abs(referenceDerivative(p.f, x, i) - g[i]) <= 1e-6 * scale, `∂f/∂x${i} at ${x}: ${g[i]} vs ${referenceDerivative(p.f, x, i)}`));
        if (p.hessian && x.length <= 20) {
          const h = p.hessian(x);
          const hScale = Math.max(...h.flat().map(Math.abs));
          for (let j = 0; j < x.length; j++) for (let i = 0; i < x.length; i++) {
            const numeric = referenceDerivative((y) => p.g(y)[i], x, j);
            assert.ok(Math.abs(numeric - h[i][j]) <= 1e-6 * hScale, `H[${i}][${j}]: ${h[i][j]} vs ${numeric}`);
          }
        }
      }
    });
  }

  test('zero-residual problems vanish with their gradient at the published minimisers', () => {
    // Minimisers from Moré, Garbow & Hillstrom 1981 (from memory).
    const minimisers: Array<[string, number[]]> = [
      ['Rosenbrock', [1, 1]], ['Freudenstein', [5, 4]], ['Brown badly', [1e6, 2e-6]], ['Beale', [3, 0.5]], ['helical', [1, 0, 0]],
      ['box', [1, 10, 1]], ['Powell singular', [0, 0, 0, 0]], ['Wood', [1, 1, 1, 1]], ['Biggs', [1, 10, 1, 5, 4, 3]],
      ['extended Rosenbrock', new Array(10).fill(1)], ['extended Powell', new Array(12).fill(0)], ['variably', new Array(10).fill(1)],
    ];
    for (const [prefix, x] of minimisers) {
      const p = byName(prefix);
      assert.ok(p.f(x) < 1e-20, `${p.name}: f(x*) = ${p.f(x)}`);
      assert.ok(Math.max(...p.g(x).map(Math.abs)) < 1e-9, `${p.name}: ∇f(x*) = ${p.g(x)}`);
    }
  });

  test('a damped Newton iteration on our gradients reaches the published minimum values', () => {
    // f* from Moré, Garbow & Hillstrom 1981, §3 (from memory); local minima where the paper lists them.
    const minima: Array<[string, number, number[]?]> = [
      ['Freudenstein', 48.9842], ['Jennrich', 124.362], ['Bard', 8.21487e-3], ['Gaussian', 1.12793e-8],
      ['Meyer', 87.9458, [0.0056, 6181, 345.2]], ['Kowalik', 3.07505e-4], ['Brown and Dennis', 85822.2], ['Biggs', 5.65565e-3],
      ['Watson', 2.28767e-3], ['penalty I', 7.08765e-5], ['penalty II', 2.9366e-4], ['trigonometric', 2.79506e-5], ['Chebyquad', 3.51687e-3],
    ];
    for (const [prefix, published, start] of minima) {
      const p = byName(prefix);
      const reached = dampedNewton(p, start ?? p.start);
      assert.ok(Math.abs(reached - published) <= 5e-5 * published, `${p.name}: reached ${reached}, published ${published}`);
    }
  });
});

/** Levenberg–Marquardt-damped Newton steps; the Hessian is a central difference of the gradient under test. */
function dampedNewton(p: TestProblem, start: number[]): number {
  let x = start.slice();
  let fx = p.f(x);
  let damping = 1e-3;
  for (let iteration = 0; iteration < 500; iteration++) {
    const g = p.g(x);
    const columns = x.map((v, j) => {
      const h = 1e-6 * Math.max(1, Math.abs(v));
      const plus = x.slice(); plus[j] += h;
      const minus = x.slice(); minus[j] -= h;
      const [gp, gm] = [p.g(plus), p.g(minus)];
      return gp.map((value, i) => (value - gm[i]) / (2 * h));
    });
    let improved = false;
    for (let attempt = 0; attempt < 30 && !improved; attempt++) {
      const a = new Matrix(x.map((_, i) => x.map((__, j) => 0.5 * (columns[j][i] + columns[i][j]) + (i === j ? damping * Math.max(Math.abs(columns[i][i]), 1e-12) : 0))));
      const step = solve(a, Matrix.columnVector(g)).to1DArray();
      const y = x.map((v, i) => v - step[i]);
      const fy = p.f(y);
      if (fy < fx) [x, fx, damping, improved] = [y, fy, Math.max(damping / 10, 1e-12), true];
      else damping *= 10;
    }
    if (!improved) break;
  }
  return fx;
}
