// The suite in suite/index.ts, inside a VS Code desktop build named by
// SLOPECHECK_VSCODE_EXECUTABLE (nothing is downloaded). Without it the test is
// reported as skipped, with the reason, never as passed.
import { mkdtempSync, rmSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { test } from 'node:test';
import { runTests } from '@vscode/test-electron';
import { repoRoot } from '../../support/paths';
import { DemoWorkspace } from '../demoWorkspace';

const executable = process.env.SLOPECHECK_VSCODE_EXECUTABLE;
const notRun =
  'test-electron suite did not run: set SLOPECHECK_VSCODE_EXECUTABLE to the executable of a VS Code desktop build (see DEVELOPERS.md, "End-to-end tests")';

if (!executable) console.log(notRun);

test('the extension inside a VS Code desktop build: activation, diagnostics, hover', { skip: executable ? false : notRun, timeout: 180_000 }, async () => {
  const demo = DemoWorkspace.copy();
  const profile = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-vscode-profile-'));
  try {
    // runTests rejects when the suite's run() throws or VS Code exits with a failure.
    await runTests({
      vscodeExecutablePath: executable!,
      extensionDevelopmentPath: repoRoot,
      extensionTestsPath: path.join(__dirname, 'suite', 'index.js'),
      launchArgs: [
        demo.folder,
        '--disable-workspace-trust',
        '--disable-extensions',
        '--skip-welcome',
        '--skip-release-notes',
        `--user-data-dir=${path.join(profile, 'data')}`,
        `--extensions-dir=${path.join(profile, 'extensions')}`,
      ],
    });
  } finally {
    demo.remove();
    rmSync(profile, { recursive: true, force: true });
  }
});
