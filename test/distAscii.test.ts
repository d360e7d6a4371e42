// The built programs must be pure ASCII: V8 keeps a script with a single non-ASCII
// character (esbuild escapes strings, but keeps comments inside object literals) as a
// two-byte string, doubling the memory of the 10 MB server bundle (measured: 10 MB RSS).
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import * as path from 'node:path';
import { test } from 'node:test';
import { distDir } from './support/paths';

for (const program of ['server.js', 'cli.js', 'sandbox.js', 'extension.js']) {
  test(`dist/${program} is pure ASCII`, () => {
    const text = readFileSync(path.join(distDir, program), 'utf8');
    const lines = text.split('\n');
    const offending = lines.findIndex((line) => /[^\x00-\x7f]/.test(line));
    assert.equal(offending, -1, `line ${offending + 1}: ${lines[offending]?.slice(0, 120)}`);
  });
}
