// What the two second-order kinds share: the gradient they are checked against must have n
// components, and once the matrix is known (a Hessian, or H built from the products with e₁ … eₙ)
// it must be symmetric — H of a twice continuously differentiable f is (Schwarz), so an asymmetric
// H is wrong whatever the differences can tell — and its exact spectrum at the probe gives L̂.
// No learning rate is judged here: that is the gradient pair's, with its descent runs.
import type { DenseMatrix } from '../matrixRead';
import type { MatrixProbeOutcome } from '../matrixProbe';
import { smoothnessOf } from '../smoothness';
import { symmetricEigenvalues } from '../symmetricEigen';
import type { CheckOptions, Finding, MatrixSummary, PairReport } from '../types';
import { CheckStopped, makeFinding, type CallSite } from '../userCalls';
import { largest } from '../vectors';

/**
 * |H[i][j] − H[j][i]| beyond this share of the larger of the two (and of 10⁻¹⁰ of the largest
 * entry) is asymmetry, not the rounding of two orderings of the same sums (common practice).
 */
const asymmetryShare = 1e-6;
const negligibleShare = 1e-10;

/** Stops the check when the gradient has not one component per coordinate. */
export function requireGradientLength(outputs: number, n: number, site: CallSite): void {
  if (outputs !== n) throw new CheckStopped(makeFinding('gradient-wrong-length', 'objective', `the gradient has ${outputs} components but the point has ${n}`, site));
}

/** Symmetry, then (when asked for: a hover, the report) L̂ from the spectrum of the matrix that held. */
export function secondOrderAfterCheck(outcomes: MatrixProbeOutcome[], report: PairReport, options: CheckOptions, matrixNoun: string): void {
  const first = outcomes[0].context.analytic.dense;
  if (!first) return;
  const asymmetry = largestAsymmetry(first);
  if (asymmetry) {
    report.matrix!.asymmetry = asymmetry;
    report.findings.push(asymmetryFinding(asymmetry, outcomes[0].context.probeIndex, matrixNoun));
    if (report.status !== 'error') report.status = 'fail';
    return;
  }
  if (report.status === 'fail' || report.status === 'error') return;
  const held = outcomes.find((o) => o.complete && o.context.analytic.dense);
  // A Newton solve has no use for a gradient-descent step it did not ask about.
  if (!held || !(options.smoothness || options.plots)) return;
  const eigenvalues = symmetricEigenvalues(held.context.analytic.dense!.values, first.rows);
  held.report.smoothness = { lambdaMax: eigenvalues[eigenvalues.length - 1], lambdaMin: eigenvalues[0], ritzValues: eigenvalues, secantMax: 0, hessianVectorProducts: 0 };
  report.smoothness = smoothnessOf(held.report.smoothness);
}

export function largestAsymmetry(h: DenseMatrix): MatrixSummary['asymmetry'] | null {
  const n = h.rows;
  const largestEntry = largest(h.values.map(Math.abs));
  let worst: NonNullable<MatrixSummary['asymmetry']> | null = null;
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

function asymmetryFinding(asymmetry: NonNullable<MatrixSummary['asymmetry']>, probeIndex: number, matrixNoun: string): Finding {
  const { row, column } = asymmetry;
  const finding = makeFinding('hessian-not-symmetric', 'gradient', `${matrixNoun} is not symmetric at probe ${probeIndex + 1}: H[${row}][${column}] and H[${column}][${row}] differ by ${asymmetry.gap.toPrecision(3)} (${Math.round((100 * asymmetry.gap) / asymmetry.scale)} % of the larger); a Hessian of a smooth function is symmetric, so at least one of them is wrong`, { probeIndex, point: 'the probe' });
  finding.entries = [[row, column], [column, row]];
  return finding;
}
