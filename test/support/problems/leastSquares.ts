// Builds f = Σ rᵢ(x)² and ∇f = 2·Jᵀr from residuals and their Jacobian, the form in
// which Moré, Garbow & Hillstrom (ACM TOMS 7(1), 1981) state every problem.
import type { TestProblem } from './types';

export interface Residuals {
  r: number[];
  /** J[i][j] = ∂rᵢ/∂xⱼ. */
  J: number[][];
}

export type ResidualModel = (x: ArrayLike<number>) => Residuals;

export function sumOfSquares(name: string, start: number[], startValue: number | null, model: ResidualModel, extra: Partial<TestProblem> = {}): TestProblem {
  const gradientWithout = (x: ArrayLike<number>, skip: number): number[] => {
    const { r, J } = model(x);
    const g = new Array<number>(x.length).fill(0);
    for (let i = 0; i < r.length; i++) {
      if (i === skip) continue;
      for (let j = 0; j < x.length; j++) g[j] += 2 * r[i] * J[i][j];
    }
    return g;
  };
  return {
    name,
    start,
    startValue,
    f: (x) => model(x).r.reduce((sum, ri) => sum + ri * ri, 0),
    g: (x) => gradientWithout(x, -1),
    gradientWithoutTerm: gradientWithout,
    termCount: model(start).r.length,
    residuals: model,
    ...extra,
  };
}

/** `each(i)` for i = 1..count, the papers' 1-based numbering of residuals. */
export function rows<T>(count: number, each: (i: number) => T): T[] {
  return Array.from({ length: count }, (_, i) => each(i + 1));
}
