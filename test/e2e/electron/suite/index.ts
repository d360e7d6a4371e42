// Runs inside a VS Code desktop build (@vscode/test-electron loads it as the extension
// tests module) with the demo workspace open. No test framework: each check throws.
import assert from 'node:assert/strict';
import * as vscode from 'vscode';

const extensionId = 'slopecheck.slopecheck';
const checkTimeoutMs = 60_000;

const checks: Array<[string, () => Promise<void>]> = [
  ['the extension activates on a TypeScript file', extensionActivates],
  ['the wrong gradient of thermistorFit gets a gradient-mismatch diagnostic', wrongGradientDiagnosed],
  ['the hover of salinityCalibration shows the safe step', hoverShowsSafeStep],
];

export async function run(): Promise<void> {
  const failures: string[] = [];
  for (const [name, check] of checks) {
    try {
      await check();
      console.log(`ok - ${name}`);
    } catch (error) {
      console.error(`not ok - ${name}: ${error instanceof Error ? error.stack : error}`);
      failures.push(name);
    }
  }
  if (failures.length > 0) throw new Error(`${failures.length} of ${checks.length} checks failed: ${failures.join('; ')}`);
}

function demoFile(relativePath: string): vscode.Uri {
  const folder = vscode.workspace.workspaceFolders?.[0];
  assert.ok(folder, 'the demo workspace is open');
  return vscode.Uri.joinPath(folder.uri, relativePath);
}

async function openDemoFile(relativePath: string): Promise<vscode.TextDocument> {
  const document = await vscode.workspace.openTextDocument(demoFile(relativePath));
  await vscode.window.showTextDocument(document);
  return document;
}

async function extensionActivates(): Promise<void> {
  await openDemoFile('src/calibration.ts');
  const extension = vscode.extensions.getExtension(extensionId);
  assert.ok(extension, `${extensionId} is installed`);
  await extension.activate();
  assert.equal(extension.isActive, true);
}

function codeOf(diagnostic: vscode.Diagnostic): string {
  const code = diagnostic.code;
  return typeof code === 'object' ? String(code.value) : String(code);
}

/** Resolves with the file's Slopecheck diagnostics once `accept` holds for them (an event, not a sleep). */
function slopecheckDiagnostics(uri: vscode.Uri, accept: (found: vscode.Diagnostic[]) => boolean): Promise<vscode.Diagnostic[]> {
  const current = () => vscode.languages.getDiagnostics(uri).filter((d) => d.source === 'slopecheck');
  return new Promise((resolve, reject) => {
    const finish = (error?: Error) => {
      clearTimeout(timer);
      listener.dispose();
      if (error) reject(error);
      else resolve(current());
    };
    const listener = vscode.languages.onDidChangeDiagnostics(() => {
      if (accept(current())) finish();
    });
    const timer = setTimeout(() => finish(new Error(`no matching Slopecheck diagnostics for ${uri.fsPath} within ${checkTimeoutMs} ms`)), checkTimeoutMs);
    if (accept(current())) finish();
  });
}

async function wrongGradientDiagnosed(): Promise<void> {
  const document = await openDemoFile('src/calibration.ts');
  const found = await slopecheckDiagnostics(document.uri, (all) => all.some((d) => codeOf(d) === 'gradient-mismatch'));
  const mismatch = found.find((d) => codeOf(d) === 'gradient-mismatch')!;
  assert.equal(mismatch.severity, vscode.DiagnosticSeverity.Error);
  const line = document.lineAt(mismatch.range.start.line).text;
  assert.match(line, /thermistorFit_grad|rackDrying/, `the diagnostic sits on a wrong gradient's pair: ${line}`);
  assert.ok(found.some((d) => document.lineAt(d.range.start.line).text.includes('thermistorFit')), 'thermistorFit (sign error) is diagnosed');
}

async function hoverShowsSafeStep(): Promise<void> {
  const document = await openDemoFile('src/calibration.ts');
  // The check has finished once the file's diagnostics are in; before that the card says "checking…".
  await slopecheckDiagnostics(document.uri, (all) => all.length > 0);
  const offset = document.getText().indexOf('function salinityCalibration(') + 'function '.length;
  const hovers = await vscode.commands.executeCommand<vscode.Hover[]>('vscode.executeHoverProvider', document.uri, document.positionAt(offset + 2));
  const text = hovers
    .flatMap((hover) => hover.contents)
    .map((content) => (typeof content === 'string' ? content : content.value))
    .join('\n');
  assert.match(text, /safe step 1\/L̂ \| [\d.e-]+/, `the hover card of salinityCalibration gives the safe step: ${text}`);
}
