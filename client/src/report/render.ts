// The report's content as an HTML string: the verdict, the caution, the figures,
// the four plots and the per-component table. Pure, so it is tested under node;
// the webview script only inserts it. Every value of the report is escaped where it
// enters the markup, words and numbers too: the report crossed two processes, and the
// first of them ran the user's code.
import type { PairReport, ProbeReport } from '../../../server/src/engine/types';
import type { PairReportResult } from '../../../server/src/shared/protocol';
import { derivativeRows, describeLeastSquaresForm, errorShapeOf, kindWording, leastSquaresLabels, noDivergenceStep, verdictOf } from '../../../server/src/shared/wording';
import { escapeMarkup as esc, formatBound, formatDuration, formatFigure } from './format';
import { undecidedWording } from '../../../server/src/engine/decision';
import { errorHeatMap } from './heatMap';
import { descentPlot, eigenvaluePlot, gradientPlot, stepErrorPlot, worstProbeIndex } from './plots';

/** What the eigenvalue plot shows, by kind: Ritz values for a gradient, an exact spectrum for the matrix kinds. */
const spectrumCaption: Record<PairReport['kind'], string> = {
  gradient: 'Ritz values of the Lanczos iteration on Hessian-vector products.',
  jacobian: 'Ritz values of the Lanczos iteration on Hessian-vector products of ½‖r‖² (differences of Jᵀr).',
  hessian: 'Eigenvalues of the Hessian at the probe.',
  hessianVectorProduct: 'Ritz values of the Lanczos iteration on Hessian-vector products.',
};

export const localEstimateCaution =
  'Every smoothness figure (L̂, μ̂, κ̂, 1/L̂, 2/λ⁺) is a local estimate measured near the probe points, not a bound over the whole domain: far from the probes the objective may be much steeper.';

export function renderReport(result: PairReportResult): string {
  const { report } = result;
  const worst = worstProbeIndex(report.probes);
  const studied = report.probes.find((p) => p.stepStudy);
  const withDescent = report.probes[worst]?.descent.length ? report.probes[worst] : report.probes.find((p) => p.descent.length > 0);
  const pairName = result.gradient ? `${result.value} / ${result.gradient}` : result.value;
  return [
    `<header class="report-header"><h1>${esc(pairName)}</h1>`,
    `<span class="verdict verdict-${esc(report.status)}" data-status="${esc(report.status)}">${esc(verdictOf(report))}</span>`,
    '<div class="actions"><button type="button" data-action="check-again">Check again</button>',
    '<button type="button" data-action="copy-json">Copy as JSON</button></div></header>',
    `<p class="caution" role="note">${esc(localEstimateCaution)}</p>`,
    findingsList(report),
    `<section class="figures"><h2>Figures</h2>${figuresTable(report)}</section>`,
    '<section class="plots"><h2>Plots</h2>',
    report.matrix
      ? plotFigure(errorHeatMap(report.kind, report.probes[worst], Math.max(worst, 0)), 'Each cell is one entry: row i an output, column j a coordinate.')
      : plotFigure(gradientPlot(report.probes[worst], Math.max(worst, 0)), worst >= 0 ? `At probe ${worst + 1}, the one with the largest relative error.` : ''),
    plotFigure(stepErrorPlot(studied?.stepStudy), 'The chosen step balances truncation error (large h) against rounding error (small h).'),
    plotFigure(eigenvaluePlot(report.probes, report.smoothness), spectrumCaption[report.kind]),
    plotFigure(descentPlot(withDescent?.descent), 'Gradient steps w ← w − α∇f(w) from a probe.'),
    '</section>',
    worst >= 0 ? `<section class="components"><h2>Derivatives at probe ${worst + 1}</h2>${componentTable(report, report.probes[worst])}</section>` : '',
    consoleSection(result.console),
    `<footer class="settings">${esc(`Checked with seed ${result.settings.seed}, ${result.settings.probeCount} random probes when none is given, time limit ${formatDuration(result.settings.timeoutMs)}.`)}</footer>`,
  ].join('');
}

/** The report, or, for a report of a shape this page cannot read, a line saying so instead of a blank page. */
export function renderReportOrFailure(result: PairReportResult): string {
  try {
    return renderReport(result);
  } catch (error) {
    return renderFailure(result?.objective ?? 'this pair', `its report could not be shown (${String(error)})`);
  }
}

export function renderLoading(objective: string): string {
  return `<p class="loading">Checking ${esc(objective)}…</p>`;
}

