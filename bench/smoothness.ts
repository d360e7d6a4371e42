// Smoothness: the engine's L̂ and μ̂ against the extreme eigenvalues of the exact Hessian
// (ml-matrix's symmetric eigensolver), and learning-rate verdicts against real descent runs.
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { checkPair } from '../server/src/engine/checkPair';
import { defaultCheckOptions, type PairReport, type RateStatus } from '../server/src/engine/types';
import {
  extendedPowell, extendedRosenbrock, geometricSpectrum, irisLogistic, irisSoftmax, makeFloat64, moreGarbowHillstromSet, penaltyI, quadraticWithSpectrum, seededNormal, variablyDimensioned, type QuadraticProblem, type TestProblem,
} from '../test/support/problems';

export interface SmoothnessRow {
  label: string;
  n: number;
  lambdaMax: number;
  lambdaMin: number;
  lipschitz: number;
  /** The Lanczos estimate of λmax itself, before L̂ is widened by an unconverged residual. */
  ritzMax: number;
  relErrRitz: number;
  mu: number;
  relErrL: number;
  relErrMu: number;
  hessianVectorProducts: number;
}

export interface RateRow {
  label: string;
  rate: number;
  /** rate × λ_max / 2. */
  multiple: number;
  verdict: RateStatus | null;
  runDiverged: boolean;
  agrees: boolean;
}

export interface SmoothnessResult {
  quadratics: SmoothnessRow[];
  testSet: SmoothnessRow[];
  rates: RateRow[];
  quadraticMaxRelErrL: number;
  quadraticMaxRelErrRitz: number;
  /** Largest (λmax − L̂)/λmax over the quadratics: how far L̂ fell short of λmax, if ever. */
  quadraticMaxShortfallL: number;
  quadraticMaxRelErrMu: number;
  testSetMaxRelErrL: number;
  maxHessianVectorProducts: number;
  ratesAgree: number;
  seconds: number;
}

function check(problem: TestProblem, point: number[], learningRate: number | null = null): PairReport {
  return checkPair(
    { objective: (x) => problem.f(x), gradient: (x) => problem.g(x), makeVector: makeFloat64 },
    [point],
    { dimension: null, learningRate: learningRate === null ? null : { name: 'learningRate', value: learningRate }, options: { ...defaultCheckOptions, smoothness: true } },
  );
}

function extremeEigenvalues(hessian: number[][]): { lambdaMin: number; lambdaMax: number } {
  const values = new EigenvalueDecomposition(new Matrix(hessian), { assumeSymmetric: true }).realEigenvalues;
  return { lambdaMin: Math.min(...values), lambdaMax: Math.max(...values) };
}

function compare(label: string, problem: TestProblem, point: number[]): SmoothnessRow {
  const report = check(problem, point);
  const exact = extremeEigenvalues(problem.hessian!(point));
  const estimate = report.smoothness;
  const lipschitz = estimate ? estimate.lipschitz : NaN;
  const mu = estimate ? estimate.mu : NaN;
  const ritzMax = report.probes[0]?.smoothness?.lambdaMax ?? NaN;
  return {
    label,
    n: point.length,
    ...exact,
    lipschitz,
    ritzMax,
    relErrRitz: Math.abs(ritzMax - exact.lambdaMax) / Math.abs(exact.lambdaMax),
    mu,
    relErrL: Math.abs(lipschitz - exact.lambdaMax) / Math.abs(exact.lambdaMax),
    relErrMu: Math.abs(mu - exact.lambdaMin) / Math.abs(exact.lambdaMin),
    hessianVectorProducts: report.probes[0]?.smoothness?.hessianVectorProducts ?? 0,
  };
}

/** Plain gradient descent on the quadratic from its start: did f blow up? (Nocedal & Wright 2006, §3.3: x ← x − α∇f diverges on ½xᵀAx iff α > 2/λ_max, given a component along the top eigenvector.) */
function descentDiverges(q: QuadraticProblem, rate: number, steps: number): boolean {
  let x = Float64Array.from(q.start);
  const f0 = q.f(x);
  for (let k = 0; k < steps; k++) {
    const g = q.multiply(x);
    for (let i = 0; i < x.length; i++) x[i] -= rate * g[i];
  }
  const fK = q.f(x);
  return !Number.isFinite(fK) || fK > f0;
}

export function runSmoothness(log: (line: string) => void): SmoothnessResult {
  const started = Date.now();
  const quadraticProblems = [10, 100, 1000].flatMap((n) => [
    quadraticWithSpectrum(`quadratic, eigenvalues 1…1000 geometric (n = ${n})`, geometricSpectrum(n, 1, 1000), 900 + n),
    quadraticWithSpectrum(`quadratic, eigenvalues 1…100 evenly spaced (n = ${n})`, Array.from({ length: n }, (_, i) => 1 + (99 * i) / Math.max(1, n - 1)), 950 + n),
  ]);
  const quadratics = quadraticProblems.map((q) => { log(`  smoothness: ${q.name}`); return compare(q.name, q, q.start); });

  const byName = (prefix: string) => moreGarbowHillstromSet.find((p) => p.name.startsWith(prefix))!;
  const withHessian = [byName('Rosenbrock'), byName('Powell badly'), byName('Brown badly'), byName('Powell singular'), byName('Wood'), extendedRosenbrock(10), extendedPowell(12), penaltyI(10), variablyDimensioned(10), irisLogistic(), irisSoftmax(), extendedRosenbrock(100)];
  const testSet: SmoothnessRow[] = [];
  withHessian.forEach((p, k) => {
    const normal = seededNormal(1200 + k);
    const points = [p.start, ...[1, 2].map(() => p.start.map((v) => v + 0.1 * Math.max(1, Math.abs(v)) * normal()))];
    points.forEach((point, j) => testSet.push(compare(`${p.name} @ ${j === 0 ? 'x0' : `x0+δ${j}`}`, p, point)));
  });

  // Learning-rate verdicts just below and just above the divergence threshold 2/λ_max.
  const rates: RateRow[] = [];
  for (const q of quadraticProblems) {
    const lambdaMax = Math.max(...q.eigenvalues);
    for (const multiple of [0.99, 1.01]) {
      const rate = (multiple * 2) / lambdaMax;
      const verdict = check(q, q.start, rate).learningRate?.status ?? null;
      const runDiverged = descentDiverges(q, rate, 3000);
      rates.push({ label: q.name, rate, multiple, verdict, runDiverged, agrees: verdict !== null && (verdict === 'divergent') === runDiverged });
    }
  }
  const max = (values: number[]) => Math.max(...values.map((v) => (Number.isNaN(v) ? Infinity : v)));
  return {
    quadratics,
    testSet,
    rates,
    quadraticMaxRelErrL: max(quadratics.map((r) => r.relErrL)),
    quadraticMaxRelErrRitz: max(quadratics.map((r) => r.relErrRitz)),
    quadraticMaxShortfallL: max(quadratics.map((r) => (r.lambdaMax - r.lipschitz) / r.lambdaMax)),
    quadraticMaxRelErrMu: max(quadratics.map((r) => r.relErrMu)),
    testSetMaxRelErrL: max(testSet.map((r) => r.relErrL)),
    maxHessianVectorProducts: Math.max(...[...quadratics, ...testSet].map((r) => r.hessianVectorProducts)),
    ratesAgree: rates.filter((r) => r.agrees).length,
    seconds: (Date.now() - started) / 1000,
  };
}
