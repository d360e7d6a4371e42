// Bundling reads only code and JSON inside the workspace folder. Every route a module has to
// another file — an absolute path, `../` out of the root, tsconfig `paths`/`baseUrl`/`extends`,
// a symlink, an import attribute, a computed path, an input source map — is tried against a
// secret file outside the root that carries a unique marker, which must appear nowhere.
import assert from 'node:assert/strict';
import { randomUUID } from 'node:crypto';
import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import * as path from 'node:path';
import { after, describe, test } from 'node:test';
import * as vm from 'node:vm';
import { bundleDocument, isRunnable, unrunnableBundleFindings, type Bundle } from '../../server/src/sandbox/bundle';

const marker = `SECRET-${randomUUID()}`;
const base = mkdtempSync(path.join(tmpdir(), 'slopecheck-confine-'));
after(() => rmSync(base, { recursive: true, force: true }));

// Each secret starts with the marker, so a parser quoting the first token of the file would show it.
const outside = path.join(base, 'outside');
mkdirSync(outside);
writeFileSync(path.join(outside, 'secret.ts'), `export const leaked = '${marker}';\n`);
writeFileSync(path.join(outside, 'secret.txt'), `${marker}\n`);
writeFileSync(path.join(outside, 'secret.js.map'), JSON.stringify({ version: 3, sources: [`${marker}.ts`], names: [marker], mappings: 'AAAA' }));

let workspaces = 0;
/** A fresh workspace folder beside `outside`, holding `files` (folders are made as needed). */
function workspace(files: Record<string, string>, parent = base): string {
  const root = path.join(parent, `workspace${++workspaces}`);
  for (const [name, text] of Object.entries(files)) {
    mkdirSync(path.dirname(path.join(root, name)), { recursive: true });
    writeFileSync(path.join(root, name), text);
  }
  mkdirSync(root, { recursive: true });
  return root;
}

/** Bundles `text` as the unsaved document `name` of `root`. */
function bundleIn(root: string, text: string, name = 'main.ts'): Promise<Bundle> {
  return bundleDocument(text, path.join(root, name), root, ['value']);
}

/** Everything a bundle carries, with its inline source map decoded. */
function everythingIn(bundle: Bundle): string {
  const inlineMap = bundle.code.split('base64,').pop() ?? '';
  return JSON.stringify(bundle) + Buffer.from(inlineMap, 'base64').toString('utf8');
}

/** The one finding of a refused bundle: `bundle-error` at `line`, naming `specifier`; no trace of the secret. */
function assertRefused(bundle: Bundle, specifier: string, line: number, reason: RegExp): void {
  assert.equal(everythingIn(bundle).includes(marker), false, 'the secret reached the bundle');
  assert.equal(bundle.code, '');
  assert.equal(isRunnable(bundle), false);
  const findings = unrunnableBundleFindings(bundle);
  assert.deepEqual(findings.map((f) => f.code), ['bundle-error']);
  assert.ok(findings[0].message.includes(`'${specifier}'`), findings[0].message);
  assert.match(findings[0].message, reason);
  assert.equal(findings[0].location?.line, line);
}

const outsideRoot = /is outside the workspace folder/;

/** The module's exports, evaluated in a fresh realm as the sandbox does. */
function exportsOf(bundle: Bundle): Record<string, unknown> {
  const module = { exports: {} as Record<string, unknown> };
  vm.runInNewContext(bundle.code, { module, exports: module.exports });
  return module.exports;
}

