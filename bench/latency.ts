// Editor latency: the built language server (dist/server.js) over stdio, driven with
// vscode-jsonrpc as an editor would. Save → diagnostics for each demo fixture at an editing
// pace, the same back to back (a stress test), the first check after start, and the memory
// (VmRSS) of the server and its sandbox processes.
import { spawn } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import * as path from 'node:path';
import { pathToFileURL } from 'node:url';
import { createMessageConnection, StreamMessageReader, StreamMessageWriter } from 'vscode-jsonrpc/node';
import { fixturesDir, serverScript } from '../test/support/paths';

export interface FixtureLatency {
  file: string;
  medianMs: number;
  p95Ms: number;
}

export interface LatencyResult {
  /** Saves at an editing pace: each one `editPauseMs` after the previous diagnostics. */
  medianMs: number;
  p95Ms: number;
  editPauseMs: number;
  /** Saves back to back, each sent the moment the previous diagnostics arrive. */
  backToBackMedianMs: number;
  backToBackP95Ms: number;
  firstCheckMs: number;
  /** Server start (spawn) to the first diagnostics. */
  startToFirstDiagnosticsMs: number;
  /** At rest after the last check: the server and its spare sandbox process. */
  rssMb: number;
  serverRssMb: number;
  sandboxRssMb: number;
  /** The most seen at any sample while checks ran back to back (finishing, running and spare processes). */
  peakRssMb: number;
  checks: number;
  /** Total RSS at rest after every 100 checks, for growth. */
  rssSamples: Array<{ checks: number; rssMb: number }>;
  growthOverLast500Mb: number;
  fixtures: FixtureLatency[];
}

const savesPerFixture = 50;
const totalChecks = 1000;
const waitLimitMs = 30000;
/**
 * Time between diagnostics and the next save in the paced runs: a person reads the result before
 * saving again. Every check runs in a fresh sandbox process, and starting Node takes about 100 ms
 * of CPU on the bench machine, so saves sent back to back wait for the next process to boot.
 */
const editPauseMs = 400;
/** Longer than the pool's wait for more targets of the same file, so only the spare is left. */
const settleMs = 600;
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

const percentile = (values: number[], q: number) => {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)];
};

/** VmRSS of a process in MB, from /proc/<pid>/status (Linux). */
function rssMb(pid: number): number {
  try {
    const match = /VmRSS:\s+(\d+)\s+kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    return match ? Number(match[1]) / 1024 : 0;
  } catch {
    return 0;
  }
}

/** Child processes of `pid`, from the parent field of /proc/<child>/stat. */
function childrenOf(pid: number): number[] {
  return readdirSync('/proc').filter((name) => /^\d+$/.test(name)).filter((name) => {
    try {
      const stat = readFileSync(`/proc/${name}/stat`, 'utf8');
      return Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]) === pid;
    } catch {
      return false;
    }
  }).map(Number);
}

