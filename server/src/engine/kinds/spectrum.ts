// A symmetric matrix's spectrum as the smoothness figures of a target: L̂ from its eigenvalues,
// and the learning-rate verdict on a declared rate. Used where the matrix itself is at hand
// (a Hessian that checked out, JᵀJ of a Jacobian that did).
import type { PairPlan } from '../checkPair';
import { smoothnessOf } from '../smoothness';
import { reviewLearningRate } from '../stepSize';
import { symmetricEigenvalues } from '../symmetricEigen';
import type { PairReport, ProbeReport } from '../types';

/**
 * Eigenvalues of the symmetric matrix; recorded on the probe and turned into L̂, μ̂ and step sizes
 * when they are asked for, as for a gradient: a declared rate, the hover or the report (a Newton
 * solve has no use for a gradient-descent step it did not ask about).
 */
export function smoothnessFromMatrix(values: ArrayLike<number>, n: number, probe: ProbeReport, report: PairReport, plan: PairPlan): number[] {
  const eigenvalues = symmetricEigenvalues(values, n);
  if (!(plan.learningRate || plan.options.smoothness || plan.options.plots)) return eigenvalues;
  probe.smoothness = { lambdaMax: eigenvalues[n - 1], lambdaMin: eigenvalues[0], ritzValues: eigenvalues, secantMax: 0, hessianVectorProducts: 0 };
  report.smoothness = smoothnessOf(probe.smoothness);
  if (report.smoothness && plan.learningRate) {
    // No descent runs: the verdict rests on the exact spectrum of the matrix at the probe.
    const review = reviewLearningRate(plan.learningRate, report.smoothness, []);
    report.learningRate = review.verdict;
    report.findings.push(...review.findings);
  }
  return eigenvalues;
}
