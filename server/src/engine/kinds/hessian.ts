// Kind `hessian`: a gradient ∇f: Rⁿ → Rⁿ and its Hessian H (n × n), checked entry by entry
// against differences of the gradient, and for symmetry: H of a twice continuously
// differentiable f is symmetric (Schwarz), so an asymmetric H is wrong whatever the
// differences can tell. Once it holds, its exact spectrum at the probe gives L̂ (no learning
// rate is judged here: that is the gradient pair's, with its descent runs).
import { readMatrix, times, type DenseMatrix } from '../matrixRead';
import type { MatrixKind } from '../matrixTarget';
import type { Finding, MatrixSummary } from '../types';
import { CheckStopped, makeFinding } from '../userCalls';
import { smoothnessOf } from '../smoothness';
import { largest } from '../vectors';
import { symmetricEigenvalues } from '../symmetricEigen';

/**
 * |H[i][j] − H[j][i]| beyond this share of the larger of the two (and of 10⁻¹⁰ of the largest
 * entry) is asymmetry, not the rounding of two orderings of the same sums (common practice).
 */
const asymmetryShare = 1e-6;
const negligibleShare = 1e-10;

export const hessianKind: MatrixKind = {
  kind: 'hessian',
  analyticAt(calls, x, outputs, site) {
    if (outputs !== x.length) throw new CheckStopped(makeFinding('gradient-wrong-length', 'objective', `the gradient has ${outputs} components but the point has ${x.length}`, site));
    const dense = readMatrix(calls.derivativeResult(x, site), x.length, x.length, 'Hessian', site);
    return { dense, times: (v) => times(dense, v) };
  },
  afterCheck(outcomes, report, plan) {
    const first = outcomes[0].context.analytic.dense;
    if (!first) return;
    const asymmetry = largestAsymmetry(first);
    if (asymmetry) {
      report.matrix!.asymmetry = asymmetry;
      report.findings.push(asymmetryFinding(asymmetry, outcomes[0].context.probeIndex));
      if (report.status !== 'error') report.status = 'fail';
      return;
    }
    if (report.status === 'fail' || report.status === 'error') return;
    const held = outcomes.find((o) => o.complete && o.context.analytic.dense);
    // L̂ from the exact spectrum of the Hessian that held, when asked for (a hover, the report); a
    // Newton solve has no use for a gradient-descent step it did not ask about.
    if (held && (plan.options.smoothness || plan.options.plots)) {
      const eigenvalues = symmetricEigenvalues(held.context.analytic.dense!.values, first.rows);
      held.report.smoothness = { lambdaMax: eigenvalues[eigenvalues.length - 1], lambdaMin: eigenvalues[0], ritzValues: eigenvalues, secantMax: 0, hessianVectorProducts: 0 };
      report.smoothness = smoothnessOf(held.report.smoothness);
    }
  },
};

export function largestAsymmetry(h: DenseMatrix): MatrixSummary['asymmetry'] | null {
  const n = h.rows;
  const largestEntry = largest(h.values.map(Math.abs));
  let worst: { row: number; column: number; gap: number; scale: number } | null = null;
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const [a, b] = [h.values[i * n + j], h.values[j * n + i]];
      const gap = Math.abs(a - b);
      const scale = Math.max(Math.abs(a), Math.abs(b));
      if (gap > asymmetryShare * scale && gap > negligibleShare * largestEntry && (!worst || gap / scale > worst.gap / worst.scale)) worst = { row: i, column: j, gap, scale };
    }
  }
  return worst;
}

function asymmetryFinding(asymmetry: NonNullable<MatrixSummary['asymmetry']>, probeIndex: number): Finding {
  const { row, column } = asymmetry;
  const finding = makeFinding('hessian-not-symmetric', 'gradient', `the Hessian is not symmetric at probe ${probeIndex + 1}: H[${row}][${column}] and H[${column}][${row}] differ by ${asymmetry.gap.toPrecision(3)} (${Math.round((100 * asymmetry.gap) / asymmetry.scale)} % of the larger); a Hessian of a smooth function is symmetric, so at least one of them is wrong`, { probeIndex, point: 'the probe' });
  finding.entries = [[row, column], [column, row]];
  return finding;
}
