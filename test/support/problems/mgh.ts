// Fixed-size problems of Moré, Garbow & Hillstrom, "Testing Unconstrained Optimization
// Software", ACM TOMS 7(1), 1981, numbered as there, at their standard starting points.
// Each is written as residuals rᵢ and their Jacobian (f = Σ rᵢ²), as the paper states them.
// Data tables and start values f(x0) are quoted from memory of the paper unless marked
// "derived by hand" (computed from the definition with a calculator).
import { rows, sumOfSquares } from './leastSquares';
import type { TestProblem } from './types';

export const rosenbrock: TestProblem = sumOfSquares('Rosenbrock (MGH 1)', [-1.2, 1], 24.2, (x) => ({
  r: [10 * (x[1] - x[0] ** 2), 1 - x[0]],
  J: [[-20 * x[0], 10], [-1, 0]],
}), {
  hessian: (x) => [[1200 * x[0] ** 2 - 400 * x[1] + 2, -400 * x[0]], [-400 * x[0], 200]],
});

// Derived by hand: r = (19.5, −4.5) at x0, f = 400.5.
export const freudensteinRoth: TestProblem = sumOfSquares('Freudenstein and Roth (MGH 2)', [0.5, -2], 400.5, (x) => ({
  r: [-13 + x[0] + ((5 - x[1]) * x[1] - 2) * x[1], -29 + x[0] + ((x[1] + 1) * x[1] - 14) * x[1]],
  J: [[1, 10 * x[1] - 3 * x[1] ** 2 - 2], [1, 3 * x[1] ** 2 + 2 * x[1] - 14]],
}));

// Derived by hand: 1 + (e⁻¹ − 0.0001)² = 1.135262…
export const powellBadlyScaled: TestProblem = sumOfSquares('Powell badly scaled (MGH 3)', [0, 1], 1.135262, (x) => ({
  r: [1e4 * x[0] * x[1] - 1, Math.exp(-x[0]) + Math.exp(-x[1]) - 1.0001],
  J: [[1e4 * x[1], 1e4 * x[0]], [-Math.exp(-x[0]), -Math.exp(-x[1])]],
}), {
  // 2·Σ (∇rᵢ∇rᵢᵀ + rᵢ∇²rᵢ), ∇²r₁ = [[0, 1e4], [1e4, 0]], ∇²r₂ = diag(e^−x₁, e^−x₂).
  hessian: (x) => {
    const r1 = 1e4 * x[0] * x[1] - 1;
    const r2 = Math.exp(-x[0]) + Math.exp(-x[1]) - 1.0001;
    const [e0, e1] = [Math.exp(-x[0]), Math.exp(-x[1])];
    return [
      [2 * (1e8 * x[1] ** 2 + e0 * e0 + r2 * e0), 2 * (1e8 * x[0] * x[1] + 1e4 * r1 + e0 * e1)],
      [2 * (1e8 * x[0] * x[1] + 1e4 * r1 + e0 * e1), 2 * (1e8 * x[0] ** 2 + e1 * e1 + r2 * e1)],
    ];
  },
});

// Derived by hand: (1 − 10⁶)² + (1 − 2·10⁻⁶)² + 1 ≈ 0.999998·10¹².
export const brownBadlyScaled: TestProblem = sumOfSquares('Brown badly scaled (MGH 4)', [1, 1], 0.999998e12, (x) => ({
  r: [x[0] - 1e6, x[1] - 2e-6, x[0] * x[1] - 2],
  J: [[1, 0], [0, 1], [x[1], x[0]]],
}), {
  hessian: (x) => {
    const r3 = x[0] * x[1] - 2;
    return [[2 * (1 + x[1] ** 2), 2 * (x[0] * x[1] + r3)], [2 * (x[0] * x[1] + r3), 2 * (1 + x[0] ** 2)]];
  },
});

// Derived by hand: 1.5² + 2.25² + 2.625² (every residual keeps yᵢ since x₂ = 1).
const bealeTargets = [1.5, 2.25, 2.625];
export const beale: TestProblem = sumOfSquares('Beale (MGH 5)', [1, 1], 14.203125, (x) => ({
  r: bealeTargets.map((y, k) => y - x[0] * (1 - x[1] ** (k + 1))),
  J: bealeTargets.map((_, k) => [-(1 - x[1] ** (k + 1)), x[0] * (k + 1) * x[1] ** k]),
}));

// Derived by hand (agrees with the 4171.3 remembered from the paper's companion tables).
export const jennrichSampson: TestProblem = sumOfSquares('Jennrich and Sampson (MGH 6, m = 10)', [0.3, 0.4], 4171.306, (x) => ({
  r: rows(10, (i) => 2 + 2 * i - (Math.exp(i * x[0]) + Math.exp(i * x[1]))),
  J: rows(10, (i) => [-i * Math.exp(i * x[0]), -i * Math.exp(i * x[1])]),
}));

