// The host side of the sandbox: permission-restricted Node processes running
// dist/sandbox.js. A process serves the checks of one bundle only (the targets of one file,
// back to back) and is ended once they are done; a spare is started ahead so a check does
// not wait for a process to boot. Every run resolves with a report;
// hangs, crashes, memory exhaustion (heap or resident set) and cancellation become findings.
import { spawn, type ChildProcess } from 'node:child_process';
import * as path from 'node:path';
import type { CheckPlan, Finding, PairReport } from '../engine/types';
import { isRunnable, unrunnableBundleFindings, type Bundle } from './bundle';
import { sandboxLaunch, type SandboxLaunch } from './launch';
import { residentBytes } from './residentMemory';
import { validateConsole, validateReport } from './validateReport';
import type { SandboxReceipt, SandboxReply, SandboxRequest } from './protocol';
import { cancelledFinding, errorReport, timeoutFinding } from './reports';
import { locateInUserSource } from './sourceMap';
import { defaultSettings } from '../shared/settings';

export interface SandboxPoolOptions {
  /** Path of the built dist/sandbox.js. */
  sandboxScript: string;
  /** Budget of one pair's whole plan, module load included: the engine reports what it decided by then. Default 10000. */
  timeoutMs?: number;
  /**
   * Memory of each sandbox process, in MB: its resident set (read from outside, so memory outside
   * the V8 heap counts) and its V8 old space. Default 512. A bare check uses about 50 MB.
   */
  memoryMb?: number;
  /** Most checks running at once. Default 1. */
  size?: number;
}

export interface SandboxResult {
  report: PairReport;
  console: string[];
  consoleTruncated: boolean;
}

/** Time past the budget before the host stops waiting: covers process start and message passing. */
const killGraceMs = 1500;
/** How often a running check's resident memory is read. */
const memoryPollMs = 50;
/**
 * How long a process that has run a bundle waits for another target of the same bundle before
 * it is ended: a file's targets are checked back to back, so any pause means its check is over.
 */
const sameBundleWaitMs = 250;
/** Idle time before the spare is started: a file's targets follow each other within a few milliseconds. */
const spareDelayMs = 30;
const stderrTailLength = 4000;
const outOfMemoryPattern = /heap out of memory|Reached heap limit|Allocation failed/i;
/**
 * Young generation of a sandbox process, per semi-space. V8's default lets it grow to
 * 16 MB each; at 1 MB a warm sandbox measured 58–74 MB instead of 93–100 MB over
 * 400 checks of the demo, and save-to-diagnostics times stayed within run-to-run noise
 * (our own measurement, 2-core machine).
 */
const semiSpaceMb = 1;

interface Job {
  id: number;
  bundle: Bundle;
  plan: CheckPlan;
  signal?: AbortSignal;
  onAbort?: () => void;
  settled: boolean;
  /** The sandbox confirmed it has the request (see SandboxReceipt). */
  received: boolean;
  /** Sent again once already, after its first process turned out to be dead. */
  resent: boolean;
  resolve(result: SandboxResult): void;
}

interface Slot {
  child: ChildProcess;
  job: Job | null;
  timer: NodeJS.Timeout | null;
  memoryWatch: NodeJS.Timeout | null;
  stderrTail: string;
  /** The bundle this process has run, if any: it may run nothing else. */
  code: string | null;
}

/** A handle that can stop keeping the event loop alive (child process, IPC channel, pipe). */
type Refable = { ref(): void; unref(): void };

export class SandboxPool {
  private readonly sandboxScript: string;
  private readonly timeoutMs: number;
  private readonly memoryMb: number;
  private readonly size: number;
  private readonly launch: SandboxLaunch;
  private readonly slots: Slot[] = [];
  private readonly queue: Job[] = [];
  private nextId = 1;
  private disposed = false;
  private spareTimer: NodeJS.Timeout | null = null;
  /** A spare died before it was used: none is started again until the next check asks for a process. */
  private spareFailed = false;

