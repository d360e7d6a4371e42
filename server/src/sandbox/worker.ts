// Entry of dist/sandbox.js: the separate, permission-restricted Node process that
// runs user code. It serves the checks of ONE module (one bundle), each in a fresh, bare vm
// context; a request for any other code ends it. The host ends it when that module's checks
// are done, so no state of one file's code ever meets another file's.
// Only strings cross between this realm and the context, never host objects,
// because any host object leads back to `process` through `.constructor.constructor`;
// and the host never reads a property of a user value (a stack, a message) in its own realm,
// where a user-set getter or Error.prepareStackTrace would run with host objects in reach.
import * as vm from 'node:vm';
import { types } from 'node:util';
import runnerSource from 'slopecheck:in-context-runner';
import { defaultCheckOptions, type PairReport } from '../engine/types';
import type { SandboxReceipt, SandboxReply, SandboxRequest } from './protocol';
import { engineEndsAt, errorReport, internalFinding, timeoutFinding } from './reports';
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
// WeakRef and FinalizationRegistry are taken away: their callbacks would run outside every deadline.
const prepareScript = new vm.Script(
  // The value is restated: vm's global interceptor loses it when a descriptor leaves it out.
  `(() => {
    const runner = Object.freeze(__slopecheckRunner);
    Object.defineProperty(globalThis, '__slopecheckRunner', { value: runner, writable: false, configurable: false });
    runner.installConsole();
    runner.installProcessStandIn();
    delete globalThis.WeakRef;
    delete globalThis.FinalizationRegistry;
  })();`,
  { filename: 'slopecheck-prepare.js' },
);

class DeadlinePassed extends Error {}

/** A bare context with our runner installed and locked, and no user code run in it yet. */
interface FreshRealm {
  context: vm.Context;
  /** Compiles code for this context, with dynamic import() answered in the context's own realm. */
  script(code: string, filename: string, lineOffset?: number): vm.Script;
}

/** Time our own setup of a realm may take; no user code runs in it. */
const setupLimitMs = 5000;

function freshRealm(): FreshRealm {
  const context = vm.createContext(Object.create(null), {
    name: 'slopecheck sandbox',
    codeGeneration: { strings: false, wasm: false },
    // Promise jobs run inside each evaluation, so they fall under its timeout.
    microtaskMode: 'afterEvaluate',
  });
  // A dynamic import() rejects with an error of the context's own realm: an error made in this
  // realm would carry this realm's Function.prototype into user code.
  const ContextError = vm.runInContext('Error', context) as ErrorConstructor;
  const importModuleDynamically = (() => {
    throw new ContextError('import() is not available in the sandbox: it runs only self-contained modules.');
  }) as unknown as vm.ScriptOptions['importModuleDynamically'];
  runnerScript.runInContext(context, { timeout: setupLimitMs, displayErrors: false });
  prepareScript.runInContext(context, { timeout: setupLimitMs, displayErrors: false });
  return { context, script: (code, filename, lineOffset = 0) => new vm.Script(code, { filename, lineOffset, importModuleDynamically }) };
}

/**
 * The realm of the next check, set up while the process waits: creating a context and evaluating
 * the runner are a few milliseconds every check would otherwise spend after its request arrives.
 */
let nextRealm: FreshRealm | null = null;

function takeRealm(): FreshRealm {
  const realm = nextRealm ?? freshRealm();
  nextRealm = null;
  return realm;
}

