// SVG building blocks for the report's plots: axes, scales, frame, legend.
// Pure string building, so plots are testable under node. Colours come from CSS
// classes that the report's stylesheet maps to the editor theme. Every value put into
// the markup goes through `esc`, or through `coord`, which prints only numbers.
import { escapeMarkup as esc, formatPowerOfTen, formatTick, isFiniteNumber } from './format';

/** Drawing area: the whole SVG, and the margins around the plotting rectangle. */
export interface Box {
  width: number;
  height: number;
  left: number;
  right: number;
  top: number;
  bottom: number;
}

export const defaultBox: Box = { width: 560, height: 300, left: 68, right: 16, top: 30, bottom: 46 };

/** One axis: its kind, its range in data units, and where ticks go. */
export interface Axis {
  kind: 'linear' | 'log';
  min: number;
  max: number;
  ticks: number[];
}

export type Range = readonly [from: number, to: number];

export const xRange = (box: Box): Range => [box.left, box.width - box.right];
/** SVG y grows downwards, so data's min maps to the bottom. */
export const yRange = (box: Box): Range => [box.height - box.bottom, box.top];

/** A linear axis over the values, with "nice" round ticks. */
export function linearAxis(values: number[], tickCount = 5): Axis {
  const finite = values.filter(isFiniteNumber);
  let min = finite.length ? Math.min(...finite) : 0;
  let max = finite.length ? Math.max(...finite) : 1;
  if (max - min <= 1e-12 * Math.max(Math.abs(min), Math.abs(max), 1e-300)) {
    const pad = min === 0 ? 1 : Math.abs(min) * 0.1;
    min -= pad;
    max += pad;
  }
  const step = niceStep((max - min) / tickCount);
  const first = Math.floor(min / step) * step;
  const last = Math.ceil(max / step) * step;
  const ticks: number[] = [];
  for (let k = 0; first + k * step <= last + step * 1e-9; k++) ticks.push(cleanTick(first + k * step, step));
  return { kind: 'linear', min: first, max: last, ticks };
}

/** A log axis over the positive values, from one power of ten to another, ticks at powers of ten. */
export function logAxis(values: number[], maxTicks = 9): Axis {
  const positive = values.filter((v) => isFiniteNumber(v) && v > 0);
  let low = positive.length ? Math.floor(Math.log10(Math.min(...positive))) : 0;
  let high = positive.length ? Math.ceil(Math.log10(Math.max(...positive))) : 1;
  if (high <= low) high = low + 1;
  // Thin the labels of wide ranges to every k-th decade, keeping the ends on a tick.
  const stride = Math.ceil((high - low) / (maxTicks - 1));
  low = Math.floor(low / stride) * stride;
  high = Math.ceil(high / stride) * stride;
  const ticks: number[] = [];
  // Number('1e-4') is exactly the double nearest 10⁻⁴; 10 ** -4 is not.
  const power = (e: number) => Number(`1e${e}`);
  for (let e = low; e <= high; e += stride) ticks.push(power(e));
  return { kind: 'log', min: power(low), max: power(high), ticks };
}

/** Log scale when the values are all positive and span at least two decades (common practice). */
export function prefersLogScale(values: number[]): boolean {
  const finite = values.filter(isFiniteNumber);
  if (finite.length < 2 || finite.some((v) => v <= 0)) return false;
  // Two decades, give or take the rounding of estimates that sit on them (1 and 99.9999999).
  return Math.max(...finite) / Math.min(...finite) >= 100 * (1 - 1e-6);
}

/** Maps a data value to an SVG coordinate. */
export function project(axis: Axis, value: number, [from, to]: Range): number {
  const t =
    axis.kind === 'log'
      ? (Math.log10(value) - Math.log10(axis.min)) / (Math.log10(axis.max) - Math.log10(axis.min))
      : (value - axis.min) / (axis.max - axis.min);
  return from + t * (to - from);
}

/** A coordinate as SVG text: two decimals, and never NaN (a caller bug shows as 0, not as a broken SVG). */
export function coord(x: number): string {
  return Number.isFinite(x) ? String(Math.round(x * 100) / 100) : '0';
}

export function svgDocument(plot: string, title: string, description: string, body: string, box: Box = defaultBox): string {
  const id = esc(`plot-${plot}`);
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" class="plot" data-plot="${esc(plot)}" role="img" ` +
    `viewBox="0 0 ${box.width} ${box.height}" aria-labelledby="${id}-title ${id}-desc">` +
    `<title id="${id}-title">${esc(title)}</title><desc id="${id}-desc">${esc(description)}</desc>` +
    body +
    '</svg>'
  );
}

