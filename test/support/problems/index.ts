// The one set of test problems shared by the engine tests and the benchmarks.
import { bard, beale, biggsExp6, box3d, brownBadlyScaled, brownDennis, freudensteinRoth, gaussian, helicalValley, jennrichSampson, kowalikOsborne, meyer, powellBadlyScaled, powellSingular, rosenbrock, wood } from './mgh';
import { chebyquad, extendedPowell, extendedRosenbrock, penaltyI, penaltyII, trigonometric, variablyDimensioned, watson } from './mghScalable';
import type { TestProblem } from './types';

export * from './mgh';
export * from './mghScalable';
export * from './quadratic';
export * from './logistic';
export * from './softmax';
export * from './types';

/** Moré, Garbow & Hillstrom 1981 problems at the dimensions the paper suggests (MGH 22 needs n divisible by 4). */
export const moreGarbowHillstromSet: TestProblem[] = [
  rosenbrock, freudensteinRoth, powellBadlyScaled, brownBadlyScaled, beale, jennrichSampson, helicalValley, bard, gaussian, meyer,
  box3d, powellSingular, wood, kowalikOsborne, brownDennis, biggsExp6, watson(6), extendedRosenbrock(10), extendedPowell(12),
  penaltyI(10), penaltyII(10), variablyDimensioned(10), trigonometric(10), chebyquad(8),
];

/** The seven small problems the engine's own tests run every mutation on. */
export const engineCoreSet: TestProblem[] = [rosenbrock, powellBadlyScaled, brownBadlyScaled, beale, helicalValley, wood, powellSingular];
