// Compiles bench/main.ts with esbuild (packages external) and runs it.
// Usage: node bench/run.mjs [section...]   sections: accuracy smoothness realcode budget adversarial jacobian scale latency (default: all)
import { rmSync } from 'node:fs';
import * as path from 'node:path';
import { compileForNode, repoRoot, runNode } from '../test/support/compile.mjs';

const benchRoot = path.join(repoRoot, 'bench');
const outdir = path.join(repoRoot, '.bench-build', String(process.pid));
const [main] = await compileForNode([path.join(benchRoot, 'main.ts')], { outdir, outbase: benchRoot });
const status = runNode([main, ...process.argv.slice(2)]);
rmSync(outdir, { recursive: true, force: true });
process.exit(status);
