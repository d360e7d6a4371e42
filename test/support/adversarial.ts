// Cases built to make a gradient check pass a wrong gradient or raise a false learning-rate
// alarm, each with the verdict it must give. test/engine/adversarial.test.ts asserts them one by
// one in detail and as a table; bench/adversarial.ts prints the table with the calls each took.
import { checkPair, type PairFunctions } from '../../server/src/engine/checkPair';
import { defaultCheckOptions, type CheckOptions, type PairReport, type PairStatus, type RateStatus } from '../../server/src/engine/types';
import { brownBadlyScaled, makeArray } from './problems';

export type Gradient = (x: ArrayLike<number>) => number[];

/** A check of f and ∇f at the given probes, with a learning rate when one is given. */
export function checkAt(objective: PairFunctions['objective'], gradient: Gradient, probes: number[][], rate: number | null = null, options: Partial<CheckOptions> = {}): PairReport {
  return checkPair(
    { objective, gradient, makeVector: makeArray },
    probes,
    { dimension: null, learningRate: rate === null ? null : { name: 'rate', value: rate }, options: { ...defaultCheckOptions, ...options } },
  );
}

/** The same gradient with component `i` changed by `change`. */
export const altered = (g: Gradient, i: number, change: (v: number) => number): Gradient => (x) => {
  const out = g(x);
  out[i] = change(out[i]);
  return out;
};

/**
 * f = 1/x₀ + 1/x₁, ∇f = (−1/x₀², −1/x₁²) (elementary calculus). At (1e-4, 3e-4) a step relative
 * to max(|xᵢ|, 1) reaches across the pole at 0.
 */
export const pole = {
  f: (x: ArrayLike<number>) => 1 / x[0] + 1 / x[1],
  g: ((x) => [-1 / x[0] ** 2, -1 / x[1] ** 2]) as Gradient,
  probes: [[1e-4, 3e-4]],
};

/** f = Σ (xᵢ − 1)², minimum at (1, 1, 1), where ∇f = 0 and 2∇f = 0 too (common practice). */
export const bowl = {
  f: (x: ArrayLike<number>) => (x[0] - 1) ** 2 + (x[1] - 1) ** 2 + (x[2] - 1) ** 2,
  g: ((x) => Array.from(x, (v) => 2 * (v - 1))) as Gradient,
};

/** ½xᵀAx with A diagonal: eigenvalues A's entries, and rate α diverges on it exactly from 2/λmax (by hand). */
export function diagonalQuadratic(diagonal: number[]) {
  const n = diagonal.length;
  return {
    f: (x: ArrayLike<number>) => {
      let s = 0;
      for (let i = 0; i < n; i++) s += 0.5 * diagonal[i] * x[i] ** 2;
      return s;
    },
    g: ((x) => Array.from({ length: n }, (_, i) => diagonal[i] * x[i])) as Gradient,
    probe: Array.from({ length: n }, (_, i) => 1 + 0.5 * Math.sin(3 * i)),
    lambdaMax: Math.max(...diagonal),
  };
}

/** Forty eigenvalues within 4 % of 100 over ten small ones: Lanczos converges slowly on the top. */
export const topCluster = diagonalQuadratic(Array.from({ length: 50 }, (_, i) => (i < 40 ? 100 * (1 - 1e-3 * i) : 1 + i / 10)));

/**
 * f = Σ (i + 1)·cosh(0.3·xᵢ), ∇f = 0.3(i + 1)·sinh(0.3·xᵢ) (elementary calculus), on a clock that
 * advances by `costMs(call number)` per call of either function: a slow objective measured
 * without waiting. `wrongComponent` flips one sign.
 */
export function slowPair(n: number, wrongComponent: number | null, costMs: (call: number) => number) {
  const clock = { now: 0, calls: 0 };
  const tick = () => (clock.now += costMs(clock.calls++));
  const objective = (x: ArrayLike<number>) => {
    tick();
    let s = 0;
    for (let i = 0; i < n; i++) s += (i + 1) * Math.cosh(0.3 * x[i]);
    return s;
  };
  const gradient = (x: ArrayLike<number>) => {
    tick();
    return Array.from({ length: n }, (_, i) => (i === wrongComponent ? -1 : 1) * 0.3 * (i + 1) * Math.sinh(0.3 * x[i]));
  };
  return { clock, fns: { objective, gradient, makeVector: makeArray } };
}

/** A slow pair checked under a budget of `budgetMs` on its own clock. */
export function checkSlow(n: number, wrong: number | null, budgetMs: number, costMs: (call: number) => number = () => 50): { report: PairReport; spentMs: number } {
  const { clock, fns } = slowPair(n, wrong, costMs);
  const report = checkPair(fns, [], { dimension: n, learningRate: null, options: defaultCheckOptions, endsAt: budgetMs }, () => clock.now);
  return { report, spentMs: clock.now };
}

export interface AdversarialCase {
  name: string;
  /** What the case tries to provoke. */
  trap: 'false pass' | 'false alarm' | 'false rate alarm' | 'rate called safe too soon' | 'lost to the time budget';
  run(): PairReport;
  /** The pair verdict it must give. */
  status: PairStatus;
  /** The learning-rate verdict it must give, where a rate is declared. */
  rate?: RateStatus;
}

const flip = (v: number) => -v;
const double = (v: number) => 2 * v;

