// The error of a Jacobian or Hessian per entry, as a grid: each cell is one entry, shaded by
// how far its analytic value lies from the difference, in units of the difference's error
// bound, on a log scale. A cell within its bound is left pale; an undecided entry is grey.
// Pure, like plots.ts: it runs under node's test runner as in the webview.
import { kindWording } from '../../../server/src/engine/kindWording';
import type { ProbeReport, TargetKind } from '../../../server/src/engine/types';
import { escapeMarkup as esc, formatBound } from './format';
import { coord, emptyPlot, svgDocument, type Box } from './svg';

// Rows and columns drawn; a larger matrix shows its wrong and undecided entries only, which the report keeps.
const largestSide = 64;
// Shading saturates at this many error bounds (10⁴).
const saturation = 4;

/** Heat map of |analytic − numerical| / bound for the entries of one probe. */
export function errorHeatMap(kind: TargetKind, probe: ProbeReport | undefined, probeIndex = 0): string {
  const wording = kindWording[kind];
  const title = `Error of the ${wording.derivative} per entry at probe ${probeIndex + 1}`;
  const entries = probe?.entries ?? [];
  if (entries.length === 0) return emptyPlot('heat-map', title, 'No entry was compared at this probe.');
  const rows = Math.min(largestSide, Math.max(...entries.map((e) => e.row)) + 1);
  const columns = Math.min(largestSide, Math.max(...entries.map((e) => e.column)) + 1);
  const cell = Math.max(4, Math.min(28, Math.floor(400 / Math.max(rows, columns))));
  const box: Box = { width: 68 + columns * cell + 150, height: 30 + rows * cell + 46, left: 68, right: 150, top: 30, bottom: 46 };
  const cells = entries
    .filter((e) => e.row < rows && e.column < columns)
    .map((e) => {
      const ratio = Math.abs(e.analytic - e.numerical) / (e.errorBound > 0 ? e.errorBound : Number.MIN_VALUE);
      const level = e.undecided && !e.mismatch ? 0 : Math.min(1, Math.max(0, Math.log10(Math.max(ratio, 1)) / saturation));
      const state = e.mismatch ? 'heat-wrong' : e.undecided ? 'heat-undecided' : 'heat-agrees';
      const label = `${wording.entry(e.row, e.column)}: analytic ${e.analytic}, numerical ${e.numerical} ± ${formatBound(e.errorBound)}`;
      return (
        `<rect class="heat-cell ${state}" data-row="${esc(e.row)}" data-column="${esc(e.column)}" x="${coord(box.left + e.column * cell)}" y="${coord(box.top + e.row * cell)}" ` +
        `width="${cell}" height="${cell}"${e.mismatch ? ` fill-opacity="${coord(0.35 + 0.65 * level)}"` : ''}><title>${esc(label)}</title></rect>`
      );
    })
    .join('');
  const axes =
    `<text class="axis-label" x="${coord(box.left + (columns * cell) / 2)}" y="${coord(box.top + rows * cell + 30)}" text-anchor="middle">column j (coordinate), 0–${columns - 1}</text>` +
    `<text class="axis-label" transform="translate(${coord(box.left - 16)} ${coord(box.top + (rows * cell) / 2)}) rotate(-90)" text-anchor="middle">row i (${esc(wording.output)}), 0–${rows - 1}</text>`;
  const legendX = box.left + columns * cell + 16;
  const legend = [
    ['heat-wrong', 'wrong (darker: further beyond the bound)'],
    ['heat-agrees', 'agrees within the bound'],
    ['heat-undecided', 'undecided'],
  ]
    .map(([state, text], i) => `<rect class="heat-cell ${state}" x="${coord(legendX)}" y="${coord(box.top + i * 20)}" width="12" height="12"/><text x="${coord(legendX + 18)}" y="${coord(box.top + i * 20 + 10)}">${esc(text)}</text>`)
    .join('');
  const drawn = entries.filter((e) => e.row < rows && e.column < columns);
  const beyond = entries.length - drawn.length;
  const description = `${drawn.filter((e) => e.mismatch).length} of ${drawn.length} entries drawn disagree with their differences${beyond > 0 ? `; ${beyond} more lie beyond row or column ${largestSide - 1} and are listed in the table below` : ''}.`;
  return svgDocument('heat-map', title, description, cells + axes + legend, box);
}
