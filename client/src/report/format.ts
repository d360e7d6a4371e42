// Number and text formatting shared by the report's tables and plots.
// Pure: the report's figures come through JSON, where NaN and ±Infinity arrive as null.
import { trimExponent } from '../../../server/src/engine/format';

/** A number from the report, or nothing when JSON turned a non-finite value into null. */
export type Figure = number | null | undefined;

export function isFiniteNumber(x: unknown): x is number {
  return typeof x === 'number' && Number.isFinite(x);
}

/** A value to compare: up to 6 significant digits, exponent notation when very large or small. */
export function formatFigure(x: Figure): string {
  // A report that is not what its type says (a string where a number belongs) shows nothing.
  if (typeof x !== 'number') return '—';
  if (Number.isNaN(x)) return 'NaN';
  if (!Number.isFinite(x)) return x > 0 ? '∞' : '−∞';
  if (x === 0) return '0';
  const magnitude = Math.abs(x);
  const text = magnitude >= 1e6 || magnitude < 1e-4 ? trimExponent(x.toExponential(5)) : String(Number(x.toPrecision(6)));
  return text.replace(/^-/, '−');
}

/** An error bound or a relative error: two significant digits are enough. */
export function formatBound(x: Figure): string {
  if (!isFiniteNumber(x)) return formatFigure(x);
  if (x === 0) return '0';
  return trimExponent(x.toExponential(1)).replace(/^-/, '−');
}

/** An axis tick: short, and exact for powers of ten. */
export function formatTick(x: number): string {
  if (x === 0) return '0';
  const magnitude = Math.abs(x);
  if (magnitude >= 1e4 || magnitude < 1e-3) return trimExponent(x.toExponential(2)).replace(/^-/, '−');
  return String(Number(x.toPrecision(4))).replace(/^-/, '−');
}

/** 10^k as a label: "1e-8", "1", "10". */
export function formatPowerOfTen(exponent: number): string {
  if (exponent >= 0 && exponent <= 3) return String(10 ** exponent);
  return `1e${exponent}`.replace('-', '−');
}

export function formatDuration(ms: Figure): string {
  if (!isFiniteNumber(ms)) return '—';
  return ms < 1000 ? `${Math.round(ms)} ms` : `${(ms / 1000).toFixed(2)} s`;
}

/**
 * Escapes a value for HTML and XML content and for double- or single-quoted attribute values.
 * Takes any value: numbers and words from the report reach the page through here too, as a
 * report that crossed processes may hold text where its type says number or enum.
 */
export function escapeMarkup(value: unknown): string {
  return String(value).replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}
