// Learning-rate verdicts from the local curvature for gradient descent w ← w − α∇f(w):
// α ≤ 1/L̂ safe, α ≥ 2/λ⁺ divergent along the steepest positive curvature λ⁺ (on the
// quadratic model; Nocedal & Wright 2006, §3.3; common practice), confirmed by short runs.
import { formatBound, formatValue } from './format';
import type { DeclaredRate, DescentRun, Finding, LearningRateVerdict, RateStatus, SmoothnessEstimate } from './types';
import { CheckStopped, type UserCalls } from './userCalls';

export function rateStatus(rate: number, smoothness: SmoothnessEstimate): RateStatus {
  if (smoothness.divergenceStep !== null && rate >= smoothness.divergenceStep) return 'divergent';
  if (rate > smoothness.safeStep) return 'aggressive';
  return 'safe';
}

/**
 * `steps` iterations of gradient descent from `start`, recording f. A run that
 * leaves the region where f is finite, or where the user's code throws, stops
 * there and counts as not decreasing: that is what divergence looks like.
 */
export function descend(calls: UserCalls, start: Float64Array, startValue: number, rate: number, steps: number, label: DescentRun['label'], probeIndex: number): DescentRun {
  const site = { probeIndex, point: 'a descent iterate' };
  const values = [startValue];
  let x = start;
  let ended = false;
  for (let k = 0; k < steps && !ended; k++) {
    try {
      const gradient = calls.gradient(x, site);
      const next = new Float64Array(x.length);
      for (let i = 0; i < x.length; i++) next[i] = x[i] - rate * gradient[i];
      const value = calls.objective(next, site);
      if (!Number.isFinite(value)) ended = true;
      else {
        values.push(value);
        x = next;
      }
    } catch (err) {
      if (!(err instanceof CheckStopped)) throw err;
      ended = true;
    }
  }
  const decreased = !ended && values[values.length - 1] < startValue;
  return { label, rate, values, decreased };
}

export interface RateReview {
  verdict: LearningRateVerdict;
  findings: Finding[];
}

const localNote = 'L̂ is a local estimate from the probes, not a global bound';

export function reviewLearningRate(declared: DeclaredRate, smoothness: SmoothnessEstimate, declaredRuns: DescentRun[]): RateReview {
  const { name, value: rate, momentum } = declared;
  const status = rateStatus(rate, smoothness);
  const decreased = declaredRuns.map((run) => run.decreased);
  const findings: Finding[] = [];
  const lipschitz = formatValue(smoothness.lipschitz);
  // Heavy-ball momentum changes the stable range of α; until that is modelled, say so next to the verdict.
  const momentumNote = momentum ? `; momentum ${momentum.name} = ${formatValue(momentum.value)} is used with it and is not taken into account` : '';
  const divergence = smoothness.divergenceStep === null
    ? 'no positive curvature found, so no divergence threshold'
    : `divergence at 2/λ⁺ = ${formatValue(smoothness.divergenceStep)}, λ⁺ the largest positive curvature`;
  const widenings = [
    ...(smoothness.widened ? ['the residual of a Lanczos estimate that had not converged'] : []),
    ...(smoothness.productError !== undefined ? [`the Hessian-vector products' error (${formatBound(smoothness.productError)}, from two step sizes)`] : []),
  ];
  const widenedNote = widenings.length > 0 ? `, widened by ${widenings.join(' and ')}` : '';
  const bounds = `1/L̂ = ${formatValue(smoothness.safeStep)} with L̂ = ${lipschitz}${widenedNote}, ${divergence}, near the probes; ${localNote}${momentumNote}`;
  if (status === 'aggressive') {
    findings.push({ code: 'rate-aggressive', severity: 'warning', subject: 'learningRate', message: `learning rate ${name} = ${formatValue(rate)} is above the safe step but below the divergence threshold (${bounds})` });
  } else if (status === 'divergent') {
    findings.push({ code: 'rate-divergent', severity: 'error', subject: 'learningRate', message: `learning rate ${name} = ${formatValue(rate)} is at or above the divergence threshold: gradient descent is expected to diverge near the probes (${bounds})` });
  }
  const runsDecreased = decreased.filter(Boolean).length;
  const expectsDecrease = status !== 'divergent';
  const disagreeing = expectsDecrease ? decreased.length - runsDecreased : runsDecreased;
  if (decreased.length > 0 && disagreeing > 0) {
    const what = expectsDecrease ? 'did not decrease f' : 'still decreased f';
    findings.push({
      code: 'rate-unconfirmed',
      severity: 'info',
      subject: 'learningRate',
      message: `the verdict '${status}' for ${name} = ${formatValue(rate)} is not confirmed: ${disagreeing} of ${decreased.length} short descent runs at that rate ${what} (${bounds})`,
    });
  }
  const verdict: LearningRateVerdict = { name, value: rate, status, decreased };
  if (momentum) verdict.momentum = { name: momentum.name, value: momentum.value };
  return { verdict, findings };
}
