// A gradient fix is verified the way the file's own checks run: with the same workspace view,
// so a pair whose data live in an importing training script can be verified at all.
import assert from 'node:assert/strict';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { after, test } from 'node:test';
import { defaultCheckOptions } from '../../server/src/engine/types';
import { PatchVerifier } from '../../server/src/lsp/patchVerifier';
import { SandboxPool } from '../../server/src/sandbox/pool';
import { sandboxScript } from '../support/paths';

const dir = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-patch-'));
const pool = new SandboxPool({ sandboxScript });
after(() => {
  pool.dispose();
  rmSync(dir, { recursive: true, force: true });
});

// mse(w) = Σ (w₀ tᵢ − hᵢ)² / n, gradient 2 Σ tᵢ (w₀ tᵢ − hᵢ) / n (common practice).
const fixedModel = [
  'export interface Batch { t: number[]; h: number[] }',
  'export function mse(w: number[], b: Batch): number { let s = 0; for (let i = 0; i < b.t.length; i++) s += (w[0] * b.t[i] - b.h[i]) ** 2; return s / b.t.length; }',
  'export function mseGrad(w: number[], b: Batch): number[] { let g = 0; for (let i = 0; i < b.t.length; i++) g += 2 * b.t[i] * (w[0] * b.t[i] - b.h[i]); return [g / b.t.length]; }',
].join('\n');
const trainer = "import { mseGrad, type Batch } from './model';\nconst train: Batch = { t: [1, 2, 3], h: [2, 4, 7] };\nexport function fit() { const w = [0.5]; for (let k = 0; k < 10; k++) w[0] -= 0.01 * mseGrad(w, train)[0]; return w; }\n";

test("a patch of a pair whose data live in an importing script passes with the workspace's view, and cannot without it", async () => {
  const model = path.join(dir, 'model.ts');
  const train = path.join(dir, 'train.ts');
  writeFileSync(model, fixedModel);
  writeFileSync(train, trainer);
  const workspace = () => ({ workspaceRoot: dir, importersOf: async () => [{ fileName: train, text: trainer }] });
  const withWorkspace = new PatchVerifier(() => pool, { workspace });
  assert.equal(await withWorkspace.passes(fixedModel, model, 'mse', defaultCheckOptions), true);
  const alone = new PatchVerifier(() => pool);
  assert.equal(await alone.passes(fixedModel, model, 'mse', defaultCheckOptions), false);
});
