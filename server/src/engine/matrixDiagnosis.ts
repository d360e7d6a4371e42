// The shape of a wrong Jacobian or Hessian, read off the table of analytic entries A and their
// differences N: transposed, rows shifted by one output, columns swapped, a whole matrix, a
// column or a row off by a sign or a constant factor, a wrong diagonal, one wrong entry, or
// errors confined to a block. Each shape must explain every entry to within its error bound.
import type { EntryCheck, MatrixDiagnosis } from './types';
import { largest, smallest } from './vectors';

// Shapes must hold to this relative accuracy on top of the numerical error bound (as for gradients).
const shapeTolerance = 1e-6;
// A block covering more than this share of the matrix is no region worth naming.
const regionShare = 0.5;
// Wrong entries in at most this many columns (or rows) are named by them.
const fewLines = 2;

interface Table {
  rows: number;
  columns: number;
  at(i: number, j: number): EntryCheck | undefined;
}

/** True when the analytic entry equals `expected` within the entry's bound. */
function near(analytic: number, expected: number, bound: number): boolean {
  return Math.abs(analytic - expected) <= 2 * bound + shapeTolerance * Math.max(Math.abs(analytic), Math.abs(expected));
}

/**
 * The shape of the error, or null when nothing is wrong. `complete` says every entry was
 * checked (full mode); otherwise only the entries given (located ones) are read, and only the
 * shapes those can show (one entry, a block) are named.
 */
export function diagnoseMatrix(rows: number, columns: number, entries: EntryCheck[], complete: boolean): MatrixDiagnosis | null {
  const wrong = entries.filter((e) => e.mismatch);
  if (wrong.length === 0) return null;
  const byPosition = new Map(entries.map((e) => [e.row * columns + e.column, e]));
  const table: Table = { rows, columns, at: (i, j) => byPosition.get(i * columns + j) };
  // One wrong entry is named as such, whatever else it could be read as (the only nonzero of its column, say).
  if (wrong.length === 1) return { kind: 'entry', row: wrong[0].row, column: wrong[0].column };
  if (complete && entries.length === rows * columns) {
    const shape = transposed(table) ?? rowShift(table, wrong) ?? lineSwap(table, wrong, 'column') ?? lineSwap(table, wrong, 'row') ?? factors(table, wrong) ?? diagonalOffset(table, wrong) ?? oneSided(table, wrong);
    if (shape) return shape;
  }
  const wrongColumns = [...new Set(wrong.map((e) => e.column))].sort((a, b) => a - b);
  const wrongRows = [...new Set(wrong.map((e) => e.row))].sort((a, b) => a - b);
  if (wrongColumns.length <= fewLines && wrongColumns.length < columns) return { kind: 'columns', columns: wrongColumns };
  if (wrongRows.length <= fewLines && wrongRows.length < rows) return { kind: 'rows', rows: wrongRows };
  const rowsSpan: [number, number] = [smallest(wrong.map((e) => e.row)), largest(wrong.map((e) => e.row))];
  const columnsSpan: [number, number] = [smallest(wrong.map((e) => e.column)), largest(wrong.map((e) => e.column))];
  const area = (rowsSpan[1] - rowsSpan[0] + 1) * (columnsSpan[1] - columnsSpan[0] + 1);
  if (area <= regionShare * rows * columns) return { kind: 'region', rows: rowsSpan, columns: columnsSpan };
  return { kind: 'unknown' };
}

/** Every entry (i, j) equals the difference of (j, i), and the true matrix is not symmetric (else transposing changes nothing). */
function transposed(table: Table): MatrixDiagnosis | null {
  if (table.rows !== table.columns || table.rows < 2) return null;
  let asymmetric = false;
  for (let i = 0; i < table.rows; i++) {
    for (let j = 0; j < table.columns; j++) {
      const entry = table.at(i, j)!;
      const mirror = table.at(j, i)!;
      const bound = Math.max(entry.errorBound, mirror.errorBound);
      if (!near(entry.analytic, mirror.numerical, bound)) return null;
      asymmetric ||= !near(entry.numerical, mirror.numerical, bound);
    }
  }
  return asymmetric ? { kind: 'transposed' } : null;
}

/**
 * Row i holds output i + s's derivatives for every row that has such an output (s = ±1), and
 * some such row is wrong (else only the edge row is, which is no shift).
 */
function rowShift(table: Table, wrong: EntryCheck[]): MatrixDiagnosis | null {
  if (table.rows < 3) return null;
  for (const shift of [1, -1]) {
    let holds = wrong.some((e) => e.row + shift >= 0 && e.row + shift < table.rows);
    for (let i = 0; i < table.rows && holds; i++) {
      const source = i + shift;
      if (source < 0 || source >= table.rows) continue;
      for (let j = 0; j < table.columns && holds; j++) {
        const entry = table.at(i, j)!;
        const other = table.at(source, j)!;
        holds = near(entry.analytic, other.numerical, Math.max(entry.errorBound, other.errorBound));
      }
    }
    if (holds) return { kind: 'rowShift', shift };
  }
  return null;
}

