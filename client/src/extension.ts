// VS Code entry (dist/extension.js): wires the log, the language server, the
// status bar, Workspace Trust, the commands and the report panels.
import * as vscode from 'vscode';
import { defaultSettings, readSettings } from '../../server/src/shared/settings';
import { registerCommands } from './commands';
import { ReportPanels } from './report/panel';
import { ServerConnection } from './serverClient';
import { StatusBar } from './statusBar';
import { watchTrust } from './trust';

let server: ServerConnection | undefined;

export async function activate(context: vscode.ExtensionContext): Promise<void> {
  // One channel for the extension's whole life, so the log survives server restarts.
  const log = vscode.window.createOutputChannel('Slopecheck', { log: true });
  const version = (context.extension.packageJSON as { version?: string }).version ?? 'unknown';
  log.info(`Slopecheck ${version} in VS Code ${vscode.version}; workspace ${vscode.workspace.isTrusted ? 'trusted' : 'in Restricted Mode'}.`);
  log.info(`Settings: ${JSON.stringify(effectiveSettings())}`);

  server = new ServerConnection(context.asAbsolutePath('dist/server.js'), log);
  const statusBar = new StatusBar(server);
  const panels = new ReportPanels(context.extensionUri, server, log);
  context.subscriptions.push(
    log,
    server,
    statusBar,
    panels,
    ...registerCommands({ server, panels, log }),
    watchTrust(server, statusBar, log),
    server.onDidReceiveSummary((summary) => {
      if (summary.state === 'done') panels.refreshDocument(summary.uri);
    }),
    vscode.workspace.onDidChangeConfiguration((event) => {
      if (event.affectsConfiguration('slopecheck')) log.info(`Settings changed: ${JSON.stringify(effectiveSettings())}`);
    }),
  );
  await server.start();
}

export async function deactivate(): Promise<void> {
  await server?.stop();
}

/** The settings as the server will read them (same defaults and ranges). */
function effectiveSettings() {
  const configuration = vscode.workspace.getConfiguration('slopecheck');
  return readSettings(Object.fromEntries(Object.keys(defaultSettings).map((key) => [key, configuration.get(key)])));
}
