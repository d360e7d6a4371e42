// Runs test/nvim/driver.lua in headless Neovim against a copy of the demo workspace and
// returns what the driver recorded. Each run has its own temp folder: the workspace copy (the
// quick fix writes to it), the XDG folders (so lsp.log, where the server's stderr goes, is its
// own) and the plan and result files.
import { spawn, spawnSync } from 'node:child_process';
import { cpSync, existsSync, mkdirSync, mkdtempSync, readFileSync, realpathSync, rmSync, writeFileSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { fixturesDir, repoRoot, serverScript } from '../support/paths';

/** A point in a file, 0-based, UTF-16 characters. */
export interface PlanRequest {
  file: string;
  line: number;
  character: number;
}

/** What the driver should do, besides opening files and waiting for their first diagnostics. */
export interface Plan {
  open: string[];
  hovers: PlanRequest[];
  lenses: string[];
  /** The code action whose title starts with `titlePrefix`, for the `code` diagnostic on `line`. */
  fix: PlanRequest & { code: string; titlePrefix: string };
}

export interface Published {
  uri: string;
  version?: number;
  diagnostics: any[];
}

/** The driver's JSON (see driver.lua); LSP payloads are kept as the server sent them. */
export interface DriverResult {
  ok: boolean;
  error?: string;
  clientCapabilities: any;
  serverCapabilities: any;
  offsetEncoding: string;
  serverRequests: string[];
  published: Published[];
  documents: Array<{ file: string; uri: string; shown: Array<{ lnum: number; col: number; end_lnum: number; end_col: number; code: string }> }>;
  hovers: Array<{ file: string; result: unknown }>;
  lenses: Array<{ file: string; result: unknown }>;
  fix: { sent: any[]; titles: string[]; chosen: { title: string }; version: number; after: Published; bufferText: string; diskText: string };
}

export interface NeovimRun {
  /** The copy of fixtures/demo. */
  workspace: string;
  /** A demo file's text as copied, before anything edited it. */
  original(name: string): string;
  dispose(): void;
}

const driverScript = path.join(repoRoot, 'test', 'nvim', 'driver.lua');
/** Longest wait of the driver for any one answer; the whole run is killed after `killAfterMs`. */
const waitMs = 60_000;
const killAfterMs = 150_000;

export function startNeovimRun(): NeovimRun {
  const scratch = realpathSync(mkdtempSync(path.join(os.tmpdir(), 'slopecheck-nvim-')));
  const workspace = path.join(scratch, 'demo');
  cpSync(path.join(fixturesDir, 'demo'), workspace, { recursive: true });
  const originals = new Map<string, string>();
  return {
    workspace,
    original(name) {
      if (!originals.has(name)) originals.set(name, readFileSync(path.join(fixturesDir, 'demo', 'src', name), 'utf8'));
      return originals.get(name)!;
    },
    dispose: () => rmSync(scratch, { recursive: true, force: true }),
  };
}

export async function runDriver(run: NeovimRun, plan: Plan): Promise<DriverResult> {
  requireNeovim();
  if (!existsSync(serverScript)) throw new Error(`${serverScript} is missing: run npm run build first`);
  const scratch = path.dirname(run.workspace);
  const output = path.join(scratch, 'result.json');
  const planFile = path.join(scratch, 'plan.json');
  writeFileSync(planFile, JSON.stringify({ ...plan, cmd: [process.execPath, serverScript, '--stdio'], root: run.workspace, output, waitMs }));
  const xdg = Object.fromEntries(['CONFIG', 'DATA', 'STATE', 'CACHE'].map((kind) => [`XDG_${kind}_HOME`, path.join(scratch, 'xdg', kind.toLowerCase())]));
  for (const dir of Object.values(xdg)) mkdirSync(dir, { recursive: true });
  const lspLog = () => tail(path.join(xdg.XDG_CACHE_HOME, 'nvim', 'lsp.log'));

  const exit = await new Promise<{ code: number | null; signal: string | null; stderr: string; killed: boolean }>((resolve, reject) => {
    const child = spawn('nvim', ['--headless', '-u', 'NONE', '-i', 'NONE', '-n', '-c', 'lua dofile(vim.env.DRIVER)'], {
      cwd: run.workspace,
      env: { ...process.env, ...xdg, DRIVER: driverScript, SLOPECHECK_NVIM_PLAN: planFile },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let stderr = '';
    let killed = false;
    child.stdout.resume();
    child.stderr.on('data', (chunk) => (stderr += chunk));
    // The driver's own waits end sooner; this catches a Neovim that never gets to run them.
    const timer = setTimeout(() => {
      killed = true;
      child.kill('SIGKILL');
    }, killAfterMs);
    child.on('error', (error) => {
      clearTimeout(timer);
      reject(error);
    });
    child.on('exit', (code, signal) => {
      clearTimeout(timer);
      resolve({ code, signal, stderr, killed });
    });
  });

  const result: DriverResult | null = existsSync(output) ? JSON.parse(readFileSync(output, 'utf8')) : null;
  if (exit.killed) throw new Error(`nvim did not finish within ${killAfterMs} ms and was killed.\n${exit.stderr}\nlsp.log:\n${lspLog()}`);
  if (exit.code !== 0 || !result?.ok) {
    throw new Error(`the Neovim driver failed (exit ${exit.code ?? exit.signal}): ${result?.error ?? 'no result written'}\n${exit.stderr}\nlsp.log:\n${lspLog()}`);
  }
  return result;
}

/** Fails, never skips, without Neovim: CI installs it, so a missing nvim is a broken setup. */
function requireNeovim(): void {
  const probe = spawnSync('nvim', ['--version'], { encoding: 'utf8' });
  if (probe.error || probe.status !== 0) {
    throw new Error(`nvim is not installed (${probe.error?.message ?? `exit ${probe.status}`}): run test/e2e/setup.sh, which installs Debian's neovim (CI runs it)`);
  }
}

function tail(file: string, lines = 40): string {
  if (!existsSync(file)) return '(no lsp.log)';
  return readFileSync(file, 'utf8').split('\n').slice(-lines).join('\n');
}
