// Problems of variable dimension from Moré, Garbow & Hillstrom, ACM TOMS 7(1), 1981
// (numbers as there). Start values f(x0) are derived by hand from the definitions
// unless marked "from memory" (of the paper's companion tables).
import { powellBlock, powellBlockHessian } from './mgh';
import { rows, sumOfSquares, type Residuals } from './leastSquares';
import type { TestProblem } from './types';

/**
 * f = Σ over consecutive blocks of `blockSize` coordinates of Σ r², in O(n):
 * the extended Rosenbrock and extended Powell functions at n up to 10⁵.
 */
function blockSumOfSquares(
  name: string,
  start: number[],
  startValue: number,
  blockSize: number,
  block: (x: number[]) => Residuals,
  blockHessian: (x: number[]) => number[][],
): TestProblem {
  const n = start.length;
  const residualsPerBlock = block(start.slice(0, blockSize)).r.length;
  const blockAt = (x: ArrayLike<number>, b: number) => Array.from({ length: blockSize }, (_, k) => x[b * blockSize + k]);
  const gradientWithout = (x: ArrayLike<number>, skip: number): number[] => {
    const g = new Array<number>(x.length).fill(0);
    for (let b = 0; b < x.length / blockSize; b++) {
      const { r, J } = block(blockAt(x, b));
      for (let i = 0; i < r.length; i++) {
        if (b * residualsPerBlock + i === skip) continue;
        for (let k = 0; k < blockSize; k++) g[b * blockSize + k] += 2 * r[i] * J[i][k];
      }
    }
    return g;
  };
  return {
    name,
    start,
    startValue,
    f: (x) => {
      let sum = 0;
      for (let b = 0; b < x.length / blockSize; b++) for (const ri of block(blockAt(x, b)).r) sum += ri * ri;
      return sum;
    },
    g: (x) => gradientWithout(x, -1),
    gradientWithoutTerm: gradientWithout,
    termCount: (n / blockSize) * residualsPerBlock,
    hessian: (x) => {
      const h = Array.from({ length: x.length }, () => new Array<number>(x.length).fill(0));
      for (let b = 0; b < x.length / blockSize; b++) {
        const hb = blockHessian(blockAt(x, b));
        for (let i = 0; i < blockSize; i++) for (let j = 0; j < blockSize; j++) h[b * blockSize + i][b * blockSize + j] = hb[i][j];
      }
      return h;
    },
  };
}

/** MGH 21, n even: f(x0) = 24.2·n/2 (each block is Rosenbrock at (−1.2, 1)). */
export function extendedRosenbrock(n: number): TestProblem {
  const start = rows(n, (i) => (i % 2 === 1 ? -1.2 : 1));
  return blockSumOfSquares(`extended Rosenbrock (MGH 21, n = ${n})`, start, 12.1 * n, 2, ([a, b]) => ({ r: [10 * (b - a * a), 1 - a], J: [[-20 * a, 10], [-1, 0]] }), ([a, b]) => [
    [1200 * a * a - 400 * b + 2, -400 * a],
    [-400 * a, 200],
  ]);
}

/** MGH 22, n a multiple of 4: f(x0) = 215·n/4 (each block is Powell singular at (3, −1, 0, 1)). */
export function extendedPowell(n: number): TestProblem {
  const start = rows(n, (i) => [3, -1, 0, 1][(i - 1) % 4]);
  return blockSumOfSquares(`extended Powell singular (MGH 22, n = ${n})`, start, 53.75 * n, 4, ([a, b, c, d]) => powellBlock(a, b, c, d), ([a, b, c, d]) => powellBlockHessian(a, b, c, d));
}

/** MGH 20, m = 31. At x0 = 0 the first 29 residuals are −1, r₃₀ = 0, r₃₁ = −1: f = 30. */
export function watson(n: number): TestProblem {
  return sumOfSquares(`Watson (MGH 20, n = ${n})`, new Array(n).fill(0), 30, (x) => {
    const r: number[] = [];
    const J: number[][] = [];
    for (let i = 1; i <= 29; i++) {
      const t = i / 29;
      let s1 = 0;
      let s2 = 0;
      for (let j = 1; j <= n; j++) {
        if (j >= 2) s1 += (j - 1) * x[j - 1] * t ** (j - 2);
        s2 += x[j - 1] * t ** (j - 1);
      }
      r.push(s1 - s2 * s2 - 1);
      J.push(rows(n, (j) => (j >= 2 ? (j - 1) * t ** (j - 2) : 0) - 2 * s2 * t ** (j - 1)));
    }
    r.push(x[0], x[1] - x[0] ** 2 - 1);
    J.push(rows(n, (j) => (j === 1 ? 1 : 0)), rows(n, (j) => (j === 1 ? -2 * x[0] : j === 2 ? 1 : 0)));
    return { r, J };
  });
}

const penaltyA = 1e-5;

