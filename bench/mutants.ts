// Wrong gradients made from correct ones, each a bug seen in hand-written gradient code:
// sign flip, constant factor, one wrong component, swapped components, a dropped term of
// a sum of squares, and small perturbations of prescribed relative size.
import { seededUniform, type TestProblem } from '../test/support/problems';

export type MutantKind = 'sign' | 'factor 2' | 'factor 1/2' | 'one component' | 'swap' | 'dropped term' | 'perturb 1e-2' | 'perturb 1e-4' | 'perturb 1e-6';

export const mutantKinds: MutantKind[] = ['sign', 'factor 2', 'factor 1/2', 'one component', 'swap', 'dropped term', 'perturb 1e-2', 'perturb 1e-4', 'perturb 1e-6'];

export interface Mutant {
  kind: MutantKind;
  /** The wrong gradient. */
  g: (x: ArrayLike<number>) => number[];
  /** Relative size ‖wrong − right‖ / ‖right‖ at the case's point. */
  relativeSize: number;
}

const norm = (v: ArrayLike<number>) => Math.sqrt(Array.from(v).reduce((s, x) => s + x * x, 0));
const largest = (v: number[]) => Math.max(...v.map(Math.abs));

/**
 * The mutants of `problem`'s gradient at `point`, or fewer when a kind cannot make a real
 * bug there (a swap of equal components, a dropped term that is zero at the point).
 */
export function mutantsAt(problem: TestProblem, point: number[], seed: number): Mutant[] {
  const uniform = seededUniform(seed);
  const g0 = problem.g(point);
  const n = point.length;
  const scale = largest(g0);
  const made: Array<Omit<Mutant, 'relativeSize'>> = [
    { kind: 'sign', g: (x) => problem.g(x).map((v) => -v) },
    { kind: 'factor 2', g: (x) => problem.g(x).map((v) => 2 * v) },
    { kind: 'factor 1/2', g: (x) => problem.g(x).map((v) => v / 2) },
  ];
  // One component off by a tenth of the largest component.
  const wrong = Math.floor(uniform() * n);
  made.push({ kind: 'one component', g: (x) => { const g = problem.g(x); g[wrong] += 0.1 * largest(g); return g; } });
  // Two components whose values differ by at least a tenth of the largest.
  const candidates: Array<[number, number]> = [];
  for (let i = 0; i < Math.min(n, 200); i++) for (let j = i + 1; j < Math.min(n, 200); j++) if (Math.abs(g0[i] - g0[j]) >= 0.1 * scale) candidates.push([i, j]);
  if (candidates.length > 0) {
    const [i, j] = candidates[Math.floor(uniform() * candidates.length)];
    made.push({ kind: 'swap', g: (x) => { const g = problem.g(x); [g[i], g[j]] = [g[j], g[i]]; return g; } });
  }
  if (problem.gradientWithoutTerm && problem.termCount) {
    const without = problem.gradientWithoutTerm;
    const terms = Array.from({ length: Math.min(problem.termCount, 400) }, (_, t) => t).filter((t) => norm(without(point, t).map((v, i) => v - g0[i])) >= 1e-3 * norm(g0));
    if (terms.length > 0) {
      const term = terms[Math.floor(uniform() * terms.length)];
      made.push({ kind: 'dropped term', g: (x) => without(x, term) });
    }
  }
  for (const [kind, size] of [['perturb 1e-2', 1e-2], ['perturb 1e-4', 1e-4], ['perturb 1e-6', 1e-6]] as const) {
    // g + size·‖g‖·u along a fixed seeded unit direction u, so ‖Δ‖/‖g‖ = size at the point.
    const direction = Array.from({ length: n }, () => uniform() - 0.5);
    const length = norm(direction);
    const shift = direction.map((v) => (size * norm(g0) * v) / length);
    made.push({ kind, g: (x) => problem.g(x).map((v, i) => v + shift[i]) });
  }
  return made
    .map((m) => ({ ...m, relativeSize: norm(m.g(point).map((v, i) => v - g0[i])) / norm(g0) }))
    .filter((m) => m.relativeSize > 1e-12);
}
