// Shape of one test problem: an objective with a hand-written gradient, a standard
// starting point and, where written out, the exact Hessian. Shared by tests and bench.

export type Objective = (x: ArrayLike<number>) => number;
export type Gradient = (x: ArrayLike<number>) => number[];
export type Hessian = (x: ArrayLike<number>) => number[][];

export interface TestProblem {
  name: string;
  start: number[];
  /** f at the start where known: as published, or derived by hand where the problem's file says so; else null. */
  startValue: number | null;
  f: Objective;
  g: Gradient;
  /** Exact Hessian, for the problems where it is written out. */
  hessian?: Hessian;
  /** For sums of squares: the gradient with residual `term` left out (a "dropped term" bug). */
  gradientWithoutTerm?: (x: ArrayLike<number>, term: number) => number[];
  /** Number of residuals, when `gradientWithoutTerm` exists. */
  termCount?: number;
  /** For sums of squares: the residuals r(x) and their Jacobian J(x), as the problem's source states them. */
  residuals?: (x: ArrayLike<number>) => { r: number[]; J: number[][] };
}

/** Plain-array vectors, as for `number[]` parameters. */
export const makeArray = (values: ArrayLike<number>): number[] => Array.from(values);
/** Float64Array vectors, as for `Float64Array` parameters. */
export const makeFloat64 = (values: ArrayLike<number>): Float64Array => new Float64Array(values as ArrayLike<number>);
