// What the CLI learned about each file, in the shape every output format reads.
import type { DocumentCheck } from '../check/checkDocument';
import type { PairStatus } from '../engine/types';

export interface FileOutcome {
  /** The path as shown to the user (relative to the working folder where possible). */
  path: string;
  check: DocumentCheck | null;
  /** Why the file could not be checked at all (unreadable, not text). */
  error: string | null;
}

export interface Summary {
  files: number;
  pairs: number;
  byStatus: Record<PairStatus, number>;
  errors: number;
  warnings: number;
  unreadable: number;
}

export function summarise(outcomes: FileOutcome[]): Summary {
  const summary: Summary = {
    files: outcomes.length,
    pairs: 0,
    byStatus: { pass: 0, fail: 0, inconclusive: 0, error: 0 },
    errors: 0,
    warnings: 0,
    unreadable: 0,
  };
  for (const outcome of outcomes) {
    if (outcome.error) summary.unreadable++;
    const findings = [...(outcome.check?.fileFindings ?? []), ...(outcome.check?.pairs.flatMap((p) => p.report.findings) ?? [])];
    for (const finding of findings) {
      if (finding.severity === 'error') summary.errors++;
      if (finding.severity === 'warning') summary.warnings++;
    }
    for (const { report } of outcome.check?.pairs ?? []) {
      summary.pairs++;
      summary.byStatus[report.status]++;
    }
  }
  return summary;
}

/** 2 when some input could not be read, 1 when any finding is an error, else 0. */
export function exitCode(summary: Summary): number {
  if (summary.unreadable > 0) return 2;
  return summary.errors > 0 ? 1 : 0;
}