function helicalTheta(x: ArrayLike<number>): number {
  return Math.atan(x[1] / x[0]) / (2 * Math.PI) + (x[0] < 0 ? 0.5 : 0);
}
export const helicalValley: TestProblem = sumOfSquares('helical valley (MGH 7)', [-1, 0, 0], 2500, (x) => {
  const r2 = x[0] ** 2 + x[1] ** 2;
  const r = Math.sqrt(r2);
  const dTheta = [-x[1] / (2 * Math.PI * r2), x[0] / (2 * Math.PI * r2)];
  return {
    r: [10 * (x[2] - 10 * helicalTheta(x)), 10 * (r - 1), x[2]],
    J: [[-100 * dTheta[0], -100 * dTheta[1], 10], [(10 * x[0]) / r, (10 * x[1]) / r, 0], [0, 0, 1]],
  };
});

const bardY = [0.14, 0.18, 0.22, 0.25, 0.29, 0.32, 0.35, 0.39, 0.37, 0.58, 0.73, 0.96, 1.34, 2.1, 4.39];
export const bard: TestProblem = sumOfSquares('Bard (MGH 8)', [1, 1, 1], 41.6817, (x) => {
  const terms = rows(15, (i) => ({ u: i, v: 16 - i, w: Math.min(i, 16 - i), y: bardY[i - 1] }));
  return {
    r: terms.map(({ u, v, w, y }) => y - (x[0] + u / (v * x[1] + w * x[2]))),
    J: terms.map(({ u, v, w }) => {
      const d = v * x[1] + w * x[2];
      return [-1, (u * v) / d ** 2, (u * w) / d ** 2];
    }),
  };
});

const gaussianY = [0.0009, 0.0044, 0.0175, 0.054, 0.1295, 0.242, 0.3521, 0.3989, 0.3521, 0.242, 0.1295, 0.054, 0.0175, 0.0044, 0.0009];
export const gaussian: TestProblem = sumOfSquares('Gaussian (MGH 9)', [0.4, 1, 0], 3.88811e-6, (x) => {
  const ts = rows(15, (i) => (8 - i) / 2);
  return {
    r: ts.map((t, k) => x[0] * Math.exp((-x[1] * (t - x[2]) ** 2) / 2) - gaussianY[k]),
    J: ts.map((t) => {
      const e = Math.exp((-x[1] * (t - x[2]) ** 2) / 2);
      return [e, (-x[0] * e * (t - x[2]) ** 2) / 2, x[0] * e * x[1] * (t - x[2])];
    }),
  };
});

const meyerY = [34780, 28610, 23650, 19630, 16370, 13720, 11540, 9744, 8261, 7030, 6005, 5147, 4427, 3820, 3307, 2872];
export const meyer: TestProblem = sumOfSquares('Meyer (MGH 10)', [0.02, 4000, 250], 1.69361e9, (x) => {
  const ts = rows(16, (i) => 45 + 5 * i);
  return {
    r: ts.map((t, k) => x[0] * Math.exp(x[1] / (t + x[2])) - meyerY[k]),
    J: ts.map((t) => {
      const e = Math.exp(x[1] / (t + x[2]));
      return [e, (x[0] * e) / (t + x[2]), (-x[0] * e * x[1]) / (t + x[2]) ** 2];
    }),
  };
});

export const box3d: TestProblem = sumOfSquares('box three-dimensional (MGH 12, m = 10)', [0, 10, 20], 1031.15, (x) => {
  const ts = rows(10, (i) => 0.1 * i);
  return {
    r: ts.map((t) => Math.exp(-t * x[0]) - Math.exp(-t * x[1]) - x[2] * (Math.exp(-t) - Math.exp(-10 * t))),
    J: ts.map((t) => [-t * Math.exp(-t * x[0]), t * Math.exp(-t * x[1]), -(Math.exp(-t) - Math.exp(-10 * t))]),
  };
});

/** Residuals of one block of Powell's singular function (MGH 13; extended in MGH 22). */
export function powellBlock(a: number, b: number, c: number, d: number): { r: number[]; J: number[][] } {
  const [s5, s10] = [Math.sqrt(5), Math.sqrt(10)];
  return {
    r: [a + 10 * b, s5 * (c - d), (b - 2 * c) ** 2, s10 * (a - d) ** 2],
    J: [[1, 10, 0, 0], [0, 0, s5, -s5], [0, 2 * (b - 2 * c), -4 * (b - 2 * c), 0], [2 * s10 * (a - d), 0, 0, -2 * s10 * (a - d)]],
  };
}

