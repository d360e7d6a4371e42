// Consistency between a gradient pair and the residuals its objective is built from: f is ½‖r‖²
// or ‖r‖², so ∇f must be Jᵀr or 2Jᵀr (J the Jacobian of r). A gradient that is the other one is
// off by a factor of 2, the usual slip of a hand-written least-squares gradient; the finding says
// which form f has and which one the gradient returns.
import type { PairFunctions } from './checkPair';
import { kindWording } from './kindWording';
import { readMatrix, transposeTimes } from './matrixRead';
import type { ProbeContext } from './probeContext';
import type { LeastSquaresForm, PairReport } from './types';
import { halfSquaredNorm } from './vectors';
import { CheckStopped, BudgetSpent, createUserCalls, makeFinding, type CallBudget, type CallSite } from './userCalls';

// f and ½‖r‖² computed two ways agree to rounding; a gap beyond this share is a different function (common practice).
const valueShare = 1e-9;
// ∇f and Jᵀr summed in different orders agree to rounding of their terms (common practice).
const gradientShare = 1e-7;

/**
 * Reads r and J at the first probe and records which form f and ∇f have; adds a finding when f
 * has a form and ∇f has not the matching one. Problems of the residual functions themselves are
 * left to their own target's check.
 */
export function compareWithResiduals(residuals: PairFunctions, at: ProbeContext, budget: CallBudget, report: PairReport): void {
  const n = at.x.length;
  const calls = createUserCalls(residuals, n, budget, { objective: 'residual function', gradient: 'Jacobian' });
  const site: CallSite = { probeIndex: at.probeIndex, point: 'the probe' };
  let r: Float64Array;
  let jacobian;
  try {
    r = calls.outputs(at.x, site);
    jacobian = readMatrix(calls.derivativeResult(at.x, site), r.length, n, kindWording.jacobian, site);
  } catch (err) {
    if (err instanceof CheckStopped || err instanceof BudgetSpent) return;
    throw err;
  }
  const squares = 2 * halfSquaredNorm(r);
  const jtr = transposeTimes(jacobian, r);
  // The size of the terms each component of Jᵀr sums, for the rounding allowed between the two.
  const terms = transposeTimes({ ...jacobian, values: jacobian.values.map(Math.abs) }, r.map(Math.abs));
  const valueIs = (target: number) => Math.abs(at.value - target) <= valueShare * Math.max(Math.abs(at.value), Math.abs(target)) + Number.MIN_VALUE;
  const gradientIs = (factor: number) => at.gradient.every((g, j) => Math.abs(g - factor * jtr[j]) <= gradientShare * factor * terms[j] + 16 * at.gradientUnit * Math.abs(g));
  const form: LeastSquaresForm = {
    probeIndex: at.probeIndex,
    objective: valueIs(squares / 2) ? 'half' : valueIs(squares) ? 'full' : null,
    gradient: gradientIs(1) ? 'half' : gradientIs(2) ? 'full' : null,
  };
  report.leastSquaresForm = form;
  if (form.objective === null || form.gradient === form.objective) return;
  const expected = form.objective === 'half' ? 'Jᵀr' : '2Jᵀr';
  const head = `the objective is ${form.objective === 'half' ? '½‖r‖²' : '‖r‖²'} of the residual function at probe ${at.probeIndex + 1}, so its gradient is ${expected}`;
  // A gradient that agreed with its differences is right: then Jᵀr is what is wrong, and the Jacobian's own check says where.
  if (report.status === 'pass') {
    const finding = makeFinding('least-squares-inconsistent', 'gradient', `${head}; the gradient agrees with its differences but not with ${expected}, so the Jacobian is wrong (its own finding says where)`, site);
    finding.severity = 'info';
    report.findings.push(finding);
    return;
  }
  const seen = form.gradient === null ? 'neither Jᵀr nor 2Jᵀr' : form.gradient === 'half' ? 'Jᵀr, half the gradient of ‖r‖²' : '2Jᵀr, twice the gradient of ½‖r‖²';
  const finding = makeFinding('least-squares-inconsistent', 'gradient', `${head}; the gradient returns ${seen}`, site);
  // Only a gradient found wrong is blamed; one left undecided may be right, with the Jacobian wrong.
  if (report.status !== 'fail') finding.severity = 'info';
  report.findings.push(finding);
}