  constructor(options: SandboxPoolOptions) {
    this.sandboxScript = path.resolve(options.sandboxScript);
    this.timeoutMs = options.timeoutMs ?? defaultSettings.timeoutMs;
    this.memoryMb = options.memoryMb ?? 512;
    this.size = Math.max(1, options.size ?? 1);
    this.launch = sandboxLaunch(this.sandboxScript, this.memoryMb, semiSpaceMb);
  }

  /** How the sandbox processes are kept from the network on this machine. */
  get network(): SandboxLaunch['network'] {
    return this.launch.network;
  }

  /** Runs one pair's plan on the bundle. Never rejects. */
  run(bundle: Bundle, plan: CheckPlan, signal?: AbortSignal): Promise<SandboxResult> {
    if (!isRunnable(bundle)) return Promise.resolve(resultOf(errorReport(unrunnableBundleFindings(bundle))));
    if (this.disposed || signal?.aborted) return Promise.resolve(resultOf(errorReport([cancelledFinding()])));
    this.spareFailed = false;
    return new Promise((resolve) => {
      const job: Job = { id: this.nextId++, bundle, plan, signal, settled: false, received: false, resent: false, resolve };
      if (signal) {
        job.onAbort = () => this.cancel(job);
        signal.addEventListener('abort', job.onAbort, { once: true });
      }
      this.queue.push(job);
      this.dispatch();
    });
  }

  /** Stops every process; queued and running checks resolve as cancelled. */
  dispose(): void {
    this.disposed = true;
    if (this.spareTimer) clearTimeout(this.spareTimer);
    for (const job of this.queue.splice(0)) this.settle(job, resultOf(errorReport([cancelledFinding()])));
    for (const slot of [...this.slots]) {
      const job = this.retire(slot);
      if (job) this.settle(job, resultOf(errorReport([cancelledFinding()])));
    }
  }

  /** Test hook: ids of the live sandbox processes. */
  processIds(): number[] {
    return this.slots.flatMap((slot) => (slot.child.pid === undefined ? [] : [slot.child.pid]));
  }

  /** Test hook: processes started (or tried) so far. */
  spawned = 0;

  /** Test hook: id of the spare process, once it has been started. */
  spareProcessId(): number | undefined {
    return this.spare()?.child.pid;
  }

  private dispatch(): void {
    while (this.queue.length > 0 && !this.disposed) {
      const busy = this.slots.filter((slot) => slot.job !== null).length;
      if (busy >= this.size) break;
      const job = this.queue.shift()!;
      const idle = this.slots.filter((candidate) => candidate.job === null);
      const slot = idle.find((candidate) => candidate.code === job.bundle.code) ?? this.spare() ?? this.spawn();
      this.start(slot, job);
    }
    this.keepSpare();
  }

  /**
   * One process started ahead and waiting, never used, so the next file's check finds it booted.
   * It is started once the pool has been idle for a moment: booting Node takes about 100 ms of CPU,
   * which would otherwise be taken from the running check or the file's next target. A check that
   * begins during that moment does not put it off again, so checks arriving back to back still
   * find a spare booting beside them.
   */
  private keepSpare(): void {
    if (!this.wantsSpare()) return;
    if (this.queue.length > 0 || this.slots.some((slot) => slot.job !== null)) return;
    if (this.spareTimer) clearTimeout(this.spareTimer);
    this.spareTimer = setTimeout(() => {
      this.spareTimer = null;
      // Asked again: the pool may have been disposed, or a spare started or failed, in the meantime.
      if (this.wantsSpare()) setReferenced(this.spawn(), false);
    }, spareDelayMs);
    this.spareTimer.unref();
  }

  /** No spare is waiting, and one may be started. */
  private wantsSpare(): boolean {
    return !this.disposed && !this.spareFailed && this.spare() === undefined;
  }

  /** The process waiting for a first bundle, if one has been started. */
  private spare(): Slot | undefined {
    return this.slots.find((slot) => slot.job === null && slot.code === null);
  }

