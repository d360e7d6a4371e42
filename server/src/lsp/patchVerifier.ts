// A gradient fix is offered only once the patched text has passed the check in the
// sandbox. Verdicts are remembered by patched text, pair and options.
import { createHash } from 'node:crypto';
import { checkDocument, type PairRunner, type WorkspaceContext } from '../check/checkDocument';
import type { CheckOptions } from '../engine/types';

export class PatchVerifier {
  private readonly verdicts = new Map<string, Promise<boolean>>();

  private readonly capacity: number;
  private readonly workspace: (fileName: string) => WorkspaceContext;

  /** `workspace`: the same view of the workspace the file's own checks get, so a patch is checked as they are. */
  constructor(
    private readonly runner: () => PairRunner,
    options: { capacity?: number; workspace?: (fileName: string) => WorkspaceContext } = {},
  ) {
    this.capacity = options.capacity ?? 100;
    this.workspace = options.workspace ?? (() => ({}));
  }

  /** True when `objective`'s pair passes in `patchedText`. A cancelled verification is forgotten. */
  passes(patchedText: string, fileName: string, objective: string, options: CheckOptions, signal?: AbortSignal): Promise<boolean> {
    const key = createHash('sha256').update(fileName).update('\0').update(objective).update('\0').update(JSON.stringify(options)).update('\0').update(patchedText).digest('hex');
    const known = this.verdicts.get(key);
    if (known) return known;
    const verdict = checkDocument(patchedText, fileName, this.runner(), options, signal, {
      onlyTarget: objective,
      ...this.workspace(fileName),
    }).then(
      (check) => !signal?.aborted && check.pairs.length === 1 && check.pairs[0].report.status === 'pass',
      () => false,
    );
    this.verdicts.set(key, verdict);
    if (this.verdicts.size > this.capacity) this.verdicts.delete(this.verdicts.keys().next().value!);
    void verdict.then(() => {
      if (signal?.aborted) this.verdicts.delete(key);
    });
    return verdict;
  }

  /** Test hook: verdicts remembered. */
  get size(): number {
    return this.verdicts.size;
  }
}
