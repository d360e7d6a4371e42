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

/** All eigenvalues, ascending. `offDiagonal[i]` couples rows i and i+1. */
export function tridiagonalEigenvalues(diagonal: ArrayLike<number>, offDiagonal: ArrayLike<number>): number[] {
  const n = diagonal.length;
  if (n === 0) return [];
  // Gershgorin discs bound the spectrum.
  let low = Number.POSITIVE_INFINITY;
  let high = Number.NEGATIVE_INFINITY;
  for (let i = 0; i < n; i++) {
    const radius = (i > 0 ? Math.abs(offDiagonal[i - 1]) : 0) + (i < n - 1 ? Math.abs(offDiagonal[i]) : 0);
    low = Math.min(low, diagonal[i] - radius);
    high = Math.max(high, diagonal[i] + radius);
  }
  const width = Math.max(Math.abs(low), Math.abs(high), Number.MIN_VALUE);
  const values: number[] = [];
  for (let k = 0; k < n; k++) {
    let a = low;
    let b = high;
    for (let iteration = 0; iteration < 200 && b - a > 4 * Number.EPSILON * width; iteration++) {
      const middle = (a + b) / 2;
      if (countBelow(diagonal, offDiagonal, middle) > k) b = middle;
      else a = middle;
    }
    values.push((a + b) / 2);
  }
  return values;
}