  private spawn(): Slot {
    const child = spawn(this.launch.command, this.launch.args, {
      // A minimal environment: no NODE_OPTIONS can slip flags in, and no secrets are in reach.
      env: process.env.SystemRoot ? { SystemRoot: process.env.SystemRoot } : {},
      cwd: path.dirname(this.sandboxScript),
      // User output never mixes into ours; stderr is kept for crash diagnosis.
      stdio: ['ignore', 'ignore', 'pipe', 'ipc'],
      serialization: 'json',
    });
    const slot: Slot = { child, job: null, timer: null, memoryWatch: null, stderrTail: '', code: null };
    child.stderr?.setEncoding('utf8');
    child.stderr?.on('data', (text: string) => {
      slot.stderrTail = (slot.stderrTail + text).slice(-stderrTailLength);
    });
    child.on('message', (message: unknown) => this.onReply(slot, message));
    // 'close' waits for stderr to drain, so an out-of-memory message is seen before judging the exit.
    child.on('close', (code: number | null, signal: NodeJS.Signals | null) => this.onExit(slot, code, signal));
    // A process that could not be started (or signalled) is an exit like any other: the spare rule holds for it too.
    child.on('error', () => this.onExit(slot, null, null));
    this.slots.push(slot);
    this.spawned++;
    return slot;
  }

  private start(slot: Slot, job: Job): void {
    if (slot.timer) clearTimeout(slot.timer);
    slot.job = job;
    slot.code = job.bundle.code;
    setReferenced(slot, true);
    slot.timer = setTimeout(() => {
      this.retire(slot);
      this.settle(job, resultOf(errorReport([timeoutFinding(this.timeoutMs)], this.timeoutMs)));
      this.dispatch();
    }, this.timeoutMs + killGraceMs);
    // Polled from outside: a check busy in user code cannot be asked. Below the heap cap's own limit,
    // so a runaway allocation ends here, before V8's slow collections near its limit.
    const limitBytes = this.memoryMb * 1024 * 1024;
    slot.memoryWatch = setInterval(() => {
      const resident = slot.child.pid === undefined ? null : residentBytes(slot.child.pid);
      if (resident === null || resident <= limitBytes || slot.job !== job) return;
      this.retire(slot);
      this.settle(job, resultOf(errorReport([this.memoryFinding(`its resident memory passed ${Math.round(limitBytes / 2 ** 20)} MB`)])));
      this.dispatch();
    }, memoryPollMs);
    const request: SandboxRequest = { id: job.id, code: job.bundle.code, plan: job.plan, timeoutMs: this.timeoutMs };
    slot.child.send(request, (error) => {
      if (!error || slot.job !== job) return;
      this.retire(slot);
      this.lost(job, this.crashFinding(null, null, slot.stderrTail));
      this.dispatch();
    });
  }

  private onReply(slot: Slot, message: unknown): void {
    const job = slot.job;
    if (!job) return;
    if (isReceiptOf(job.id, message)) {
      job.received = true;
      return;
    }
    if (!isReplyTo(job.id, message)) return;
    // The process may serve the next target of the same bundle, and nothing else: it is ended
    // when none comes at once.
    this.release(slot);
    slot.timer = setTimeout(() => {
      if (slot.job === null) this.retire(slot);
    }, sameBundleWaitMs);
    slot.timer.unref();
    // The reply is data from a process that ran user code: held to the report's shape and capped
    // before anything of it is used; locations come only from our own source mapping.
    const validated = validateReport(message.report);
    if ('problem' in validated) {
      const finding: Finding = { code: 'sandbox-crash', severity: 'error', subject: 'objective', message: `The sandbox answered with a malformed report (${validated.problem}); none of it was used.` };
      this.settle(job, resultOf(errorReport([finding])));
    } else {
      this.settle(job, { report: withUserLocations(validated.report, job.bundle), console: validateConsole(message.console), consoleTruncated: message.consoleTruncated === true });
    }
    this.dispatch();
  }

  private onExit(slot: Slot, code: number | null, signal: NodeJS.Signals | null): void {
    // A process that cannot even boot would otherwise be replaced forever.
    if (slot === this.spare()) this.spareFailed = true;
    const job = this.retire(slot);
    if (job) this.lost(job, this.crashFinding(code, signal, slot.stderrTail));
    this.dispatch();
  }

