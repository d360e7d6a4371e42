// Extreme eigenvalues of a symmetric operator known only through products H·v:
// Lanczos with full reorthogonalisation (Golub & Van Loan, Matrix Computations,
// 4th ed., 2013, §10.1 and §10.3.1).
import { tridiagonalEigenvalue, tridiagonalEigenvalues, tridiagonalEigenvector } from './tridiagonal';
import { dot, norm2 } from './vectors';

export interface LanczosResult {
  lambdaMax: number;
  lambdaMin: number;
  /** Ritz values of the final tridiagonal matrix, ascending. */
  ritzValues: number[];
  /**
   * Residual norms ‖Hy − θy‖ of the extreme Ritz pairs: some eigenvalue of H lies
   * within each of its Ritz value (not necessarily the extreme one, which an
   * unlucky start can miss). Zero when the Krylov space became invariant.
   */
  lambdaMaxResidual: number;
  lambdaMinResidual: number;
  /** Unit Ritz vector of whichever of λmax and λmin is larger in magnitude. */
  dominantVector: Float64Array;
  /** Operator products spent. */
  products: number;
}

// Extreme Ritz pairs whose residual is below this fraction of the spectrum's scale are
// converged: each then lies that close to an eigenvalue (Parlett 1998, §4.5, from memory).
const convergedResidual = 1e-8;

/**
 * `multiply` may return null when the product cannot be formed (non-finite
 * gradient); the iteration then stops with what it has. Returns null when not
 * even one product succeeded.
 */
export function lanczosExtremes(multiply: (v: Float64Array) => Float64Array | null, start: Float64Array, maxSteps: number): LanczosResult | null {
  const basis: Float64Array[] = [];
  const diagonal: number[] = [];
  const offDiagonal: number[] = [];
  // Only the extreme Ritz values are needed while iterating; all of them once at the end.
  let lowest = Number.NaN;
  let highest = Number.NaN;
  let residuals = { lambdaMax: Number.POSITIVE_INFINITY, lambdaMin: Number.POSITIVE_INFINITY };
  let products = 0;
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
    lowest = tridiagonalEigenvalue(diagonal, offDiagonal, 0);
    highest = tridiagonalEigenvalue(diagonal, offDiagonal, diagonal.length - 1);
    const scale = Math.max(Math.abs(lowest), Math.abs(highest), Number.MIN_VALUE);
    const beta = norm2(w);
    if (!Number.isFinite(beta)) break;
    residuals = { lambdaMax: ritzResidual(diagonal, offDiagonal, highest, beta), lambdaMin: ritzResidual(diagonal, offDiagonal, lowest, beta) };
    // Both ends converged, or an invariant subspace (the Ritz values are then exact eigenvalues).
    if (Math.max(residuals.lambdaMax, residuals.lambdaMin) <= convergedResidual * scale || beta <= 1e-12 * scale) break;
    offDiagonal.push(beta);
    q = w.map((value) => value / beta);
  }
  if (diagonal.length === 0) return null;
  // T_k couples its k rows through the first k − 1 off-diagonal entries.
  const coupling = offDiagonal.slice(0, diagonal.length - 1);
  const ritzValues = tridiagonalEigenvalues(diagonal, coupling);
  const dominant = Math.abs(highest) >= Math.abs(lowest) ? highest : lowest;
  const dominantVector = ritzVector(basis, tridiagonalEigenvector(diagonal, coupling, dominant));
  return { lambdaMax: highest, lambdaMin: lowest, ritzValues, lambdaMaxResidual: residuals.lambdaMax, lambdaMinResidual: residuals.lambdaMin, dominantVector, products };
}

/** y = Q_k·s, normalised. */
function ritzVector(basis: Float64Array[], s: ArrayLike<number>): Float64Array {
  const y = new Float64Array(basis[0].length);
  for (let j = 0; j < basis.length; j++) for (let i = 0; i < y.length; i++) y[i] += s[j] * basis[j][i];
  const length = norm2(y) || 1;
  return y.map((value) => value / length);
}

/**
 * ‖Hy − θy‖ = β_k·|s_k| for the Ritz vector y = Q_k·s of T_k s = θs, where s_k is
 * the last component of s (Parlett, The Symmetric Eigenvalue Problem, 1998, §13.2;
 * Golub & Van Loan 2013, §10.1.4, section from memory). Costs no product with H.
 */
function ritzResidual(diagonal: number[], offDiagonal: number[], theta: number, beta: number): number {
  const s = tridiagonalEigenvector(diagonal, offDiagonal, theta);
  return beta * Math.abs(s[s.length - 1]);
}