export async function runLatency(log: (line: string) => void): Promise<LatencyResult> {
  const spawned = performance.now();
  const child = spawn(process.execPath, [serverScript, '--stdio'], { stdio: ['pipe', 'pipe', 'pipe'] });
  child.stderr.resume();
  const connection = createMessageConnection(new StreamMessageReader(child.stdout), new StreamMessageWriter(child.stdin));
  const waiters: Array<{ uri: string; version: number; resolve(): void }> = [];
  connection.onNotification('textDocument/publishDiagnostics', (params: { uri: string; version?: number }) => {
    for (const waiter of waiters.filter((w) => w.uri === params.uri && w.version === params.version)) {
      waiters.splice(waiters.indexOf(waiter), 1);
      waiter.resolve();
    }
  });
  connection.onRequest('workspace/configuration', (params: { items: unknown[] }) => params.items.map(() => ({})));
  connection.listen();
  const diagnosticsFor = (uri: string, version: number) =>
    new Promise<void>((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error(`no diagnostics for ${uri} version ${version} within ${waitLimitMs} ms`)), waitLimitMs);
      waiters.push({ uri, version, resolve: () => { clearTimeout(timer); resolve(); } });
    });
  try {
    await connection.sendRequest('initialize', { processId: process.pid, rootUri: pathToFileURL(path.join(fixturesDir, 'demo')).href, capabilities: {}, initializationOptions: { trusted: true } });
    await connection.sendNotification('initialized', {});

    const files = readdirSync(path.join(fixturesDir, 'demo', 'src')).filter((f) => f.endsWith('.ts')).sort();
    const documents = files.map((file) => {
      const fileName = path.join(fixturesDir, 'demo', 'src', file);
      return { file, uri: pathToFileURL(fileName).href, text: readFileSync(fileName, 'utf8'), version: 1 };
    });
    let firstCheckMs = 0;
    let startToFirstDiagnosticsMs = 0;
    for (const [k, doc] of documents.entries()) {
      const opened = performance.now();
      const published = diagnosticsFor(doc.uri, doc.version);
      await connection.sendNotification('textDocument/didOpen', { textDocument: { uri: doc.uri, languageId: 'typescript', version: doc.version, text: doc.text } });
      await published;
      if (k === 0) [firstCheckMs, startToFirstDiagnosticsMs] = [performance.now() - opened, performance.now() - spawned];
    }

    let checks = 0;
    const save = async (doc: (typeof documents)[number]) => {
      doc.version++;
      // A changed export, not just a comment: the bundle (the server's cache key) must change too.
      const text = `${doc.text}\nexport const benchSaveCounter = ${doc.version};\n`;
      const published = diagnosticsFor(doc.uri, doc.version);
      const started = performance.now();
      await connection.sendNotification('textDocument/didChange', { textDocument: { uri: doc.uri, version: doc.version }, contentChanges: [{ text }] });
      await connection.sendNotification('textDocument/didSave', { textDocument: { uri: doc.uri } });
      await published;
      checks++;
      return performance.now() - started;
    };
    const totalRss = () => {
      const sandboxes = childrenOf(child.pid!);
      const sandboxRss = sandboxes.reduce((sum, pid) => sum + rssMb(pid), 0);
      return { server: rssMb(child.pid!), sandbox: sandboxRss };
    };

    const fixtures: FixtureLatency[] = [];
    const paced: number[] = [];
    const backToBack: number[] = [];
    const rssSamples: Array<{ checks: number; rssMb: number }> = [];
    let peakRssMb = 0;
    // Memory is compared at rest, after the pool has ended the processes of the last check.
    const sampleAtRest = async () => {
      if (checks % 100 !== 0) return;
      await sleep(settleMs);
      const { server, sandbox } = totalRss();
      rssSamples.push({ checks, rssMb: server + sandbox });
    };
    for (const doc of documents) {
      const times: number[] = [];
      for (let k = 0; k < savesPerFixture; k++) {
        await sleep(editPauseMs);
        times.push(await save(doc));
        await sampleAtRest();
      }
      paced.push(...times);
      fixtures.push({ file: doc.file, medianMs: percentile(times, 0.5), p95Ms: percentile(times, 0.95) });
      log(`  latency: ${doc.file}: median ${percentile(times, 0.5).toFixed(1)} ms, p95 ${percentile(times, 0.95).toFixed(1)} ms`);
    }
    while (checks < totalChecks) {
      backToBack.push(await save(documents[checks % documents.length]));
      const { server, sandbox } = totalRss();
      peakRssMb = Math.max(peakRssMb, server + sandbox);
      await sampleAtRest();
    }
    await sleep(settleMs);
    const { server, sandbox } = totalRss();
    const at500 = rssSamples.find((s) => s.checks === 500)?.rssMb ?? NaN;
    log(`  latency: ${checks} checks, back to back median ${percentile(backToBack, 0.5).toFixed(1)} ms; at rest RSS server ${server.toFixed(1)} MB + sandbox ${sandbox.toFixed(1)} MB, peak ${peakRssMb.toFixed(1)} MB`);
    return {
      medianMs: percentile(paced, 0.5),
      p95Ms: percentile(paced, 0.95),
      editPauseMs,
      backToBackMedianMs: percentile(backToBack, 0.5),
      backToBackP95Ms: percentile(backToBack, 0.95),
      firstCheckMs,
      startToFirstDiagnosticsMs,
      rssMb: server + sandbox,
      serverRssMb: server,
      sandboxRssMb: sandbox,
      peakRssMb,
      checks,
      rssSamples,
      growthOverLast500Mb: server + sandbox - at500,
      fixtures,
    };
  } finally {
    connection.dispose();
    child.kill();
  }
}