/** Exact Hessian of one Powell block: quadratic part plus p = 12(b − 2c)², q = 120(a − d)². */
export function powellBlockHessian(a: number, b: number, c: number, d: number): number[][] {
  const p = 12 * (b - 2 * c) ** 2;
  const q = 120 * (a - d) ** 2;
  return [
    [2 + q, 20, 0, -q],
    [20, 200 + p, -2 * p, 0],
    [0, -2 * p, 10 + 4 * p, -10],
    [-q, 0, -10, 10 + q],
  ];
}

export const powellSingular: TestProblem = sumOfSquares('Powell singular (MGH 13)', [3, -1, 0, 1], 215, (x) => powellBlock(x[0], x[1], x[2], x[3]), {
  hessian: (x) => powellBlockHessian(x[0], x[1], x[2], x[3]),
});

// 10.1((x₂−1)² + (x₄−1)²) + 19.8(x₂−1)(x₄−1) = 10(x₂ + x₄ − 2)² + 0.1(x₂ − x₄)²: two residuals.
export const wood: TestProblem = sumOfSquares('Wood (MGH 14)', [-3, -1, -3, -1], 19192, (x) => ({
  r: [10 * (x[1] - x[0] ** 2), 1 - x[0], Math.sqrt(90) * (x[3] - x[2] ** 2), 1 - x[2], Math.sqrt(10) * (x[1] + x[3] - 2), (x[1] - x[3]) / Math.sqrt(10)],
  J: [
    [-20 * x[0], 10, 0, 0],
    [-1, 0, 0, 0],
    [0, 0, -2 * Math.sqrt(90) * x[2], Math.sqrt(90)],
    [0, 0, -1, 0],
    [0, Math.sqrt(10), 0, Math.sqrt(10)],
    [0, 1 / Math.sqrt(10), 0, -1 / Math.sqrt(10)],
  ],
}), {
  hessian: (x) => [
    [1200 * x[0] ** 2 - 400 * x[1] + 2, -400 * x[0], 0, 0],
    [-400 * x[0], 220.2, 0, 19.8],
    [0, 0, 1080 * x[2] ** 2 - 360 * x[3] + 2, -360 * x[2]],
    [0, 19.8, -360 * x[2], 200.2],
  ],
});

const kowalikY = [0.1957, 0.1947, 0.1735, 0.16, 0.0844, 0.0627, 0.0456, 0.0342, 0.0323, 0.0235, 0.0246];
const kowalikU = [4, 2, 1, 0.5, 0.25, 0.167, 0.125, 0.1, 0.0833, 0.0714, 0.0625];
export const kowalikOsborne: TestProblem = sumOfSquares('Kowalik and Osborne (MGH 15)', [0.25, 0.39, 0.415, 0.39], 5.31317e-3, (x) => ({
  r: kowalikU.map((u, k) => kowalikY[k] - (x[0] * (u * u + u * x[1])) / (u * u + u * x[2] + x[3])),
  J: kowalikU.map((u) => {
    const top = u * u + u * x[1];
    const bottom = u * u + u * x[2] + x[3];
    return [-top / bottom, (-x[0] * u) / bottom, (x[0] * top * u) / bottom ** 2, (x[0] * top) / bottom ** 2];
  }),
}));

export const brownDennis: TestProblem = sumOfSquares('Brown and Dennis (MGH 16, m = 20)', [25, 5, -5, -1], 7.92669e6, (x) => {
  const ts = rows(20, (i) => i / 5);
  const parts = ts.map((t) => ({ t, a: x[0] + t * x[1] - Math.exp(t), b: x[2] + x[3] * Math.sin(t) - Math.cos(t) }));
  return {
    r: parts.map(({ a, b }) => a * a + b * b),
    J: parts.map(({ t, a, b }) => [2 * a, 2 * a * t, 2 * b, 2 * b * Math.sin(t)]),
  };
});

export const biggsExp6: TestProblem = sumOfSquares('Biggs EXP6 (MGH 18, m = 13)', [1, 2, 1, 1, 1, 1], null, (x) => {
  const ts = rows(13, (i) => 0.1 * i);
  return {
    r: ts.map((t) => x[2] * Math.exp(-t * x[0]) - x[3] * Math.exp(-t * x[1]) + x[5] * Math.exp(-t * x[4]) - (Math.exp(-t) - 5 * Math.exp(-10 * t) + 3 * Math.exp(-4 * t))),
    J: ts.map((t) => [
      -t * x[2] * Math.exp(-t * x[0]),
      t * x[3] * Math.exp(-t * x[1]),
      Math.exp(-t * x[0]),
      -Math.exp(-t * x[1]),
      -t * x[5] * Math.exp(-t * x[4]),
      Math.exp(-t * x[4]),
    ]),
  };
});