/** The wrong columns (or rows) pair up: column j holds column k's derivatives and k holds j's. */
function lineSwap(table: Table, wrong: EntryCheck[], line: 'column' | 'row'): MatrixDiagnosis | null {
  const lines = [...new Set(wrong.map((e) => e[line]))].sort((a, b) => a - b);
  if (lines.length < 2) return null;
  const across = line === 'column' ? table.rows : table.columns;
  const at = (k: number, i: number) => (line === 'column' ? table.at(i, k)! : table.at(k, i)!);
  const holds = (j: number, k: number) => {
    for (let i = 0; i < across; i++) {
      const [a, b] = [at(j, i), at(k, i)];
      if (!near(a.analytic, b.numerical, Math.max(a.errorBound, b.errorBound))) return false;
    }
    return true;
  };
  const pairs: Array<[number, number]> = [];
  const left = new Set(lines);
  for (const j of lines) {
    if (!left.has(j)) continue;
    const partner = lines.find((k) => k !== j && left.has(k) && holds(j, k) && holds(k, j));
    if (partner === undefined) return null;
    pairs.push([j, partner]);
    left.delete(j);
    left.delete(partner);
  }
  return line === 'column' ? { kind: 'columnSwap', pairs } : { kind: 'rowSwap', pairs };
}

/**
 * Constant factors: the whole matrix, each wrong column, each wrong row, or the diagonal alone,
 * each scaled by one factor. The factor is fitted on the entries whose difference is well above
 * its bound, then must explain every entry of that line.
 */
function factors(table: Table, wrong: EntryCheck[]): MatrixDiagnosis | null {
  const all: EntryCheck[] = [];
  for (let i = 0; i < table.rows; i++) for (let j = 0; j < table.columns; j++) all.push(table.at(i, j)!);
  const whole = commonFactor(all);
  if (whole !== null) return { kind: 'matrixFactor', factor: whole };
  if (table.rows === table.columns && wrong.every((e) => e.row === e.column)) {
    const diagonal = commonFactor(all.filter((e) => e.row === e.column));
    if (diagonal !== null) return { kind: 'diagonalFactor', factor: diagonal };
  }
  const lineFactors = (key: 'row' | 'column') => {
    const lines = [...new Set(wrong.map((e) => e[key]))].sort((a, b) => a - b);
    const found: Array<{ index: number; factor: number }> = [];
    for (const index of lines) {
      const factor = commonFactor(all.filter((e) => e[key] === index));
      if (factor === null) return null;
      found.push({ index, factor });
    }
    return found;
  };
  const columns = lineFactors('column');
  if (columns && columns.length < table.columns) return { kind: 'columnFactor', columns };
  const rows = lineFactors('row');
  if (rows && rows.length < table.rows) return { kind: 'rowFactor', rows };
  return null;
}

/** Only the diagonal is wrong, every entry by one offset: a λ·I term (a ridge, a damping) missing or extra. */
function diagonalOffset(table: Table, wrong: EntryCheck[]): MatrixDiagnosis | null {
  if (table.rows !== table.columns || wrong.length < 2 || !wrong.every((e) => e.row === e.column)) return null;
  const diagonal = Array.from({ length: table.rows }, (_, i) => table.at(i, i)!);
  const offset = diagonal.reduce((sum, e) => sum + (e.analytic - e.numerical), 0) / diagonal.length;
  return diagonal.every((e) => near(e.analytic, e.numerical + offset, e.errorBound)) ? { kind: 'diagonalOffset', offset } : null;
}

/** Every wrong entry is off the diagonal and its mirror image is right: a term added at (a, b) and not at (b, a). */
function oneSided(table: Table, wrong: EntryCheck[]): MatrixDiagnosis | null {
  if (table.rows !== table.columns || !wrong.every((e) => e.row !== e.column && !table.at(e.column, e.row)!.mismatch)) return null;
  const side = wrong.every((e) => e.row > e.column) ? 'lower' : wrong.every((e) => e.row < e.column) ? 'upper' : null;
  return { kind: 'oneSided', side };
}

/** c ≠ 1 with analytic ≈ c·numerical for every entry given, or null. */
function commonFactor(entries: EntryCheck[]): number | null {
  const telling = entries.filter((e) => Math.abs(e.numerical) > 10 * e.errorBound);
  if (telling.length === 0) return null;
  const factor = telling.reduce((sum, e) => sum + e.analytic * e.numerical, 0) / telling.reduce((sum, e) => sum + e.numerical * e.numerical, 0);
  if (!Number.isFinite(factor) || Math.abs(factor - 1) <= 1e-3) return null;
  // Round to a short value when it is one (2, −1, 0.5), so the wording reads as the bug does.
  const rounded = Math.abs(factor - Math.round(factor * 1000) / 1000) <= 1e-6 * Math.abs(factor) ? Math.round(factor * 1000) / 1000 : factor;
  return entries.every((e) => near(e.analytic, rounded * e.numerical, Math.abs(rounded) * e.errorBound)) ? rounded : null;
}
