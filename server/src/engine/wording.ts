// The words of a gradient mismatch, one text wherever it is read: the finding's message (CLI,
// JSON, SARIF), the editor's diagnostic (with the user's names), the hover and the report (the
// shape of the error). Everything is worded from a probe's report, so every reader gets the same.
import { formatBound, formatList, formatValue, shortNumber } from './format';
import type { KindWording } from './kindWording';
import type { ComponentCheck, Diagnosis, MatrixDiagnosis, ProbeReport } from './types';

/** The shape of a wrong gradient in a few words. */
export function describeDiagnosis(diagnosis: Diagnosis | null): string {
  if (!diagnosis) return 'wrong';
  switch (diagnosis.kind) {
    case 'sign':
      return 'sign flipped';
    case 'factor':
      return `off by a constant factor (${shortNumber(diagnosis.factor, 6)}× the true gradient)`;
    case 'permutation':
      return `components swapped (${diagnosis.pairs.map(([i, j]) => `${i} ↔ ${j}`).join(', ')})`;
    case 'subset':
      return `${diagnosis.components.length === 1 ? 'component' : 'components'} ${formatList(diagnosis.components, 6)} wrong`;
    default:
      return 'wrong, with no simple pattern';
  }
}

/** What the sentence calls the two functions: the user's names where the reader has them. */
export interface MismatchNames {
  gradient: string;
  objective: string | null;
}

/** Inside the engine the functions have no names. */
export const anonymousNames: MismatchNames = { gradient: 'the gradient', objective: null };

/** Most wrong components shown with their figures. */
const shownComponents = 4;

/**
 * The mismatch at one probe: where, the shape of the error, the wrong components with analytic
 * and numerical values and the bound, and in directional mode how many random directions
 * disagreed and how the wrong components were located.
 */
export function mismatchMessage(probe: ProbeReport, probeIndex: number, diagnosis: Diagnosis | null, names: MismatchNames = anonymousNames): string {
  let head = `${names.gradient} disagrees with central differences${names.objective ? ` of ${names.objective}` : ''} at probe ${probeIndex + 1}`;
  const directions = probe.directions.filter((d) => d.mismatch);
  if (directions.length > 0) {
    const [example] = directions;
    head += ` along ${directions.length} of ${probe.directions.length} random ${probe.directions.length === 1 ? 'direction' : 'directions'} (e.g. ∇f·v = ${formatValue(example.analytic)}, numerical ${formatValue(example.numerical)} ± ${formatBound(example.errorBound)})`;
  }
  const sentences = [`${head}: ${describeDiagnosis(diagnosis)}.`];
  const wrong = probe.components.filter((c) => c.mismatch);
  if (wrong.length > 0) sentences.push(`${capitalised(describeComponents(wrong))}.`);
  const located = probe.localisation;
  if (located) {
    const stopped = located.incomplete ? '; the search stopped before every discrepancy was explained, so more components may be wrong' : '';
    sentences.push(`Located by ${located.pooledDifferences} pooled directional and ${located.coordinateDifferences} coordinate differences${stopped}.`);
  }
  return sentences.join(' ');
}

function describeComponents(components: ComponentCheck[]): string {
  const parts = components.slice(0, shownComponents).map((c) => `component ${c.index}: analytic ${formatValue(c.analytic)}, numerical ${formatValue(c.numerical)} ± ${formatBound(c.errorBound)}`);
  if (components.length > shownComponents) parts.push(`and ${components.length - shownComponents} more`);
  return parts.join('; ');
}

