// Kind `jacobian`: residuals r: Rⁿ → Rᵐ and their Jacobian J (m × n, J[i][j] = ∂rᵢ/∂xⱼ). Once J
// checks out, the Gauss–Newton model of ½‖r‖² at the probe: its Hessian JᵀJ, whose largest
// eigenvalue σmax(J)² is the model's Lipschitz constant, the condition number of JᵀJ, and the
// learning-rate verdict for gradient descent on ½‖r‖² (Nocedal & Wright 2006, §10.3).
import { readMatrix, times } from '../matrixRead';
import type { MatrixKind } from '../matrixTarget';
import { smoothnessFromMatrix } from './spectrum';

// JᵀJ counts as singular when σmin² is below this share of σmax² (rounding of a product of J with itself; common practice).
const singularShare = 1e-14;

export const jacobianKind: MatrixKind = {
  kind: 'jacobian',
  analyticAt(calls, x, outputs, site) {
    const dense = readMatrix(calls.derivativeResult(x, site), outputs, x.length, 'Jacobian', site);
    return { dense, times: (v) => times(dense, v) };
  },
  canCheckWhole: (n, options) => n <= options.fullCheckMaxDimension,
  afterCheck(outcomes, report, plan) {
    if (report.status === 'fail' || report.status === 'error') return;
    const held = outcomes.find((o) => o.complete && o.context.analytic.dense);
    const jacobian = held?.context.analytic.dense;
    if (!held || !jacobian) return;
    const n = jacobian.columns;
    const normal = new Float64Array(n * n);
    for (let i = 0; i < jacobian.rows; i++) {
      for (let j = 0; j < n; j++) {
        const a = jacobian.values[i * n + j];
        if (a === 0) continue;
        for (let k = j; k < n; k++) normal[j * n + k] += a * jacobian.values[i * n + k];
      }
    }
    const eigenvalues = smoothnessFromMatrix(normal, n, held.report, report, plan);
    const [smallest, largest] = [Math.max(0, eigenvalues[0]), eigenvalues[n - 1]];
    report.matrix!.leastSquares = {
      probeIndex: held.context.probeIndex,
      sigmaMaxSquared: largest,
      sigmaMinSquared: smallest,
      conditionNumber: smallest > singularShare * largest ? largest / smallest : null,
    };
  },
};
