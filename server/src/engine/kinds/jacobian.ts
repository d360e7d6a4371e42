// Kind `jacobian`: residuals r: Rⁿ → Rᵐ and their Jacobian J (m × n, J[i][j] = ∂rᵢ/∂xⱼ). Once J
// checks out, the Gauss–Newton model of ½‖r‖² at the probe: its Hessian JᵀJ, whose largest
// eigenvalue σmax(J)² is the model's Lipschitz constant, and the condition number of JᵀJ
// (Nocedal & Wright 2006, §10.3). A learning rate for gradient descent on ½‖r‖² is judged as a
// gradient pair's is, on f = ½‖r‖² with gradient Jᵀr: the model leaves out Σ rᵢ∇²rᵢ, which far
// from a fit can move the curvature either way.
import { estimateSmoothness, type PairFunctions } from '../checkPair';
import { kindWording } from '../kindWording';
import { lanczosExtremes } from '../lanczos';
import { readMatrix, times, transposeTimes, type DenseMatrix } from '../matrixRead';
import type { MatrixKind } from '../matrixTarget';
import type { MatrixProbeContext } from '../matrixProbe';
import type { ProbeContext } from '../probeContext';
import type { CheckOptions } from '../types';
import { symmetricEigenvalues } from '../symmetricEigen';
import { createUserCalls, type CallSite, type UserCalls } from '../userCalls';
import { halfSquaredNorm } from '../vectors';

// JᵀJ counts as singular when σmin² is below this share of σmax² (rounding of a product of J with itself; common practice).
const singularShare = 1e-14;

// JᵀJ's spectrum is exact (Jacobi) up to this many coordinates, O(n³); above, Lanczos on JᵀJ·v.
const exactSpectrumLimit = 200;

export const jacobianKind: MatrixKind = {
  kind: 'jacobian',
  analyticAt(calls, x, outputs, site) {
    const dense = readMatrix(calls.derivativeResult(x, site), outputs, x.length, kindWording.jacobian, site);
    return { dense, times: (v) => times(dense, v) };
  },
  afterCheck(outcomes, report, plan, options) {
    if (report.status === 'fail' || report.status === 'error') return;
    const held = outcomes.find((o) => o.complete && o.context.analytic.dense);
    const jacobian = held?.context.analytic.dense;
    if (!held || !jacobian) return;
    const { smallest, largest } = normalSpectrum(jacobian, options);
    report.matrix!.leastSquares = {
      probeIndex: held.context.probeIndex,
      sigmaMaxSquared: largest,
      sigmaMinSquared: smallest,
      conditionNumber: smallest > singularShare * largest ? largest / smallest : null,
    };
    const { calls, context } = halfSquares(held.context);
    estimateSmoothness(calls, context, held.report, plan, options, report);
  },
};

/** The extreme eigenvalues of JᵀJ: σmin(J)² (0 when negative by rounding) and σmax(J)². */
function normalSpectrum(jacobian: DenseMatrix, options: CheckOptions): { smallest: number; largest: number } {
  const n = jacobian.columns;
  if (n <= exactSpectrumLimit) {
    const eigenvalues = symmetricEigenvalues(normalMatrix(jacobian), n);
    return { smallest: Math.max(0, eigenvalues[0]), largest: eigenvalues[n - 1] };
  }
  const start = Float64Array.from({ length: n }, (_, j) => 1 + ((j * 7919) % 13) / 13);
  const lanczos = lanczosExtremes((v) => transposeTimes(jacobian, times(jacobian, v)), start, options.lanczosSteps);
  return { smallest: Math.max(0, lanczos?.lambdaMin ?? 0), largest: lanczos?.lambdaMax ?? 0 };
}

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
  const fns: PairFunctions = {
    objective: (x) => halfSquaredNorm(inner.outputs(x as Float64Array, site)),
    gradient: (x) => {
      const r = inner.outputs(x as Float64Array, site);
      return transposeTimes(readMatrix(inner.derivativeResult(x as Float64Array, site), r.length, context.x.length, kindWording.jacobian, site), r);
    },
    makeVector: (values) => Float64Array.from(values),
  };
  const calls = createUserCalls(fns, context.x.length, { clock: () => 0, endsAt: null }, { objective: '½‖r‖² of the residual function', gradient: 'Jᵀr' });
  const r = context.values;
  // The noise of ½‖r‖² from the residuals', to first order: Σ |rᵢ|·σᵢ.
  const noise = r.reduce((sum, v, i) => sum + Math.abs(v) * context.noise[i], 0) + 2 ** -52 * halfSquaredNorm(r);
  const gradient = transposeTimes(context.analytic.dense!, r);
  return { calls, context: { calls, probeIndex: context.probeIndex, x: context.x, value: halfSquaredNorm(r), gradient, noise, gradientUnit: 2 ** -52, curvatureSeen: 0 } };
}
