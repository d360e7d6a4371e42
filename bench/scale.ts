// Scale: evaluations and wall time of checking one vectorised objective (Float64Array) with one
// wrong component, through the real sandbox (bundleDocument + SandboxPool + dist/sandbox.js),
// for n = 10 … 1e5. Overhead ratio = check wall time ÷ (evaluations × time of one evaluation).
import * as os from 'node:os';
import * as path from 'node:path';
import * as vm from 'node:vm';
import { defaultCheckOptions, type CheckPlan } from '../server/src/engine/types';
import { bundleDocument, SandboxPool } from '../server/src/sandbox';
import { scopeKeysOf } from '../server/src/sandbox/scopeHook';
import { sandboxScript } from '../test/support/paths';
import { planOf } from '../test/support/plans';

export interface ScaleRow {
  n: number;
  evaluations: number;
  objectiveEvaluations: number;
  gradientEvaluations: number;
  /** Wall time of pool.run, as a user waits for it (median of the repeats). */
  seconds: number;
  /** Time the engine itself measured inside the sandbox. */
  engineSeconds: number;
  objectiveMs: number;
  gradientMs: number;
  overheadRatio: number;
  status: string;
  /** Components the check named as wrong; the planted one is n/3. */
  wrongComponents: number[];
}

export const scaleDimensions = [10, 100, 1000, 10000, 100000];

/** A separable, convex objective Σ aᵢ(½xᵢ² + log(1 + e^{xᵢ})) with component ⌊n/3⌋ of the gradient doubled. */
function moduleText(n: number): string {
  return `
const n = ${n};
/** @probe start */
export const start = Float64Array.from({ length: n }, (_, i) => Math.sin(i + 1));
export function objective(x: Float64Array): number {
  let sum = 0;
  for (let i = 0; i < x.length; i++) {
    const v = x[i];
    sum += (1 + i / n) * (0.5 * v * v + (v > 0 ? v + Math.log1p(Math.exp(-v)) : Math.log1p(Math.exp(v))));
  }
  return sum;
}
export function gradient(x: Float64Array): Float64Array {
  const g = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) g[i] = (1 + i / n) * (x[i] + 1 / (1 + Math.exp(-x[i])));
  g[${Math.floor(n / 3)}] *= 2;
  return g;
}
`;
}

function plan(n: number): CheckPlan {
  return planOf({ argumentKind: 'float64array', probes: [], probeKeys: ['start'], dimension: n, options: { ...defaultCheckOptions } });
}

/** Mean time of one call, measured on the same bundle in a fresh vm context as the sandbox uses. */
function timeOneCall(code: string, name: 'objective' | 'gradient'): number {
  const context = vm.createContext({});
  const module = { exports: {} as Record<string, any> };
  new vm.Script(`(function (exports, module) {\n${code}\n})`).runInContext(context)(module.exports, module);
  const fn = module.exports[name];
  const x = module.exports.start;
  for (let k = 0; k < 5; k++) fn(x);
  let calls = 0;
  const started = process.hrtime.bigint();
  let elapsed = 0;
  while (elapsed < 200 || calls < 5) {
    fn(x);
    calls++;
    elapsed = Number(process.hrtime.bigint() - started) / 1e6;
  }
  return elapsed / calls;
}

const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];

export async function runScale(log: (line: string) => void): Promise<ScaleRow[]> {
  const pool = new SandboxPool({ sandboxScript, timeoutMs: 120000, memoryMb: 1024 });
  const rows: ScaleRow[] = [];
  try {
    for (const n of scaleDimensions) {
      const folder = path.join(os.tmpdir(), 'slopecheck-bench');
      const bundle = await bundleDocument(moduleText(n), path.join(folder, `scale${n}.ts`), folder, scopeKeysOf(plan(n)));
      if (bundle.errors.length > 0) throw new Error(`bundle failed: ${JSON.stringify(bundle.errors)}`);
      // One warm-up run, so process start and first compilation are not counted.
      await pool.run(bundle, plan(n));
      const walls: number[] = [];
      let last = null;
      // Three timed runs, one at n = 1e5 where a run takes seconds.
      for (let k = 0; k < (n >= 100000 ? 1 : 3); k++) {
        const started = process.hrtime.bigint();
        last = await pool.run(bundle, plan(n));
        walls.push(Number(process.hrtime.bigint() - started) / 1e9);
      }
      const report = last!.report;
      const objectiveMs = timeOneCall(bundle.code, 'objective');
      const gradientMs = timeOneCall(bundle.code, 'gradient');
      const { objective, gradient } = report.evaluations;
      const seconds = median(walls);
      const mismatch = report.findings.find((f) => f.code === 'gradient-mismatch');
      rows.push({
        n,
        evaluations: objective + gradient,
        objectiveEvaluations: objective,
        gradientEvaluations: gradient,
        seconds,
        engineSeconds: report.elapsedMs / 1000,
        objectiveMs,
        gradientMs,
        overheadRatio: (seconds * 1000) / (objective * objectiveMs + gradient * gradientMs),
        status: report.status,
        wrongComponents: mismatch?.components ?? [],
      });
      log(`  scale: n = ${n}: ${report.status}, ${objective + gradient} evaluations, ${seconds.toFixed(3)} s`);
    }
  } finally {
    pool.dispose();
  }
  return rows;
}
