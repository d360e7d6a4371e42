// Remembers sandbox results by what determines them: the bundled code and the plan
// (options included). Reopening or re-saving an unchanged file then costs no sandbox run.
import { createHash } from 'node:crypto';
import type { CheckPlan, FindingCode } from '../engine/types';
import type { Bundle } from '../sandbox/bundle';
import type { SandboxResult } from '../sandbox/pool';
import type { PairRunner } from './checkDocument';

/** Outcomes that say more about the machine or the moment than about the code. */
const transientCodes = new Set<FindingCode>(['timeout', 'sandbox-crash', 'memory-limit']);

export class CachedRunner implements PairRunner {
  private readonly entries = new Map<string, SandboxResult>();
  /** Test hook: how many runs reached the sandbox. */
  sandboxRuns = 0;

  constructor(
    private readonly runner: () => PairRunner,
    private readonly capacity = 200,
  ) {}

  async run(bundle: Bundle, plan: CheckPlan, signal?: AbortSignal): Promise<SandboxResult> {
    const key = cacheKey(bundle, plan);
    const hit = this.entries.get(key);
    if (hit) {
      // Most recently used goes last, so the oldest entry is evicted first.
      this.entries.delete(key);
      this.entries.set(key, hit);
      return structuredClone(hit);
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
      this.entries.delete(key);
      this.entries.set(key, structuredClone(result));
      if (this.entries.size > this.capacity) this.entries.delete(this.entries.keys().next().value!);
    }
    return result;
  }

  clear(): void {
    this.entries.clear();
  }

  get size(): number {
    return this.entries.size;
  }
}

function cacheKey(bundle: Bundle, plan: CheckPlan): string {
  return createHash('sha256').update(bundle.code).update('\0').update(JSON.stringify(plan)).digest('hex');
}
