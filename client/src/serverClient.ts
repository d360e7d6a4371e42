// The language client: starts dist/server.js over IPC, keeps the log channel
// across restarts, and turns the client's states into one health value.
import * as vscode from 'vscode';
import { CloseAction, LanguageClient, State, TransportKind, type ErrorHandler } from 'vscode-languageclient/node';
import { methods, type DocumentSummaryParams, type InitializationOptions } from '../../server/src/shared/protocol';
import { checkedLanguages } from './languages';
import type { ServerHealth } from './statusText';

const documentSelector = checkedLanguages.map((language) => ({ scheme: 'file', language }));

export class ServerNotRunning extends Error {}

export class ServerConnection implements vscode.Disposable {
  private client: LanguageClient | undefined;
  private currentHealth: ServerHealth = 'stopped';
  private readonly healthChanged = new vscode.EventEmitter<ServerHealth>();
  private readonly summaryArrived = new vscode.EventEmitter<DocumentSummaryParams>();
  readonly onDidChangeHealth = this.healthChanged.event;
  readonly onDidReceiveSummary = this.summaryArrived.event;

  constructor(
    private readonly serverModule: string,
    private readonly log: vscode.LogOutputChannel,
  ) {}

  get health(): ServerHealth {
    return this.currentHealth;
  }

  async start(): Promise<void> {
    const client = this.createClient();
    this.client = client;
    try {
      await client.start();
    } catch (error) {
      this.log.error(`The server did not start: ${describe(error)}`);
      if (this.client === client) this.setHealth('stopped');
    }
  }

  /** A new client each time: one whose start failed cannot be started again. */
  async restart(): Promise<void> {
    this.log.info('Restarting the server.');
    await this.stop();
    await this.start();
  }

  async stop(): Promise<void> {
    const client = this.client;
    this.client = undefined;
    if (!client) return;
    try {
      await client.stop();
    } catch (error) {
      this.log.warn(`Stopping the server: ${describe(error)}`);
    }
    this.setHealth('stopped');
  }

  /** Why requests cannot be served now, or undefined when the server is running. */
  notRunningReason(): string | undefined {
    if (this.currentHealth === 'running' && this.client) return undefined;
    return this.currentHealth === 'starting'
      ? "Slopecheck's server is not running yet: it is still starting."
      : "Slopecheck's server is not running: it stopped (see Slopecheck: Show Log) — try Slopecheck: Restart Server.";
  }

  async request<R>(method: string, params: unknown): Promise<R> {
    const reason = this.notRunningReason();
    if (reason) throw new ServerNotRunning(reason);
    return this.client!.sendRequest<R>(method, params);
  }

  async notify(method: string, params: unknown): Promise<void> {
    if (this.notRunningReason()) return;
    await this.client!.sendNotification(method, params);
  }

  dispose(): void {
    this.healthChanged.dispose();
    this.summaryArrived.dispose();
  }

  private createClient(): LanguageClient {
    let client: LanguageClient;
    // The client's default policy restarts a server that dies (up to 4 times in 3 minutes); it is kept, only logged.
    let fallback: ErrorHandler | undefined;
    const defaults = () => (fallback ??= client.createDefaultErrorHandler());
    const errorHandler: ErrorHandler = {
      error: (error, message, count) => {
        this.log.error(`Connection to the server failed (${count ?? 1}×): ${error.message}`);
        return defaults().error(error, message, count);
      },
      closed: async () => {
        const result = await defaults().closed();
        if (result.action === CloseAction.Restart) this.log.warn('The server stopped unexpectedly; starting it again.');
        else this.log.error(`The server stopped unexpectedly and will not be started again: ${result.message ?? 'too many crashes'}.`);
        return result;
      },
    };
    const run = { module: this.serverModule, transport: TransportKind.ipc };
    client = new LanguageClient(
      'slopecheck',
      'Slopecheck',
      { run, debug: run },
      {
        documentSelector,
        outputChannel: this.log,
        errorHandler,
        // Read at every (re)start, so a restart after granting trust starts trusted.
        initializationOptions: (): InitializationOptions => ({ trusted: vscode.workspace.isTrusted }),
        synchronize: { configurationSection: 'slopecheck' },
      },
    );
    client.onDidChangeState(({ newState }) => {
      if (this.client !== client) return;
      this.setHealth(newState === State.Running ? 'running' : newState === State.Starting ? 'starting' : 'stopped');
    });
    client.onNotification(methods.documentSummary, (params: DocumentSummaryParams) => this.summaryArrived.fire(params));
    return client;
  }

  private setHealth(health: ServerHealth): void {
    if (health === this.currentHealth) return;
    this.currentHealth = health;
    this.log.info(`Server ${health}.`);
    this.healthChanged.fire(health);
  }
}

export function describe(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}