function handle(request: SandboxRequest, { context, script }: FreshRealm): SandboxReply {
  const started = Date.now();
  const deadline = started + request.timeoutMs;
  const runUntilDeadline = (compiled: vm.Script): unknown => {
    const remaining = deadline - Date.now();
    if (remaining <= 0) throw new DeadlinePassed();
    return compiled.runInContext(context, { timeout: remaining, displayErrors: false });
  };
  let report: PairReport;
  try {
    // The wrapper sits on its own line; lineOffset -1 keeps stack lines equal to bundle lines.
    const factory = `(function (${realmGlobals}) { return function (exports, module, require) {\n${request.code}\n}; })(${realmGlobals})`;
    const loadOutcome = readReport(runUntilDeadline(script(`__slopecheckRunner.loadModule(${factory});`, bundleScriptName, -1)), true);
    if (loadOutcome) {
      report = loadOutcome;
    } else {
      // The engine stops starting calls a little before the hard deadline, so it can still report.
      const endsAt = engineEndsAt(deadline, request.timeoutMs);
      const run = script(`__slopecheckRunner.runLoaded(${JSON.stringify(JSON.stringify(request.plan))}, ${endsAt});`, 'slopecheck-run.js');
      report = readReport(runUntilDeadline(run), false) ?? internalError('the runner returned no report');
    }
  } catch (error) {
    // Only our own timeout is told apart; anything else thrown out of the context is user-made
    // and is not looked into here.
    report = isTimeout(error) ? errorReport([timeoutFinding(request.timeoutMs)]) : internalError('the check ended with an error thrown from user code');
  }
  report.elapsedMs = report.elapsedMs || Date.now() - started;
  return { id: request.id, report, ...collectConsole(context, script) };
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

function collectConsole(context: vm.Context, script: (code: string, filename: string) => vm.Script): Pick<SandboxReply, 'console' | 'consoleTruncated'> {
  try {
    const answer = script('__slopecheckRunner.takeConsole()', 'slopecheck-console.js').runInContext(context, { timeout: consoleGraceMs, displayErrors: false });
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

/**
 * vm's own timeout error, told by its `code`, an own data property read without running
 * any getter (a Proxy is no native error, so no trap runs either).
 */
function isTimeout(error: unknown): boolean {
  if (error instanceof DeadlinePassed) return true;
  if (!types.isNativeError(error)) return false;
  return Object.getOwnPropertyDescriptor(error, 'code')?.value === 'ERR_SCRIPT_EXECUTION_TIMEOUT';
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

// Never look into what user code threw or rejected with: fixed words only.
process.on('uncaughtException', () => {
  process.stderr.write('slopecheck sandbox: uncaught exception\n');
});
process.on('unhandledRejection', () => {
  process.stderr.write('slopecheck sandbox: unhandled rejection\n');
});
process.on('disconnect', () => reallyExit(0));

// A fresh process runs the engine cold. Before any user code arrives, one check of our own on a
// fixed quadratic compiles the engine's bytecode and baseline code, which V8 keeps with the script
// and shares with every later context: the first real check then runs warm. No user code is involved.
const warmUpModule = [
  'exports.objective = (x) => x[0] * x[0] + 3 * x[1] * x[1];',
  'exports.gradient = (x) => [2 * x[0], 6 * x[1]];',
  'globalThis.__slopecheckScope = { objective: () => exports.objective, gradient: () => exports.gradient };',
].join('\n');
handle({
  id: 0,
  code: warmUpModule,
  timeoutMs: 5000,
  plan: {
    kind: 'gradient',
    label: 'objective',
    recipe: { host: null, value: 'objective', derivative: 'gradient', split: null, extraArguments: [] },
    argumentKind: 'array',
    probes: [],
    probeKeys: [],
    start: null,
    dimension: 2,
    learningRate: { name: 'rate', value: 0.1 },
    options: defaultCheckOptions,
  },
}, freshRealm());
nextRealm = freshRealm();
// One module per process: requests for the bundle of the first are served; any other code ends
// the process before it runs (the host never sends one; this holds even if it did).
let servedCode: string | null = null;
process.on('message', (message: unknown) => {
  if (!isRequest(message)) {
    process.stderr.write('slopecheck sandbox: ignored a malformed request\n');
    return;
  }
  if (servedCode !== null && message.code !== servedCode) reallyExit(0);
  servedCode = message.code;
  const receipt: SandboxReceipt = { id: message.id, received: true };
  process.send?.(receipt);
  let realm: FreshRealm;
  try {
    realm = takeRealm();
  } catch {
    process.send?.({ id: message.id, report: internalError('the sandbox could not set up a realm'), console: [], consoleTruncated: false } satisfies SandboxReply);
    return;
  }
  process.send?.(handle(message, realm));
  // Another target of the same module may follow: its realm is made while the host reads this reply.
  setImmediate(() => {
    nextRealm ??= freshRealm();
  });
});
