// The one status bar item: the server's health and the active file's summary;
// a click opens the log, the tooltip offers the commands.
import * as vscode from 'vscode';
import type { DocumentSummaryParams } from '../../server/src/shared/protocol';
import { commandIds } from './commandIds';
import { checkedLanguages } from './languages';
import type { ServerConnection } from './serverClient';
import { statusView } from './statusText';


export class StatusBar implements vscode.Disposable {
  private readonly item = vscode.window.createStatusBarItem('slopecheck.status', vscode.StatusBarAlignment.Left, 10);
  private readonly summaries = new Map<string, DocumentSummaryParams>();
  private readonly subscriptions: vscode.Disposable[];

  constructor(private readonly server: ServerConnection) {
    this.item.name = 'Slopecheck';
    this.item.command = commandIds.showLog;
    this.subscriptions = [
      server.onDidChangeHealth(() => this.refresh()),
      server.onDidReceiveSummary((summary) => {
        this.summaries.set(summary.uri, summary);
        this.refresh();
      }),
      vscode.window.onDidChangeActiveTextEditor(() => this.refresh()),
      vscode.workspace.onDidCloseTextDocument((document) => this.summaries.delete(document.uri.toString())),
    ];
    this.refresh();
  }

  refresh(): void {
    const document = vscode.window.activeTextEditor?.document;
    const relevant = document !== undefined && checkedLanguages.includes(document.languageId);
    // A stopped server is worth showing whatever file is open; otherwise stay out of unrelated files.
    if (!relevant && this.server.health !== 'stopped') {
      this.item.hide();
      return;
    }
    const view = statusView(this.server.health, vscode.workspace.isTrusted, document && this.summaries.get(document.uri.toString()));
    this.item.text = view.text;
    const tooltip = new vscode.MarkdownString(view.tooltip, true);
    tooltip.isTrusted = true;
    this.item.tooltip = tooltip;
    this.item.backgroundColor = view.alarm ? new vscode.ThemeColor('statusBarItem.errorBackground') : undefined;
    this.item.show();
  }

  dispose(): void {
    this.item.dispose();
    for (const subscription of this.subscriptions) subscription.dispose();
  }
}
