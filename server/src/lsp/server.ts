// Wires the LSP connection to the document checks and the editor features.
import * as path from 'node:path';
import { fileURLToPath } from 'node:url';
import {
  CodeActionKind, CodeLensRefreshRequest, DidChangeConfigurationNotification, TextDocumentSyncKind, TextDocuments, type Connection, type InitializeParams,
} from 'vscode-languageserver';
import { TextDocument } from 'vscode-languageserver-textdocument';
import type { WorkspaceContext } from '../check/checkDocument';
import { CachedRunner } from '../check/runCache';
import { discoverPairs } from '../discovery/discover';
import { anchorOf } from '../discovery/pairing';
import type { NamedSpan } from '../discovery/types';
import { isInside } from '../sandbox/confine';
import { SandboxPool } from '../sandbox/pool';
import { productVersion, sandboxScriptPath, shippedReadmeUrl } from '../shared/productInfo';
import {
  methods, type CheckAgainResult, type DocumentParams, type InitializationOptions, type PairListing, type PairReportParams, type PairReportResult, type SetTrustParams,
} from '../shared/protocol';
import type { SlopecheckSettings } from '../shared/settings';
import { codeActions } from './codeActions';
import { pairLenses } from './codeLens';
import { toDiagnostics, toRange } from './diagnostics';
import { DiscoveryCache } from './discoveryCache';
import { checkOptions, DocumentChecks } from './documentChecks';
import { hoverMarkdown, nameAt } from './hover';
import { PatchVerifier } from './patchVerifier';
import { SettingsSource } from './settingsSource';
import { WorkspaceSources } from './workspaceSources';

// Diagnostic codes link to their section of the README shipped beside dist/.
const shippedReadme = shippedReadmeUrl();

