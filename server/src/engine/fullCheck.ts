// Coordinate-wise gradient check for small dimensions: every component against
// its own central difference, with steps scaled to max(|x_i|, 1).
import { checkSlice, initialRelativeStep, type ProbeContext } from './probeContext';
import type { ComponentCheck } from './types';
import type { CallSite } from './userCalls';
import { offsetComponent } from './vectors';

export interface FullCheckResult {
  components: ComponentCheck[];
  /** Components where f looks non-smooth. */
  kinks: number[];
  /** Components whose error bound allows a verdict. */
  decidable: number[];
  /** Step of the best estimate, per component. */
  steps: number[];
  /** Largest rate of change of f seen at the first difference step. */
  slopeScale: number;
}

export function checkEveryComponent(context: ProbeContext): FullCheckResult {
  const { x, gradient } = context;
  const site: CallSite = { probeIndex: context.probeIndex, point: 'a finite-difference point' };
  const relativeStep = initialRelativeStep(context);
  const result: FullCheckResult = { components: [], kinks: [], decidable: [], steps: [], slopeScale: 0 };
  for (let i = 0; i < x.length; i++) {
    const phi = (t: number) => context.calls.objective(offsetComponent(x, i, t), site);
    const scale = Math.max(Math.abs(x[i]), 1);
    const { numerical, verdict } = checkSlice(phi, context.value, relativeStep * scale, gradient[i], Math.abs(gradient[i]), context.gradientUnit, { minLevels: 4, maxLevels: 12, noise: context.noise });
    result.components.push({ index: i, analytic: gradient[i], numerical: numerical.value, errorBound: verdict.errorBound, relError: verdict.relError, mismatch: verdict.mismatch });
    result.steps.push(numerical.step);
    result.slopeScale = Math.max(result.slopeScale, numerical.slopeScale / scale);
    if (numerical.kink) result.kinks.push(i);
    if (verdict.decidable) result.decidable.push(i);
  }
  return result;
}
