// A minimal LSP client for the protocol tests: starts the built dist/server.js over stdio
// and talks to it with vscode-jsonrpc as an editor would. Waits are on notifications with
// timeouts, never fixed sleeps.
import { spawn, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import { createMessageConnection, StreamMessageReader, StreamMessageWriter, type MessageConnection } from 'vscode-jsonrpc/node';
import { WorkDoneProgress, type Diagnostic, type PublishDiagnosticsParams, type TextEdit } from 'vscode-languageserver-protocol';
import { TextDocument } from 'vscode-languageserver-textdocument';
import { serverScript } from '../support/paths';

export interface StartOptions {
  /** Client capabilities; the default declares nothing, like a bare editor. */
  capabilities?: object;
  initializationOptions?: object;
  /** Answer to workspace/configuration (only asked when capabilities allow it). */
  settings?: object;
}

type Listener = { method: string; match(params: any): boolean; resolve(params: any): void };

export class TestClient {
  readonly notifications: Array<{ method: string; params: any }> = [];
  readonly serverRequests: string[] = [];
  private listeners: Listener[] = [];
  private versions = new Map<string, number>();
  settings: object;

  private constructor(private readonly child: ChildProcess, readonly connection: MessageConnection, settings: object) {
    this.settings = settings;
  }

  static async start(options: StartOptions = {}): Promise<TestClient> {
    const child = spawn(process.execPath, [serverScript, '--stdio'], { stdio: ['pipe', 'pipe', 'pipe'] });
    child.stderr!.resume();
    const connection = createMessageConnection(new StreamMessageReader(child.stdout!), new StreamMessageWriter(child.stdin!));
    const client = new TestClient(child, connection, options.settings ?? {});
    connection.onNotification((method, params) => client.received(method, params));
    connection.onRequest((method, params: any) => {
      client.serverRequests.push(method);
      if (method === 'workspace/configuration') return params.items.map(() => client.settings);
      // vscode-jsonrpc routes $/progress by token, so each created token gets its own handler.
      if (method === 'window/workDoneProgress/create') {
        connection.onProgress(WorkDoneProgress.type, params.token, (value) => client.received('$/progress', { token: params.token, value }));
      }
      return null;
    });
    connection.listen();
    await connection.sendRequest('initialize', {
      processId: process.pid,
      rootUri: null,
      capabilities: options.capabilities ?? {},
      initializationOptions: options.initializationOptions,
    });
    await connection.sendNotification('initialized', {});
    return client;
  }

  /** Resolves with the next `method` notification (after this call) that matches, or rejects after `timeoutMs`. */
  next<T = any>(method: string, match: (params: T) => boolean = () => true, timeoutMs = 30000, what = method): Promise<T> {
    return new Promise((resolve, reject) => {
      const listener: Listener = {
        method,
        match,
        resolve: (params) => {
          clearTimeout(timer);
          resolve(params);
        },
      };
      const timer = setTimeout(() => {
        this.listeners = this.listeners.filter((l) => l !== listener);
        const seen = this.notifications.filter((n) => n.method === method).slice(-3).map((n) => JSON.stringify(n.params).slice(0, 300));
        reject(new Error(`no ${what} within ${timeoutMs} ms; last ${method} seen: ${seen.join('\n') || 'none'}`));
      }, timeoutMs);
      this.listeners.push(listener);
    });
  }

  /** The next diagnostics published for `uri`. */
  nextDiagnostics(uri: string, match: (diagnostics: Diagnostic[]) => boolean = () => true, timeoutMs?: number): Promise<PublishDiagnosticsParams> {
    return this.next<PublishDiagnosticsParams>('textDocument/publishDiagnostics', (p) => p.uri === uri && match(p.diagnostics), timeoutMs, `diagnostics for ${uri}`);
  }

  lastDiagnostics(uri: string): PublishDiagnosticsParams | undefined {
    return this.notifications.filter((n) => n.method === 'textDocument/publishDiagnostics' && n.params.uri === uri).pop()?.params;
  }

  open(file: string, text = readFileSync(file, 'utf8')): { uri: string; text: string } {
    const uri = pathToFileURL(file).href;
    this.versions.set(uri, 1);
    void this.connection.sendNotification('textDocument/didOpen', { textDocument: { uri, languageId: 'typescript', version: 1, text } });
    return { uri, text };
  }

  /** Replaces the whole text, as a full-document change. */
  change(uri: string, text: string): void {
    const version = (this.versions.get(uri) ?? 1) + 1;
    this.versions.set(uri, version);
    void this.connection.sendNotification('textDocument/didChange', { textDocument: { uri, version }, contentChanges: [{ text }] });
  }

  save(uri: string): void {
    void this.connection.sendNotification('textDocument/didSave', { textDocument: { uri } });
  }

  close(uri: string): void {
    void this.connection.sendNotification('textDocument/didClose', { textDocument: { uri } });
  }

  request<T = any>(method: string, params: unknown): Promise<T> {
    return this.connection.sendRequest(method, params) as Promise<T>;
  }

  notify(method: string, params: unknown): void {
    void this.connection.sendNotification(method, params);
  }

  async stop(): Promise<void> {
    try {
      await this.connection.sendRequest('shutdown');
      await this.connection.sendNotification('exit');
    } catch {
      // The server may already be gone; it is killed below either way.
    }
    this.connection.dispose();
    if (this.child.exitCode === null) {
      const exited = new Promise((resolve) => this.child.once('exit', resolve));
      const timer = setTimeout(() => this.child.kill('SIGKILL'), 3000);
      await exited;
      clearTimeout(timer);
    }
  }

  get alive(): boolean {
    return this.child.exitCode === null;
  }

  private received(method: string, params: any): void {
    this.notifications.push({ method, params });
    for (const listener of [...this.listeners]) {
      if (listener.method === method && listener.match(params)) {
        this.listeners = this.listeners.filter((l) => l !== listener);
        listener.resolve(params);
      }
    }
  }
}

/** Applies LSP text edits with the reference implementation of text documents. */
export function applyEdits(text: string, edits: TextEdit[]): string {
  return TextDocument.applyEdits(TextDocument.create('untitled:x', 'typescript', 1, text), edits);
}

/** The range of the `occurrence`-th `needle` in `text`, as LSP positions. */
export function rangeOf(text: string, needle: string, occurrence = 0) {
  let start = -1;
  for (let i = 0; i <= occurrence; i++) start = text.indexOf(needle, start + 1);
  if (start < 0) throw new Error(`not in text: ${needle}`);
  const document = TextDocument.create('untitled:x', 'typescript', 1, text);
  return { start: document.positionAt(start), end: document.positionAt(start + needle.length) };
}

export function messageOf(diagnostic: Diagnostic): string {
  return typeof diagnostic.message === 'string' ? diagnostic.message : diagnostic.message.value;
}
