// Extreme eigenvalues of a symmetric operator known only through products H·v:
// Lanczos with full reorthogonalisation (Golub & Van Loan, Matrix Computations,
// 4th ed., 2013, §10.1 and §10.3.1).
import { tridiagonalEigenvalues } from './tridiagonal';
import { dot, norm2 } from './vectors';

export interface LanczosResult {
  lambdaMax: number;
  lambdaMin: number;
  /** Ritz values of the final tridiagonal matrix, ascending. */
  ritzValues: number[];
  /** Operator products spent. */
  products: number;
}

// Extreme Ritz values that move less than this (relative) for two steps are taken as converged.
const convergedChange = 1e-10;

/**
 * `multiply` may return null when the product cannot be formed (non-finite
 * gradient); the iteration then stops with what it has. Returns null when not
 * even one product succeeded.
 */
export function lanczosExtremes(multiply: (v: Float64Array) => Float64Array | null, start: Float64Array, maxSteps: number): LanczosResult | null {
  const basis: Float64Array[] = [];
  const diagonal: number[] = [];
  const offDiagonal: number[] = [];
  let ritzValues: number[] = [];
  let products = 0;
  let quietSteps = 0;
  const startNorm = norm2(start);
  if (!(startNorm > 0)) return null;
  let q = start.map((value) => value / startNorm);
  for (let step = 0; step < maxSteps; step++) {
    basis.push(q);
    const w = multiply(q);
    products++;
    if (w === null) {
      basis.pop();
      break;
    }
    diagonal.push(dot(q, w));
    // Full reorthogonalisation by Gram–Schmidt, repeated when it removed most of w
    // (Kahan's "twice is enough" test, as in Parlett, The Symmetric Eigenvalue Problem, 1998, §6.9).
    for (let pass = 0; pass < 2; pass++) {
      const before = norm2(w);
      const n = w.length;
      for (const b of basis) {
        let projection = 0;
        for (let i = 0; i < n; i++) projection += b[i] * w[i];
        for (let i = 0; i < n; i++) w[i] -= projection * b[i];
      }
      if (norm2(w) > 0.7 * before) break;
    }
    const previous = ritzValues;
    ritzValues = tridiagonalEigenvalues(diagonal, offDiagonal);
    const scale = Math.max(Math.abs(ritzValues[0]), Math.abs(ritzValues[ritzValues.length - 1]), Number.MIN_VALUE);
    const beta = norm2(w);
    // An invariant subspace: the Ritz values are exact eigenvalues.
    if (beta <= 1e-12 * scale || !Number.isFinite(beta)) break;
    if (previous.length > 0) {
      const moved = Math.max(Math.abs(ritzValues[0] - previous[0]), Math.abs(ritzValues[ritzValues.length - 1] - previous[previous.length - 1]));
      quietSteps = moved <= convergedChange * scale ? quietSteps + 1 : 0;
      if (quietSteps >= 2) break;
    }
    offDiagonal.push(beta);
    q = w.map((value) => value / beta);
  }
  if (diagonal.length === 0) return null;
  return { lambdaMax: ritzValues[ritzValues.length - 1], lambdaMin: ritzValues[0], ritzValues, products };
}
