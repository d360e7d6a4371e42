// Workspace Trust: the server learns it at start and when it is granted; in
// Restricted Mode the user is told once per session why nothing is checked.
import * as vscode from 'vscode';
import { methods, type SetTrustParams } from '../../server/src/shared/protocol';
import { manageTrustCommand } from './commandIds';
import type { ServerConnection } from './serverClient';
import type { StatusBar } from './statusBar';
import { restrictedModeExplanation } from './statusText';

let explainedThisSession = false;

export function watchTrust(server: ServerConnection, statusBar: StatusBar, log: vscode.LogOutputChannel): vscode.Disposable {
  if (!vscode.workspace.isTrusted) {
    log.info('Restricted Mode: nothing will be checked until the workspace is trusted.');
    if (!explainedThisSession) {
      explainedThisSession = true;
      void explainRestrictedMode();
    }
  }
  return vscode.workspace.onDidGrantWorkspaceTrust(async () => {
    log.info('The workspace is now trusted: checking starts.');
    const params: SetTrustParams = { trusted: true };
    // A server that is not running reads the trust when it next starts.
    await server.notify(methods.setTrust, params);
    statusBar.refresh();
  });
}

/** Says why nothing runs, with VS Code's own trust page one click away. */
export async function explainRestrictedMode(): Promise<void> {
  const manage = 'Manage Workspace Trust';
  const choice = await vscode.window.showInformationMessage(restrictedModeExplanation, manage);
  if (choice === manage) await vscode.commands.executeCommand(manageTrustCommand);
}
