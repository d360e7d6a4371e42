// When and how each open document is checked: on open and save, or while typing after a
// pause; a newer check cancels the older one, and a stale result is never published.
// Knows nothing of the LSP connection: the server passes callbacks, tests pass their own.
import { checkDocument, type DocumentCheck, type PairOutcome, type WorkspaceContext } from '../check/checkDocument';
import type { CachedRunner } from '../check/runCache';
import { defaultCheckOptions, type CheckOptions, type PairStatus } from '../engine/types';
import type { DocumentSummaryParams } from '../shared/protocol';
import type { SlopecheckSettings } from '../shared/settings';
import type { DocumentCheckSummary } from '../shared/summary';
import { baseName } from '../shared/wording';
import { CheckProgress, type ProgressFactory } from './progress';

export interface DocumentChecksHost {
  /** The cache in front of the current sandbox pool. */
  runner: CachedRunner;
  settings(): SlopecheckSettings;
  trusted(): boolean;
  /** A finished check of `text` (version `version`); null clears the document's diagnostics. */
  publish(uri: string, result: { check: DocumentCheck; text: string; version: number } | null): void;
  summary(params: DocumentSummaryParams): void;
  /** Null when the client does not show server-initiated progress. */
  progress: ProgressFactory | null;
  /** The workspace around a document (its folder, the files importing it); absent: the document stands alone. */
  workspace?(fileName: string): WorkspaceContext;
  log(message: string): void;
}

interface DocumentState {
  uri: string;
  fileName: string;
  text: string;
  version: number;
  check: DocumentCheck | null;
  state: DocumentCheckSummary['state'];
  /** Bumped by every new check and every cancellation, so older runs know they are stale. */
  generation: number;
  running: AbortController | null;
  finished: Promise<void>;
  typingTimer: NodeJS.Timeout | null;
  /** Detailed outcomes asked for by hovers and the report, by text version, pair and options; emptied with each new check. */
  detailed: Map<string, Promise<PairOutcome | null>>;
  /** Aborts the detailed checks still running (stopDetailed). */
  detailedRuns: AbortController;
}

export class DocumentChecks {
  private readonly documents = new Map<string, DocumentState>();

  constructor(private readonly host: DocumentChecksHost) {}

  opened(uri: string, fileName: string, text: string, version: number): void {
    const previous = this.documents.get(uri);
    if (previous) this.cancel(previous);
    const state: DocumentState = {
      uri, fileName, text, version, check: null, state: 'idle', generation: 0, running: null, finished: Promise.resolve(), typingTimer: null,
      detailed: new Map(),
      detailedRuns: new AbortController(),
    };
    this.documents.set(uri, state);
    void this.start(state, false);
  }

  changed(uri: string, text: string, version: number): void {
    const state = this.documents.get(uri);
    if (!state || (state.version === version && state.text === text)) return;
    state.text = text;
    state.version = version;
    // Detailed outcomes of older text can no longer be asked for.
    this.stopDetailed(state);
    state.detailed.clear();
    const settings = this.host.settings();
    if (settings.checkWhen !== 'typing') return;
    // The running check is about text that no longer exists.
    this.cancel(state);
    state.typingTimer = setTimeout(() => {
      state.typingTimer = null;
      void this.start(state, false);
    }, settings.typingDelayMs);
  }

  saved(uri: string): void {
    const state = this.documents.get(uri);
    if (state) void this.start(state, false);
  }

  closed(uri: string): void {
    const state = this.documents.get(uri);
    if (!state) return;
    this.cancel(state);
    this.documents.delete(uri);
    this.host.publish(uri, null);
  }

  /** Checks now, running every pair in the sandbox again; resolves with the new summary. */
  async checkAgain(uri: string): Promise<DocumentSummaryParams | null> {
    const state = this.documents.get(uri);
    if (!state) return null;
    await this.start(state, true);
    return this.summaryOf(state);
  }

  /** After trust, settings or the sandbox changed. */
  checkAll(): void {
    for (const state of this.documents.values()) void this.start(state, false);
  }

  /** Trust was withdrawn: stop everything and take back what was shown. */
  withdrawAll(): void {
    for (const state of this.documents.values()) {
      this.cancel(state);
      state.check = null;
      state.detailed.clear();
      state.state = 'untrusted';
      this.host.publish(state.uri, null);
      this.host.summary(this.summaryOf(state));
    }
  }

  outcome(uri: string, objective: string): PairOutcome | null {
    return this.documents.get(uri)?.check?.pairs.find((p) => p.pair.key === objective) ?? null;
  }

