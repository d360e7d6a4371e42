// Reads a Jacobian or Hessian out of the user's realm: number[][] (or an array of typed rows),
// a flat row-major Float64Array / number[] of rows·columns values, or an object that states its
// shape ({ rows, columns | cols, data }). A result of another shape is a finding that names both
// shapes, never a guess.
import type { KindWording } from './kindWording';
import { CheckStopped, describeSite, makeFinding, type CallSite } from './userCalls';

/** A dense row-major matrix copied into plain numbers. */
export interface DenseMatrix {
  rows: number;
  columns: number;
  values: Float64Array;
}

/** Column `column` as a new vector. */
export function columnOf(matrix: DenseMatrix, column: number): Float64Array {
  const out = new Float64Array(matrix.rows);
  for (let i = 0; i < matrix.rows; i++) out[i] = matrix.values[i * matrix.columns + column];
  return out;
}

/** A matrix from its columns (each of length `rows`). */
export function fromColumns(columns: Float64Array[], rows: number): DenseMatrix {
  const values = new Float64Array(rows * columns.length);
  columns.forEach((column, j) => {
    for (let i = 0; i < rows; i++) values[i * columns.length + j] = column[i];
  });
  return { rows, columns: columns.length, values };
}

/** M·v. */
export function times(matrix: DenseMatrix, v: ArrayLike<number>): Float64Array {
  const out = new Float64Array(matrix.rows);
  for (let i = 0; i < matrix.rows; i++) {
    let sum = 0;
    for (let j = 0; j < matrix.columns; j++) sum += matrix.values[i * matrix.columns + j] * v[j];
    out[i] = sum;
  }
  return out;
}

/** Mᵀ·v (Jᵀr for a Jacobian and its residuals). */
export function transposeTimes(matrix: DenseMatrix, v: ArrayLike<number>): Float64Array {
  const out = new Float64Array(matrix.columns);
  for (let i = 0; i < matrix.rows; i++) {
    if (v[i] === 0) continue;
    for (let j = 0; j < matrix.columns; j++) out[j] += matrix.values[i * matrix.columns + j] * v[i];
  }
  return out;
}

// Largest matrix read out of the user's realm (entries): beyond it the check stops with a finding.
const largestMatrix = 2 ** 24;

/**
 * The matrix the derivative function returned, expected `rows` × `columns` (`noun` names it in
 * messages: 'Jacobian', 'Hessian'). Stops the check with a `matrix-wrong-shape` finding for
 * another shape (naming both, and saying "transposed" for columns × rows), ragged rows or a
 * value that is no matrix, and with `non-finite-value` naming the entries that are NaN or ±∞.
 * `wording` names the matrix and its rows in messages (kindWording.ts).
 */
export function readMatrix(result: unknown, rows: number, columns: number, wording: Pick<KindWording, 'derivative' | 'output'>, site: CallSite): DenseMatrix {
  const noun = wording.derivative;
  const where = `at ${describeSite(site)}`;
  const expected = `${rows} × ${columns} (${rows === 1 ? 'one row' : `${rows} rows`}, one per ${wording.output}; ${columns} columns, one per coordinate of the point)`;
  const shape: ShapeFailures = {
    wrongShape: (seen, extra = '') => new CheckStopped(makeFinding('matrix-wrong-shape', 'gradient', `the ${noun} is ${seen} ${where}, but it must be ${expected}${extra}`, site)),
    ragged: (row, length, firstLength) => new CheckStopped(makeFinding('matrix-wrong-shape', 'gradient', `the ${noun} has ragged rows ${where}: row 0 has ${firstLength} entries but row ${row} has ${length}; it must be ${expected}`, site)),
  };
  let matrix: DenseMatrix;
  try {
    matrix = copy(result, rows, columns, shape);
  } catch (err) {
    if (err instanceof CheckStopped) throw err;
    throw new CheckStopped(makeFinding('runtime-error', 'gradient', `reading the ${noun} threw ${where}`, site));
  }
  const bad: Array<[number, number]> = [];
  for (let k = 0; k < matrix.values.length && bad.length < 64; k++) if (!Number.isFinite(matrix.values[k])) bad.push([Math.floor(k / columns), k % columns]);
  if (bad.length > 0) {
    const shown = bad.slice(0, 6).map(([i, j]) => `[${i}][${j}] = ${matrix.values[i * columns + j]}`).join(', ');
    const finding = makeFinding('non-finite-value', 'gradient', `the ${noun} has non-finite entries ${where}: ${shown}${bad.length > 6 ? ` and ${bad.length - 6} more` : ''}`, site);
    finding.entries = bad;
    throw new CheckStopped(finding);
  }
  return matrix;
}

