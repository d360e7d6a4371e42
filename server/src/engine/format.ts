// Number formatting for finding messages: short, but exact enough to compare.

export function formatValue(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return '0';
  const magnitude = Math.abs(x);
  if (magnitude >= 1e6 || magnitude < 1e-4) return trimExponent(x.toExponential(6));
  return String(Number(x.toPrecision(7)));
}

/** An error bound or noise level: one significant digit is enough. */
export function formatBound(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return '0';
  return x.toExponential(0).replace('e+', 'e');
}

export function formatList(items: number[], limit = 8): string {
  const shown = items.slice(0, limit).join(', ');
  return items.length > limit ? `${shown} and ${items.length - limit} more` : shown;
}

/** "1.50000e-7" → "1.5e-7". */
export function trimExponent(text: string): string {
  const [mantissa, exponent] = text.split('e');
  const trimmed = mantissa.includes('.') ? mantissa.replace(/0+$/, '').replace(/\.$/, '') : mantissa;
  return `${trimmed}e${exponent.replace('+', '')}`;
}

/** A figure for a card or a lens: three significant digits, exponent form when very large or small. */
export function shortNumber(x: number | null | undefined, digits = 3): string {
  if (x === null || x === undefined) return '—';
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return '0';
  const magnitude = Math.abs(x);
  if (magnitude >= 1e4 || magnitude < 1e-3) return Number(x.toPrecision(digits)).toExponential().replace('e+', 'e');
  return String(Number(x.toPrecision(digits)));
}
