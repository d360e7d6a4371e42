// Reports for checks that ended before the engine could produce one.
// Pure: used by the host, the sandbox process and the in-context runner alike.
import { emptyReport } from '../engine/emptyReport';
import type { Finding, PairReport } from '../engine/types';

/** A report with status 'error' carrying the given findings and nothing measured. */
export function errorReport(findings: Finding[], elapsedMs = 0): PairReport {
  return { ...emptyReport('error', findings), elapsedMs };
}

/** Time kept back from the budget for the engine to write its report once it stops starting calls. */
const reportReserveMs = 300;

/** When the engine must stop starting calls, for a check whose hard deadline is `deadline`. */
export function engineEndsAt(deadline: number, timeoutMs: number): number {
  return deadline - Math.min(reportReserveMs, timeoutMs / 10);
}

export function timeoutFinding(timeoutMs: number): Finding {
  return {
    code: 'timeout',
    severity: 'error',
    subject: 'objective',
    message: `The module, or one call into it, did not return within the ${timeoutMs} ms budget: it may loop forever, or one call takes longer than the whole budget.`,
  };
}

/** A cancelled check is not the user's fault, hence 'info'. */
export function cancelledFinding(): Finding {
  return { code: 'timeout', severity: 'info', subject: 'objective', message: 'The check was cancelled before it finished.' };
}

/** Something in our own machinery failed; not the user's code. */
export function internalFinding(what: string): Finding {
  return { code: 'sandbox-crash', severity: 'error', subject: 'objective', message: `Internal error in the sandbox: ${what}.` };
}
