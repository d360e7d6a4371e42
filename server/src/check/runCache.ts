// Remembers sandbox results by what determines them: the bundled code and the plan
// (options included). Reopening or re-saving an unchanged file then costs no sandbox run.
// Results are kept as JSON text: one flat string per entry is compact, its size is known,
// and parsing it hands every caller its own copy.
import { createHash } from 'node:crypto';
import type { CheckPlan, FindingCode } from '../engine/types';
import type { Bundle } from '../sandbox/bundle';
import type { SandboxResult } from '../sandbox/pool';
import type { PairRunner } from './checkDocument';

/** Outcomes that say more about the machine or the moment than about the code. */
const transientCodes = new Set<FindingCode>(['timeout', 'sandbox-crash', 'memory-limit']);

export const defaultRunCacheEntries = 200;
/** Reports of the demo pairs are 0.5–2 kB as JSON, so this holds far more than the entry limit needs. */
export const defaultRunCacheBytes = 2 * 1024 * 1024;

export class CachedRunner implements PairRunner {
  /** Key to JSON of the result; insertion order is use order, oldest first. */
  private readonly entries = new Map<string, string>();
  private storedBytes = 0;
  /** Test hook: how many runs reached the sandbox. */
  sandboxRuns = 0;

  constructor(
    private readonly runner: () => PairRunner,
    private readonly maxEntries = defaultRunCacheEntries,
    /** Bound on the stored JSON, counted as one byte per character (reports are ASCII but for user text). */
    private readonly maxBytes = defaultRunCacheBytes,
  ) {}

  async run(bundle: Bundle, plan: CheckPlan, signal?: AbortSignal): Promise<SandboxResult> {
    const key = cacheKey(bundle, plan);
    const hit = this.entries.get(key);
    if (hit !== undefined) {
      // Most recently used goes last, so the oldest entry is evicted first.
      this.entries.delete(key);
      this.entries.set(key, hit);
      return JSON.parse(hit) as SandboxResult;
    }
    return this.runAndRemember(key, bundle, plan, signal);
  }

  /** Runs in the sandbox whatever is remembered, and remembers the fresh result. */
  uncached(): PairRunner {
    return { run: (bundle, plan, signal) => this.runAndRemember(cacheKey(bundle, plan), bundle, plan, signal) };
  }

  private async runAndRemember(key: string, bundle: Bundle, plan: CheckPlan, signal?: AbortSignal): Promise<SandboxResult> {
    this.sandboxRuns++;
    const result = await this.runner().run(bundle, plan, signal);
    if (!signal?.aborted && !result.report.findings.some((f) => transientCodes.has(f.code))) {
      // Results crossed the process boundary as JSON already, so the text loses nothing.
      this.remember(key, JSON.stringify(result));
    }
    return result;
  }

  private remember(key: string, json: string): void {
    this.forget(key);
    if (json.length > this.maxBytes) return;
    this.entries.set(key, json);
    this.storedBytes += json.length;
    while (this.entries.size > this.maxEntries || this.storedBytes > this.maxBytes) this.forget(this.entries.keys().next().value!);
  }

  private forget(key: string): void {
    const json = this.entries.get(key);
    if (json === undefined) return;
    this.entries.delete(key);
    this.storedBytes -= json.length;
  }

  clear(): void {
    this.entries.clear();
    this.storedBytes = 0;
  }

  get size(): number {
    return this.entries.size;
  }

  /** Stored JSON in characters, the measure `maxBytes` bounds. */
  get bytes(): number {
    return this.storedBytes;
  }
}

function cacheKey(bundle: Bundle, plan: CheckPlan): string {
  return createHash('sha256').update(bundle.code).update('\0').update(JSON.stringify(plan)).digest('hex');
}
