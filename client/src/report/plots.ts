// The report's four plots as SVG strings: pure functions of the report's data,
// no DOM and no VS Code, so they run under node's test runner as they run in the webview.
// Every value of the report enters the SVG through `esc` (or `coord`, which prints only numbers).
import type { DescentRun, ProbeReport, SmoothnessEstimate, StepStudy } from '../../../server/src/engine/types';
import { escapeMarkup as esc, formatBound, formatFigure, isFiniteNumber } from './format';
import {
  coord,
  defaultBox,
  drawAxes,
  drawLegend,
  emptyPlot,
  linearAxis,
  logAxis,
  polylines,
  prefersLogScale,
  project,
  svgDocument,
  xRange,
  yRange,
  type Axis,
} from './svg';

const box = defaultBox;

/** One compared derivative: a component of the full check or a random direction. */
interface Compared {
  index: number;
  analytic: number | null;
  numerical: number | null;
  errorBound: number | null;
  mismatch: boolean;
}

/** Analytic against numerical derivative per component, with the numerical error bound as error bars. */
export function gradientPlot(probe: ProbeReport | undefined, probeIndex = 0): string {
  const title = `Analytic and numerical gradient at probe ${probeIndex + 1}`;
  if (!probe) return emptyPlot('gradient', title, 'No probe was evaluated.');
  const byComponent = probe.components.length > 0;
  const entries: Compared[] = byComponent
    ? probe.components.map((c) => ({ ...c }))
    : probe.directions.map((d, index) => ({ index, ...d }));
  if (entries.length === 0) return emptyPlot('gradient', title, 'No derivative was compared at this probe.');

  const finiteOr = (x: number | null) => (isFiniteNumber(x) ? x : null);
  const extents = entries.flatMap((e) => {
    const values = [e.analytic, e.numerical].filter(isFiniteNumber);
    if (isFiniteNumber(e.numerical) && isFiniteNumber(e.errorBound)) values.push(e.numerical - e.errorBound, e.numerical + e.errorBound);
    return values;
  });
  const x = bandAxis(entries.length);
  const y = linearAxis([0, ...extents]);
  const xs = xRange(box);
  const ys = yRange(box);
  const band = (xs[1] - xs[0]) / entries.length;
  const offset = Math.min(band / 6, 6);

  const marks = entries.map((e, slot) => {
    const cx = project(x, slot, xs);
    const analytic = finiteOr(e.analytic);
    const numerical = finiteOr(e.numerical);
    const parts: string[] = [];
    if (e.mismatch) {
      parts.push(
        `<rect class="mismatch-band" x="${coord(cx - band / 2)}" y="${coord(ys[1])}" width="${coord(band)}" height="${coord(ys[0] - ys[1])}"/>`,
        `<text class="mismatch-mark" x="${coord(cx)}" y="${coord(ys[1] + 12)}" text-anchor="middle">✗</text>`,
      );
    }
    if (numerical !== null && isFiniteNumber(e.errorBound)) {
      const nx = cx + offset;
      const top = coord(project(y, numerical + e.errorBound, ys));
      const bottom = coord(project(y, numerical - e.errorBound, ys));
      parts.push(
        `<g class="error-bar" data-bound="${esc(e.errorBound)}"><line x1="${coord(nx)}" x2="${coord(nx)}" y1="${top}" y2="${bottom}"/>` +
          `<line x1="${coord(nx - 3)}" x2="${coord(nx + 3)}" y1="${top}" y2="${top}"/><line x1="${coord(nx - 3)}" x2="${coord(nx + 3)}" y1="${bottom}" y2="${bottom}"/></g>`,
      );
    }
    if (numerical !== null) {
      const ny = project(y, numerical, ys);
      parts.push(`<rect class="numerical" x="${coord(cx + offset - 3)}" y="${coord(ny - 3)}" width="6" height="6"/>`);
    }
    if (analytic !== null) parts.push(`<circle class="analytic" cx="${coord(cx - offset)}" cy="${coord(project(y, analytic, ys))}" r="3.5"/>`);
    const name = byComponent ? `component ${e.index}` : `direction ${e.index + 1}`;
    const hover = `${name}: analytic ${formatFigure(e.analytic)}, numerical ${formatFigure(e.numerical)} ± ${formatBound(e.errorBound)}${e.mismatch ? ' (mismatch)' : ''}`;
    return `<g class="component${e.mismatch ? ' mismatch' : ''}" data-index="${esc(e.index)}"><title>${esc(hover)}</title>${parts.join('')}</g>`;
  });

  const mismatched = entries.filter((e) => e.mismatch).map((e) => e.index);
  const description =
    `${entries.length} ${byComponent ? 'component' : 'random direction'}${entries.length === 1 ? '' : 's'} compared; ` +
    (mismatched.length ? `mismatch at ${byComponent ? 'component' : 'direction'} ${mismatched.map((i) => (byComponent ? i : i + 1)).join(', ')}.` : 'no mismatch.');
  const body =
    drawAxes(box, x, y, {
      x: byComponent ? 'component i' : 'random direction',
      y: byComponent ? '∂f/∂xᵢ' : 'directional derivative ∇f·v',
      xTickLabel: (slot) => String(byComponent ? entries[slot].index : entries[slot].index + 1),
    }) +
    zeroLine(y) +
    drawLegend(box, [
      { className: 'analytic', label: 'analytic' },
      { className: 'numerical', label: 'numerical ± error bound' },
      ...(mismatched.length ? [{ className: 'mismatch', label: 'mismatch' }] : []),
    ]) +
    `<g class="marks">${marks.join('')}</g>`;
  return svgDocument('gradient', title, description, body);
}

