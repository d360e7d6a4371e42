// The hover card of a pair: verdict, error, local smoothness and steps, probes and cost.
// Pure functions of the report, so they are tested without an editor.
import type { PairOutcome } from '../check/checkDocument';
import type { DiscoveredPair, SourceSpan } from '../discovery/types';
import type { RateStatus } from '../engine/types';
import { documentNamespace } from '../discovery/importerCalls';
import { baseName, describeCall, describeLeastSquaresForm, errorShapeOf, kindWording, leastSquaresLabels, noDivergenceStep, shortNumber, verdictOf, withoutNamespace } from '../shared/wording';

export type NameRole = 'objective' | 'gradient' | 'learningRate';

/**
 * The pair whose objective, gradient or learning-rate name covers `offset`. A gradient shared by
 * its pair and a Hessian is its pair's: names a target is known by (its anchor) and the gradients
 * of gradient pairs come before the value function of a Hessian or product.
 */
export function nameAt(pairs: DiscoveredPair[], offset: number): { pair: DiscoveredPair; role: NameRole } | null {
  const covers = (span: SourceSpan | undefined) => span !== undefined && span.start <= offset && offset <= span.end;
  const ordered = [...pairs].sort((a, b) => Number(a.kind !== 'gradient') - Number(b.kind !== 'gradient'));
  for (const pair of ordered) {
    if (covers(pair.objective.nameSpan)) return { pair, role: 'objective' };
    if (covers(pair.gradient?.nameSpan)) return { pair, role: 'gradient' };
    if (covers(pair.learningRate?.nameSpan)) return { pair, role: 'learningRate' };
  }
  return null;
}

const rateWords: Record<RateStatus, string> = {
  safe: 'safe (at or below 1/L̂)',
  aggressive: 'aggressive (between 1/L̂ and 2/λ⁺: may oscillate)',
  divergent: 'divergent (at or above 2/λ⁺)',
};

const shownProbes = 2;
const shownCoordinates = 3;

/** Markdown card for a pair; `outcome` is null while no check has finished. */
export function hoverMarkdown(pair: DiscoveredPair, outcome: PairOutcome | null, checking: boolean): string {
  const words = kindWording[pair.kind];
  const title = pair.gradient ? `\`${pair.objective.name}\` → \`${pair.gradient.name}\`` : `\`${pair.objective.name}\` (${words.value} and ${words.derivative})`;
  if (pair.skipped) return `**${title}** · not checked: \`// slopecheck-skip\` is above it`;
  if (!outcome) return `**${title}** · ${checking ? 'checking…' : 'not checked yet'}`;
  const { report } = outcome;
  const verdict = report.status === 'fail' ? `${verdictOf(report)}: ${errorShapeOf(report) ?? 'wrong'}` : verdictOf(report);
  const s = report.smoothness;
  const rows: Array<[string, string]> = [];
  if (report.maxRelError !== null) rows.push(['max relative error', shortNumber(report.maxRelError)]);
  const leastSquares = report.matrix?.leastSquares;
  if (leastSquares) {
    rows.push([leastSquaresLabels.sigmaMaxSquared, shortNumber(leastSquares.sigmaMaxSquared)]);
    rows.push([leastSquaresLabels.conditionNumber, leastSquares.conditionNumber === null ? leastSquaresLabels.singular : shortNumber(leastSquares.conditionNumber)]);
    // J ≡ 0 has no curvature to bound a step by.
    if (leastSquares.sigmaMaxSquared > 0) rows.push(['gradient descent on ½‖r‖², on that model', `safe at steps ≤ 1/σmax² = ${shortNumber(1 / leastSquares.sigmaMaxSquared)}; diverges from 2/σmax² = ${shortNumber(2 / leastSquares.sigmaMaxSquared)}`]);
  }
  if (s) {
    rows.push(['L̂ (local Lipschitz estimate)', shortNumber(s.lipschitz)]);
    rows.push(['safe step 1/L̂', shortNumber(s.safeStep)]);
    rows.push(['divergence at 2/λ⁺', s.divergenceStep === null ? noDivergenceStep : shortNumber(s.divergenceStep)]);
    rows.push(['μ̂ (smallest curvature)', `${shortNumber(s.mu)}${s.mu < 0 ? ' (not convex here)' : ''}`]);
    rows.push(['κ̂ = L̂/μ̂', s.kappa === null ? '— (μ̂ ≤ 0)' : shortNumber(s.kappa)]);
  }
  if (report.leastSquaresForm) rows.push(['built from residuals', describeLeastSquaresForm(report.leastSquaresForm)]);
  const rate = report.learningRate;
  if (rate) {
    const momentum = rate.momentum ? `; used with momentum \`${rate.momentum.name}\` = ${rate.momentum.value}, not taken into account` : '';
    rows.push([`learning rate \`${rate.name}\` = ${rate.value}`, rateWords[rate.status] + momentum]);
  }
  rows.push(['called as', `\`${describeCall(pair.plan, documentNamespace)}\`${pair.entry ? ` with the data of ${baseName(pair.entry.fileName)}, line ${pair.entry.line}` : ''}`]);
  if (pair.plan.start !== null && report.probes.length > 0) {
    // A mismatch at the start ends the check there: no perturbed probe was run.
    const others = report.status === 'fail' && report.probes.length === 1 ? 'the check stopped at its mismatch' : 'the others perturb it';
    rows.push(['probe 1', `your start \`${withoutNamespace(pair.plan.start, documentNamespace)}\`; ${others}`]);
  }
  if (report.probes.length > 0) rows.push(['probes', describeProbes(report.probes.map((p) => p.point), report.dimension)]);
  rows.push(['work', `${report.evaluations.objective} ${words.value} and ${report.evaluations.gradient} ${words.derivative} evaluations in ${Math.round(report.elapsedMs)} ms`]);

  const lines = [`**${title}** · ${verdict}`, '', '| | |', '|:--|:--|', ...rows.map(([k, v]) => `| ${k} | ${v} |`)];
  const notes = report.findings.filter((f) => f.severity !== 'info' || report.status !== 'pass').map((f) => `\`${f.code}\``);
  if (notes.length > 0) lines.push('', `Findings: ${[...new Set(notes)].join(', ')}`);
  if (s || report.maxRelError !== null) lines.push('', '_L̂, μ̂, κ̂ and the steps are local estimates near the probes, not bounds for the whole domain._');
  return lines.join('\n');
}

function describeProbes(points: number[][], dimension: number | null): string {
  const n = dimension ?? points[0]?.length ?? 0;
  const shown = points.slice(0, shownProbes).map((point) => {
    const head = point.slice(0, shownCoordinates).map((v) => shortNumber(v)).join(', ');
    return `[${head}${n > shownCoordinates ? ', …' : ''}]`;
  });
  const more = points.length > shownProbes ? `, and ${points.length - shownProbes} more` : '';
  return `${points.length} in dimension ${n}: ${shown.join(', ')}${more}`;
}

