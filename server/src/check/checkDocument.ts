// The one path from a document's text to verdicts, shared by the CLI and the
// language server: discover pairs, bundle the module, run each pair's plan in
// the sandbox.
import { discoverPairs } from '../discovery/discover';
import type { DiscoveredPair, SourceSpan } from '../discovery/types';
import { emptyReport } from '../engine/emptyReport';
import { kindWording } from '../engine/kindWording';
import type { CheckOptions, CheckPlan, Finding, PairReport, PairStatus } from '../engine/types';
import { documentNamespace } from '../discovery/importerCalls';
import type { SourceText } from '../discovery/importers';
import { bundleDocument, unrunnableBundleFindings, type Bundle } from '../sandbox/bundle';
import { bundleRootFor } from '../sandbox/confine';
import { scopeKeysOf } from '../sandbox/scopeHook';
import type { SandboxPool } from '../sandbox/pool';

/** What checkDocument needs of the sandbox: the pool itself, or a cache in front of it. */
export type PairRunner = Pick<SandboxPool, 'run'>;

export interface PairOutcome {
  pair: DiscoveredPair;
  report: PairReport;
  /** The user's console output during the check, truncated. */
  console: string[];
}

export interface DocumentCheck {
  fileName: string;
  pairs: PairOutcome[];
  /** Problems of the whole file (syntax errors), with where they are. */
  fileFindings: Array<Finding & { span: SourceSpan }>;
  /** Pairs left unchecked by a `// slopecheck-skip` comment. */
  skipped: DiscoveredPair[];
}

export interface CheckDocumentHooks {
  /** Check only the target with this key (DiscoveredPair.key; the others are left out of the result). */
  onlyTarget?: string;
  /** Called after each pair, e.g. for progress reports. */
  onPairChecked?(done: number, total: number, objective: string): void;
  /** Workspace files that import `fileName`, asked only when a pair needs data its own file lacks. */
  importersOf?(fileName: string): Promise<readonly SourceText[]>;
  /**
   * The workspace folder: every bundle reads only files inside it. When it does not hold the
   * document, or is absent, the document's own folder is the root.
   */
  workspaceRoot?: string;
}

/** What a check knows of the workspace around a file: its folder and the files that import it. */
export type WorkspaceContext = Pick<CheckDocumentHooks, 'importersOf' | 'workspaceRoot'>;

/** Codes found by discovery that leave nothing to run. */
const blockingCodes = new Set(['unknown-dimension', 'bad-probe', 'missing-export', 'missing-argument']);

export async function checkDocument(
  text: string,
  fileName: string,
  pool: PairRunner,
  options: CheckOptions,
  signal?: AbortSignal,
  hooks: CheckDocumentHooks = {},
): Promise<DocumentCheck> {
  // Importers are looked for only when a pair asks for data its own file lacks; then discovery runs again with them.
  let wantsImporters = false;
  let discovery = discoverPairs(text, fileName, () => {
    wantsImporters = true;
    return [];
  });
  if (wantsImporters && hooks.importersOf) {
    const importers = await hooks.importersOf(fileName);
    if (importers.length > 0) discovery = discoverPairs(text, fileName, () => importers);
  }
  const wanted = discovery.pairs.filter((pair) => hooks.onlyTarget === undefined || pair.key === hooks.onlyTarget);
  const toCheck = wanted.filter((pair) => !pair.skipped);
  const result: DocumentCheck = { fileName, pairs: [], fileFindings: discovery.fileFindings, skipped: wanted.filter((pair) => pair.skipped) };
  if (toCheck.length === 0) return result;

  // One bundle per entry: the document for most targets, an importing file for those whose data live there.
  // Each exposes every value its targets' plans name, and all read under the same root.
  const root = bundleRootFor(fileName, hooks.workspaceRoot);
  const bundles = new Map<string, Promise<Bundle>>();
  const bundleFor = (pair: DiscoveredPair): Promise<Bundle> => {
    const entry = pair.entry;
    const key = entry?.fileName ?? '';
    let bundle = bundles.get(key);
    if (!bundle) {
      const keys = toCheck.filter((p) => (p.entry?.fileName ?? '') === key).flatMap((p) => scopeKeysOf(p.plan));
      bundle = entry
        ? bundleDocument(entry.text, entry.fileName, root, keys, { documentImport: { namespace: documentNamespace, specifier: entry.specifier }, replaced: { fileName, text } })
        : bundleDocument(text, fileName, root, keys);
      bundles.set(key, bundle);
    }
    return bundle;
  };
  for (const pair of toCheck) {
    signal?.throwIfAborted();
    const bundle = await bundleFor(pair);
    const bundleFindings = unrunnableBundleFindings(bundle);
    const blocking = pair.findings.filter((f) => blockingCodes.has(f.code) || f.severity === 'error');
    if (bundleFindings.length > 0) {
      result.pairs.push(unrunOutcome(pair, [...pair.findings, ...bundleFindings], 'error'));
    } else if (blocking.length > 0) {
      const status = blocking.some((f) => f.severity === 'error') ? 'error' : 'inconclusive';
      result.pairs.push(unrunOutcome(pair, pair.findings, status));
    } else {
      const plan: CheckPlan = { ...pair.plan, options };
      const run = await pool.run(bundle, plan, signal);
      run.report.findings.unshift(...pair.findings);
      // The plan says what was checked: a report the sandbox could not write (a timeout, a crash) says nothing of it.
      run.report.kind = pair.kind;
      result.pairs.push({ pair, report: run.report, console: run.console });
    }
    hooks.onPairChecked?.(result.pairs.length, toCheck.length, pair.objective.name);
  }
  judgedAgainstWrongGradients(result.pairs);
  return result;
}

