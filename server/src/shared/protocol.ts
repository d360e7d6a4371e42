// The custom LSP messages between the VS Code client and the Slopecheck server.
// Both sides import this file; every method shares the `slopecheck/` prefix.
import type { DocumentCheckSummary } from './summary';
import type { PairReport, TargetKind } from '../engine/types';

/** Sent by the client as `initializationOptions`. */
export interface InitializationOptions {
  /** Workspace trust; a client that sends nothing is treated as trusted. */
  trusted?: boolean;
}

export const methods = {
  /** client to server (notification): workspace trust changed. */
  setTrust: 'slopecheck/setTrust',
  /** client to server (request): the full report of one pair, for the report view. */
  pairReport: 'slopecheck/pairReport',
  /** client to server (request): the pairs of a document, for a quick pick. */
  listPairs: 'slopecheck/listPairs',
  /** client to server (request): check a document again now, ignoring the cache. */
  checkAgain: 'slopecheck/checkAgain',
  /** server to client (notification): a document's summary changed, for the status bar. */
  documentSummary: 'slopecheck/documentSummary',
} as const;

export interface SetTrustParams {
  trusted: boolean;
}

export interface DocumentParams {
  uri: string;
}

export interface PairReportParams {
  uri: string;
  /** The target's key, as listed by `listPairs`. */
  objective: string;
}

export interface PairListing {
  /** The target's key: its objective's name for a gradient pair, its derivative's (a Jacobian's, a Hessian's) for the other kinds. */
  objective: string;
  /** What is checked; the two functions are named by kindWording. */
  kind: TargetKind;
  /** The value function's name (the objective, the residual function, the gradient of a Hessian). */
  value: string;
  gradient: string | null;
  /** 0-based line of the name the target is known by. */
  line: number;
  status: PairReport['status'] | 'pending';
}

export interface PairReportResult {
  uri: string;
  /** The target's key. */
  objective: string;
  /** The value function's name. */
  value: string;
  gradient: string | null;
  line: number;
  report: PairReport;
  /** The user's console output during the check. */
  console: string[];
  /** Settings the check ran with, for reproducing it. */
  settings: { seed: number; timeoutMs: number; probeCount: number };
}

export type DocumentSummaryParams = DocumentCheckSummary & { uri: string };

/** Result of `checkAgain`: the document's summary once the check has finished; null for a document the server does not have open. */
export type CheckAgainResult = DocumentSummaryParams | null;
