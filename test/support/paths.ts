// Where the tests find the built programs and fixtures. test/run.mjs sets the root.
import * as path from 'node:path';

export const repoRoot = process.env.SLOPECHECK_ROOT ?? process.cwd();
export const distDir = path.join(repoRoot, 'dist');
export const fixturesDir = path.join(repoRoot, 'fixtures');
export const sandboxScript = path.join(distDir, 'sandbox.js');
export const cliScript = path.join(distDir, 'cli.js');
export const serverScript = path.join(distDir, 'server.js');
