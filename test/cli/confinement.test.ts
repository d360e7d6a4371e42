// The CLI bundles only what is inside its working folder (or, for a file outside it, the file's own
// folder). A workspace whose modules reach a secret outside by every route an import has: the
// secret's marker must appear in no output format, and each module's pair says which import was refused.
import assert from 'node:assert/strict';
import { randomUUID } from 'node:crypto';
import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { after, before, describe, test } from 'node:test';
import { runCli, type CliRun } from '../support/runCli';

const marker = `SECRET-${randomUUID()}`;
const base = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-cli-confine-'));
after(() => rmSync(base, { recursive: true, force: true }));
const outside = path.join(base, 'outside');
const workspace = path.join(base, 'workspace');

/** A correct pair (∇ of x₀² + x₁² is 2x) that prints and throws whatever `leaked` holds, once bundled. */
const pairUsing = (importLine: string) => `${importLine}
/** @probe [0.5, -1] */
export function energy(x: number[]): number {
  console.log(String(leaked));
  if (x.length > 2) throw new Error(String(leaked));
  return x[0] ** 2 + x[1] ** 2;
}
export function energyGrad(x: number[]): number[] {
  return [2 * x[0], 2 * x[1]];
}
`;

/** Each route to the secret: the workspace file, the import as written, the import statement. */
const routes = [
  { file: 'absolute.ts', specifier: path.join(outside, 'secret.ts'), statement: (s: string) => `import { leaked } from '${s}';` },
  { file: 'src/climbing.ts', specifier: '../../outside/secret', statement: (s: string) => `import { leaked } from '${s}';` },
  { file: 'aliased.ts', specifier: '@outside/secret', statement: (s: string) => `import { leaked } from '${s}';` },
  { file: 'linked.ts', specifier: './shared', statement: (s: string) => `import { leaked } from '${s}';` },
  { file: 'asText.ts', specifier: '../outside/secret.txt', statement: (s: string) => `import leaked from '${s}' with { type: 'text' };` },
  { file: 'notes.ts', specifier: './notes.txt', statement: (s: string) => `import leaked from '${s}';` },
];

function write(file: string, text: string): void {
  mkdirSync(path.dirname(file), { recursive: true });
  writeFileSync(file, text);
}

before(() => {
  write(path.join(outside, 'secret.ts'), `export const leaked = '${marker}';\n`);
  write(path.join(outside, 'secret.txt'), `${marker}\n`);
  write(path.join(workspace, 'tsconfig.json'), JSON.stringify({ compilerOptions: { paths: { '@outside/*': ['../outside/*'], '@lib/*': ['./lib/*'] } } }));
  // Inside the root, but not code: the marker here too must stay out.
  write(path.join(workspace, 'notes.txt'), `${marker}\n`);
  symlinkSync(path.join(outside, 'secret.ts'), path.join(workspace, 'shared.ts'));
  for (const route of routes) write(path.join(workspace, route.file), pairUsing(route.statement(route.specifier)));
  // Allowed routes: a relative file, a tsconfig path inside the root, JSON, a package in the root's node_modules.
  write(path.join(workspace, 'lib', 'greeting.ts'), "export const greeting = 'hello from lib';\n");
  write(path.join(workspace, 'data.json'), '{ "greeting": "hello from json" }');
  write(path.join(workspace, 'node_modules', 'tiny-greeting', 'package.json'), '{ "name": "tiny-greeting", "main": "index.js" }');
  write(path.join(workspace, 'node_modules', 'tiny-greeting', 'index.js'), "export const greeting = 'hello from a package';\n");
  // In a subfolder, importing from its parent: the working folder, not the file's own, is the root.
  write(
    path.join(workspace, 'src', 'allowed.ts'),
    pairUsing(
      [
        "import { greeting as fromLib } from '@lib/greeting';",
        "import data from '../data.json';",
        "import { greeting as fromPackage } from 'tiny-greeting';",
        'const leaked = [fromLib, data.greeting, fromPackage].join(" / ");',
      ].join('\n'),
    ),
  );
  // Checked from another folder: its own folder, not the workspace, is then the root.
  write(path.join(workspace, 'lib', 'count.ts'), 'export const leaked = 3;\n');
  write(path.join(base, 'apart', 'usesLib.ts'), pairUsing("import { leaked } from '../workspace/lib/count';"));
});

describe('the CLI keeps bundling inside the working folder', () => {
  const runs: Partial<Record<'json' | 'sarif' | 'text', CliRun>> = {};
  let files: any[];
  before(async () => {
    const formats = ['json', 'sarif', 'text'] as const;
    const results = await Promise.all(formats.map((format) => runCli(['--format', format, '.'], { cwd: workspace })));
    formats.forEach((format, k) => (runs[format] = results[k]));
    assert.equal(runs.json!.code, 1, runs.json!.stderr);
    files = JSON.parse(runs.json!.stdout).files;
  });

  const pairOf = (file: string) => {
    const entry = files.find((f) => f.path === file);
    assert.ok(entry, `${file} was checked`);
    assert.equal(entry.pairs.length, 1);
    return entry.pairs[0];
  };

  test('the marker appears nowhere: not in JSON, SARIF or text, not on stderr', () => {
    for (const [format, run] of Object.entries(runs)) {
      assert.equal(run!.stdout.includes(marker), false, `${format} stdout`);
      assert.equal(run!.stderr.includes(marker), false, `${format} stderr`);
    }
  });

  for (const { file, specifier } of routes) {
    test(`${file}: not run; a bundle-error at the import names '${specifier}'`, () => {
      const pair = pairOf(file);
      assert.equal(pair.status, 'error');
      assert.deepEqual(pair.console, []);
      const errors = pair.findings.filter((f: any) => f.code === 'bundle-error');
      assert.equal(errors.length, 1, JSON.stringify(pair.findings));
      assert.ok(errors[0].message.includes(`'${specifier}'`), errors[0].message);
      assert.match(errors[0].message, /outside the workspace folder|imported with|not code or JSON/);
      assert.equal(errors[0].line, 1);
    });
  }

  test('imports inside the root still bundle and run: the pair passes and prints what it imported', () => {
    const pair = pairOf('src/allowed.ts');
    assert.equal(pair.status, 'pass', JSON.stringify(pair.findings));
    // The same console route that would carry a leaked secret carries the imported text.
    assert.ok(pair.console.some((line: string) => line.includes('hello from lib / hello from json / hello from a package')), JSON.stringify(pair.console));
  });
});

test('a file outside the working folder is bundled under its own folder', async () => {
  const run = await runCli(['--format', 'json', path.join(base, 'apart', 'usesLib.ts')], { cwd: workspace });
  assert.equal(run.code, 1, run.stderr);
  const pair = JSON.parse(run.stdout).files[0].pairs[0];
  assert.equal(pair.status, 'error');
  const error = pair.findings.find((f: any) => f.code === 'bundle-error');
  assert.ok(error, JSON.stringify(pair.findings));
  assert.ok(error.message.includes(`'../workspace/lib/count' is outside the workspace folder ${path.join(base, 'apart')}`), error.message);
});
