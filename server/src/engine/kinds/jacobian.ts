// Kind `jacobian`: residuals r: Rⁿ → Rᵐ and their Jacobian J (m × n, J[i][j] = ∂rᵢ/∂xⱼ). Once J
// checks out, the Gauss–Newton model of ½‖r‖² at the probe: its Hessian JᵀJ, whose largest
// eigenvalue σmax(J)² is the model's Lipschitz constant, and the condition number of JᵀJ
// (Nocedal & Wright 2006, §10.3). A learning rate for gradient descent on ½‖r‖² is judged as a
// gradient pair's is, on f = ½‖r‖² with gradient Jᵀr: the model leaves out Σ rᵢ∇²rᵢ, which far
// from a fit can move the curvature either way.
import { estimateSmoothness, type PairFunctions } from '../checkPair';
import { readMatrix, times, type DenseMatrix } from '../matrixRead';
import type { MatrixKind } from '../matrixTarget';
import type { MatrixProbeContext } from '../matrixProbe';
import type { ProbeContext } from '../probeContext';
import { defaultCheckOptions } from '../types';
import { symmetricEigenvalues } from '../symmetricEigen';
import { createUserCalls, type CallSite, type UserCalls } from '../userCalls';

// JᵀJ counts as singular when σmin² is below this share of σmax² (rounding of a product of J with itself; common practice).
const singularShare = 1e-14;

export const jacobianKind: MatrixKind = {
  kind: 'jacobian',
  analyticAt(calls, x, outputs, site) {
    const dense = readMatrix(calls.derivativeResult(x, site), outputs, x.length, 'Jacobian', site);
    return { dense, times: (v) => times(dense, v) };
  },
  afterCheck(outcomes, report, plan) {
    if (report.status === 'fail' || report.status === 'error') return;
    const held = outcomes.find((o) => o.complete && o.context.analytic.dense);
    const jacobian = held?.context.analytic.dense;
    if (!held || !jacobian) return;
    const eigenvalues = symmetricEigenvalues(normalMatrix(jacobian), jacobian.columns);
    const [smallest, largest] = [Math.max(0, eigenvalues[0]), eigenvalues[eigenvalues.length - 1]];
    report.matrix!.leastSquares = {
      probeIndex: held.context.probeIndex,
      sigmaMaxSquared: largest,
      sigmaMinSquared: smallest,
      conditionNumber: smallest > singularShare * largest ? largest / smallest : null,
    };
    const { calls, context } = halfSquares(held.context);
    estimateSmoothness(calls, context, held.report, plan, { ...defaultCheckOptions, ...plan.options }, report);
  },
};

/** JᵀJ, row-major n × n (the upper triangle, which the eigenvalue routine reads). */
function normalMatrix(jacobian: DenseMatrix): Float64Array {
  const n = jacobian.columns;
  const normal = new Float64Array(n * n);
  for (let i = 0; i < jacobian.rows; i++) {
    for (let j = 0; j < n; j++) {
      const a = jacobian.values[i * n + j];
      if (a === 0) continue;
      for (let k = j; k < n; k++) normal[j * n + k] += a * jacobian.values[i * n + k];
    }
  }
  return normal;
}

/**
 * f = ½‖r‖² with gradient Jᵀr, as a pair over the user's residual and Jacobian functions (their
 * calls counted and budgeted by `context.calls`), and its probe context at the checked probe.
 */
function halfSquares(context: MatrixProbeContext): { calls: UserCalls; context: ProbeContext } {
  const inner = context.calls;
  const site: CallSite = { probeIndex: context.probeIndex, point: 'a curvature point' };
  const value = (r: Float64Array) => 0.5 * r.reduce((sum, v) => sum + v * v, 0);
  const gradient = (x: Float64Array): Float64Array => {
    const r = inner.outputs(x, site);
    const jacobian = readMatrix(inner.derivativeResult(x, site), r.length, x.length, 'Jacobian', site);
    const g = new Float64Array(x.length);
    for (let i = 0; i < r.length; i++) for (let j = 0; j < x.length; j++) g[j] += jacobian.values[i * x.length + j] * r[i];
    return g;
  };
  const fns: PairFunctions = {
    objective: (x) => value(inner.outputs(x as Float64Array, site)),
    gradient: (x) => gradient(x as Float64Array),
    makeVector: (values) => Float64Array.from(values),
  };
  const calls = createUserCalls(fns, context.x.length, { clock: () => 0, endsAt: null }, { objective: '½‖r‖² of the residual function', gradient: 'Jᵀr' });
  const r = context.values;
  // The noise of ½‖r‖² from the residuals', to first order: Σ |rᵢ|·σᵢ.
  const noise = r.reduce((sum, v, i) => sum + Math.abs(v) * context.noise[i], 0) + 2 ** -52 * value(r);
  const jtr = times(transpose(context.analytic.dense!), r);
  return { calls, context: { calls, probeIndex: context.probeIndex, x: context.x, value: value(r), gradient: jtr, noise, gradientUnit: 2 ** -52, curvatureSeen: 0 } };
}

function transpose(matrix: DenseMatrix): DenseMatrix {
  const values = new Float64Array(matrix.values.length);
  for (let i = 0; i < matrix.rows; i++) for (let j = 0; j < matrix.columns; j++) values[j * matrix.rows + i] = matrix.values[i * matrix.columns + j];
  return { rows: matrix.columns, columns: matrix.rows, values };
}

