// The commands, registered at activation. While the server is not running they
// say why instead of failing silently.
import * as vscode from 'vscode';
import { methods, type DocumentParams, type PairListing } from '../../server/src/shared/protocol';
import { kindWording, verdictWords } from '../../server/src/shared/wording';
import { commandIds } from './commandIds';
import { pairAtCursor, symbolSpans, type SymbolLike } from './pairAtCursor';
import type { ReportPanels } from './report/panel';
import { describe, ServerNotRunning, type ServerConnection } from './serverClient';
import { explainRestrictedMode } from './trust';

interface Services {
  server: ServerConnection;
  panels: ReportPanels;
  log: vscode.LogOutputChannel;
}

const statusWords: Record<PairListing['status'], string> = { ...verdictWords, pending: 'not checked yet' };

export function registerCommands({ server, panels, log }: Services): vscode.Disposable[] {
  const guarded =
    (name: string, run: (...args: any[]) => Promise<unknown>) =>
    async (...args: unknown[]) => {
      try {
        await run(...args);
      } catch (error) {
        if (error instanceof ServerNotRunning) {
          await offerRestart(error.message);
          return;
        }
        log.error(`${name}: ${describe(error)}`);
        void vscode.window.showErrorMessage(`Slopecheck: ${name} failed: ${describe(error)}`);
      }
    };

  /** The pair under the cursor, the file's only pair, or one the user picks. */
  async function choosePair(): Promise<{ uri: string; objective: string; pending: boolean } | undefined> {
    const editor = vscode.window.activeTextEditor;
    if (!editor) {
      void vscode.window.showInformationMessage('Open a TypeScript or JavaScript file with an objective to check.');
      return undefined;
    }
    if (!vscode.workspace.isTrusted) {
      await explainRestrictedMode();
      return undefined;
    }
    const uri = editor.document.uri.toString();
    const params: DocumentParams = { uri };
    const pairs = await server.request<PairListing[]>(methods.listPairs, params);
    if (pairs.length === 0) {
      void vscode.window.showInformationMessage('Slopecheck found nothing to check in this file: no objective with its gradient, residuals with their Jacobian, or Hessian.');
      return undefined;
    }
    const symbols = await vscode.commands
      .executeCommand<SymbolLike[] | undefined>('vscode.executeDocumentSymbolProvider', editor.document.uri)
      .then((found) => found ?? [], () => []);
    const atCursor = pairAtCursor(pairs, symbolSpans(symbols), editor.selection.active.line);
    const pair = atCursor ?? (pairs.length === 1 ? pairs[0] : await pickPair(pairs));
    return pair && { uri, objective: pair.objective, pending: pair.status === 'pending' };
  }

  return [
    vscode.commands.registerCommand(
      commandIds.checkObjective,
      guarded('Check This Objective', async () => {
        const chosen = await choosePair();
        if (!chosen) return;
        panels.show(chosen.uri, chosen.objective);
        // Not checked yet (e.g. checking on save and never saved): check now; the panel follows the result.
        if (chosen.pending) await server.request(methods.checkAgain, { uri: chosen.uri } satisfies DocumentParams);
      }),
    ),
    vscode.commands.registerCommand(
      commandIds.openReport,
      guarded('Open Gradient Report', async (uri?: string | vscode.Uri, objective?: string) => {
        const chosen = uri !== undefined && objective !== undefined ? { uri: uri.toString(), objective } : await choosePair();
        if (chosen) panels.show(chosen.uri, chosen.objective);
      }),
    ),
    vscode.commands.registerCommand(
      commandIds.checkAgain,
      guarded('Check File Again', async (uri?: string | vscode.Uri) => {
        const target = uri?.toString() ?? vscode.window.activeTextEditor?.document.uri.toString();
        if (!target) {
          void vscode.window.showInformationMessage('Open a TypeScript or JavaScript file to check it again.');
          return;
        }
        if (!vscode.workspace.isTrusted) return explainRestrictedMode();
        const params: DocumentParams = { uri: target };
        await server.request(methods.checkAgain, params);
      }),
    ),
    vscode.commands.registerCommand(
      commandIds.restartServer,
      guarded('Restart Server', () => server.restart()),
    ),
    vscode.commands.registerCommand(commandIds.showLog, () => log.show()),
  ];

  async function offerRestart(reason: string): Promise<void> {
    const restart = 'Restart Server';
    const showLog = 'Show Log';
    const choice = await vscode.window.showWarningMessage(reason, restart, showLog);
    if (choice === restart) await server.restart();
    if (choice === showLog) log.show();
  }
}

async function pickPair(pairs: PairListing[]): Promise<PairListing | undefined> {
  const items = pairs.map((pair) => ({
    label: pair.objective,
    description: describeListing(pair),
    detail: `line ${pair.line + 1} · ${statusWords[pair.status]}`,
    pair,
  }));
  const picked = await vscode.window.showQuickPick(items, { title: 'Slopecheck: which target?', placeHolder: 'The cursor is on none of the targets; pick one' });
  return picked?.pair;
}

/** "Jacobian sondeJacobian of sondeResiduals", "gradient lossGrad of loss", "objective and gradient in one function". */
function describeListing(pair: PairListing): string {
  const words = kindWording[pair.kind];
  return pair.gradient ? `${words.derivative} ${pair.gradient} of ${pair.value}` : `${words.value} and ${words.derivative} in one function`;
}
