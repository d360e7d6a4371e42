// Entry of dist/sandbox.js: the separate, permission-restricted Node process that
// runs user code. Each request gets a fresh, bare vm context; the process stays warm.
// Only strings cross between this realm and the context, never host objects,
// because any host object leads back to `process` through `.constructor.constructor`.
import * as vm from 'node:vm';
import { types } from 'node:util';
import runnerSource from 'slopecheck:in-context-runner';
import type { PairReport } from '../engine/types';
import type { SandboxReceipt, SandboxReply, SandboxRequest } from './protocol';
import { errorReport, internalFinding, timeoutFinding } from './reports';
import { bundleScriptName } from './sourceMap';

/** Time allowed to collect the console after the budget ran out; it is our code, but in a realm user code may have changed. */
const consoleGraceMs = 200;

// A free name like Math resolves through the context's global interceptor on every use, which made
// hot loops several times slower than in a plain realm (measured: the demo's n = 120 pair, 125 ms
// against 47 ms). Code we evaluate gets these built-ins as parameters of an outer function, so they
// are plain local bindings; user code may still shadow them with its own declarations.
const realmGlobals = ['Math', 'Number', 'Array', 'Float64Array', 'Float32Array', 'Int32Array', 'Object', 'Reflect', 'JSON', 'Date', 'String', 'Symbol', 'Error', 'RangeError', 'TypeError', 'Map', 'Set', 'Infinity', 'NaN', 'isFinite', 'isNaN'].join(', ');

const runnerScript = new vm.Script(`(function (${realmGlobals}) {\n${runnerSource}\nglobalThis.__slopecheckRunner = __slopecheckRunner;\n})(${realmGlobals});`, {
  filename: 'slopecheck-runner.js',
});
// Lock the runner before user code runs, so the module cannot swap the code that writes its report.
const prepareScript = new vm.Script(
  // The value is restated: vm's global interceptor loses it when a descriptor leaves it out.
  `(() => {
    const runner = Object.freeze(__slopecheckRunner);
    Object.defineProperty(globalThis, '__slopecheckRunner', { value: runner, writable: false, configurable: false });
    runner.installConsole();
    runner.installProcessStandIn();
  })();`,
  { filename: 'slopecheck-prepare.js' },
);
const takeConsoleScript = new vm.Script('__slopecheckRunner.takeConsole()', { filename: 'slopecheck-console.js' });

class DeadlinePassed extends Error {}

function handle(request: SandboxRequest): SandboxReply {
  const started = Date.now();
  const deadline = started + request.timeoutMs;
  const context = vm.createContext(Object.create(null), {
    name: 'slopecheck sandbox',
    codeGeneration: { strings: false, wasm: false },
    // Promise jobs run inside each evaluation, so they fall under its timeout.
    microtaskMode: 'afterEvaluate',
  });
  const runUntilDeadline = (script: vm.Script): unknown => {
    const remaining = deadline - Date.now();
    if (remaining <= 0) throw new DeadlinePassed();
    return script.runInContext(context, { timeout: remaining, displayErrors: false });
  };
  let report: PairReport;
  try {
    runUntilDeadline(runnerScript);
    runUntilDeadline(prepareScript);
    // The wrapper sits on its own line; lineOffset -1 keeps stack lines equal to bundle lines.
    const factory = `(function (${realmGlobals}) { return function (exports, module, require) {\n${request.code}\n}; })(${realmGlobals})`;
    const loadScript = new vm.Script(`__slopecheckRunner.loadModule(${factory});`, {
      filename: bundleScriptName,
      lineOffset: -1,
    });
    const loadOutcome = readReport(runUntilDeadline(loadScript), true);
    if (loadOutcome) {
      report = loadOutcome;
    } else {
      const runScript = new vm.Script(`__slopecheckRunner.runLoaded(${JSON.stringify(JSON.stringify(request.plan))});`, { filename: 'slopecheck-run.js' });
      report = readReport(runUntilDeadline(runScript), false) ?? internalError('the runner returned no report');
    }
  } catch (error) {
    report = isTimeout(error) ? errorReport([timeoutFinding(request.timeoutMs)]) : internalError(describeHostError(error));
  }
  report.elapsedMs = report.elapsedMs || Date.now() - started;
  return { id: request.id, report, ...collectConsole(context), rssBytes: process.memoryUsage.rss() };
}

