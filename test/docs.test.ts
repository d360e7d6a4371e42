// The README's finding reference is where every diagnostic and SARIF rule links to.
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import * as path from 'node:path';
import { test } from 'node:test';
import { pathToFileURL } from 'node:url';
import { allFindingCodes, findingHelpUrl } from '../server/src/check/codes';
import { shippedReadmeUrl } from '../server/src/shared/productInfo';
import { repoRoot } from './support/paths';

const readme = readFileSync(path.join(repoRoot, 'README.md'), 'utf8');

test('every finding code has its own README section, and its link points at it', () => {
  const headings = new Set([...readme.matchAll(/^### `([a-z-]+)`$/gm)].map((m) => m[1]));
  for (const code of allFindingCodes) {
    assert.ok(headings.has(code), `README section for ${code}`);
    assert.equal(findingHelpUrl(code, shippedReadmeUrl(path.join(repoRoot, 'dist'))), `${pathToFileURL(path.join(repoRoot, 'README.md')).href}#${code}`);
  }
  assert.equal(headings.size, allFindingCodes.length, 'no README section for a code that does not exist');
});

test('the README starts with the job and gives the demo and test commands that CI runs', () => {
  const ci = readFileSync(path.join(repoRoot, '.ci/run'), 'utf8');
  assert.match(readme, /npm ci && npm run demo/);
  assert.match(readme, /^npm test$/m);
  assert.match(ci, /^npm test$/m);
});