  /** A job whose process died: sent again once if no user code can have run, else a crash. */
  private lost(job: Job, crash: Finding): void {
    if (!job.received && !job.resent) {
      job.resent = true;
      this.queue.unshift(job);
    } else {
      this.settle(job, resultOf(errorReport([crash])));
    }
  }

  private cancel(job: Job): void {
    const queued = this.queue.indexOf(job);
    if (queued >= 0) this.queue.splice(queued, 1);
    const running = this.slots.find((slot) => slot.job === job);
    if (running) this.retire(running);
    this.settle(job, resultOf(errorReport([cancelledFinding()])));
    this.dispatch();
  }

  /** Stops watching a slot's job. */
  private release(slot: Slot): void {
    if (slot.timer) clearTimeout(slot.timer);
    if (slot.memoryWatch) clearInterval(slot.memoryWatch);
    slot.timer = null;
    slot.memoryWatch = null;
    slot.job = null;
    setReferenced(slot, false);
  }

  /** Kills a slot's process and forgets it; returns the job it was running, if any. */
  private retire(slot: Slot): Job | null {
    const job = slot.job;
    this.release(slot);
    const index = this.slots.indexOf(slot);
    if (index >= 0) this.slots.splice(index, 1);
    if (slot.child.exitCode === null && slot.child.signalCode === null) slot.child.kill('SIGKILL');
    return job;
  }

  private settle(job: Job, result: SandboxResult): void {
    if (job.settled) return;
    job.settled = true;
    if (job.signal && job.onAbort) job.signal.removeEventListener('abort', job.onAbort);
    job.resolve(result);
  }

  private memoryFinding(how = ''): Finding {
    return {
      code: 'memory-limit',
      severity: 'error',
      subject: 'objective',
      message: `The code used more memory than the sandbox allows (${this.memoryMb} MB${how ? `; ${how}` : ''}), so the sandbox was stopped.`,
    };
  }

  private crashFinding(code: number | null, signal: NodeJS.Signals | null, stderrTail: string): Finding {
    if (outOfMemoryPattern.test(stderrTail)) return this.memoryFinding();
    const how = signal ? `signal ${signal}` : code === null ? 'an error' : `exit code ${code}`;
    const lastLine = stderrTail.trim().split('\n').pop()?.trim();
    return {
      code: 'sandbox-crash',
      severity: 'error',
      subject: 'objective',
      message: `The sandbox process ended unexpectedly (${how})${lastLine ? `: ${lastLine.slice(0, 300)}` : '.'}`,
    };
  }
}

function resultOf(report: PairReport): SandboxResult {
  return { report, console: [], consoleTruncated: false };
}

function isReceiptOf(id: number, message: unknown): boolean {
  const receipt = message as Partial<SandboxReceipt> | null;
  return typeof receipt === 'object' && receipt !== null && receipt.id === id && receipt.received === true;
}

/** A reply to this request: the shape of its contents is checked by validateReport and validateConsole. */
function isReplyTo(id: number, message: unknown): message is SandboxReply {
  const reply = message as Partial<SandboxReply> | null;
  return typeof reply === 'object' && reply !== null && Object.hasOwn(reply, 'id') && reply.id === id && Object.hasOwn(reply, 'report');
}

/** Fills `location` of findings that carry a user stack, through the bundle's source map. */
function withUserLocations(report: PairReport, bundle: Bundle): PairReport {
  for (const finding of report.findings) {
    if (!finding.stack || finding.location) continue;
    const location = locateInUserSource(finding.stack, bundle);
    if (location) finding.location = location;
  }
  return report;
}

/** An idle pool must not keep the host alive; a busy one must. */
function setReferenced(slot: Slot, referenced: boolean): void {
  const handles = [slot.child, slot.child.channel, slot.child.stderr] as Array<Partial<Refable> | null | undefined>;
  for (const handle of handles) {
    if (referenced) handle?.ref?.();
    else handle?.unref?.();
  }
}
