// The textbook derivative checks, for comparison: forward differences with
// hᵢ = √ε·max(1, |xᵢ|) (Nocedal & Wright, Numerical Optimization, 2nd ed., 2006, §8.1,
// eq. 8.6 and the step rule after it) and a fixed relative tolerance of 1e-4 (common practice):
// for a gradient on ‖analytic − numerical‖ / max(‖analytic‖, ‖numerical‖); for a Jacobian entry
// by entry, |J − J_num| > 1e-4·max(|J|, |J_num|, 1) (the rule as the product's Jacobian issue states it).

export type Verdict = 'pass' | 'fail' | 'inconclusive';

export interface BaselineResult {
  verdict: Verdict;
  relError: number;
  evaluations: number;
}

const machineEpsilon = 2 ** -52;
export const baselineTolerance = 1e-4;

/** Column j = (F(x + hⱼeⱼ) − F(x)) / hⱼ for every coordinate j of the point: n + 1 calls of F. */
export function forwardDifferenceColumns(F: (x: number[]) => ArrayLike<number>, point: number[]): number[][] {
  const F0 = F(point);
  const x = point.slice();
  return point.map((xj, j) => {
    const h = Math.sqrt(machineEpsilon) * Math.max(1, Math.abs(xj));
    x[j] = xj + h;
    // (x + h) − x, so the step actually taken is exact in floating point.
    const step = x[j] - xj;
    const Fh = F(x);
    x[j] = xj;
    return Array.from(Fh, (v, i) => (v - F0[i]) / step);
  });
}

export function forwardDifferenceCheck(f: (x: number[]) => number, g: (x: number[]) => ArrayLike<number>, point: number[]): BaselineResult {
  const n = point.length;
  const numerical = forwardDifferenceColumns((x) => [f(x)], point).map((column) => column[0]);
  const analytic = g(point);
  let differenceSq = 0;
  let analyticSq = 0;
  let numericalSq = 0;
  for (let i = 0; i < n; i++) {
    differenceSq += (analytic[i] - numerical[i]) ** 2;
    analyticSq += analytic[i] ** 2;
    numericalSq += numerical[i] ** 2;
  }
  const relError = Math.sqrt(differenceSq) / Math.max(Math.sqrt(analyticSq), Math.sqrt(numericalSq), Number.MIN_VALUE);
  const evaluations = n + 2;
  if (!Number.isFinite(relError)) return { verdict: 'inconclusive', relError, evaluations };
  return { verdict: relError > baselineTolerance ? 'fail' : 'pass', relError, evaluations };
}

export interface JacobianBaselineResult {
  verdict: Verdict;
  /** The matrix is not m × n: reported as a shape error (verdict 'fail'), no entry compared. */
  shapeWrong: boolean;
  /** Entries flagged. */
  flagged: number;
  /** n + 1 calls of r and one of J. */
  evaluations: number;
}

/** The textbook Jacobian check of residuals r: Rⁿ → Rᵐ and J (m × n) at the point, entry by entry. */
export function forwardDifferenceJacobianCheck(r: (x: number[]) => ArrayLike<number>, J: (x: number[]) => number[][], point: number[]): JacobianBaselineResult {
  const n = point.length;
  const columns = forwardDifferenceColumns(r, point);
  const analytic = J(point);
  const evaluations = n + 2;
  const m = columns[0].length;
  if (analytic.length !== m || analytic.some((row) => row.length !== n)) return { verdict: 'fail', shapeWrong: true, flagged: 0, evaluations };
  let flagged = 0;
  let finite = true;
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < n; j++) {
      const [a, d] = [analytic[i][j], columns[j][i]];
      if (!Number.isFinite(a) || !Number.isFinite(d)) finite = false;
      else if (Math.abs(a - d) > baselineTolerance * Math.max(Math.abs(a), Math.abs(d), 1)) flagged++;
    }
  }
  return { verdict: flagged > 0 ? 'fail' : finite ? 'pass' : 'inconclusive', shapeWrong: false, flagged, evaluations };
}