/** MGH 23: a·Σ(xⱼ − 1)² + (Σxⱼ² − ¼)², x0ⱼ = j. At n = 10: 285a + 384.75² = 148032.56535. */
export function penaltyI(n: number): TestProblem {
  const start = rows(n, (j) => j);
  const startValue = penaltyA * start.reduce((s, v) => s + (v - 1) ** 2, 0) + (start.reduce((s, v) => s + v * v, 0) - 0.25) ** 2;
  return sumOfSquares(`penalty I (MGH 23, n = ${n})`, start, n === 10 ? 148032.56535 : startValue, (x) => {
    const sumSq = Array.from(x).reduce((s, v) => s + v * v, 0);
    return {
      r: [...rows(n, (j) => Math.sqrt(penaltyA) * (x[j - 1] - 1)), sumSq - 0.25],
      J: [...rows(n, (i) => rows(n, (j) => (i === j ? Math.sqrt(penaltyA) : 0))), rows(n, (j) => 2 * x[j - 1])],
    };
  }, {
    // 2a·I + 4(Σx² − ¼)·I + 8·x·xᵀ.
    hessian: (x) => {
      const sumSq = Array.from(x).reduce((s, v) => s + v * v, 0);
      return rows(n, (i) => rows(n, (j) => 8 * x[i - 1] * x[j - 1] + (i === j ? 2 * penaltyA + 4 * (sumSq - 0.25) : 0)));
    },
  });
}

/** MGH 24, m = 2n, x0 = ½. */
export function penaltyII(n: number): TestProblem {
  const sa = Math.sqrt(penaltyA);
  return sumOfSquares(`penalty II (MGH 24, n = ${n})`, new Array(n).fill(0.5), null, (x) => {
    const e = (j: number) => Math.exp(x[j - 1] / 10);
    const zero = () => new Array<number>(n).fill(0);
    const r: number[] = [x[0] - 0.2];
    const J: number[][] = [rows(n, (j) => (j === 1 ? 1 : 0))];
    for (let i = 2; i <= n; i++) {
      r.push(sa * (e(i) + e(i - 1) - (Math.exp(i / 10) + Math.exp((i - 1) / 10))));
      const row = zero();
      row[i - 1] = (sa * e(i)) / 10;
      row[i - 2] = (sa * e(i - 1)) / 10;
      J.push(row);
    }
    for (let i = n + 1; i < 2 * n; i++) {
      r.push(sa * (e(i - n + 1) - Math.exp(-1 / 10)));
      const row = zero();
      row[i - n] = (sa * e(i - n + 1)) / 10;
      J.push(row);
    }
    r.push(rows(n, (j) => (n - j + 1) * x[j - 1] ** 2).reduce((s, v) => s + v, 0) - 1);
    J.push(rows(n, (j) => 2 * (n - j + 1) * x[j - 1]));
    return { r, J };
  });
}

/** MGH 25, m = n + 2, x0ⱼ = 1 − j/n. At n = 10: 3.85 + 38.5² + 38.5⁴ = 2198551.1625. */
export function variablyDimensioned(n: number): TestProblem {
  const weightedSum = (x: ArrayLike<number>) => rows(n, (j) => j * (x[j - 1] - 1)).reduce((s, v) => s + v, 0);
  return sumOfSquares(`variably dimensioned (MGH 25, n = ${n})`, rows(n, (j) => 1 - j / n), n === 10 ? 2198551.1625 : null, (x) => {
    const s = weightedSum(x);
    return {
      r: [...rows(n, (j) => x[j - 1] - 1), s, s * s],
      J: [...rows(n, (i) => rows(n, (j) => (i === j ? 1 : 0))), rows(n, (j) => j), rows(n, (j) => 2 * s * j)],
    };
  }, {
    // 2I + (2 + 12s²)·jjᵀ with j = (1, …, n).
    hessian: (x) => {
      const s = weightedSum(x);
      return rows(n, (i) => rows(n, (j) => (2 + 12 * s * s) * i * j + (i === j ? 2 : 0)));
    },
  });
}

/** MGH 26, m = n, x0 = 1/n. */
export function trigonometric(n: number): TestProblem {
  return sumOfSquares(`trigonometric (MGH 26, n = ${n})`, new Array(n).fill(1 / n), null, (x) => {
    const cosSum = Array.from(x).reduce((s, v) => s + Math.cos(v), 0);
    return {
      r: rows(n, (i) => n - cosSum + i * (1 - Math.cos(x[i - 1])) - Math.sin(x[i - 1])),
      J: rows(n, (i) => rows(n, (j) => Math.sin(x[j - 1]) + (i === j ? i * Math.sin(x[i - 1]) - Math.cos(x[i - 1]) : 0))),
    };
  });
}

/** MGH 35, m = n, x0ⱼ = j/(n + 1): shifted Chebyshev polynomials Tᵢ(2x − 1) on [0, 1]. */
export function chebyquad(n: number): TestProblem {
  return sumOfSquares(`Chebyquad (MGH 35, n = ${n})`, rows(n, (j) => j / (n + 1)), null, (x) => {
    const r = new Array<number>(n).fill(0);
    const J = Array.from({ length: n }, () => new Array<number>(n).fill(0));
    for (let j = 0; j < n; j++) {
      const y = 2 * x[j] - 1;
      // T₀ = 1, T₁ = y, Tₖ₊₁ = 2yTₖ − Tₖ₋₁, and the same recurrence differentiated.
      let [tPrev, t, dPrev, d] = [1, y, 0, 1];
      for (let i = 1; i <= n; i++) {
        r[i - 1] += t / n;
        J[i - 1][j] = (2 * d) / n;
        [tPrev, t, dPrev, d] = [t, 2 * y * t - tPrev, d, 2 * t + 2 * y * d - dPrev];
      }
    }
    // ∫₀¹ Tᵢ(2x − 1) dx = −1/(i² − 1) for even i, 0 for odd i.
    for (let i = 2; i <= n; i += 2) r[i - 1] += 1 / (i * i - 1);
    return { r, J };
  });
}