describe('bundling reads only inside the workspace folder', () => {
  test('an absolute import of a file outside is refused at its line', async () => {
    const root = workspace({});
    const specifier = path.join(outside, 'secret.ts');
    const bundle = await bundleIn(root, `export const value = 1;\nimport { leaked } from '${specifier}';\nexport { leaked };\n`);
    assertRefused(bundle, specifier, 2, outsideRoot);
  });

  test("'../../' climbing out of the root is refused, for a file that exists and one that does not alike", async () => {
    const root = workspace({ 'src/keep.ts': 'export {};\n' });
    const bundle = await bundleIn(root, "import { leaked } from '../../outside/secret';\nexport const value = leaked;\n", 'src/main.ts');
    assertRefused(bundle, '../../outside/secret', 1, outsideRoot);
    const missing = await bundleIn(root, "import { gone } from '../../outside/missing';\nexport const value = gone;\n", 'src/main.ts');
    assertRefused(missing, '../../outside/missing', 1, outsideRoot);
  });

  test('tsconfig `paths` and `baseUrl` that point outside are refused', async () => {
    const withPaths = workspace({ 'tsconfig.json': JSON.stringify({ compilerOptions: { paths: { '@shared/*': ['../outside/*'] } } }) });
    assertRefused(await bundleIn(withPaths, "import { leaked } from '@shared/secret';\nexport const value = leaked;\n"), '@shared/secret', 1, outsideRoot);
    const withBaseUrl = workspace({ 'tsconfig.json': '{ "compilerOptions": { "baseUrl": ".." } }' });
    assertRefused(await bundleIn(withBaseUrl, "import { leaked } from 'outside/secret';\nexport const value = leaked;\n"), 'outside/secret', 1, outsideRoot);
  });

  test('a symlink inside the root that points outside is refused, to a file or to a folder', async () => {
    const root = workspace({});
    symlinkSync(path.join(outside, 'secret.ts'), path.join(root, 'shared.ts'));
    symlinkSync(outside, path.join(root, 'vendor'));
    assertRefused(await bundleIn(root, "import { leaked } from './shared';\nexport const value = leaked;\n"), './shared', 1, outsideRoot);
    assertRefused(await bundleIn(root, "export const value = 1;\nimport { leaked } from './vendor/secret';\nexport { leaked };\n"), './vendor/secret', 2, outsideRoot);
  });

  for (const type of ['text', 'bytes', 'file']) {
    test(`an import with { type: '${type}' } is refused, inside the root too`, async () => {
      const root = workspace({ 'notes.ts': `export const note = '${marker}';\n` });
      for (const specifier of ['../outside/secret.txt', './notes.ts']) {
        const bundle = await bundleIn(root, `import leaked from '${specifier}' with { type: '${type}' };\nexport const value = leaked;\n`);
        assertRefused(bundle, specifier, 1, new RegExp(`imported with \\{"type":"${type}"\\}`));
      }
    });
  }

  test('a .txt file is refused even inside the root: only code and JSON are bundled', async () => {
    const root = workspace({ 'notes.txt': `${marker}\n` });
    assertRefused(await bundleIn(root, "import notes from './notes.txt';\nexport const value = notes;\n"), './notes.txt', 1, /is not code or JSON/);
  });

  test('a tsconfig that extends a file outside is refused without a word of that file', async () => {
    const root = workspace({ 'tsconfig.json': '{ "extends": "../outside/secret.txt" }' });
    const bundle = await bundleIn(root, 'export const value = 1;\n');
    assert.equal(everythingIn(bundle).includes(marker), false);
    const findings = unrunnableBundleFindings(bundle);
    assert.deepEqual(findings.map((f) => f.code), ['bundle-error']);
    assert.match(findings[0].message, /tsconfig\.json extends '\.\.\/outside\/secret\.txt', which is not a file inside the workspace folder/);
    assert.equal(findings[0].location?.file, path.join(root, 'tsconfig.json'));
  });

  test('a tsconfig.json above the root is not read', async () => {
    // Above the root, a JSX factory named by the marker; read, it would be called in the bundle.
    const parent = path.join(base, 'withConfigAbove');
    mkdirSync(parent);
    writeFileSync(path.join(parent, 'tsconfig.json'), JSON.stringify({ compilerOptions: { jsx: 'react', jsxFactory: marker.replace(/-/g, '_') } }));
    const root = workspace({ 'view.tsx': 'export const view = () => <div />;\n' }, parent);
    const bundle = await bundleIn(root, "export { view as value } from './view';\n");
    assert.deepEqual(bundle.errors, []);
    assert.equal(everythingIn(bundle).includes(marker.replace(/-/g, '_')), false);
    assert.match(bundle.code, /React\.createElement\("div"/, 'the default factory, as with no tsconfig');
  });

  test('a broken package.json above the root: its error is reported without its text', async () => {
    const parent = path.join(base, 'withPackageAbove');
    mkdirSync(parent);
    writeFileSync(path.join(parent, 'package.json'), `${marker}\n`);
    const root = workspace({ 'lib.ts': 'export const one = 1;\n' }, parent);
    const bundle = await bundleIn(root, "import { one } from './lib';\nexport const value = one;\n");
    assert.equal(everythingIn(bundle).includes(marker), false);
    assert.ok(bundle.errors.length > 0);
    for (const error of bundle.errors) assert.match(error.message, /bundling could not use a file outside the workspace folder .*its text is not shown/);
  });

  test("a file's sourceMappingURL naming a map outside is not followed", async () => {
    const mapUrls = ['../outside/secret.js.map', `file://${path.join(outside, 'secret.js.map')}`];
    const root = workspace(Object.fromEntries(mapUrls.map((url, k) => [`lib${k}.js`, `export const one = 1;\n//# sourceMappingURL=${url}\n`])));
    const bundle = await bundleIn(root, `import { one } from './lib0.js';\nimport { one as also } from './lib1.js';\nexport const value = one + also;\n//# sourceMappingURL=${mapUrls[1]}\n`);
    assert.deepEqual(bundle.errors, []);
    assert.equal(everythingIn(bundle).includes(marker), false);
    assert.equal(exportsOf(bundle).value, 2);
  });

  test('an import with a computed path that matches files outside is refused without naming them', async () => {
    const root = workspace({});
    const bundle = await bundleIn(root, "export const value = (name: string) => require('../outside/' + name);\n");
    assert.equal(everythingIn(bundle).includes(marker), false);
    const findings = unrunnableBundleFindings(bundle);
    assert.ok(findings.length > 0);
    for (const finding of findings) {
      assert.equal(finding.code, 'bundle-error');
      assert.match(finding.message, /an import with a computed path matches files outside the workspace folder/);
      assert.equal(finding.message.includes('secret'), false, 'no file name of the outside folder');
    }
  });

  test("relative files, a package in the root's node_modules, JSON and tsconfig paths inside the root still bundle and run", async () => {
    const root = workspace({
      'tsconfig.json': '// comments are allowed\n{ "extends": ["./config/base", "shared-config"], "compilerOptions": { "strict": true, }, }',
      'config/base.json': JSON.stringify({ compilerOptions: { paths: { '@lib/*': ['../lib/*'] } } }),
      'node_modules/shared-config/tsconfig.json': JSON.stringify({ compilerOptions: { jsx: 'react', jsxFactory: 'h' } }),
      'src/view.tsx': 'const h = (tag: string) => tag.length;\nexport const width = <div />;\n',
      'lib/scale.ts': 'export const scale = 3;\n',
      'src/square.ts': 'export const square = (x: number) => x * x;\n',
      'data.json': '{ "offset": 4 }',
      'node_modules/tiny-sum/package.json': '{ "name": "tiny-sum", "main": "index.js" }',
      'node_modules/tiny-sum/index.js': 'export function sum(values) { return values.reduce((a, b) => a + b, 0); }\n',
    });
    const text = [
      "import { square } from './src/square';",
      "import { scale } from '@lib/scale';",
      "import data from './data.json' with { type: 'json' };",
      "import { sum } from 'tiny-sum';",
      "import { width } from './src/view';",
      'export const value = sum([square(2), scale, data.offset, width]);',
    ].join('\n');
    const bundle = await bundleIn(root, text);
    assert.deepEqual(bundle.errors, []);
    assert.ok(isRunnable(bundle));
    // 2² + 3 + 4 + 'div'.length = 14: every import was bundled and ran, JSX with the factory the extended package config names.
    assert.equal(exportsOf(bundle).value, 14);
  });

  test('an importing file as the entry: the unsaved document replaces its file and is reached through the namespace import', async () => {
    const root = workspace({ 'model.ts': 'export const weight = 1;\n', 'train.ts': "import { weight } from './model';\nexport const start = weight;\n" });
    const bundle = await bundleDocument("import { weight } from './model';\nexport const start = weight;\n", path.join(root, 'train.ts'), root, ['start', 'checked.weight'], {
      documentImport: { namespace: 'checked', specifier: './model' },
      replaced: { fileName: path.join(root, 'model.ts'), text: 'export const weight = 5;\n' },
    });
    assert.deepEqual(bundle.errors, []);
    const context: Record<string, unknown> = { module: { exports: {} } };
    vm.runInNewContext(bundle.code, context);
    const scope = context.__slopecheckScope as Record<string, () => unknown>;
    assert.equal(scope.start(), 5, 'the unsaved text won over the file on disk');
    assert.equal(scope['checked.weight'](), 5);
  });
});