export const adversarialCases: AdversarialCase[] = [
  { name: 'pole within the first step, correct', trap: 'false pass', run: () => checkAt(pole.f, pole.g, pole.probes), status: 'pass' },
  { name: 'pole within the first step, sign flipped', trap: 'false pass', run: () => checkAt(pole.f, altered(pole.g, 0, flip), pole.probes), status: 'fail' },
  { name: 'pole within the first step, factor 2', trap: 'false pass', run: () => checkAt(pole.f, altered(pole.g, 0, double), pole.probes), status: 'fail' },
  // Brown badly scaled (Moré, Garbow & Hillstrom 1981, problem 4) at (1, 1): ∂f/∂x₁ = −4·10⁻⁶ beside f ≈ 10¹².
  { name: 'Brown badly scaled, tiny component sign flipped', trap: 'false pass', run: () => checkAt(brownBadlyScaled.f, altered(brownBadlyScaled.g, 1, flip), [brownBadlyScaled.start]), status: 'inconclusive' },
  { name: 'Brown badly scaled, tiny component ×10', trap: 'false pass', run: () => checkAt(brownBadlyScaled.f, altered(brownBadlyScaled.g, 1, (v) => 10 * v), [brownBadlyScaled.start]), status: 'inconclusive' },
  { name: '10⁻⁸·x₀² + x₁², small component sign flipped', trap: 'false pass', run: () => checkAt((x) => 1e-8 * x[0] ** 2 + x[1] ** 2, (x) => [-2e-8 * x[0], 2 * x[1]], [[0.7, 1.3]]), status: 'fail' },
  { name: 'stationary probe alone, gradient doubled', trap: 'false pass', run: () => checkAt(bowl.f, (x) => bowl.g(x).map(double), [[1, 1, 1]]), status: 'inconclusive' },
  { name: 'stationary probe and another, gradient doubled', trap: 'false pass', run: () => checkAt(bowl.f, (x) => bowl.g(x).map(double), [[1, 1, 1], [2, 0, 1.5]]), status: 'fail' },
  { name: 'stationary probe and another, correct', trap: 'false pass', run: () => checkAt(bowl.f, bowl.g, [[1, 1, 1], [2, 0, 1.5]]), status: 'pass' },
  {
    name: 'wrong only where x₁ < 0, away from probe 1',
    trap: 'false pass',
    run: () => checkAt((x) => x[0] ** 2 + Math.exp(x[1]), (x) => [2 * x[0], x[1] < 0 ? 2 * Math.exp(x[1]) : Math.exp(x[1])], [[1, 0.5], [0.3, -1], [2, 1]]),
    status: 'fail',
  },
  {
    // Quiet at probe 1, rough (relative noise ~10⁻⁷) where x₀ > 1.5: a spot check there assumes probe 1's
    // noise, so its mismatch must be checked again with the noise measured there before it counts.
    name: 'noise only away from probe 1, correct',
    trap: 'false alarm',
    run: () => checkAt((x) => x[0] ** 2 + x[1] ** 2 + (x[0] > 1.5 ? 1e-6 * Math.sin(1e7 * x[0] + 3e7 * x[1]) : 0), (x) => [2 * x[0], 2 * x[1]], [[1, 1], [2, 0.5], [3, 2]]),
    status: 'pass',
  },
  // f = x₀² + 50·x₁²: curvatures 2 and 100; 0.009 < 1/100.
  { name: 'x₀ ≈ 10⁶ beside x₁ ≈ 0.3, rate 0.009', trap: 'false rate alarm', run: () => checkAt((x) => x[0] ** 2 + 50 * x[1] ** 2, (x) => [2 * x[0], 100 * x[1]], [[1e6, 0.3]], 0.009), status: 'pass', rate: 'safe' },
  // f = ½x₀² − 2x₁²: curvatures 1 and −4; gradient descent diverges only from α ≥ 2 (by hand).
  { name: 'negative curvature −4 beside +1, rate 0.8', trap: 'false rate alarm', run: () => checkAt((x) => 0.5 * x[0] ** 2 - 2 * x[1] ** 2, (x) => [x[0], -4 * x[1]], [[0.7, 0.4]], 0.8), status: 'pass', rate: 'aggressive' },
  { name: 'negative curvature −4 beside +1, rate 2.5', trap: 'rate called safe too soon', run: () => checkAt((x) => 0.5 * x[0] ** 2 - 2 * x[1] ** 2, (x) => [x[0], -4 * x[1]], [[0.7, 0.4]], 2.5), status: 'pass', rate: 'divergent' },
  { name: 'crowded top of the spectrum, rate 1.9/λmax', trap: 'false rate alarm', run: () => checkAt(topCluster.f, topCluster.g, [topCluster.probe], 1.9 / topCluster.lambdaMax), status: 'pass', rate: 'aggressive' },
  { name: 'crowded top of the spectrum, rate 2.2/λmax', trap: 'rate called safe too soon', run: () => checkAt(topCluster.f, topCluster.g, [topCluster.probe], 2.2 / topCluster.lambdaMax), status: 'pass', rate: 'divergent' },
  { name: 'crowded top, 3 Lanczos steps, rate 1.1/λmax', trap: 'rate called safe too soon', run: () => checkAt(topCluster.f, topCluster.g, [topCluster.probe], 1.1 / topCluster.lambdaMax, { lanczosSteps: 3 }), status: 'pass', rate: 'aggressive' },
  { name: '50 ms per call, n = 20, correct', trap: 'lost to the time budget', run: () => checkSlow(20, null, 10_000).report, status: 'pass' },
  { name: '50 ms per call, n = 20, one component wrong', trap: 'lost to the time budget', run: () => checkSlow(20, 1, 10_000).report, status: 'fail' },
  { name: '200 ms per call, n = 100, correct', trap: 'lost to the time budget', run: () => checkSlow(100, null, 10_000, () => 200).report, status: 'pass' },
  { name: '200 ms per call, n = 100, one component wrong', trap: 'lost to the time budget', run: () => checkSlow(100, 1, 10_000, () => 200).report, status: 'fail' },
];