  /**
   * The pair's outcome with what the everyday check leaves out, checked again for the current
   * text: the report's plot data (step study, descent at 1/L̂ and 2/λ⁺), or the curvature of a pair
   * without a learning rate, which a hover shows. The runner's cache answers when it is asked
   * again on the same text. Null before the pair's first check, or when the detailed check
   * cannot be had (untrusted, closed, failed).
   */
  detailedOutcome(uri: string, objective: string, wanted: Partial<Pick<CheckOptions, 'plots' | 'smoothness'>> = { plots: true }): Promise<PairOutcome | null> {
    const state = this.documents.get(uri);
    if (!state || !this.outcome(uri, objective) || !this.host.trusted()) return Promise.resolve(null);
    // Hovers come far more often than edits: discovery and bundling run once per text and request.
    const options = { ...checkOptions(this.host.settings()), ...wanted };
    const key = `${state.version}\0${objective}\0${JSON.stringify(options)}`;
    let detailed = state.detailed.get(key);
    if (!detailed) {
      detailed = this.checkDetailed(state, objective, options);
      state.detailed.set(key, detailed);
      // A failed check is not remembered: the next request tries again.
      void detailed.then((outcome) => {
        if (outcome === null && state.detailed.get(key) === detailed) state.detailed.delete(key);
      });
    }
    return detailed;
  }

  private async checkDetailed(state: DocumentState, objective: string, options: CheckOptions): Promise<PairOutcome | null> {
    const { signal } = state.detailedRuns;
    try {
      const check = await checkDocument(state.text, state.fileName, this.host.runner, options, signal, { onlyTarget: objective, ...this.host.workspace?.(state.fileName) });
      return signal.aborted ? null : (check.pairs.find((p) => p.pair.key === objective) ?? null);
    } catch (error) {
      if (signal.aborted) return null;
      this.host.log(`the detailed check of ${objective} failed: ${error instanceof Error ? error.message : String(error)}`);
      return null;
    }
  }

  isChecking(uri: string): boolean {
    return this.documents.get(uri)?.state === 'checking';
  }

  document(uri: string): { fileName: string; text: string; version: number } | null {
    return this.documents.get(uri) ?? null;
  }

  /** Resolves when the document's current check (if any) has finished. */
  settled(uri: string): Promise<void> {
    return this.documents.get(uri)?.finished ?? Promise.resolve();
  }

  /** Test hook: documents with state held. */
  get openCount(): number {
    return this.documents.size;
  }

  dispose(): void {
    for (const state of this.documents.values()) this.cancel(state);
    this.documents.clear();
  }

  private start(state: DocumentState, bypassCache: boolean): Promise<void> {
    this.cancel(state);
    if (!this.host.trusted()) {
      state.state = 'untrusted';
      this.host.summary(this.summaryOf(state));
      return Promise.resolve();
    }
    state.finished = this.run(state, bypassCache);
    return state.finished;
  }

  private async run(state: DocumentState, bypassCache: boolean): Promise<void> {
    const generation = state.generation;
    const controller = new AbortController();
    state.running = controller;
    const { text, version } = state;
    state.state = 'checking';
    this.host.summary(this.summaryOf(state));
    const progress = this.host.progress ? new CheckProgress(this.host.progress, `Slopecheck: checking ${baseName(state.fileName)}`) : null;
    const isCurrent = () => state.generation === generation && !controller.signal.aborted && this.documents.get(state.uri) === state;
    try {
      const runner = bypassCache ? this.host.runner.uncached() : this.host.runner;
      const check = await checkDocument(text, state.fileName, runner, checkOptions(this.host.settings()), controller.signal, {
        onPairChecked: (done, total, objective) => progress?.pairChecked(done, total, objective),
        ...this.host.workspace?.(state.fileName),
      });
      if (!isCurrent()) return;
      state.check = check;
      state.detailed.clear();
      state.state = 'done';
      this.host.publish(state.uri, { check, text, version });
      this.host.summary(this.summaryOf(state));
    } catch (error) {
      if (!isCurrent()) return;
      state.state = 'idle';
      this.host.log(`checking ${state.fileName} failed: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}`);
      this.host.summary(this.summaryOf(state));
    } finally {
      progress?.end();
      if (state.running === controller) state.running = null;
    }
  }

  private cancel(state: DocumentState): void {
    state.generation++;
    if (state.typingTimer) clearTimeout(state.typingTimer);
    state.typingTimer = null;
    state.running?.abort();
    state.running = null;
    this.stopDetailed(state);
  }

  /**
   * Stops the detailed checks still running: the text changed, or a check of the document is
   * starting, which must not wait in the sandbox pool behind a hover's check of up to its budget.
   */
  private stopDetailed(state: DocumentState): void {
    state.detailedRuns.abort();
    state.detailedRuns = new AbortController();
  }

  private summaryOf(state: DocumentState): DocumentSummaryParams {
    return { uri: state.uri, ...summarise(state.state, state.check) };
  }
}

export function summarise(state: DocumentCheckSummary['state'], check: DocumentCheck | null): DocumentCheckSummary {
  const byStatus: Record<PairStatus, number> = { pass: 0, fail: 0, inconclusive: 0, error: 0 };
  let smallestSafeStep: number | null = null;
  for (const { report } of check?.pairs ?? []) {
    byStatus[report.status]++;
    const step = report.smoothness?.safeStep;
    if (step !== undefined && Number.isFinite(step) && (smallestSafeStep === null || step < smallestSafeStep)) smallestSafeStep = step;
  }
  return { state, byStatus, smallestSafeStep };
}

export function checkOptions(settings: SlopecheckSettings): CheckOptions {
  return { ...defaultCheckOptions, seed: settings.seed, probeCount: settings.probeCount, fullCheckMaxDimension: settings.fullCheckMaxDimension };
}
