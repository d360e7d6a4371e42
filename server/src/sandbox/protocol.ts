// Messages between the host (server or CLI) and the sandbox process (dist/sandbox.js).
import type { CheckPlan, PairReport } from '../engine/types';

/** Host → sandbox: check one pair of the bundled module. */
export interface SandboxRequest {
  id: number;
  /** The user's module bundled by esbuild as CommonJS, with an inline source map. */
  code: string;
  plan: CheckPlan;
  /** Budget for the whole plan, module load included. */
  timeoutMs: number;
}

/**
 * Sandbox → host, first thing on receiving a request: the request reached a live process.
 * A process that dies before this was already dead when the request was sent (killed from
 * outside while idle), so the host may send the request again without running user code twice.
 */
export interface SandboxReceipt {
  id: number;
  received: true;
}

/** Sandbox → host: the one result of the process's one request; the process then ends. */
export interface SandboxReply {
  id: number;
  report: PairReport;
  /** Captured user console output, already truncated. */
  console: string[];
  consoleTruncated: boolean;
}
