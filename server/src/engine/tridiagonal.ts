// Eigenvalues of a symmetric tridiagonal matrix by Sturm-sequence bisection
// (Golub & Van Loan, Matrix Computations, 4th ed., 2013, §8.4.1).

/** Number of eigenvalues below `shift` (the negative pivots of LDLᵀ of T − shift·I). */
function countBelow(diagonal: ArrayLike<number>, offDiagonal: ArrayLike<number>, shift: number): number {
  let count = 0;
  let pivot = 1;
  for (let i = 0; i < diagonal.length; i++) {
    const coupling = i > 0 ? offDiagonal[i - 1] : 0;
    pivot = diagonal[i] - shift - (i > 0 ? (coupling * coupling) / pivot : 0);
    // An exact zero pivot is nudged, the usual remedy in Sturm counts.
    if (pivot === 0) pivot = -Number.EPSILON * (Math.abs(shift) + Number.MIN_VALUE);
    if (pivot < 0) count++;
  }
  return count;
}

/** Gershgorin discs bound the spectrum: [low, high] holds every eigenvalue. */
function spectrumBounds(diagonal: ArrayLike<number>, offDiagonal: ArrayLike<number>): [number, number] {
  const n = diagonal.length;
  let low = Number.POSITIVE_INFINITY;
  let high = Number.NEGATIVE_INFINITY;
  for (let i = 0; i < n; i++) {
    const radius = (i > 0 ? Math.abs(offDiagonal[i - 1]) : 0) + (i < n - 1 ? Math.abs(offDiagonal[i]) : 0);
    low = Math.min(low, diagonal[i] - radius);
    high = Math.max(high, diagonal[i] + radius);
  }
  return [low, high];
}

/** The k-th smallest eigenvalue (k from 0), by bisection on the Sturm count. */
export function tridiagonalEigenvalue(diagonal: ArrayLike<number>, offDiagonal: ArrayLike<number>, k: number, bounds = spectrumBounds(diagonal, offDiagonal)): number {
  let [a, b] = bounds;
  const width = Math.max(Math.abs(a), Math.abs(b), Number.MIN_VALUE);
  for (let iteration = 0; iteration < 200 && b - a > 4 * Number.EPSILON * width; iteration++) {
    const middle = (a + b) / 2;
    if (countBelow(diagonal, offDiagonal, middle) > k) b = middle;
    else a = middle;
  }
  return (a + b) / 2;
}

/** All eigenvalues, ascending. `offDiagonal[i]` couples rows i and i+1. */
export function tridiagonalEigenvalues(diagonal: ArrayLike<number>, offDiagonal: ArrayLike<number>): number[] {
  const bounds = spectrumBounds(diagonal, offDiagonal);
  return Array.from({ length: diagonal.length }, (_, k) => tridiagonalEigenvalue(diagonal, offDiagonal, k, bounds));
}

/**
 * Unit eigenvector of a symmetric tridiagonal T for a computed eigenvalue θ, by
 * inverse iteration: two solves with T − θI, factored once by Gaussian elimination
 * with partial pivoting (Golub & Van Loan 2013, §4.3.5 banded LU with pivoting and
 * §8.2.2 inverse iteration). A zero pivot is replaced by a tiny one, as usual.
 */
export function tridiagonalEigenvector(diagonal: ArrayLike<number>, offDiagonal: ArrayLike<number>, theta: number): Float64Array {
  const n = diagonal.length;
  let size = 0;
  for (let i = 0; i < n; i++) size = Math.max(size, Math.abs(diagonal[i] - theta) + (i > 0 ? Math.abs(offDiagonal[i - 1]) : 0) + (i < n - 1 ? Math.abs(offDiagonal[i]) : 0));
  const tiny = Number.EPSILON * Math.max(size, Number.MIN_VALUE);
  // U keeps three bands (pivot, first and second superdiagonal); L is kept as multipliers.
  const pivot = Float64Array.from({ length: n }, (_, i) => diagonal[i] - theta);
  const upper = Float64Array.from({ length: Math.max(n - 1, 0) }, (_, i) => offDiagonal[i]);
  const upper2 = new Float64Array(Math.max(n - 2, 0));
  const multiplier = new Float64Array(Math.max(n - 1, 0));
  const swapped = new Uint8Array(Math.max(n - 1, 0));
  for (let i = 0; i + 1 < n; i++) {
    const below = offDiagonal[i];
    if (Math.abs(pivot[i]) >= Math.abs(below)) {
      if (pivot[i] === 0) pivot[i] = tiny;
      multiplier[i] = below / pivot[i];
      pivot[i + 1] -= multiplier[i] * upper[i];
    } else {
      // Row i+1 becomes the pivot row.
      swapped[i] = 1;
      multiplier[i] = pivot[i] / below;
      const next = pivot[i + 1];
      pivot[i] = below;
      pivot[i + 1] = upper[i] - multiplier[i] * next;
      if (i + 2 < n) {
        upper2[i] = upper[i + 1];
        upper[i + 1] = -multiplier[i] * upper[i + 1];
      }
      upper[i] = next;
    }
  }
  if (pivot[n - 1] === 0) pivot[n - 1] = tiny;
  let x = new Float64Array(n).fill(1);
  for (let iteration = 0; iteration < 2; iteration++) {
    const b = Float64Array.from(x);
    for (let i = 0; i + 1 < n; i++) {
      if (swapped[i]) [b[i], b[i + 1]] = [b[i + 1], b[i] - multiplier[i] * b[i + 1]];
      else b[i + 1] -= multiplier[i] * b[i];
    }
    for (let i = n - 1; i >= 0; i--) {
      const rest = (i + 1 < n ? upper[i] * b[i + 1] : 0) + (i + 2 < n ? upper2[i] * b[i + 2] : 0);
      b[i] = (b[i] - rest) / pivot[i];
    }
    let length = 0;
    for (let i = 0; i < n; i++) length += b[i] * b[i];
    length = Math.sqrt(length);
    x = b.map((value) => value / length);
  }
  return x;
}