export function renderFailure(objective: string, message: string): string {
  return `<p class="failure">No report for ${esc(objective)}: ${esc(message)}</p>`;
}

function plotFigure(svg: string, caption: string): string {
  return `<figure class="plot-figure">${svg}${caption ? `<figcaption>${esc(caption)}</figcaption>` : ''}</figure>`;
}

function findingsList(report: PairReport): string {
  if (report.findings.length === 0) return '';
  const items = report.findings
    .map((f) => `<li class="finding severity-${esc(f.severity)}" data-code="${esc(f.code)}"><code>${esc(f.code)}</code> ${esc(f.message)}</li>`)
    .join('');
  return `<section class="findings"><h2>Findings</h2><ul>${items}</ul></section>`;
}

function figuresTable(report: PairReport): string {
  const s = report.smoothness;
  const rate = report.learningRate;
  const words = kindWording[report.kind];
  const leastSquares = report.matrix?.leastSquares;
  const rows: Array<[string, string]> = [
    ['Verdict', verdictOf(report)],
    ['Max relative error', formatBound(report.maxRelError)],
    ['Shape of the error', errorShapeOf(report) ?? '—'],
    ...(report.matrix ? [['Shape of the matrix', `${report.matrix.rows} × ${report.matrix.columns}`] as [string, string]] : []),
    ...(leastSquares
      ? ([
          [leastSquaresLabels.sigmaMaxSquared, formatFigure(leastSquares.sigmaMaxSquared)],
          [leastSquaresLabels.conditionNumber, leastSquares.conditionNumber === null ? leastSquaresLabels.singular : formatFigure(leastSquares.conditionNumber)],
        ] as Array<[string, string]>)
      : []),
    ...(report.leastSquaresForm ? [['Built from residuals', describeLeastSquaresForm(report.leastSquaresForm)] as [string, string]] : []),
    ['L̂ (local Lipschitz estimate)', formatFigure(s?.lipschitz)],
    ['Safe step 1/L̂', formatFigure(s?.safeStep)],
    ['Divergence step 2/λ⁺', s?.divergenceStep === null ? noDivergenceStep : formatFigure(s?.divergenceStep)],
    ['μ̂ (smallest curvature)', formatFigure(s?.mu)],
    ['κ̂ = L̂/μ̂', formatFigure(s?.kappa)],
    ['Learning rate', rate ? `${rate.name} = ${formatFigure(rate.value)}: ${rate.status}` : 'none declared'],
    ['Dimension', formatFigure(report.dimension)],
    ['Probes', String(report.probes.length)],
    ['Evaluations', `${words.value} ${report.evaluations.objective}, ${words.derivative} ${report.evaluations.gradient}`],
    ['Time', formatDuration(report.elapsedMs)],
  ];
  const body = rows.map(([name, value]) => `<tr><th scope="row">${esc(name)}</th><td>${esc(value)}</td></tr>`).join('');
  return `<table class="figures-table" id="figures-table"><tbody>${body}</tbody></table>`;
}

/** The compared derivatives of a probe, whatever the kind: components, entries or directions. */
function componentTable(report: PairReport, probe: ProbeReport): string {
  const { heading, rows } = derivativeRows(report.kind, probe);
  const head = `<thead><tr><th scope="col">${esc(heading)}</th><th scope="col">analytic</th><th scope="col">numerical</th><th scope="col">error bound</th><th scope="col">relative error</th><th scope="col"></th></tr></thead>`;
  const body = rows
    .map(
      (row) =>
        `<tr class="${row.mismatch ? 'mismatch' : ''}" data-index="${esc(row.label)}">` +
        cells([row.label, formatFigure(row.analytic), formatFigure(row.numerical), formatBound(row.bound), row.relError === null ? '' : formatBound(row.relError)]) +
        `${row.mismatch ? '<td class="mismatch-cell">✗ mismatch</td>' : row.undecided ? `<td class="undecided-cell">${esc(undecidedWording[row.undecided])}</td>` : '<td></td>'}</tr>`,
    )
    .join('');
  return `<table class="component-table">${head}<tbody>${body}</tbody></table>`;
}

/** Table cells, each value escaped. */
function cells(values: unknown[]): string {
  return values.map((value) => `<td>${esc(value)}</td>`).join('');
}

function consoleSection(lines: string[]): string {
  if (!lines.length) return '';
  return `<section class="console"><h2>Console output during the check</h2><pre>${esc(lines.join('\n'))}</pre></section>`;
}
