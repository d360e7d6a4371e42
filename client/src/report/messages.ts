// Messages between the report panel (extension host) and its webview script.
import type { PairReportResult } from '../../../server/src/shared/protocol';

/** Extension host → webview. */
export type ToWebview =
  | { type: 'loading'; objective: string }
  | { type: 'report'; result: PairReportResult }
  | { type: 'failed'; objective: string; message: string };

/** Webview → extension host. */
export type FromWebview = { type: 'ready' } | { type: 'copyJson' } | { type: 'checkAgain' };
