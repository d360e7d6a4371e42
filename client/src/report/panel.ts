// Report panels, one per pair and reused: the host side of the webview. It asks
// the server for the pair's report and hands it to the page by postMessage.
import { randomBytes } from 'node:crypto';
import * as vscode from 'vscode';
import { methods, type PairReportParams, type PairReportResult } from '../../../server/src/shared/protocol';
import { describe, type ServerConnection } from '../serverClient';
import { nonceFromBytes, reportShellHtml } from './html';
import type { FromWebview, ToWebview } from './messages';

export class ReportPanels implements vscode.Disposable {
  private readonly open = new Map<string, ReportPanel>();

  constructor(
    private readonly extensionUri: vscode.Uri,
    private readonly server: ServerConnection,
    private readonly log: vscode.LogOutputChannel,
  ) {}

  show(uri: string, objective: string): void {
    const key = `${uri}#${objective}`;
    const existing = this.open.get(key);
    if (existing) {
      existing.reveal();
      void existing.load();
      return;
    }
    const panel = new ReportPanel(this.extensionUri, this.server, this.log, uri, objective, () => this.open.delete(key));
    this.open.set(key, panel);
    void panel.load();
  }

  /** A document was checked again: its open reports follow. */
  refreshDocument(uri: string): void {
    for (const panel of this.open.values()) if (panel.uri === uri) void panel.load();
  }

  dispose(): void {
    for (const panel of [...this.open.values()]) panel.dispose();
  }
}

class ReportPanel {
  private readonly panel: vscode.WebviewPanel;
  private current: ToWebview;
  private result: PairReportResult | undefined;

  constructor(
    extensionUri: vscode.Uri,
    private readonly server: ServerConnection,
    private readonly log: vscode.LogOutputChannel,
    readonly uri: string,
    private readonly objective: string,
    onClosed: () => void,
  ) {
    const dist = vscode.Uri.joinPath(extensionUri, 'dist');
    this.panel = vscode.window.createWebviewPanel(
      'slopecheck.report',
      `Slopecheck report: ${objective}`,
      { viewColumn: vscode.ViewColumn.Beside, preserveFocus: true },
      { enableScripts: true, localResourceRoots: [dist], enableFindWidget: true },
    );
    const webview = this.panel.webview;
    webview.html = reportShellHtml({
      cspSource: webview.cspSource,
      nonce: nonceFromBytes(randomBytes(16)),
      scriptUri: webview.asWebviewUri(vscode.Uri.joinPath(dist, 'report.js')).toString(),
      title: `Slopecheck report: ${objective}`,
    });
    this.current = { type: 'loading', objective };
    webview.onDidReceiveMessage((message: FromWebview) => void this.handle(message));
    this.panel.onDidDispose(onClosed);
  }

  reveal(): void {
    this.panel.reveal(undefined, true);
  }

  async load(): Promise<void> {
    this.post({ type: 'loading', objective: this.objective });
    try {
      const params: PairReportParams = { uri: this.uri, objective: this.objective };
      const result = await this.server.request<PairReportResult | null>(methods.pairReport, params);
      this.result = result ?? undefined;
      // The server has no report before the pair's first check ends; the panel reloads when it does.
      this.post(result ? { type: 'report', result } : { type: 'failed', objective: this.objective, message: 'it has not been checked yet. The report appears when its check ends.' });
    } catch (error) {
      this.log.warn(`Report of ${this.objective}: ${describe(error)}`);
      this.post({ type: 'failed', objective: this.objective, message: describe(error) });
    }
  }

  dispose(): void {
    this.panel.dispose();
  }

  private post(message: ToWebview): void {
    this.current = message;
    void this.panel.webview.postMessage(message);
  }

  private async handle(message: FromWebview): Promise<void> {
    switch (message.type) {
      case 'ready':
        // The page is new (first load, or shown again): give it the latest state.
        void this.panel.webview.postMessage(this.current);
        break;
      case 'copyJson':
        if (!this.result) return;
        await vscode.env.clipboard.writeText(JSON.stringify(this.result, null, 2));
        void vscode.window.showInformationMessage(`Copied the report of ${this.objective} as JSON.`);
        break;
      case 'checkAgain':
        try {
          this.post({ type: 'loading', objective: this.objective });
          await this.server.request(methods.checkAgain, { uri: this.uri });
          await this.load();
        } catch (error) {
          this.post({ type: 'failed', objective: this.objective, message: describe(error) });
        }
        break;
    }
  }
}
