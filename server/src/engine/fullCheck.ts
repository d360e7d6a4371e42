// Coordinate-wise gradient check for small dimensions: every component against
// its own central difference, with steps scaled to max(|x_i|, 1).
import { componentCheckOf } from './decision';
import { defaultDifferenceSettings } from './differences';
import { checkSlice, initialRelativeStep, noteCurvature, type ProbeContext } from './probeContext';
import type { ComponentCheck } from './types';
import { BudgetSpent, type CallSite } from './userCalls';
import { offsetComponent } from './vectors';

export interface FullCheckResult {
  components: ComponentCheck[];
  /** Components where f looks non-smooth. */
  kinks: number[];
  /** The time budget ran out before every component was checked; `components` holds those that were. */
  cut: boolean;
  /** Step of the best estimate, per entry of `components`. */
  steps: number[];
}

/** Checks the components `indices` (every one by default), in order. */
export function checkComponents(context: ProbeContext, indices: Iterable<number> = context.x.keys()): FullCheckResult {
  const { x, gradient } = context;
  const site: CallSite = { probeIndex: context.probeIndex, point: 'a finite-difference point' };
  const relativeStep = initialRelativeStep(context);
  const result: FullCheckResult = { components: [], kinks: [], steps: [], cut: false };
  for (const i of indices) {
    const phi = (t: number) => context.calls.objective(offsetComponent(x, i, t), site);
    const scale = Math.max(Math.abs(x[i]), 1);
    // Each component is judged against its own size: a tiny component must be resolved on its own.
    const scales = { roundoffScale: Math.abs(gradient[i]), unit: context.gradientUnit, size: 0 };
    let checked;
    try {
      checked = checkSlice(phi, context.value, relativeStep * scale, gradient[i], scales, { ...defaultDifferenceSettings, noise: context.noise });
    } catch (err) {
      // Out of time: the components checked so far still count (a mismatch among them decides).
      if (!(err instanceof BudgetSpent)) throw err;
      result.cut = true;
      break;
    }
    const { numerical, verdict } = checked;
    // φ(t) = f(x + t·eᵢ): φ'' is Hᵢᵢ.
    noteCurvature(context, numerical, 1);
    result.components.push(componentCheckOf(i, gradient[i], numerical.value, verdict));
    result.steps.push(numerical.step);
    if (numerical.kink) result.kinks.push(i);
  }
  return result;
}
