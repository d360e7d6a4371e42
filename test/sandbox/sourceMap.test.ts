// locateInUserSource reads a map that workspace files help write and a stack that user code
// writes: whatever they hold, it never throws and names only plain files of this machine.
import assert from 'node:assert/strict';
import * as path from 'node:path';
import { describe, test } from 'node:test';
import { pathToFileURL } from 'node:url';
import { bundleScriptName, locateInUserSource } from '../../server/src/sandbox/sourceMap';

const sourceRoot = path.resolve('project');
const inlinePrefix = '//# sourceMappingURL=data:application/json;base64,';

/** A one-line "bundle" carrying `mapText` (any text) as its inline map. */
function bundleWith(mapText: string): { code: string; sourceRoot: string } {
  return { code: `module.exports = 1;\n${inlinePrefix}${Buffer.from(mapText).toString('base64')}\n`, sourceRoot };
}

/** Generated line 1, column 0 → `sources[0]`, original line 1; generated line 2 → `sources[1]`, line 1. */
const twoLines = 'AAAA;ACAA';
const mapOf = (sources: unknown, mappings = twoLines) => JSON.stringify({ version: 3, sources, names: [], mappings });
const frame = (line: number | string, column: number | string = 1) => `    at f (${bundleScriptName}:${line}:${column})`;
const stackAt = (...lines: Array<number | string>) => ['Error: boom', ...lines.map((line) => frame(line))].join('\n');

describe('locateInUserSource', () => {
  test('a relative source resolves against the bundle folder (the ordinary case)', () => {
    const location = locateInUserSource(stackAt(1), bundleWith(mapOf(['model.ts'])));
    assert.deepEqual(location, { file: path.join(sourceRoot, 'model.ts'), line: 1, column: 1 });
  });

  test('file: URLs of this machine are files; a URL with a host name is not, and the next frame is tried', () => {
    const local = path.join(sourceRoot, 'local.ts');
    for (const url of [pathToFileURL(local).href, pathToFileURL(local).href.replace('file://', 'file://localhost')]) {
      assert.equal(locateInUserSource(stackAt(1), bundleWith(mapOf([url])))?.file, local, url);
    }
    const bundle = bundleWith(mapOf(['file://evil-host/x.ts', 'model.ts']));
    assert.equal(locateInUserSource(stackAt(1), bundle), null);
    assert.equal(locateInUserSource(stackAt(1, 2), bundle)?.file, path.join(sourceRoot, 'model.ts'));
  });

  test('sources that are not plain files give no location', () => {
    for (const source of ['http://example.invalid/x.ts', 'webpack:///x.ts', 'data:text/plain,x', '', 'a\0b.ts', 42, null, {}, ['x.ts']]) {
      assert.equal(locateInUserSource(stackAt(1), bundleWith(mapOf([source]))), null, JSON.stringify(source));
    }
  });

  test('malformed maps give no location', () => {
    const maps = [mapOf(null), mapOf('model.ts'), '{"version": 3, "sources": ["a.ts"', 'not json', 'null', '[]', mapOf(['a.ts'], '!!!;;;')];
    for (const map of maps) assert.doesNotThrow(() => locateInUserSource(stackAt(1, 2), bundleWith(map)), map);
    assert.equal(locateInUserSource(stackAt(1), bundleWith(mapOf(null))), null);
    const notBase64 = { code: `x;\n${inlinePrefix}%%%not base64%%%\n`, sourceRoot };
    assert.equal(locateInUserSource(stackAt(1), notBase64), null);
  });

  test('negative and huge original lines give no location', () => {
    // VLQ 'F' is −2 and '+/////D' is 2³¹ − 1 (Source Map Revision 3 base64 VLQ).
    for (const mappings of ['AAFA', 'AA+/////D', 'AA//////H']) {
      assert.equal(locateInUserSource(stackAt(1), bundleWith(mapOf(['a.ts'], mappings))), null, mappings);
    }
  });

  test('frames with impossible positions are passed over', () => {
    const bundle = bundleWith(mapOf(['model.ts']));
    for (const [line, column] of [[0, 1], [1, 0], ['99999999999999999999', 1], [1, '99999999999999999999']]) {
      assert.equal(locateInUserSource(['Error: x', frame(line, column)].join('\n'), bundle), null, `${line}:${column}`);
    }
  });

  test('a map beyond the size cap is not parsed', () => {
    const padding = 'x'.repeat(7 * 1024 * 1024);
    const big = JSON.stringify({ version: 3, sources: ['model.ts'], names: [], mappings: 'AAAA', padding });
    const small = JSON.stringify({ version: 3, sources: ['model.ts'], names: [], mappings: 'AAAA', padding: 'x' });
    assert.equal(locateInUserSource(stackAt(1), bundleWith(small))?.file, path.join(sourceRoot, 'model.ts'));
    assert.equal(locateInUserSource(stackAt(1), bundleWith(big)), null);
  });

  test('frames in packages are skipped', () => {
    const bundle = bundleWith(mapOf([path.join('node_modules', 'lib', 'index.js'), 'model.ts']));
    assert.equal(locateInUserSource(stackAt(1, 2), bundle)?.file, path.join(sourceRoot, 'model.ts'));
  });
});
