// The correct (function, point) cases of the accuracy benchmark: every Moré–Garbow–Hillstrom
// problem at its standard start and at seeded points around it, the extended problems and a
// quadratic of prescribed spectrum at n = 10…1000, logistic and softmax losses on iris, and
// objectives that stress the numerics (float32 arithmetic, |x| ≈ 1e6, f ≈ 1e-10).
import {
  extendedPowell, extendedRosenbrock, geometricSpectrum, irisLogistic, irisSoftmax, moreGarbowHillstromSet, quadraticWithSpectrum, rosenbrock, seededNormal, type TestProblem,
} from '../test/support/problems';

export interface CorrectCase {
  label: string;
  problem: TestProblem;
  point: number[];
  /** Hand the point to the functions as a Float64Array (large n), else as number[]. */
  float64: boolean;
}

/** The start and `extra` seeded points xᵢ + 0.1·max(1, |xᵢ|)·N(0, 1) around it. */
export function around(problem: TestProblem, extra: number, seed: number, float64 = false): CorrectCase[] {
  const normal = seededNormal(seed);
  const points = [problem.start, ...Array.from({ length: extra }, () => problem.start.map((v) => v + 0.1 * Math.max(1, Math.abs(v)) * normal()))];
  return points.map((point, k) => ({ label: `${problem.name} @ ${k === 0 ? 'x0' : `x0+δ${k}`}`, problem, point, float64 }));
}

const f32 = Math.fround;

/** Rosenbrock evaluated entirely in float32, gradient too: rounding noise near 6e-8 relative. */
const float32Rosenbrock: TestProblem = {
  name: 'Rosenbrock in float32 (Math.fround)',
  start: [-1.2, 1],
  startValue: null,
  f: (x) => { const a = f32(x[1] - f32(x[0] * x[0])); const b = f32(1 - x[0]); return f32(f32(100 * f32(a * a)) + f32(b * b)); },
  g: (x) => { const a = f32(x[1] - f32(x[0] * x[0])); return [f32(f32(-400 * f32(x[0] * a)) - f32(2 * f32(1 - x[0]))), f32(200 * a)]; },
};

/** Coordinates near 1e6: a shifted quadratic plus a slow sine, steps must scale with |xᵢ|. */
const largeCoordinates: TestProblem = {
  name: 'shifted quadratic at |x| ≈ 1e6',
  start: [1e6, -2e6, 3e6],
  startValue: null,
  f: (x) => 1e-3 * (x[0] - 1.5e6) ** 2 + Math.sin(x[1] / 1e6) + 2e-4 * (x[2] - 2.9e6) ** 2 + 1e-3 * (x[0] - 1.5e6) * (x[2] - 2.9e6) * 1e-2,
  g: (x) => [2e-3 * (x[0] - 1.5e6) + 1e-5 * (x[2] - 2.9e6), Math.cos(x[1] / 1e6) / 1e6, 4e-4 * (x[2] - 2.9e6) + 1e-5 * (x[0] - 1.5e6)],
};

/** f ≈ 1e-10: the absolute size of f must not matter. */
const tinyRosenbrock: TestProblem = {
  name: 'Rosenbrock × 1e-12 (f ≈ 1e-10)',
  start: rosenbrock.start,
  startValue: null,
  f: (x) => 1e-12 * rosenbrock.f(x),
  g: (x) => rosenbrock.g(x).map((v) => 1e-12 * v),
};

export function correctCases(): CorrectCase[] {
  const quadratics = [10, 100, 1000].map((n) => quadraticWithSpectrum(`quadratic, eigenvalues 1…1000 geometric (n = ${n})`, geometricSpectrum(n, 1, 1000), n));
  return [
    ...moreGarbowHillstromSet.flatMap((p, k) => around(p, 6, 100 + k)),
    ...[10, 100, 1000].flatMap((n) => around(extendedRosenbrock(n), 2, 200 + n, n > 64)),
    ...[12, 100, 1000].flatMap((n) => around(extendedPowell(n), 2, 300 + n, n > 64)),
    ...quadratics.flatMap((q, k) => around(q, 2, 400 + k, true)),
    ...around(irisLogistic(), 5, 500),
    ...around(irisSoftmax(), 5, 501),
    ...around(float32Rosenbrock, 5, 600),
    ...around(largeCoordinates, 5, 601),
    ...around(tinyRosenbrock, 5, 602),
  ];
}
