// The report of a pair before (or without) any measurement.
import type { Finding, PairReport, PairStatus, TargetKind } from './types';

export function emptyReport(status: PairStatus, findings: Finding[] = [], dimension: number | null = null, kind: TargetKind = 'gradient'): PairReport {
  return {
    kind,
    status,
    dimension,
    maxRelError: null,
    diagnosis: null,
    smoothness: null,
    learningRate: null,
    probes: [],
    findings,
    evaluations: { objective: 0, gradient: 0 },
    elapsedMs: 0,
  };
}
