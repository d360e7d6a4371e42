// What the status bar item says for the server's health, the workspace's trust
// and the active file's summary. Pure, so it is tested under node.
import type { PairStatus } from '../../server/src/engine/types';
import type { DocumentCheckSummary } from '../../server/src/shared/summary';
import { verdictCountWords } from '../../server/src/shared/wording';
import { commandIds, manageTrustCommand } from './commandIds';

export type ServerHealth = 'starting' | 'running' | 'stopped';

export interface StatusView {
  text: string;
  /** Markdown; command links need a trusted MarkdownString. */
  tooltip: string;
  /** A stopped server gets the error background: it is the one state the user must act on. */
  alarm: boolean;
}

// Most urgent first.
const countOrder: PairStatus[] = ['fail', 'error', 'inconclusive', 'pass'];

const links =
  `[Check file again](command:${commandIds.checkAgain}) · ` +
  `[Restart server](command:${commandIds.restartServer}) · [Show log](command:${commandIds.showLog})`;

export const restrictedModeExplanation =
  "Checking a gradient runs this workspace's code, so Slopecheck checks nothing while the workspace is in Restricted Mode.";

export function statusView(health: ServerHealth, trusted: boolean, summary: DocumentCheckSummary | undefined): StatusView {
  if (!trusted || summary?.state === 'untrusted') {
    return {
      text: '$(shield) Slopecheck: off in Restricted Mode',
      tooltip: `${restrictedModeExplanation}\n\n[Manage Workspace Trust](command:${manageTrustCommand}) · [Show log](command:${commandIds.showLog})`,
      alarm: false,
    };
  }
  if (health === 'starting') return { text: '$(sync~spin) Slopecheck: starting…', tooltip: links, alarm: false };
  if (health === 'stopped') {
    return { text: '$(debug-disconnect) Slopecheck: server stopped', tooltip: `The server is not running; the log says why.\n\n${links}`, alarm: true };
  }
  if (!summary || summary.state === 'idle') return { text: '$(pulse) Slopecheck', tooltip: `No check has run on this file yet.\n\n${links}`, alarm: false };
  if (summary.state === 'checking') return { text: '$(sync~spin) Slopecheck: checking…', tooltip: links, alarm: false };

  const counts = countOrder.filter((status) => (summary.byStatus[status] ?? 0) > 0).map((status) => `${summary.byStatus[status]} ${verdictCountWords[status]}`);
  if (counts.length === 0) return { text: '$(dash) Slopecheck: no pairs', tooltip: `Nothing to check found in this file: no objective with its gradient, residuals with their Jacobian, or Hessian.\n\n${links}`, alarm: false };
  const icon = summary.byStatus.fail > 0 || summary.byStatus.error > 0 ? '$(error)' : summary.byStatus.inconclusive > 0 ? '$(warning)' : '$(check)';
  const step = summary.smallestSafeStep === null ? '' : `\n\nSmallest safe step 1/L̂ in this file: ${Number(summary.smallestSafeStep.toPrecision(4))} (a local estimate).`;
  return { text: `${icon} Slopecheck: ${counts.join(', ')}`, tooltip: `Gradients in this file: ${counts.join(', ')}.${step}\n\n${links}`, alarm: false };
}
