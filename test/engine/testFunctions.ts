// Objectives with hand-written gradients used by the engine tests. Functions and
// standard starting points from Moré, Garbow & Hillstrom, "Testing Unconstrained
// Optimization Software", ACM TOMS 7(1), 1981 (problem numbers as there), and
// Rosenbrock, Computer Journal 3, 1960.

export type Objective = (x: ArrayLike<number>) => number;
export type Gradient = (x: ArrayLike<number>) => number[];

export interface TestFunction {
  name: string;
  start: number[];
  /** f at the start: as published (Rosenbrock 1960; MGH 1981, §3, from memory) or derived by hand where marked. */
  startValue: number;
  f: Objective;
  g: Gradient;
}

export const rosenbrock: TestFunction = {
  name: 'Rosenbrock (MGH 1)',
  start: [-1.2, 1],
  startValue: 24.2,
  f: (x) => 100 * (x[1] - x[0] ** 2) ** 2 + (1 - x[0]) ** 2,
  g: (x) => [-400 * x[0] * (x[1] - x[0] ** 2) - 2 * (1 - x[0]), 200 * (x[1] - x[0] ** 2)],
};

export const powellBadlyScaled: TestFunction = {
  name: 'Powell badly scaled (MGH 3)',
  start: [0, 1],
  // Derived by hand from the definition: 1 + (e⁻¹ − 0.0001)² = 1.135262…
  startValue: 1.135262,
  f: (x) => (1e4 * x[0] * x[1] - 1) ** 2 + (Math.exp(-x[0]) + Math.exp(-x[1]) - 1.0001) ** 2,
  g: (x) => {
    const r1 = 1e4 * x[0] * x[1] - 1;
    const r2 = Math.exp(-x[0]) + Math.exp(-x[1]) - 1.0001;
    return [2 * r1 * 1e4 * x[1] - 2 * r2 * Math.exp(-x[0]), 2 * r1 * 1e4 * x[0] - 2 * r2 * Math.exp(-x[1])];
  },
};

export const brownBadlyScaled: TestFunction = {
  name: 'Brown badly scaled (MGH 4)',
  start: [1, 1],
  // Derived by hand: (1 − 10⁶)² + (1 − 2·10⁻⁶)² + 1 ≈ 0.999998·10¹².
  startValue: 0.999998e12,
  f: (x) => (x[0] - 1e6) ** 2 + (x[1] - 2e-6) ** 2 + (x[0] * x[1] - 2) ** 2,
  g: (x) => {
    const r3 = x[0] * x[1] - 2;
    return [2 * (x[0] - 1e6) + 2 * r3 * x[1], 2 * (x[1] - 2e-6) + 2 * r3 * x[0]];
  },
};

const bealeTargets = [1.5, 2.25, 2.625];
export const beale: TestFunction = {
  name: 'Beale (MGH 5)',
  start: [1, 1],
  // Derived by hand: 1.5² + 2.25² + 2.625² (every residual keeps y_i since x2 = 1).
  startValue: 14.203125,
  f: (x) => bealeTargets.reduce((sum, y, k) => sum + (y - x[0] * (1 - x[1] ** (k + 1))) ** 2, 0),
  g: (x) => {
    const g = [0, 0];
    bealeTargets.forEach((y, k) => {
      const i = k + 1;
      const r = y - x[0] * (1 - x[1] ** i);
      g[0] += 2 * r * -(1 - x[1] ** i);
      g[1] += 2 * r * x[0] * i * x[1] ** (i - 1);
    });
    return g;
  },
};

function helicalTheta(x: ArrayLike<number>): number {
  return Math.atan(x[1] / x[0]) / (2 * Math.PI) + (x[0] < 0 ? 0.5 : 0);
}
export const helicalValley: TestFunction = {
  name: 'helical valley (MGH 7)',
  start: [-1, 0, 0],
  startValue: 2500,
  f: (x) => (10 * (x[2] - 10 * helicalTheta(x))) ** 2 + (10 * (Math.hypot(x[0], x[1]) - 1)) ** 2 + x[2] ** 2,
  g: (x) => {
    const r2 = x[0] ** 2 + x[1] ** 2;
    const r = Math.sqrt(r2);
    const f1 = 10 * (x[2] - 10 * helicalTheta(x));
    const f2 = 10 * (r - 1);
    const dTheta = [-x[1] / (2 * Math.PI * r2), x[0] / (2 * Math.PI * r2)];
    return [2 * f1 * -100 * dTheta[0] + 2 * f2 * 10 * (x[0] / r), 2 * f1 * -100 * dTheta[1] + 2 * f2 * 10 * (x[1] / r), 2 * f1 * 10 + 2 * x[2]];
  },
};

export const wood: TestFunction = {
  name: 'Wood (MGH 14)',
  start: [-3, -1, -3, -1],
  startValue: 19192,
  f: (x) =>
    100 * (x[1] - x[0] ** 2) ** 2 + (1 - x[0]) ** 2 + 90 * (x[3] - x[2] ** 2) ** 2 + (1 - x[2]) ** 2 + 10.1 * ((x[1] - 1) ** 2 + (x[3] - 1) ** 2) + 19.8 * (x[1] - 1) * (x[3] - 1),
  g: (x) => [
    -400 * x[0] * (x[1] - x[0] ** 2) - 2 * (1 - x[0]),
    200 * (x[1] - x[0] ** 2) + 20.2 * (x[1] - 1) + 19.8 * (x[3] - 1),
    -360 * x[2] * (x[3] - x[2] ** 2) - 2 * (1 - x[2]),
    180 * (x[3] - x[2] ** 2) + 20.2 * (x[3] - 1) + 19.8 * (x[1] - 1),
  ],
};

export const extendedPowell: TestFunction = {
  name: 'extended Powell singular (MGH 13, n = 4)',
  start: [3, -1, 0, 1],
  startValue: 215,
  f: (x) => (x[0] + 10 * x[1]) ** 2 + 5 * (x[2] - x[3]) ** 2 + (x[1] - 2 * x[2]) ** 4 + 10 * (x[0] - x[3]) ** 4,
  g: (x) => [
    2 * (x[0] + 10 * x[1]) + 40 * (x[0] - x[3]) ** 3,
    20 * (x[0] + 10 * x[1]) + 4 * (x[1] - 2 * x[2]) ** 3,
    10 * (x[2] - x[3]) - 8 * (x[1] - 2 * x[2]) ** 3,
    -10 * (x[2] - x[3]) - 40 * (x[0] - x[3]) ** 3,
  ],
};

export const moreGarbowHillstrom = [rosenbrock, powellBadlyScaled, brownBadlyScaled, beale, helicalValley, wood, extendedPowell];

/** Plain-array vectors, as for `number[]` parameters. */
export const makeArray = (values: ArrayLike<number>): number[] => Array.from(values);
/** Float64Array vectors, as for `Float64Array` parameters. */
export const makeFloat64 = (values: ArrayLike<number>): Float64Array => new Float64Array(values as ArrayLike<number>);
