// f(x) = ½·xᵀAx with A = Q·diag(λ)·Qᵀ, Q a product of two seeded Householder reflections:
// the eigenvalues are λ by construction, and A·v costs O(n), so n can reach 10⁵.
import type { TestProblem } from './types';

/** Deterministic uniform numbers in [0, 1) (a 32-bit linear congruential generator, Numerical Recipes constants). */
export function seededUniform(seed: number): () => number {
  let state = seed >>> 0;
  return () => (state = (Math.imul(state, 1664525) + 1013904223) >>> 0) / 2 ** 32;
}

/** Standard normal numbers by the Box–Muller transform over `seededUniform`. */
export function seededNormal(seed: number): () => number {
  const uniform = seededUniform(seed);
  return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

export interface QuadraticProblem extends TestProblem {
  eigenvalues: number[];
  /** A·v. */
  multiply(v: ArrayLike<number>): Float64Array;
}

export function quadraticWithSpectrum(name: string, eigenvalues: number[], seed: number): QuadraticProblem {
  const n = eigenvalues.length;
  const normal = seededNormal(seed);
  const reflectors = [0, 1].map(() => {
    const u = Float64Array.from({ length: n }, normal);
    const length = Math.sqrt(u.reduce((s, v) => s + v * v, 0));
    return u.map((v) => v / length);
  });
  // (I − 2uuᵀ)·v
  const reflect = (u: Float64Array, v: ArrayLike<number>) => {
    let dot = 0;
    for (let i = 0; i < n; i++) dot += u[i] * v[i];
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) out[i] = v[i] - 2 * dot * u[i];
    return out;
  };
  const multiply = (v: ArrayLike<number>) => {
    const w = reflect(reflectors[0], reflect(reflectors[1], v));
    for (let i = 0; i < n; i++) w[i] *= eigenvalues[i];
    return reflect(reflectors[1], reflect(reflectors[0], w));
  };
  const start = Array.from({ length: n }, normal);
  const f = (x: ArrayLike<number>) => {
    const ax = multiply(x);
    let sum = 0;
    for (let i = 0; i < n; i++) sum += x[i] * ax[i];
    return 0.5 * sum;
  };
  return {
    name,
    start,
    startValue: null,
    f,
    g: (x) => Array.from(multiply(x)),
    eigenvalues,
    multiply,
    hessian: () => {
      // Column j of A is A·eⱼ; symmetrised against roundoff.
      const columns = Array.from({ length: n }, (_, j) => multiply(Float64Array.from({ length: n }, (_, i) => (i === j ? 1 : 0))));
      return Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => 0.5 * (columns[j][i] + columns[i][j])));
    },
  };
}

/** n eigenvalues spaced geometrically from `smallest` to `largest`. */
export function geometricSpectrum(n: number, smallest: number, largest: number): number[] {
  return Array.from({ length: n }, (_, i) => smallest * (largest / smallest) ** (n === 1 ? 0 : i / (n - 1)));
}
