// Eigenvalues of a small dense symmetric matrix by the cyclic Jacobi method (Golub & Van Loan,
// Matrix Computations, 4th ed., 2013, §8.5.2): rotations zero one off-diagonal pair at a time
// until the off-diagonal part is negligible. Accurate to rounding, fine for n up to a few hundred.

// Sweeps allowed; the method converges quadratically, in well under 20 sweeps for these sizes.
const maxSweeps = 50;

/** Eigenvalues, ascending, of the symmetric n × n matrix given row-major (its upper triangle is read). */
export function symmetricEigenvalues(values: ArrayLike<number>, n: number): number[] {
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = i; j < n; j++) a[i * n + j] = a[j * n + i] = values[i * n + j];
  for (let sweep = 0; sweep < maxSweeps; sweep++) {
    let off = 0;
    let total = 0;
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
      const v = a[i * n + j] ** 2;
      total += v;
      if (i !== j) off += v;
    }
    if (off <= 1e-30 * total || off === 0) break;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p * n + q];
        if (apq === 0) continue;
        // The rotation that zeroes a[p][q] (Golub & Van Loan, Algorithm 8.5.1).
        const tau = (a[q * n + q] - a[p * n + p]) / (2 * apq);
        const t = (tau >= 0 ? 1 : -1) / (Math.abs(tau) + Math.sqrt(1 + tau * tau));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k * n + p];
          const akq = a[k * n + q];
          a[k * n + p] = c * akp - s * akq;
          a[k * n + q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p * n + k];
          const aqk = a[q * n + k];
          a[p * n + k] = c * apk - s * aqk;
          a[q * n + k] = s * apk + c * aqk;
        }
      }
    }
  }
  return Array.from({ length: n }, (_, i) => a[i * n + i]).sort((x, y) => x - y);
}
