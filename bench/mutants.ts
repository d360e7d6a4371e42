// Wrong gradients made from correct ones, each a bug seen in hand-written gradient code:
// sign flip, constant factor, one wrong component, swapped components, a dropped term of
// a sum of squares, and small perturbations of prescribed relative size. And wrong Jacobians
// made from correct ones: columns swapped, transposed, a column's sign or factor, rows shifted
// by one residual, one entry off by a prescribed relative size.
import type { MatrixDiagnosis } from '../server/src/engine/types';
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
const pick = <T>(uniform: () => number, items: T[]): T => items[Math.floor(uniform() * items.length)];

/**
 * Index pairs i < j (among the first 200 items) whose items differ by at least a tenth of the
 * largest item's size: swapping them is a real bug, not a no-op.
 */
function pairsApart<T>(items: T[], gap: (a: T, b: T) => number, size: (a: T) => number): Array<[number, number]> {
  const scale = Math.max(...items.map(size));
  const count = Math.min(items.length, 200);
  const pairs: Array<[number, number]> = [];
  for (let i = 0; i < count; i++) for (let j = i + 1; j < count; j++) if (gap(items[i], items[j]) >= 0.1 * scale) pairs.push([i, j]);
  return pairs;
}

/**
 * The mutants of `problem`'s gradient at `point`, or fewer when a kind cannot make a real
 * bug there (a swap of equal components, a dropped term that is zero at the point).
 */
