// Kind `hessianVectorProduct`: a gradient ∇f and a function (x, v) ↦ H(x)v, checked against the
// directional difference of the gradient along v. Up to the whole-check dimension the products
// with e₁ … eₙ give H column by column (n products), so the entry-wise check and its diagnoses
// apply as to a Hessian, and so does the symmetry check (secondOrder.ts); above it, random
// directions and located columns.
import { fromColumns, times } from '../matrixRead';
import type { MatrixKind } from '../matrixTarget';
import { CheckStopped, makeFinding } from '../userCalls';
import { unitVector } from '../vectors';
import { requireGradientLength, secondOrderAfterCheck } from './secondOrder';

export const hessianVectorProductKind: MatrixKind = {
  kind: 'hessianVectorProduct',
  analyticAt(calls, x, outputs, site, options) {
    const n = x.length;
    requireGradientLength(outputs, n, site);
    const product = (v: Float64Array) => calls.gradient(x, site, v);
    if (n > options.fullCheckMaxDimension) return { dense: null, times: product };
    const dense = fromColumns([...Array(n).keys()].map((j) => product(unitVector(n, j))), n);
    const bad = dense.values.findIndex((v) => !Number.isFinite(v));
    if (bad >= 0) {
      const finding = makeFinding('non-finite-value', 'gradient', `the Hessian-vector product has a non-finite value at probe ${site.probeIndex + 1}: component ${Math.floor(bad / n)} of H·e${bad % n} is ${dense.values[bad]}`, site);
      finding.entries = [[Math.floor(bad / n), bad % n]];
      throw new CheckStopped(finding);
    }
    return { dense, times: (v) => times(dense, v) };
  },
  afterCheck: (outcomes, report, _plan, options) => secondOrderAfterCheck(outcomes, report, options, 'the Hessian its products give'),
};
