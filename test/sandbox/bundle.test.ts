// Bundling of user documents: relative imports, unsaved buffers, built-in imports, errors.
import assert from 'node:assert/strict';
import { after, describe, test } from 'node:test';
import * as path from 'node:path';
import * as vm from 'node:vm';
import { isRunnable, unrunnableBundleFindings } from '../../server/src/sandbox/bundle';
import { withScopeHook } from '../../server/src/sandbox/scopeHook';
import { bundleScriptName, locateInUserSource } from '../../server/src/sandbox/sourceMap';
import { lineOf, tempProject } from './support';

const project = tempProject();
after(() => project.remove());

const libText = ['export function square(x: number): number {', '  return x * x;', '}', 'export function fail(): never {', "  throw new Error('from lib');", '}', ''].join('\n');
project.write('lib.ts', libText);
// On disk the main file says something else: the open buffer must win.
project.write('main.ts', "export const version = 'on disk';\n");

const mainText = [
  "import { square, fail } from './lib';",
  "export const version = 'unsaved';",
  'export function objective(x: number[]): number {',
  '  return square(x[0]) + square(x[1]);',
  '}',
  'export function broken(): number {',
  "  throw new Error('from main'); // THROW",
  '}',
  'export function brokenInLib(): number {',
  '  return fail();',
  '}',
  '',
].join('\n');

/** Evaluates a bundle the way the sandbox does: wrapper on its own line, same script name. */
function load(code: string): Record<string, (...args: number[][]) => unknown> {
  const module = { exports: {} };
  const factory = vm.runInNewContext(`(function (exports, module, require) {\n${code}\n})`, {}, { filename: bundleScriptName, lineOffset: -1 });
  factory(module.exports, module, () => {
    throw new Error('no require');
  });
  return module.exports as Record<string, (...args: number[][]) => unknown>;
}

function stackOf(run: () => unknown): string {
  try {
    run();
  } catch (error) {
    return (error as Error).stack ?? '';
  }
  throw new Error('expected a throw');
}