/** A plot with nothing to show, saying why. */
export function emptyPlot(plot: string, title: string, reason: string, box: Box = defaultBox): string {
  const text = `<text class="empty-note" x="${coord(box.width / 2)}" y="${coord(box.height / 2)}" text-anchor="middle">${esc(reason)}</text>`;
  return svgDocument(plot, title, reason, text, box);
}

export interface AxisLabels {
  x: string;
  y: string;
  /** Tick labels of the x axis, when they are not the numbers themselves (e.g. component indices). */
  xTickLabel?: (value: number) => string;
}

/** Grid, ticks with their values (data-value, for tests and tools), and the axis titles. */
export function drawAxes(box: Box, x: Axis, y: Axis, labels: AxisLabels): string {
  const [x0, x1] = xRange(box);
  const [y0, y1] = yRange(box);
  const tickText = (axis: Axis, v: number) => (axis.kind === 'log' ? formatPowerOfTen(Math.round(Math.log10(v))) : formatTick(v));
  const xTicks = x.ticks
    .map((v) => {
      const px = coord(project(x, v, [x0, x1]));
      const label = labels.xTickLabel ? labels.xTickLabel(v) : tickText(x, v);
      return (
        `<g class="tick x-tick" data-value="${esc(v)}"><line class="grid" x1="${px}" x2="${px}" y1="${coord(y1)}" y2="${coord(y0)}"/>` +
        `<text x="${px}" y="${coord(y0 + 16)}" text-anchor="middle">${esc(label)}</text></g>`
      );
    })
    .join('');
  const yTicks = y.ticks
    .map((v) => {
      const py = coord(project(y, v, [y0, y1]));
      return (
        `<g class="tick y-tick" data-value="${esc(v)}"><line class="grid" x1="${coord(x0)}" x2="${coord(x1)}" y1="${py}" y2="${py}"/>` +
        `<text x="${coord(x0 - 6)}" y="${py}" dy="0.32em" text-anchor="end">${esc(tickText(y, v))}</text></g>`
      );
    })
    .join('');
  const frame = `<rect class="frame" x="${coord(x0)}" y="${coord(y1)}" width="${coord(x1 - x0)}" height="${coord(y0 - y1)}"/>`;
  const xTitle = `<text class="axis-label x-label" x="${coord((x0 + x1) / 2)}" y="${coord(box.height - 6)}" text-anchor="middle">${esc(labels.x)}</text>`;
  const yMid = coord((y0 + y1) / 2);
  const yTitle = `<text class="axis-label y-label" x="14" y="${yMid}" text-anchor="middle" transform="rotate(-90 14 ${yMid})">${esc(labels.y)}</text>`;
  return `<g class="axes">${frame}${xTicks}${yTicks}${xTitle}${yTitle}</g>`;
}

export interface LegendItem {
  className: string;
  label: string;
}

/** One row of swatches above the plotting rectangle. */
export function drawLegend(box: Box, items: LegendItem[]): string {
  let x = box.left;
  const y = box.top / 2;
  const parts = items.map((item) => {
    const part =
      `<g class="legend-item" data-series="${esc(item.className)}"><rect class="swatch ${esc(item.className)}-swatch" x="${coord(x)}" y="${coord(y - 5)}" width="10" height="10"/>` +
      `<text x="${coord(x + 14)}" y="${coord(y)}" dy="0.32em">${esc(item.label)}</text></g>`;
    // Rough text width: 6.5 px a character at the report's 11 px font.
    x += 28 + item.label.length * 6.5;
    return part;
  });
  return `<g class="legend">${parts.join('')}</g>`;
}

/** A polyline through the points, split where a value is missing. */
export function polylines(points: Array<[number, number] | null>, className: string): string {
  const runs: string[][] = [[]];
  for (const point of points) {
    if (point) runs[runs.length - 1].push(`${coord(point[0])},${coord(point[1])}`);
    else if (runs[runs.length - 1].length) runs.push([]);
  }
  return runs
    .filter((run) => run.length > 0)
    .map((run) => `<polyline class="${esc(className)}" points="${run.join(' ')}"/>`)
    .join('');
}

/**
 * A round tick step of 1, 2 or 5 times a power of ten near the raw step.
 * Heckbert, "Nice Numbers for Graph Labels", Graphics Gems, 1990.
 */
function niceStep(raw: number): number {
  const power = 10 ** Math.floor(Math.log10(raw));
  const fraction = raw / power;
  const nice = fraction <= 1 ? 1 : fraction <= 2 ? 2 : fraction <= 5 ? 5 : 10;
  return nice * power;
}

/** Removes the float dust of k·step (0.30000000000000004 → 0.3, 5.6e-17 → 0). */
function cleanTick(value: number, step: number): number {
  return Math.abs(value) < step * 1e-9 ? 0 : Number(value.toPrecision(12));
}
