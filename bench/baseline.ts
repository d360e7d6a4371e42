// The textbook gradient check, for comparison: forward differences with
// hᵢ = √ε·max(1, |xᵢ|) (Nocedal & Wright, Numerical Optimization, 2nd ed., 2006, §8.1,
// eq. 8.6 and the step rule after it) and a fixed relative tolerance of 1e-4 on
// ‖analytic − numerical‖ / max(‖analytic‖, ‖numerical‖) (common practice).

export type Verdict = 'pass' | 'fail' | 'inconclusive';

export interface BaselineResult {
  verdict: Verdict;
  relError: number;
  evaluations: number;
}

const machineEpsilon = 2 ** -52;
const tolerance = 1e-4;

export function forwardDifferenceCheck(f: (x: number[]) => number, g: (x: number[]) => ArrayLike<number>, point: number[]): BaselineResult {
  const n = point.length;
  const f0 = f(point);
  const analytic = g(point);
  const x = point.slice();
  let differenceSq = 0;
  let analyticSq = 0;
  let numericalSq = 0;
  for (let i = 0; i < n; i++) {
    const h = Math.sqrt(machineEpsilon) * Math.max(1, Math.abs(point[i]));
    x[i] = point[i] + h;
    // (x + h) − x, so the step actually taken is exact in floating point.
    const numerical = (f(x) - f0) / (x[i] - point[i]);
    x[i] = point[i];
    differenceSq += (analytic[i] - numerical) ** 2;
    analyticSq += analytic[i] ** 2;
    numericalSq += numerical ** 2;
  }
  const relError = Math.sqrt(differenceSq) / Math.max(Math.sqrt(analyticSq), Math.sqrt(numericalSq), Number.MIN_VALUE);
  const evaluations = n + 2;
  if (!Number.isFinite(relError)) return { verdict: 'inconclusive', relError, evaluations };
  return { verdict: relError > tolerance ? 'fail' : 'pass', relError, evaluations };
}