describe('bundleDocument', () => {
  test('bundles a relative import and uses the unsaved text over the file on disk', async () => {
    const bundle = await project.bundle(mainText);
    assert.deepEqual(bundle.errors, []);
    assert.deepEqual(bundle.builtinImports, []);
    assert.ok(isRunnable(bundle));
    const exports = load(bundle.code);
    assert.equal(exports.version, 'unsaved');
    // 3² + 4² = 25: the imported helper really ran.
    assert.equal(exports.objective([3, 4]), 25);
  });

  test('maps a stack frame back to the throwing line of the document and of an imported file', async () => {
    const bundle = await project.bundle(mainText);
    const exports = load(bundle.code);
    const inMain = locateInUserSource(stackOf(() => exports.broken()), bundle);
    assert.deepEqual(inMain && { file: inMain.file, line: inMain.line }, { file: path.join(project.dir, 'main.ts'), line: lineOf(mainText, '// THROW') });
    const inLib = locateInUserSource(stackOf(() => exports.brokenInLib()), bundle);
    assert.deepEqual(inLib && { file: inLib.file, line: inLib.line }, { file: path.join(project.dir, 'lib.ts'), line: lineOf(libText, 'from lib') });
  });

  test("an imported file's own source map naming another host: no throw, and the caller's line in the document", async () => {
    // esbuild folds a file's `sourceMappingURL` map into the bundle's, sources and all.
    const foreignMap = { version: 3, sources: ['file://evil-host/x.ts'], names: [], mappings: 'AAAA;AACA;AACA' };
    const mapComment = `//# sourceMappingURL=data:application/json;base64,${Buffer.from(JSON.stringify(foreignMap)).toString('base64')}`;
    project.write('mapped.js', `export function boom() {\n  throw new Error('from mapped');\n}\n${mapComment}\n`);
    const text = "import { boom } from './mapped.js';\nexport function callsMapped(): number {\n  return boom(); // CALL\n}\n";
    const bundle = await project.bundle(text);
    assert.match(Buffer.from(bundle.code.split('base64,').pop()!, 'base64').toString(), /file:\/\/evil-host/, 'the foreign source is in the map');
    const location = locateInUserSource(stackOf(() => load(bundle.code).callsMapped()), bundle);
    assert.deepEqual(location && { file: location.file, line: location.line }, { file: path.join(project.dir, 'main.ts'), line: lineOf(text, '// CALL') });
  });

  test('a stack without frames of the bundle maps to nothing', async () => {
    const bundle = await project.bundle(mainText);
    assert.equal(locateInUserSource('Error: x\n    at run (slopecheck-runner.js:10:5)', bundle), null);
  });

  test('lists Node built-in imports, keeps no code to run, and explains why', async () => {
    const text = "import fs from 'fs';\nimport { execSync } from 'node:child_process';\nexport const f = () => { fs.writeFileSync('x', ''); execSync('true'); };\n";
    const bundle = await project.bundle(text);
    assert.deepEqual([...bundle.builtinImports].sort(), ['fs', 'node:child_process']);
    assert.equal(bundle.code, '');
    assert.equal(isRunnable(bundle), false);
    const findings = unrunnableBundleFindings(bundle);
    assert.equal(findings.length, 1);
    assert.equal(findings[0].code, 'builtin-import');
    assert.equal(findings[0].severity, 'error');
    assert.equal(findings[0].subject, 'objective');
    assert.match(findings[0].message, /'fs'/);
    assert.match(findings[0].message, /'node:child_process'/);
    assert.match(findings[0].message, /not executed/);
    assert.deepEqual(bundle.builtinImportSites.map((site) => [site.message, site.line]).sort(), [['fs', 1], ['node:child_process', 2]]);
    assert.equal(findings[0].location?.line, 1, 'the finding points at the first built-in import');
  });

  test("a script guard's `url` and `process` imports get inert stand-ins; other built-ins stay refused", async () => {
    const text = [
      "import { fileURLToPath, pathToFileURL } from 'node:url';",
      "import process from 'process';",
      'export const guard = process.argv[1] === fileURLToPath(import.meta.url);',
      "export const href = pathToFileURL('/srv/fit.ts').href;",
      "export const back = fileURLToPath('file:///srv/fit.ts');",
    ].join('\n');
    const bundle = await project.bundle(text);
    assert.deepEqual(bundle.builtinImports, []);
    assert.ok(isRunnable(bundle));
    // The stand-in `process` is the realm's global one, set up by the sandbox (processStandIn.ts).
    const exports = vm.runInNewContext(
      `(() => { const module = { exports: {} }; (function (exports, module, require) {\n${bundle.code}\n})(module.exports, module, () => { throw new Error('no require'); }); return module.exports; })()`,
      { process: { argv: [] } },
    ) as Record<string, unknown>;
    assert.equal(exports.guard, false);
    assert.equal(exports.href, 'file:///srv/fit.ts');
    assert.equal(exports.back, '/srv/fit.ts');
    const refused = await project.bundle("import { fileURLToPath } from 'node:url';\nimport { readFileSync } from 'node:fs';\nexport const f = () => readFileSync(fileURLToPath('file:///x'));\n");
    assert.deepEqual(refused.builtinImports, ['node:fs']);
  });

  test('the scope hook exposes the values a plan names, exported or not, after the last line of the module', async () => {
    const text = 'const hidden = [1, 2];\nclass Model { f() { return 3; } }\nexport const shown = 4;\n';
    const bundle = await project.bundle(text, 'main.ts', ['hidden', 'Model', 'shown', 'hidden.length']);
    const context: Record<string, unknown> = {};
    vm.runInNewContext(`(function (exports, module, require) {\n${bundle.code}\n})({}, { exports: {} }, () => {})`, context);
    const scope = context.__slopecheckScope as Record<string, () => unknown>;
    assert.deepEqual(Array.from(scope.hidden() as number[]), [1, 2]);
    assert.equal(scope['hidden.length'](), 2);
    assert.equal(scope.shown(), 4);
    assert.equal(new (scope.Model() as new () => { f(): number })().f(), 3);
    // Nothing moved: the user's lines keep their numbers, so stacks still map to them.
    assert.equal(withScopeHook(text, ['hidden']).split('\n').slice(0, 3).join('\n'), text.split('\n').slice(0, 3).join('\n'));
  });

  test('a built-in imported by an imported file is caught too', async () => {
    project.write('usesPath.ts', "import { join } from 'path';\nexport const joined = join('a', 'b');\n");
    const bundle = await project.bundle("export { joined } from './usesPath';\n");
    assert.deepEqual(bundle.builtinImports, ['path']);
    assert.deepEqual(bundle.builtinImportSites.map((site) => [path.basename(site.file), site.line]), [['usesPath.ts', 1]]);
  });

  test('reports a syntax error with its place instead of throwing', async () => {
    const text = 'export function objective(x: number[]) {\n  return x[0] +;\n}\n';
    const bundle = await project.bundle(text);
    assert.equal(bundle.errors.length, 1);
    assert.equal(bundle.errors[0].file, path.join(project.dir, 'main.ts'));
    assert.equal(bundle.errors[0].line, 2);
    const findings = unrunnableBundleFindings(bundle);
    assert.equal(findings[0].code, 'bundle-error');
    assert.equal(findings[0].location?.line, 2);
  });

  test('reports an import that cannot be resolved', async () => {
    const bundle = await project.bundle("import { gone } from './doesNotExist';\nexport const f = gone;\n");
    assert.equal(bundle.errors.length, 1);
    assert.match(bundle.errors[0].message, /doesNotExist/);
    assert.equal(isRunnable(bundle), false);
  });
});