/** Error of the central difference against the step, on log–log axes, with the chosen step marked. */
export function stepErrorPlot(study: StepStudy | null | undefined): string {
  const title = 'Numerical-derivative error against step size';
  if (!study) return emptyPlot('step-error', title, 'No step study was made for this pair.');
  const points = study.steps
    .map((h, i) => [h, study.errors[i]] as const)
    .filter(([h, e]) => isFiniteNumber(h) && h > 0 && isFiniteNumber(e) && e > 0);
  if (points.length === 0) return emptyPlot('step-error', title, 'Every step gave the same difference: no error to plot.');
  const chosen = isFiniteNumber(study.chosenStep) && study.chosenStep > 0 ? study.chosenStep : null;
  const x = logAxis([...points.map(([h]) => h), ...(chosen === null ? [] : [chosen])]);
  const y = logAxis(points.map(([, e]) => e));
  const xs = xRange(box);
  const ys = yRange(box);
  const at = ([h, e]: readonly [number, number]): [number, number] => [project(x, h, xs), project(y, e, ys)];
  const line = polylines(points.map(at), 'step-error-line');
  const dots = points
    .map((p) => {
      const [px, py] = at(p);
      return `<circle class="step-point" data-step="${esc(p[0])}" data-error="${esc(p[1])}" cx="${coord(px)}" cy="${coord(py)}" r="3"/>`;
    })
    .join('');
  let marker = '';
  if (chosen !== null) {
    const px = coord(project(x, chosen, xs));
    marker =
      `<g class="chosen-step" data-step="${esc(chosen)}"><line x1="${px}" x2="${px}" y1="${coord(ys[0])}" y2="${coord(ys[1])}"/>` +
      `<text x="${px}" y="${coord(ys[1] - 4)}" text-anchor="middle">chosen h = ${esc(formatBound(chosen))}</text></g>`;
  }
  const where = study.component >= 0 ? `component ${study.component}` : 'a random direction';
  const dropped = study.steps.length - points.length;
  const description =
    `Error of the central difference on ${where} at ${points.length} steps` +
    (dropped > 0 ? ` (${dropped} with zero or missing error not shown)` : '') +
    (chosen === null ? '.' : `; chosen step ${formatBound(chosen)}.`);
  const body =
    drawAxes(box, x, y, { x: 'step h', y: '|error|' }) +
    drawLegend(box, [
      { className: 'step-error', label: `error on ${where}` },
      { className: 'chosen-step', label: 'chosen step' },
    ]) +
    `<g class="marks">${line}${dots}${marker}</g>`;
  return svgDocument('step-error', title, description, body);
}

/** Ritz values of the local Hessian per probe, with the L̂ and μ̂ lines. */
export function eigenvaluePlot(probes: ProbeReport[], smoothness: SmoothnessEstimate | null | undefined): string {
  const title = 'Estimated Hessian eigenvalues near the probes';
  const perProbe = probes.map((p) => (p.smoothness?.ritzValues ?? []).filter(isFiniteNumber));
  const lipschitz = isFiniteNumber(smoothness?.lipschitz) ? smoothness.lipschitz : null;
  const mu = isFiniteNumber(smoothness?.mu) ? smoothness.mu : null;
  const all = [...perProbe.flat(), ...(lipschitz === null ? [] : [lipschitz]), ...(mu === null ? [] : [mu])];
  if (perProbe.every((values) => values.length === 0)) return emptyPlot('eigenvalues', title, 'No curvature was estimated.');
  const x = bandAxis(probes.length);
  const y = prefersLogScale(all) ? logAxis(all) : linearAxis(all);
  const xs = xRange(box);
  const ys = yRange(box);
  const dots = perProbe
    .flatMap((values, i) =>
      values.map(
        (v) => `<circle class="ritz" data-probe="${i}" data-value="${esc(v)}" cx="${coord(project(x, i, xs))}" cy="${coord(project(y, v, ys))}" r="3.5"/>`,
      ),
    )
    .join('');
  const level = (className: string, value: number | null, label: string) => {
    if (value === null) return '';
    const py = coord(project(y, value, ys));
    return (
      `<g class="${esc(className)}" data-value="${esc(value)}"><line x1="${coord(xs[0])}" x2="${coord(xs[1])}" y1="${py}" y2="${py}"/>` +
      `<text x="${coord(xs[1] - 4)}" y="${py}" dy="-0.4em" text-anchor="end">${esc(`${label} = ${formatFigure(value)}`)}</text></g>`
    );
  };
  const description =
    `Ritz values of the Lanczos iteration at ${probes.length} probe${probes.length === 1 ? '' : 's'}; ` +
    `L̂ = ${formatFigure(lipschitz)}, μ̂ = ${formatFigure(mu)}. Local estimates near the probes only.`;
  const body =
    drawAxes(box, x, y, { x: 'probe', y: y.kind === 'log' ? 'eigenvalue (log scale)' : 'eigenvalue', xTickLabel: (i) => String(i + 1) }) +
    (y.kind === 'linear' ? zeroLine(y) : '') +
    drawLegend(box, [
      { className: 'ritz', label: 'Ritz values' },
      { className: 'lipschitz-line', label: 'L̂' },
      { className: 'mu-line', label: 'μ̂' },
    ]) +
    `<g class="marks">${level('lipschitz-line', lipschitz, 'L̂')}${level('mu-line', mu, 'μ̂')}${dots}</g>`;
  return svgDocument('eigenvalues', title, description, body);
}