export function startServer(connection: Connection): void {
  const documents = new TextDocuments(TextDocument);
  let trusted = true;
  let relatedInformation = false;
  let codeLensRefresh = false;
  let dynamicConfiguration = false;
  let settings!: SettingsSource;
  let pool: SandboxPool | null = null;
  let ready!: Promise<void>;
  /** The workspace folders the client named (file URIs only); a document's bundles read only inside the one holding it. */
  let folders: string[] = [];
  let sources: WorkspaceSources | null = null;
  // One view of the workspace for a file's checks and for the checks of its patches.
  const workspace = (fileName: string): WorkspaceContext => ({
    workspaceRoot: folderHolding(folders, fileName),
    importersOf: sources && folders.length > 0 ? (target) => sources!.importersOf(target) : undefined,
  });
  const runner = new CachedRunner(() => pool ?? (pool = createPool(settings.current)));
  const verifier = new PatchVerifier(() => runner, { workspace });
  let checks!: DocumentChecks;

  connection.onInitialize((params: InitializeParams) => {
    const options = (params.initializationOptions ?? {}) as InitializationOptions;
    trusted = options.trusted !== false;
    const capabilities = params.capabilities;
    relatedInformation = capabilities.textDocument?.publishDiagnostics?.relatedInformation === true;
    codeLensRefresh = capabilities.workspace?.codeLens?.refreshSupport === true;
    dynamicConfiguration = capabilities.workspace?.didChangeConfiguration?.dynamicRegistration === true;
    settings = new SettingsSource(connection, capabilities.workspace?.configuration === true);
    folders = (params.workspaceFolders ?? (params.rootUri ? [{ uri: params.rootUri }] : [])).filter((folder) => folder.uri.startsWith('file:')).map((folder) => fileNameOf(folder.uri));
    const openText = (fileName: string) => documents.all().find((document) => fileNameOf(document.uri) === fileName)?.getText();
    sources = new WorkspaceSources(() => folders, openText);
    checks = new DocumentChecks({
      runner,
      settings: () => settings.current,
      trusted: () => trusted,
      publish: (uri, result) => {
        const diagnostics = result ? toDiagnostics(result.check, { uri, text: result.text, relatedInformation, readme: shippedReadme }) : [];
        void connection.sendDiagnostics({ uri, version: result?.version, diagnostics });
        if (codeLensRefresh) void connection.sendRequest(CodeLensRefreshRequest.type).catch(() => undefined);
      },
      summary: (summary) => void connection.sendNotification(methods.documentSummary, summary),
      progress: capabilities.window?.workDoneProgress ? () => connection.window.createWorkDoneProgress() : null,
      log: (message) => connection.console.error(message),
      workspace,
    });
    return {
      capabilities: {
        textDocumentSync: { openClose: true, change: TextDocumentSyncKind.Incremental, save: { includeText: false } },
        hoverProvider: true,
        codeLensProvider: { resolveProvider: false },
        codeActionProvider: { codeActionKinds: [CodeActionKind.QuickFix] },
      },
      serverInfo: { name: 'slopecheck', version: productVersion },
    };
  });

  connection.onInitialized(() => {
    if (dynamicConfiguration) void connection.client.register(DidChangeConfigurationNotification.type, { section: 'slopecheck' });
    ready = settings.pull().then((current) => {
      connection.console.info(`Slopecheck ${productVersion} language server; workspace ${trusted ? 'trusted' : 'not trusted'}; settings ${JSON.stringify(current)}`);
    });
  });

  connection.onDidChangeConfiguration(async (change) => {
    const before = settings.current;
    const after = await settings.changed(change.settings);
    connection.console.info(`settings changed: ${JSON.stringify(after)}`);
    if (pool && (before.timeoutMs !== after.timeoutMs || before.memoryMb !== after.memoryMb)) {
      pool.dispose();
      pool = null;
    }
    checks.checkAll();
  });

  connection.onNotification(methods.setTrust, (params: SetTrustParams) => {
    trusted = params.trusted !== false;
    connection.console.info(`workspace ${trusted ? 'trusted: checking open documents' : 'not trusted: nothing is run'}`);
    if (trusted) checks.checkAll();
    else checks.withdrawAll();
  });

  // Checks wait for the first settings, so a typing-mode client is never checked with defaults first.
  const afterReady = (action: () => void) => void (ready ?? Promise.resolve()).then(action);
  documents.onDidOpen(({ document }) =>
    afterReady(() => {
      const current = documents.get(document.uri);
      if (current) checks.opened(current.uri, fileNameOf(current.uri), current.getText(), current.version);
    }),
  );
  documents.onDidChangeContent(({ document }) => checks.changed(document.uri, document.getText(), document.version));
  documents.onDidSave(({ document }) => afterReady(() => checks.saved(document.uri)));
  // Features read the current text, so names and edits line up with what the user sees.
  const discovered = new DiscoveryCache();
  const pairsOf = (document: TextDocument) => discovered.pairs(document.uri, document.version, () => discoverPairs(document.getText(), fileNameOf(document.uri)).pairs);
  documents.onDidClose(({ document }) => {
    checks.closed(document.uri);
    discovered.forget(document.uri);
  });

  connection.onHover(async ({ textDocument, position }) => {
    const document = documents.get(textDocument.uri);
    if (!document) return null;
    const hit = nameAt(pairsOf(document), document.offsetAt(position));
    if (!hit) return null;
    let outcome = checks.outcome(document.uri, hit.pair.key);
    // A passing pair without a learning rate was checked without its curvature: the hover asks for it.
    // (A Jacobian's least-squares figures come with every check: nothing to ask for.)
    if (outcome && outcome.report.status === 'pass' && !outcome.report.smoothness && !outcome.report.matrix?.leastSquares && !hit.pair.learningRate) {
      outcome = (await checks.detailedOutcome(document.uri, hit.pair.key, { smoothness: true })) ?? outcome;
    }
    const span = hit.role === 'objective' ? hit.pair.objective.nameSpan : hit.role === 'gradient' ? hit.pair.gradient!.nameSpan : hit.pair.learningRate!.nameSpan;
    return { contents: { kind: 'markdown', value: hoverMarkdown(hit.pair, outcome, checks.isChecking(document.uri)) }, range: toRange(span) };
  });

  connection.onCodeLens(({ textDocument }) => {
    const document = documents.get(textDocument.uri);
    if (!document) return [];
    const checking = checks.isChecking(document.uri);
    return pairsOf(document).flatMap((pair) => pairLenses(document.uri, pair, checks.outcome(document.uri, pair.key), checking, trusted));
  });

  connection.onCodeAction(async ({ textDocument, context }, token) => {
    const document = documents.get(textDocument.uri);
    if (!document || !trusted) return [];
    const abort = new AbortController();
    token.onCancellationRequested(() => abort.abort());
    const fileName = fileNameOf(document.uri);
    return codeActions({
      uri: document.uri,
      fileName,
      text: document.getText(),
      pairs: pairsOf(document),
      positionAt: (offset) => document.positionAt(offset),
      diagnostics: context.diagnostics,
      outcome: (objective) => checks.outcome(document.uri, objective),
      verify: (patched, objective) => verifier.passes(patched, fileName, objective, checkOptions(settings.current), abort.signal),
    });
  });

  connection.onRequest(methods.listPairs, ({ uri }: DocumentParams): PairListing[] => {
    const document = documents.get(uri);
    if (!document) return [];
    return pairsOf(document).map((pair) => ({
      objective: pair.key,
      kind: pair.kind,
      value: pair.objective.name,
      gradient: pair.gradient?.name ?? null,
      line: anchorOf<NamedSpan>(pair).nameSpan.startLine,
      status: checks.outcome(uri, pair.key)?.report.status ?? 'pending',
    }));
  });

  connection.onRequest(methods.pairReport, async ({ uri, objective }: PairReportParams): Promise<PairReportResult | null> => {
    // The plots need data the everyday check leaves out; without it the last verdict still shows.
    const outcome = (await checks.detailedOutcome(uri, objective)) ?? checks.outcome(uri, objective);
    if (!outcome) return null;
    const current = settings.current;
    return {
      uri,
      objective,
      value: outcome.pair.objective.name,
      gradient: outcome.pair.gradient?.name ?? null,
      line: anchorOf<NamedSpan>(outcome.pair).nameSpan.startLine,
      report: outcome.report,
      console: outcome.console,
      settings: { seed: current.seed, timeoutMs: current.timeoutMs, probeCount: current.probeCount },
    };
  });

  connection.onRequest(methods.checkAgain, async ({ uri }: DocumentParams): Promise<CheckAgainResult> => {
    await ready;
    return checks.checkAgain(uri);
  });

  connection.onShutdown(() => {
    checks?.dispose();
    pool?.dispose();
    pool = null;
  });

  documents.listen(connection);
  connection.listen();
}

function createPool(settings: SlopecheckSettings): SandboxPool {
  return new SandboxPool({ sandboxScript: sandboxScriptPath(), timeoutMs: settings.timeoutMs, memoryMb: settings.memoryMb, size: 1 });
}

/** The innermost workspace folder holding `fileName`; undefined when none does (its own folder is then the root). */
function folderHolding(folders: readonly string[], fileName: string): string | undefined {
  return folders.filter((folder) => isInside(folder, fileName)).sort((a, b) => b.length - a.length)[0];
}

/** A file path for the bundler: the real one for file URIs, a made-up one in the working folder otherwise. */
export function fileNameOf(uri: string): string {
  if (uri.startsWith('file:')) return fileURLToPath(uri);
  const name = uri.replace(/^[a-z]+:/i, '').replace(/[^\w.-]+/g, '_') || 'untitled';
  return path.join(process.cwd(), /\.[cm]?[jt]sx?$/.test(name) ? name : `${name}.ts`);
}
