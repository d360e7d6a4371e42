// A document's verdicts in a few numbers: for the status bar and the CLI's summary line.
import type { PairStatus } from '../engine/types';

export interface DocumentCheckSummary {
  state: 'checking' | 'done' | 'untrusted' | 'idle';
  byStatus: Record<PairStatus, number>;
  /** Smallest safe step 1/L̂ over the document's pairs, if any was estimated. */
  smallestSafeStep: number | null;
}