/** The findings a matrix of the wrong shape stops the check with. */
interface ShapeFailures {
  wrongShape(seen: string, extra?: string): CheckStopped;
  ragged(row: number, length: number, firstLength: number): CheckStopped;
}

function copy(result: unknown, rows: number, columns: number, { wrongShape, ragged: raggedRows }: ShapeFailures): DenseMatrix {
  if (result === null || typeof result !== 'object') throw wrongShape(describeValue(result));
  const stated = statedShape(result);
  if (stated) {
    if (stated.rows !== rows || stated.columns !== columns) throw shapeMismatch(stated.rows, stated.columns, rows, columns, wrongShape);
    return flat(stated.data, rows, columns, wrongShape);
  }
  const outer = result as ArrayLike<unknown>;
  const length = outer.length;
  if (typeof length !== 'number' || !Number.isInteger(length) || length < 0) throw wrongShape(describeValue(result));
  if (length === 0) throw wrongShape('empty');
  const first = outer[0];
  if (typeof first === 'number') {
    if (length === rows * columns) return flat(outer, rows, columns, wrongShape);
    throw wrongShape(`a flat array of ${length} numbers`, `; a flat ${rows * columns === 1 ? 'value' : 'matrix'} holds ${rows * columns} (${rows} × ${columns}, row by row)`);
  }
  // Rows: arrays or typed arrays of numbers, all of one length.
  const lengths: number[] = [];
  for (let i = 0; i < length; i++) {
    const row = outer[i] as ArrayLike<unknown> | null;
    const rowLength = row !== null && typeof row === 'object' ? row.length : undefined;
    if (typeof rowLength !== 'number' || !Number.isInteger(rowLength)) throw wrongShape(`an array whose row ${i} is ${describeValue(row)}`);
    lengths.push(rowLength);
  }
  const ragged = lengths.findIndex((l) => l !== lengths[0]);
  if (ragged >= 0) throw raggedRows(ragged, lengths[ragged], lengths[0]);
  if (length !== rows || lengths[0] !== columns) throw shapeMismatch(length, lengths[0], rows, columns, wrongShape);
  if (rows * columns > largestMatrix) throw wrongShape(`${rows} × ${columns}`, `; larger than ${largestMatrix} entries is not read`);
  const values = new Float64Array(rows * columns);
  for (let i = 0; i < rows; i++) {
    const row = outer[i] as ArrayLike<unknown>;
    for (let j = 0; j < columns; j++) {
      const v = row[j];
      if (typeof v !== 'number') throw wrongShape(`an array whose entry [${i}][${j}] is ${describeValue(v)}`);
      values[i * columns + j] = v;
    }
  }
  return { rows, columns, values };
}

function shapeMismatch(seenRows: number, seenColumns: number, rows: number, columns: number, wrongShape: ShapeFailures['wrongShape']): CheckStopped {
  const transposed = seenRows === columns && seenColumns === rows && rows !== columns;
  return wrongShape(`${seenRows} × ${seenColumns}`, transposed ? ': it looks transposed (a row per coordinate instead of a column)' : '');
}

function flat(source: ArrayLike<unknown>, rows: number, columns: number, wrongShape: ShapeFailures['wrongShape']): DenseMatrix {
  if (source.length !== rows * columns) throw wrongShape(`a flat array of ${source.length} numbers`, `; a flat matrix holds ${rows * columns} (${rows} × ${columns}, row by row)`);
  const values = new Float64Array(rows * columns);
  for (let k = 0; k < values.length; k++) {
    const v = source[k];
    if (typeof v !== 'number') throw wrongShape(`a flat array whose value ${k} is ${describeValue(v)}`);
    values[k] = v;
  }
  return { rows, columns, values };
}

/** `{ rows, columns (or cols), data }`: a flat row-major matrix that states its shape. */
function statedShape(result: object): { rows: number; columns: number; data: ArrayLike<unknown> } | null {
  if (Array.isArray(result) || ArrayBuffer.isView(result)) return null;
  const record = result as Record<string, unknown>;
  const rows = record.rows;
  const columns = record.columns ?? record.cols;
  const data = record.data;
  if (typeof rows !== 'number' || typeof columns !== 'number' || data === null || typeof data !== 'object' || typeof (data as ArrayLike<unknown>).length !== 'number') return null;
  return { rows, columns, data: data as ArrayLike<unknown> };
}

function describeValue(value: unknown): string {
  if (value === null) return 'null';
  if (value === undefined) return 'undefined';
  if (Array.isArray(value)) return `an array of length ${value.length}`;
  if (typeof value === 'object') return ArrayBuffer.isView(value) ? 'a typed array' : 'an object';
  return `a ${typeof value}`;
}
