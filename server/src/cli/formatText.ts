// The human-readable table of `slopecheck` (the default format). Every text that comes
// from the user's files or code goes through printableLine: a terminal must not obey it.
import { findingLine } from '../check/checkDocument';
import { anchorOf } from '../discovery/pairing';
import type { NamedSpan } from '../discovery/types';
import type { Finding, Severity } from '../engine/types';
import type { FileOutcome } from './outcome';
import { summarise } from './outcome';
import { printableLine as shown } from '../shared/plainText';
import { kindWording, verdictCountWords, verdictOf } from '../shared/wording';

const severityWord: Record<Severity, string> = { error: 'error', warning: 'warn', info: 'note' };

const columns = ['line', 'function → derivative', 'verdict', 'max rel err', 'L̂ (local)', 'step 1/L̂', 'learning rate'];

export function formatText(outcomes: FileOutcome[]): string {
  const out: string[] = [];
  for (const outcome of outcomes) {
    out.push(shown(outcome.path));
    if (outcome.error) {
      out.push(`  cannot check: ${shown(outcome.error)}`, '');
      continue;
    }
    const check = outcome.check!;
    for (const f of check.fileFindings) out.push(`  ${findingText(f, f.span.line)}`);
    for (const pair of check.skipped) out.push(`  skipped  line ${anchorOf<NamedSpan>(pair).nameSpan.line}  ${shown(pair.key)} (// slopecheck-skip)`);
    if (check.pairs.length === 0) {
      if (check.skipped.length === 0) out.push('  no function/derivative pairs found');
      out.push('');
      continue;
    }
    const rows = check.pairs.map(({ pair, report }) => [
      String(anchorOf<NamedSpan>(pair).nameSpan.line),
      pair.gradient ? `${pair.objective.name} → ${pair.gradient.name}` : `${pair.objective.name} (${kindWording[pair.kind].value} and ${kindWording[pair.kind].derivative})`,
      verdictOf(report),
      sci(report.maxRelError),
      sci(report.smoothness?.lipschitz ?? null),
      sci(report.smoothness?.safeStep ?? null),
      report.learningRate ? `${report.learningRate.name} = ${report.learningRate.value} (${report.learningRate.status})` : '—',
    ].map(shown));
    const widths = columns.map((c, i) => Math.max(c.length, ...rows.map((r) => r[i].length)));
    const line = (cells: string[]) => '  ' + cells.map((c, i) => c.padEnd(widths[i])).join('  ').trimEnd();
    out.push(line(columns));
    check.pairs.forEach(({ pair, report }, i) => {
      out.push(line(rows[i]));
      for (const f of report.findings) out.push(`      ${findingText(f, findingLine(check.fileName, pair, f))}`);
    });
    out.push('');
  }
  const s = summarise(outcomes);
  out.push(
    `${s.pairs} pair${s.pairs === 1 ? '' : 's'} in ${s.files} file${s.files === 1 ? '' : 's'}: ` +
      (['pass', 'fail', 'inconclusive', 'error'] as const).map((status) => `${s.byStatus[status]} ${verdictCountWords[status]}`).join(', ') +
      (s.unreadable ? `, ${s.unreadable} unreadable` : ''),
    'L̂ and the steps 1/L̂ are local estimates near the probe points, not guarantees for the whole domain.',
  );
  return out.join('\n') + '\n';
}

/** `error  line 12  gradient-mismatch: …`, printable whatever the report holds. */
function findingText(finding: Finding, line: number): string {
  return shown(`${severityWord[finding.severity]}  line ${line}  ${finding.code}: ${finding.message}`);
}

function sci(value: number | null): string {
  if (value === null || !Number.isFinite(value)) return '—';
  return value.toExponential(2);
}
