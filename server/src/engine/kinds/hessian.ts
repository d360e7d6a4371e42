// Kind `hessian`: a gradient ∇f: Rⁿ → Rⁿ and its Hessian H (n × n), checked entry by entry
// against differences of the gradient, then for symmetry (secondOrder.ts).
import { kindWording } from '../kindWording';
import { readMatrix, times } from '../matrixRead';
import type { MatrixKind } from '../matrixTarget';
import { requireGradientLength, secondOrderAfterCheck } from './secondOrder';

export const hessianKind: MatrixKind = {
  kind: 'hessian',
  analyticAt(calls, x, outputs, site) {
    requireGradientLength(outputs, x.length, site);
    const dense = readMatrix(calls.derivativeResult(x, site), x.length, x.length, kindWording.hessian, site);
    return { dense, times: (v) => times(dense, v) };
  },
  afterCheck: (outcomes, report, _plan, options) => secondOrderAfterCheck(outcomes, report, options, 'the Hessian'),
};