const runNames: Record<DescentRun['label'], string> = { declared: 'declared α', safe: '1/L̂', limit: '2/λ⁺' };

/** f along the short gradient-descent runs; log y when the values are positive and span decades. */
export function descentPlot(runs: DescentRun[] | undefined): string {
  const title = 'f along short gradient-descent runs';
  const usable = (runs ?? []).filter((run) => run.values.some(isFiniteNumber));
  if (usable.length === 0) return emptyPlot('descent', title, 'No gradient-descent run was made.');
  const all = usable.flatMap((run) => run.values.filter(isFiniteNumber));
  const steps = Math.max(...usable.map((run) => run.values.length));
  const x = linearAxis([0, Math.max(steps - 1, 1)]);
  const y = prefersLogScale(all) ? logAxis(all) : linearAxis(all);
  const xs = xRange(box);
  const ys = yRange(box);
  const series = usable.map((run) => {
    const points = run.values.map((v, k): [number, number] | null => (isFiniteNumber(v) ? [project(x, k, xs), project(y, v, ys)] : null));
    let lastFinite = run.values.length - 1;
    while (!isFiniteNumber(run.values[lastFinite])) lastFinite--;
    const end = points[lastFinite]!;
    // Values that overflowed to ±Infinity arrive as null: the run diverged after its last finite value.
    const diverged = lastFinite < run.values.length - 1;
    const endMark =
      `<circle class="run-end" cx="${coord(end[0])}" cy="${coord(end[1])}" r="3"/>` +
      (diverged ? `<text class="diverged-mark" x="${coord(end[0] + 5)}" y="${coord(end[1])}" dy="0.32em">overflow</text>` : '');
    return (
      `<g class="run run-${esc(run.label)}" data-run="${esc(run.label)}" data-rate="${esc(run.rate)}" data-decreased="${esc(run.decreased)}">` +
      `<title>${esc(`${runNames[run.label]}: α = ${formatFigure(run.rate)}, f ${run.decreased ? 'went down' : 'did not go down'}`)}</title>` +
      polylines(points, 'run-line') +
      endMark +
      '</g>'
    );
  });
  const description = usable
    .map((run) => `${runNames[run.label]} (α = ${formatFigure(run.rate)}): f ${run.decreased ? 'went down' : 'did not go down'}`)
    .join('; ');
  const body =
    drawAxes(box, x, y, { x: 'gradient step k', y: y.kind === 'log' ? 'f(w_k) (log scale)' : 'f(w_k)' }) +
    drawLegend(
      box,
      usable.map((run) => ({ className: `run-${run.label}`, label: `${runNames[run.label]} = ${formatFigure(run.rate)}` })),
    ) +
    `<g class="marks">${series.join('')}</g>`;
  return svgDocument('descent', title, `${description}.`, body);
}

/** Index of the probe with the largest relative error, the most telling one; -1 without probes. */
export function worstProbeIndex(probes: ProbeReport[]): number {
  let worst = -1;
  probes.forEach((p, i) => {
    const error = isFiniteNumber(p.maxRelError) ? p.maxRelError : Infinity;
    const best = worst < 0 ? -Infinity : isFiniteNumber(probes[worst].maxRelError) ? probes[worst].maxRelError : Infinity;
    if (error > best) worst = i;
  });
  return worst;
}

/** Slots 0..n−1 centred in equal bands, ticks thinned to about a dozen labels. */
function bandAxis(count: number): Axis {
  const stride = Math.max(1, Math.ceil(count / 12));
  const ticks = Array.from({ length: count }, (_, i) => i).filter((i) => i % stride === 0);
  return { kind: 'linear', min: -0.5, max: count - 0.5, ticks };
}

function zeroLine(y: Axis): string {
  if (!(y.min < 0 && y.max > 0)) return '';
  const py = coord(project(y, 0, yRange(box)));
  return `<line class="zero-line" x1="${coord(xRange(box)[0])}" x2="${coord(xRange(box)[1])}" y1="${py}" y2="${py}"/>`;
}
