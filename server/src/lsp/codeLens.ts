// The one-line summary shown above each pair, and its commands.
import type { CodeLens } from 'vscode-languageserver';
import type { PairOutcome } from '../check/checkDocument';
import { anchorOf } from '../discovery/pairing';
import type { DiscoveredPair, NamedSpan } from '../discovery/types';
import { toRange } from './diagnostics';
import { errorShapeOf, floorToSignificant, shortNumber, verdictOf, verdictWords } from '../shared/wording';

export const commands = {
  openReport: 'slopecheck.openReport',
  checkAgain: 'slopecheck.checkAgain',
} as const;

/** E.g. "gradient ok · step ≤ 0.026 (local estimate)" or "gradient wrong: sign flipped". */
export function lensTitle(outcome: PairOutcome | null, checking: boolean): string {
  if (!outcome) return checking ? 'checking…' : 'not checked yet';
  const { report } = outcome;
  switch (report.status) {
    case 'pass': {
      const step = report.smoothness ? floorToSignificant(report.smoothness.safeStep, 2) : null;
      return step === null ? verdictOf(report) : `${verdictOf(report)} · step ≤ ${shortNumber(step, 2)} (local estimate)`;
    }
    case 'fail':
      return `${verdictOf(report)}: ${errorShapeOf(report) ?? 'wrong'}`;
    default: {
      const reason = report.findings.find((f) => f.severity !== 'info') ?? report.findings[0];
      return reason ? `${verdictWords[report.status]}: ${reason.code}` : verdictWords[report.status];
    }
  }
}

export function pairLenses(uri: string, pair: DiscoveredPair, outcome: PairOutcome | null, checking: boolean, trusted = true): CodeLens[] {
  // Above the function the target is known by: a Hessian's lens sits on the Hessian, not on the gradient it shares.
  const range = toRange(anchorOf<NamedSpan>(pair).nameSpan);
  // In an untrusted workspace nothing runs, so there is nothing to open and no check to start.
  if (!trusted) return [{ range, command: { title: 'not checked: the workspace is not trusted', command: '' } }];
  const title = pair.skipped ? 'not checked (slopecheck-skip)' : lensTitle(outcome, checking);
  return [
    { range, command: { title, command: commands.openReport, arguments: [uri, pair.key] } },
    { range, command: { title: 'check again', command: commands.checkAgain, arguments: [uri] } },
  ];
}