/** Parses a runner answer; `allowNull` accepts the 'null' of a successful module load. */
function readReport(answer: unknown, allowNull: boolean): PairReport | null {
  if (typeof answer !== 'string') return internalError('the runner answered with something other than text');
  const parsed: unknown = JSON.parse(answer);
  if (parsed === null && allowNull) return null;
  if (typeof parsed === 'object' && parsed !== null && typeof (parsed as PairReport).status === 'string' && Array.isArray((parsed as PairReport).findings)) {
    return parsed as PairReport;
  }
  return internalError('the runner answered with something other than a report');
}

function collectConsole(context: vm.Context): Pick<SandboxReply, 'console' | 'consoleTruncated'> {
  try {
    const answer = takeConsoleScript.runInContext(context, { timeout: consoleGraceMs, displayErrors: false });
    if (typeof answer === 'string') {
      const parsed = JSON.parse(answer) as { lines?: unknown; truncated?: unknown };
      if (Array.isArray(parsed.lines) && parsed.lines.every((line) => typeof line === 'string')) {
        return { console: parsed.lines, consoleTruncated: parsed.truncated === true };
      }
    }
  } catch {
    // The console is a courtesy; the report stands without it.
  }
  return { console: [], consoleTruncated: false };
}

function isTimeout(error: unknown): boolean {
  return error instanceof DeadlinePassed || ownString(error, 'code') === 'ERR_SCRIPT_EXECUTION_TIMEOUT';
}

/**
 * An own data property of a native error, read without running any getter: vm
 * creates its timeout error in the context's realm, where user code could have
 * planted accessors that would run here, outside every timeout.
 */
function ownString(error: unknown, key: 'code' | 'stack'): string | undefined {
  if (!types.isNativeError(error)) return undefined;
  const value = Object.getOwnPropertyDescriptor(error, key)?.value;
  return typeof value === 'string' ? value : undefined;
}

function describeHostError(error: unknown): string {
  return ownString(error, 'stack') ?? 'a value thrown from user code';
}

function internalError(what: string): PairReport {
  return errorReport([internalFinding(what)]);
}

function isRequest(message: unknown): message is SandboxRequest {
  const request = message as Partial<SandboxRequest> | null;
  return typeof request === 'object' && request !== null && typeof request.id === 'number' && typeof request.code === 'string'
    && typeof request.timeoutMs === 'number' && typeof request.plan === 'object' && request.plan !== null;
}

// Nothing inside may end this process; only the host (by killing it) or a closed channel does.
type ExitingProcess = { reallyExit(code?: number): never };
const reallyExit = (process as unknown as ExitingProcess).reallyExit.bind(process);
const refuse = (name: string) => () => {
  throw new Error(`${name} is not available in the sandbox.`);
};
process.exit = refuse('process.exit');
process.abort = refuse('process.abort');
process.kill = refuse('process.kill');
(process as unknown as ExitingProcess).reallyExit = refuse('process.reallyExit');

process.on('uncaughtException', (error) => {
  process.stderr.write(`slopecheck sandbox: uncaught exception: ${describeHostError(error)}\n`);
});
process.on('unhandledRejection', (reason) => {
  process.stderr.write(`slopecheck sandbox: unhandled rejection: ${describeHostError(reason)}\n`);
});
process.on('disconnect', () => reallyExit(0));
process.on('message', (message: unknown) => {
  if (!isRequest(message)) {
    process.stderr.write('slopecheck sandbox: ignored a malformed request\n');
    return;
  }
  const receipt: SandboxReceipt = { id: message.id, received: true };
  process.send?.(receipt);
  process.send?.(handle(message));
});