/**
 * A Hessian is checked against differences of its pair's gradient: when that gradient is itself
 * wrong, a disagreement says nothing about the Hessian, so its mismatch becomes an undecided note
 * pointing at the gradient (an asymmetry is still wrong whatever the gradient is).
 */
function judgedAgainstWrongGradients(outcomes: PairOutcome[]): void {
  for (const { pair, report } of outcomes) {
    const gradient = pair.gradientPair === undefined ? undefined : outcomes.find((o) => o.pair.key === pair.gradientPair);
    if (!gradient || gradient.report.status !== 'fail' || report.status !== 'fail' || report.matrix?.asymmetry) continue;
    const mismatch = kindWording[pair.kind].mismatchCode;
    report.status = 'inconclusive';
    report.findings = report.findings.map((finding) =>
      finding.code !== mismatch
        ? finding
        : { code: 'matrix-undecided', severity: 'info', subject: 'gradient', message: `not judged: the ${kindWording[pair.kind].derivative} is checked against differences of \`${gradient.pair.gradient?.name ?? gradient.pair.objective.name}\`, which disagrees with its own objective; fix the gradient first (its finding says where)` },
    );
  }
}

/** A report for a pair that was not executed, carrying the reasons why. */
function unrunOutcome(pair: DiscoveredPair, findings: Finding[], status: PairStatus): PairOutcome {
  return {
    pair,
    console: [],
    report: emptyReport(status, findings, pair.plan.dimension ?? pair.plan.probes[0]?.length ?? null, pair.kind),
  };
}

/** Where a finding belongs in the document: the name it is about, or the user's throwing line. */
export function findingSpan(pair: DiscoveredPair, finding: Finding): SourceSpan {
  switch (finding.subject) {
    case 'gradient':
      return (pair.gradient ?? pair.objective).nameSpan;
    case 'learningRate':
      return (pair.learningRate ?? pair.objective).nameSpan;
    case 'probe':
      return pair.objective.probeTags[0] ?? pair.objective.nameSpan;
    case 'recipe':
      return finding.recipeKey !== undefined && Object.hasOwn(pair.recipeSpans, finding.recipeKey) ? pair.recipeSpans[finding.recipeKey] : pair.objective.nameSpan;
    default:
      return pair.objective.nameSpan;
  }
}

/** 1-based line for the CLI: the user's throwing line when it is in this file, else the finding's span. */
export function findingLine(fileName: string, pair: DiscoveredPair, finding: Finding): number {
  if (finding.location && sameFile(finding.location.file, fileName)) return finding.location.line;
  return findingSpan(pair, finding).line;
}

/** True when two paths name the same file (one may be relative to an unknown folder). */
export function sameFile(a: string, b: string): boolean {
  const norm = (p: string) => p.replace(/\\/g, '/');
  return norm(a) === norm(b) || norm(b).endsWith('/' + norm(a)) || norm(a).endsWith('/' + norm(b));
}
