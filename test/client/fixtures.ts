// Report data for the client tests, built from closed-form cases whose truth is known.
import type { ComponentCheck, DescentRun, ProbeReport, StepStudy } from '../../server/src/engine/types';

export function probe(overrides: Partial<ProbeReport> = {}): ProbeReport {
  return {
    point: [1, 2, 3],
    dimension: 3,
    value: 0,
    mode: 'full',
    components: [],
    directions: [],
    noise: 1e-16,
    maxRelError: 0,
    stepStudy: null,
    smoothness: null,
    descent: [],
    ...overrides,
  };
}

export function component(index: number, analytic: number, numerical: number, errorBound: number, mismatch = false): ComponentCheck {
  const relError = Math.abs(analytic - numerical) / Math.max(Math.abs(analytic), Math.abs(numerical), 1e-300);
  return { index, analytic, numerical, errorBound, relError, mismatch };
}

/**
 * Central differences of exp at x = 1 for h = 10⁻¹ … 10⁻¹², against the exact derivative e:
 * the V-shaped error of truncation (≈ e·h²/6) against rounding (≈ ε/h).
 * Nocedal & Wright, "Numerical Optimization", 2nd ed., 2006, §8.1 (central difference error, optimal h ~ ε^(1/3)).
 */
export function expStepStudy(): StepStudy {
  const steps = Array.from({ length: 12 }, (_, k) => 10 ** -(k + 1));
  const errors = steps.map((h) => Math.abs((Math.exp(1 + h) - Math.exp(1 - h)) / (2 * h) - Math.E));
  return { component: 0, steps, errors, chosenStep: 1e-5 };
}

/**
 * Gradient descent on f(w) = ½·L·w² from w₀ = 1: w_k = (1 − αL)^k, so f_k = ½·L·(1 − αL)^(2k).
 * The contraction factor |1 − αL| of gradient descent on a quadratic: Nocedal & Wright 2006, §3.3;
 * it stays below 1 exactly when 0 < α < 2/L.
 */
export function quadraticDescent(label: DescentRun['label'], rate: number, lipschitz = 4, steps = 8): DescentRun {
  const values = Array.from({ length: steps + 1 }, (_, k) => 0.5 * lipschitz * (1 - rate * lipschitz) ** (2 * k));
  return { label, rate, values, decreased: values[steps] < values[0] };
}
