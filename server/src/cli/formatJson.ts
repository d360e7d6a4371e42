// The JSON document of `slopecheck --format json`. Other tools read the field
// names of the pair objects; new fields may be added, none renamed.
// It goes to a terminal too: printableLines escapes, inside strings, the control and
// bidi characters JSON.stringify leaves raw (C1, U+202E), so the document parses the same.
import { findingLine } from '../check/checkDocument';
import { anchorOf } from '../discovery/pairing';
import type { NamedSpan } from '../discovery/types';
import type { FileOutcome } from './outcome';
import { summarise } from './outcome';
import { documentNamespace } from '../discovery/importerCalls';
import { printableLines } from '../shared/plainText';
import { describeCall } from '../shared/wording';

export function formatJson(outcomes: FileOutcome[], meta: { version: string; seed: number }): string {
  const files = outcomes.map((outcome) => ({
    path: outcome.path,
    ...(outcome.error ? { error: outcome.error } : {}),
    skipped: (outcome.check?.skipped ?? []).map((pair) => pair.key),
    findings: (outcome.check?.fileFindings ?? []).map((f) => ({ code: f.code, severity: f.severity, message: f.message, line: f.span.line })),
    pairs: (outcome.check?.pairs ?? []).map(({ pair, report, console }) => ({
      kind: pair.kind,
      objective: pair.objective.name,
      gradient: pair.gradient?.name ?? pair.objective.name,
      combined: pair.gradient === null,
      line: anchorOf<NamedSpan>(pair).nameSpan.line,
      call: describeCall(pair.plan, documentNamespace),
      dataFrom: pair.entry ? { path: pair.entry.fileName, line: pair.entry.line } : null,
      status: report.status,
      maxRelError: report.maxRelError,
      lipschitz: report.smoothness?.lipschitz ?? null,
      safeStep: report.smoothness?.safeStep ?? null,
      learningRate: report.learningRate
        ? { name: report.learningRate.name, value: report.learningRate.value, status: report.learningRate.status, ...(report.learningRate.momentum ? { momentum: report.learningRate.momentum } : {}) }
        : null,
      findings: report.findings.map((f) => ({
        code: f.code,
        severity: f.severity,
        message: f.message,
        line: findingLine(outcome.check!.fileName, pair, f),
        ...(f.components ? { components: f.components } : {}),
        ...(f.entries ? { entries: f.entries } : {}),
      })),
      dimension: report.dimension,
      diagnosis: report.diagnosis,
      // Jacobians and Hessians: the shape, the shape of the error, asymmetry and the least-squares figures.
      ...(report.matrix ? { matrix: report.matrix } : {}),
      ...(report.leastSquaresForm ? { leastSquaresForm: report.leastSquaresForm } : {}),
      mu: report.smoothness?.mu ?? null,
      kappa: report.smoothness?.kappa ?? null,
      divergenceStep: report.smoothness?.divergenceStep ?? null,
      probes: report.probes.length,
      evaluations: report.evaluations,
      elapsedMs: report.elapsedMs,
      console,
    })),
  }));
  const document = JSON.stringify(
    {
      tool: { name: 'slopecheck', version: meta.version },
      seed: meta.seed,
      caution: 'Smoothness figures (lipschitz, safeStep, mu, kappa) are local estimates near the probe points, not global guarantees.',
      files,
      summary: summarise(outcomes),
    },
    null,
    2,
  );
  return printableLines(document);
}
