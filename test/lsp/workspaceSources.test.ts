// The editor's view of the workspace for importers: files on disk, open buffers over them,
// skipped folders, and a cache that sees a file change.
import assert from 'node:assert/strict';
import { mkdirSync, mkdtempSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { after, test } from 'node:test';
import { WorkspaceSources } from '../../server/src/lsp/workspaceSources';

const root = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-workspace-'));
after(() => rmSync(root, { recursive: true, force: true }));
const write = (name: string, text: string) => {
  const file = path.join(root, name);
  mkdirSync(path.dirname(file), { recursive: true });
  writeFileSync(file, text);
  return file;
};

test('importers come from the workspace folders, open buffers win, node_modules is not searched', async () => {
  const model = write('src/model.ts', 'export function mse(w: number[], d: number[]) { return 0; }\n');
  const train = write('scripts/train.ts', "import { mse } from '../src/model';\n");
  write('node_modules/pkg/uses.ts', "import { mse } from '../../src/model';\n");
  write('src/other.ts', "import { x } from './unrelated';\n");
  const open = new Map<string, string>();
  const sources = new WorkspaceSources(() => [root], (file) => open.get(file));
  assert.deepEqual((await sources.importersOf(model)).map((s) => s.fileName), [train]);

  // An unsaved buffer that no longer imports the model is what counts.
  open.set(train, "import { other } from './elsewhere';\n");
  assert.deepEqual(await sources.importersOf(model), []);
  open.clear();

  // A changed file on disk is read again.
  writeFileSync(train, "export const nothing = 1;\n");
  const later = new Date(Date.now() + 5000);
  utimesSync(train, later, later);
  assert.deepEqual(await sources.importersOf(model), []);
});