function capitalised(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** The shape of a wrong Jacobian or Hessian in a few words; rows are outputs, columns coordinates. */
export function describeMatrixDiagnosis(diagnosis: MatrixDiagnosis | null, wording: KindWording): string {
  if (!diagnosis) return 'wrong';
  const factorWords = (factor: number) => {
    if (factor === -1) return 'has the wrong sign';
    const size = Math.abs(factor) >= 1 ? `${shortNumber(Math.abs(factor), 4)}× too large` : `${shortNumber(1 / Math.abs(factor), 4)}× too small`;
    return factor < 0 ? `has the wrong sign and is ${size}` : `is ${size}`;
  };
  switch (diagnosis.kind) {
    case 'transposed':
      return 'transposed (row i holds the derivatives along coordinate i)';
    case 'rowShift':
      return `rows shifted by one ${wording.output} (row i holds ${wording.output} i ${diagnosis.shift > 0 ? '+' : '−'} 1)`;
    case 'columnSwap':
      return `columns swapped (${diagnosis.pairs.map(([i, j]) => `${i} ↔ ${j}`).join(', ')})`;
    case 'rowSwap':
      return `rows swapped (${diagnosis.pairs.map(([i, j]) => `${wording.output}s ${i} ↔ ${j}`).join(', ')})`;
    case 'matrixFactor':
      return diagnosis.factor === -1 ? 'sign flipped' : `off by a constant factor (${shortNumber(diagnosis.factor, 6)}× the true ${wording.derivative})`;
    case 'columnFactor':
      return diagnosis.columns.map((c) => `column ${c.index} ${factorWords(c.factor)}`).join('; ');
    case 'rowFactor':
      return diagnosis.rows.map((r) => `row ${r.index} ${factorWords(r.factor)}`).join('; ');
    case 'diagonalFactor':
      return `the diagonal alone is wrong: ${shortNumber(diagnosis.factor, 6)}× the true one`;
    case 'diagonalOffset':
      return `the diagonal alone is off, every entry by ${shortNumber(diagnosis.offset, 4)} (a term λ·I, such as a ridge or damping, missing or extra)`;
    case 'oneSided':
      return `every wrong entry's mirror image is right${diagnosis.side ? ` (all ${diagnosis.side === 'lower' ? 'below' : 'above'} the diagonal)` : ''}: terms added at [i][j] and not at [j][i]`;
    case 'entry':
      return `one entry wrong, ${wording.entry(diagnosis.row, diagnosis.column)}`;
    case 'columns':
      return `${diagnosis.columns.length === 1 ? 'column' : 'columns'} ${formatList(diagnosis.columns)} wrong, not by one constant factor (a factor that varies by ${wording.output}, such as a chain-rule term, is missing or extra)`;
    case 'rows':
      return `${diagnosis.rows.length === 1 ? 'row' : 'rows'} ${formatList(diagnosis.rows)} (${wording.output} ${formatList(diagnosis.rows)}) wrong, not by one constant factor`;
    case 'region':
      return `wrong entries confined to rows ${span(diagnosis.rows)}, columns ${span(diagnosis.columns)}`;
    default:
      return 'wrong, with no simple pattern';
  }
}

function span([from, to]: [number, number]): string {
  return from === to ? `${from}` : `${from}–${to}`;
}

/**
 * A wrong Jacobian or Hessian at one probe: the shape of the error, then the wrong entries with
 * analytic and numerical values and bounds, and in directional mode how they were located.
 */
export function matrixMismatchMessage(probe: ProbeReport, probeIndex: number, diagnosis: MatrixDiagnosis | null, wording: KindWording, names: MismatchNames = { gradient: `the ${wording.derivative}`, objective: null }): string {
  let head = `${names.gradient} disagrees with central differences${names.objective ? ` of ${names.objective}` : ''} at probe ${probeIndex + 1}`;
  const directions = probe.directions.filter((d) => d.mismatch);
  if (directions.length > 0) head += ` along ${directions.length} of ${probe.directions.length} random ${probe.directions.length === 1 ? 'direction' : 'directions'}`;
  const sentences = [`${head}: ${describeMatrixDiagnosis(diagnosis, wording)}.`];
  const wrong = (probe.entries ?? []).filter((e) => e.mismatch);
  if (wrong.length > 0) {
    const parts = wrong.slice(0, shownComponents).map((e) => `${wording.entry(e.row, e.column)}: analytic ${formatValue(e.analytic)}, numerical ${formatValue(e.numerical)} ± ${formatBound(e.errorBound)}`);
    if (wrong.length > shownComponents) parts.push(`and ${wrong.length - shownComponents} more`);
    sentences.push(`${capitalised(parts.join('; '))}.`);
  }
  const located = probe.localisation;
  if (located) {
    const stopped = located.incomplete ? '; the search stopped before every discrepancy was explained, so more entries may be wrong' : '';
    sentences.push(`Located by ${located.pooledDifferences} pooled directional and ${located.coordinateDifferences} column differences${stopped}.`);
  }
  return sentences.join(' ');
}