export function mutantsAt(problem: TestProblem, point: number[], seed: number): Mutant[] {
  const uniform = seededUniform(seed);
  const g0 = problem.g(point);
  const n = point.length;
  const made: Array<Omit<Mutant, 'relativeSize'>> = [
    { kind: 'sign', g: (x) => problem.g(x).map((v) => -v) },
    { kind: 'factor 2', g: (x) => problem.g(x).map((v) => 2 * v) },
    { kind: 'factor 1/2', g: (x) => problem.g(x).map((v) => v / 2) },
  ];
  // One component off by a tenth of the largest component.
  const wrong = Math.floor(uniform() * n);
  made.push({ kind: 'one component', g: (x) => { const g = problem.g(x); g[wrong] += 0.1 * largest(g); return g; } });
  // Two components whose values differ by at least a tenth of the largest.
  const candidates = pairsApart(g0, (a, b) => Math.abs(a - b), Math.abs);
  if (candidates.length > 0) {
    const [i, j] = pick(uniform, candidates);
    made.push({ kind: 'swap', g: (x) => { const g = problem.g(x); [g[i], g[j]] = [g[j], g[i]]; return g; } });
  }
  if (problem.gradientWithoutTerm && problem.termCount) {
    const without = problem.gradientWithoutTerm;
    const terms = Array.from({ length: Math.min(problem.termCount, 400) }, (_, t) => t).filter((t) => norm(without(point, t).map((v, i) => v - g0[i])) >= 1e-3 * norm(g0));
    if (terms.length > 0) {
      const term = pick(uniform, terms);
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

export type JacobianMutantKind =
  | 'columns swapped' | 'transposed' | 'transposed, not square' | 'column sign' | 'column × 2' | 'column × 0.5' | 'rows shifted' | 'entry 1e-2' | 'entry 1e-4' | 'entry 1e-6';

export const jacobianMutantKinds: JacobianMutantKind[] = ['columns swapped', 'transposed', 'transposed, not square', 'column sign', 'column × 2', 'column × 0.5', 'rows shifted', 'entry 1e-2', 'entry 1e-4', 'entry 1e-6'];

/** Kinds whose wrong matrix has the wrong shape: a shape finding is the right answer, not a mismatch. */
export const jacobianShapeKinds: JacobianMutantKind[] = ['transposed, not square'];

type Matrix = number[][];

export interface JacobianMutant {
  kind: JacobianMutantKind;
  /** The wrong Jacobian. */
  J: (x: ArrayLike<number>) => Matrix;
  /** What a checker should name; null where the shape alone is wrong. */
  expected: MatrixDiagnosis | null;
  /** ‖wrong − right‖_F / ‖right‖_F at the point; NaN when the shapes differ. */
  relativeSize: number;
  /** Where the mutant is, for reading the notes: `columns 0 ↔ 2`, `entry (4, 1)`. */
  where: string;
}

const columnOf = (J: Matrix, j: number) => J.map((row) => row[j]);
const minus = (a: number[], b: number[]) => a.map((v, i) => v - b[i]);
const frobenius = (J: Matrix) => norm(J.flat());

/**
 * The mutants of a Jacobian `jacobian` (m × n) at `point`, or fewer when a kind cannot make a real
 * bug there (columns too alike to swap, a symmetric square matrix transposed, all-zero columns).
 */
export function jacobianMutantsAt(jacobian: (x: ArrayLike<number>) => Matrix, point: number[], seed: number): JacobianMutant[] {
  const uniform = seededUniform(seed);
  const J0 = jacobian(point);
  const [m, n] = [J0.length, point.length];
  const copy = (x: ArrayLike<number>) => jacobian(x).map((row) => row.slice());
  const made: Array<Omit<JacobianMutant, 'relativeSize'>> = [];
  // Two columns that differ by at least a tenth of the largest column, by the gradient swap's rule.
  const columns = [...Array(n).keys()].map((j) => columnOf(J0, j));
  const swaps = pairsApart(columns, (a, b) => norm(minus(a, b)), norm);
  if (swaps.length > 0) {
    const [j, k] = pick(uniform, swaps);
    made.push({ kind: 'columns swapped', expected: { kind: 'columnSwap', pairs: [[j, k]] }, where: `columns ${j} ↔ ${k}`, J: (x) => copy(x).map((row) => { [row[j], row[k]] = [row[k], row[j]]; return row; }) });
  }
  const transpose = (x: ArrayLike<number>) => { const J = jacobian(x); return J[0].map((_, j) => J.map((row) => row[j])); };
  if (m === n) made.push({ kind: 'transposed', expected: { kind: 'transposed' }, where: `${m} × ${n}`, J: transpose });
  else made.push({ kind: 'transposed, not square', expected: null, where: `${n} × ${m} for ${m} × ${n}`, J: transpose });
  // One column that is not zero at the point, for its sign and its factors.
  const nonzeroColumns = [...Array(n).keys()].filter((j) => norm(columns[j]) > 0);
  if (nonzeroColumns.length > 0) {
    const column = pick(uniform, nonzeroColumns);
    for (const [kind, factor] of [['column sign', -1], ['column × 2', 2], ['column × 0.5', 0.5]] as const) {
      made.push({ kind, expected: { kind: 'columnFactor', columns: [{ index: column, factor }] }, where: `column ${column}`, J: (x) => copy(x).map((row) => { row[column] *= factor; return row; }) });
    }
  }
  // Row i holds residual i + 1's derivatives (an off-by-one in the residual index).
  if (m >= 2) made.push({ kind: 'rows shifted', expected: { kind: 'rowShift', shift: 1 }, where: `by 1 of ${m} rows`, J: (x) => { const J = copy(x); return [...J.slice(1), J[0]]; } });
  // One entry that is not zero at the point (a relative change of a zero changes nothing), the same entry at every size.
  const nonzero = J0.flatMap((row, i) => row.flatMap((v, j) => (v !== 0 ? [[i, j] as const] : [])));
  if (nonzero.length > 0) {
    const [i, j] = pick(uniform, nonzero);
    for (const [kind, size] of [['entry 1e-2', 1e-2], ['entry 1e-4', 1e-4], ['entry 1e-6', 1e-6]] as const) {
      made.push({ kind, expected: { kind: 'entry', row: i, column: j }, where: `entry (${i}, ${j}) = ${J0[i][j].toPrecision(3)}`, J: (x) => { const J = copy(x); J[i][j] *= 1 + size; return J; } });
    }
  }
  return made.flatMap((mutant) => {
    const wrong = mutant.J(point);
    if (wrong.length !== m || wrong.some((row) => row.length !== n)) return [{ ...mutant, relativeSize: Number.NaN }];
    const relativeSize = frobenius(wrong.map((row, i) => minus(row, J0[i]))) / frobenius(J0);
    return relativeSize > 1e-12 ? [{ ...mutant, relativeSize }] : [];
  });
}
