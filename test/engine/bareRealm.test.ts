// The engine must run inside a bare `vm` context (ECMAScript built-ins only),
// with the user's functions and vectors living in that same realm.
import assert from 'node:assert/strict';
import * as path from 'node:path';
import * as vm from 'node:vm';
import { test } from 'node:test';
import * as esbuild from 'esbuild';
import { repoRoot } from '../support/paths';
import type { PairReport } from '../../server/src/engine/types';

async function engineSource(): Promise<string> {
  const result = await esbuild.build({
    stdin: { contents: "export { checkPair } from './server/src/engine/checkPair';", resolveDir: repoRoot, loader: 'ts' },
    bundle: true,
    write: false,
    format: 'iife',
    globalName: 'engine',
    platform: 'neutral',
    target: 'es2022',
    logLevel: 'silent',
  });
  return result.outputFiles[0].text;
}

test('checkPair runs in a bare vm context with user code of that realm', async () => {
  const context = vm.createContext({});
  vm.runInContext(await engineSource(), context, { filename: path.join('engine', 'bundle.js') });
  const run = (userCode: string): PairReport =>
    JSON.parse(
      vm.runInContext(
        `(() => {
          ${userCode}
          const plan = { dimension: 3, learningRate: { name: 'rate', value: 0.01 }, options: { seed: 1, probeCount: 2, fullCheckMaxDimension: 64, directionCount: 6, lanczosSteps: 30, descentSteps: 20 } };
          return JSON.stringify(engine.checkPair({ objective, gradient, makeVector }, [], plan, () => 0));
        })()`,
        context,
      ),
    );

  const pass = run(`
    const makeVector = (v) => Float64Array.from(v);
    const objective = (x) => { if (!(x instanceof Float64Array)) throw new TypeError('wants Float64Array'); return Math.exp(x[0]) + x[1] * x[1] * x[2] + x[2] ** 4; };
    const gradient = (x) => [Math.exp(x[0]), 2 * x[1] * x[2], x[1] * x[1] + 4 * x[2] ** 3];`);
  assert.equal(pass.status, 'pass', JSON.stringify(pass.findings));
  assert.ok(pass.smoothness !== null && pass.learningRate !== null);

  const fail = run(`
    const makeVector = (v) => Array.from(v);
    const objective = (x) => x[0] * x[0] + x[1] * x[1] + x[2] * x[2];
    const gradient = (x) => [2 * x[0], 2 * x[2], 2 * x[1]];`);
  assert.equal(fail.status, 'fail');
  assert.deepEqual(fail.diagnosis, { kind: 'permutation', pairs: [[1, 2]] });

  const thrown = run(`
    const makeVector = (v) => Array.from(v);
    const objective = (x) => { throw new Error('from the user realm'); };
    const gradient = (x) => [0, 0, 0];`);
  assert.equal(thrown.findings[0].code, 'runtime-error');
  assert.match(thrown.findings[0].stack ?? '', /from the user realm/);
});
