// Every kind of target and the check that runs it: the one place a new kind is registered.
import { checkPair, type PairFunctions, type PairPlan } from '../checkPair';
import { checkMatrixTarget } from '../matrixTarget';
import type { PairReport, TargetKind } from '../types';
import { hessianKind } from './hessian';
import { hessianVectorProductKind } from './hessianVectorProduct';
import { jacobianKind } from './jacobian';

export type TargetCheck = (fns: PairFunctions, probes: number[][], plan: PairPlan, clock?: () => number) => PairReport;

export const checkByKind: Readonly<Record<TargetKind, TargetCheck>> = {
  gradient: checkPair,
  jacobian: (fns, probes, plan, clock) => checkMatrixTarget(jacobianKind, fns, probes, plan, clock),
  hessian: (fns, probes, plan, clock) => checkMatrixTarget(hessianKind, fns, probes, plan, clock),
  hessianVectorProduct: (fns, probes, plan, clock) => checkMatrixTarget(hessianVectorProductKind, fns, probes, plan, clock),
};
