// Shared helpers of the sandbox tests: user modules written to a temp dir, plans, pools.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import * as path from 'node:path';
import type { CheckPlan } from '../../server/src/engine/types';
import { bundleDocument, type Bundle } from '../../server/src/sandbox/bundle';
import { planOf, recipeOf } from '../support/plans';

export interface TempProject {
  dir: string;
  /** Writes a file of the project and returns its absolute path. */
  write(name: string, text: string): string;
  /**
   * Bundles `text` as the (possibly unsaved) document `name` of the project, exposing the
   * names the test plans use (`scopeKeys`) through the scope hook.
   */
  bundle(text: string, name?: string, scopeKeys?: readonly string[]): Promise<Bundle>;
  remove(): void;
}

export function tempProject(): TempProject {
  const dir = mkdtempSync(path.join(tmpdir(), 'slopecheck-sandbox-'));
  return {
    dir,
    write(name, text) {
      const file = path.join(dir, name);
      writeFileSync(file, text);
      return file;
    },
    bundle(text, name = 'main.ts', scopeKeys = testScopeKeys) {
      return bundleDocument(text, path.join(dir, name), dir, scopeKeys);
    },
    remove() {
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** The module-level names the sandbox tests' plans read. */
export const testScopeKeys = ['objective', 'gradient', 'valueAndGradient', 'start', 'model'];

export function planFor(overrides: Partial<CheckPlan> = {}): CheckPlan {
  return planOf(overrides);
}

/**
 * A plan naming a value no module has: the runner answers 'unresolved-target'
 * without calling the engine, which proves a full round trip through the sandbox.
 */
export const roundTripPlan = planFor({ recipe: recipeOf('notDefinedAnywhere', 'gradient') });

/** 1-based line of the first line of `text` containing `marker`. */
export function lineOf(text: string, marker: string): number {
  const index = text.split('\n').findIndex((line) => line.includes(marker));
  if (index < 0) throw new Error(`marker ${marker} not found`);
  return index + 1;
}

/** Resolves once `condition` holds, polling on the event loop; rejects after `timeoutMs`. */
export async function waitFor(condition: () => boolean, timeoutMs = 5000): Promise<void> {
  const started = Date.now();
  while (!condition()) {
    if (Date.now() - started > timeoutMs) throw new Error('condition not reached in time');
    await new Promise((resolve) => setImmediate(resolve));
  }
}
