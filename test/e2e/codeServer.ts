// A throwaway code-server: its own state folder, the packaged extension installed,
// bound to loopback on a free port, run in its own process group so that stopping
// it also stops the extension host, the language server and the sandboxes.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { createWriteStream, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import * as os from 'node:os';
import * as path from 'node:path';
import { e2eTools } from './tools';

export interface CodeServerOptions {
  /** The packaged extension to install. */
  vsix: string;
  /** The folder the workbench opens. */
  workspace: string;
  /** False leaves Workspace Trust on, so the folder opens in Restricted Mode. */
  trusted: boolean;
}

/** Every outbound attempt silenced, motion off (screenshots), a short hover delay. */
const userSettings = {
  'telemetry.telemetryLevel': 'off',
  'update.mode': 'none',
  'extensions.autoCheckUpdates': false,
  'extensions.autoUpdate': false,
  'extensions.ignoreRecommendations': true,
  'workbench.enableExperiments': false,
  'workbench.startupEditor': 'none',
  'workbench.tips.enabled': false,
  'chat.disableAIFeatures': true,
  'typescript.disableAutomaticTypeAcquisition': true,
  'npm.fetchOnlinePackageInfo': false,
  'json.schemaDownload.enable': false,
  'git.autofetch': false,
  'workbench.reduceMotion': 'on',
  'editor.hover.delay': 300,
  // The empty secondary side bar would take a third of the screenshots.
  'workbench.secondarySideBar.defaultVisibility': 'hidden',
};

const startTimeoutMs = 30_000;
const installTimeoutMs = 60_000;

export class CodeServer {
  private exited = false;
  private readonly killOnExit = () => this.killGroup('SIGKILL');

  private constructor(
    private readonly child: ChildProcess,
    private readonly stateDir: string,
    readonly port: number,
    readonly workspace: string,
    readonly logFile: string,
  ) {
    child.once('exit', () => (this.exited = true));
    // A crashed test run must not leave a server behind.
    process.once('exit', this.killOnExit);
  }

  /** Where the packaged extension was installed. */
  get extensionsDir(): string {
    return path.join(this.stateDir, 'ext');
  }

  /** The workbench with the workspace folder open. */
  get url(): string {
    return `http://127.0.0.1:${this.port}/?folder=${encodeURIComponent(this.workspace)}`;
  }

  static async start(options: CodeServerOptions): Promise<CodeServer> {
    const stateDir = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-code-server-'));
    for (const dir of ['config', 'data/User', 'cache', 'tmp', 'ext']) mkdirSync(path.join(stateDir, dir), { recursive: true });
    writeFileSync(path.join(stateDir, 'config.yaml'), '');
    writeFileSync(path.join(stateDir, 'data/User/settings.json'), JSON.stringify(userSettings, null, 2));
    const port = await freePort();
    const env = serverEnvironment(stateDir);
    const flags = [
      '--config', path.join(stateDir, 'config.yaml'),
      '--bind-addr', `127.0.0.1:${port}`,
      '--auth', 'none',
      '--disable-telemetry',
      '--disable-update-check',
      '--disable-getting-started-override',
      '--user-data-dir', path.join(stateDir, 'data'),
      '--extensions-dir', path.join(stateDir, 'ext'),
    ];

    const install = spawnSync(e2eTools.codeServer, [...flags, '--install-extension', options.vsix], { env, encoding: 'utf8', timeout: installTimeoutMs });
    if (install.status !== 0) {
      rmSync(stateDir, { recursive: true, force: true });
      throw new Error(`code-server could not install ${options.vsix} (exit ${install.status}): ${install.stderr || install.stdout || install.error}`);
    }

    const logFile = path.join(stateDir, 'code-server.log');
    const log = createWriteStream(logFile);
    const trustFlags = options.trusted ? ['--disable-workspace-trust'] : [];
    // setsid makes code-server the leader of a new process group: one kill stops everything it started.
    const child = spawn('setsid', [e2eTools.codeServer, ...flags, ...trustFlags, options.workspace], { env, stdio: ['ignore', 'pipe', 'pipe'] });
    child.stdout!.pipe(log);
    child.stderr!.pipe(log);
    const server = new CodeServer(child, stateDir, port, options.workspace, logFile);
    try {
      await server.waitUntilHealthy();
    } catch (error) {
      await server.stop();
      throw error;
    }
    return server;
  }

  /** Stops the whole process group and removes the state folder. */
  async stop(): Promise<void> {
    process.removeListener('exit', this.killOnExit);
    if (!this.exited) {
      const gone = new Promise<void>((resolve) => this.child.once('exit', () => resolve()));
      this.killGroup('SIGTERM');
      const timer = setTimeout(() => this.killGroup('SIGKILL'), 5_000);
      await gone;
      clearTimeout(timer);
    }
    // Children of the group that outlive code-server (a language server, a sandbox) go too.
    this.killGroup('SIGKILL');
    if (!process.env.SLOPECHECK_E2E_KEEP_STATE) rmSync(this.stateDir, { recursive: true, force: true });
  }

  private killGroup(signal: NodeJS.Signals): void {
    if (this.child.pid === undefined) return;
    try {
      process.kill(-this.child.pid, signal);
    } catch {
      // The group is already gone.
    }
  }

  private async waitUntilHealthy(): Promise<void> {
    const deadline = Date.now() + startTimeoutMs;
    while (Date.now() < deadline) {
      if (this.exited) throw new Error(`code-server exited during start; its log is ${this.logFile}`);
      try {
        const response = await fetch(`http://127.0.0.1:${this.port}/healthz`, { signal: AbortSignal.timeout(2_000) });
        if (response.ok) return;
      } catch {
        // Not listening yet.
      }
      await new Promise((resolve) => setTimeout(resolve, 200));
    }
    throw new Error(`code-server did not answer /healthz within ${startTimeoutMs} ms; its log is ${this.logFile}`);
  }
}

/** Node 24 first on PATH for code-server only; every folder it writes to lies in the state folder. */
function serverEnvironment(stateDir: string): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = {};
  // npm's variables (npm test runs us) would point code-server's node at Node 20's settings.
  for (const [key, value] of Object.entries(process.env)) if (!key.toLowerCase().startsWith('npm_')) env[key] = value;
  return {
    ...env,
    PATH: `${e2eTools.node24Bin}${path.delimiter}${process.env.PATH ?? ''}`,
    XDG_CONFIG_HOME: path.join(stateDir, 'config'),
    XDG_DATA_HOME: path.join(stateDir, 'data'),
    XDG_CACHE_HOME: path.join(stateDir, 'cache'),
    TMPDIR: path.join(stateDir, 'tmp'),
    EXTENSIONS_GALLERY: '{}',
  };
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      probe.close(() => resolve(port));
    });
  });
}
