// Whole plans through the sandbox with the real engine: user faults inside the
// objective and gradient become findings on the user's own lines.
import assert from 'node:assert/strict';
import * as path from 'node:path';
import { after, describe, test } from 'node:test';
import { SandboxPool } from '../../server/src/sandbox/pool';
import { sandboxScript } from '../support/paths';
import { recipeOf } from '../support/plans';
import { lineOf, planFor, tempProject } from './support';

const project = tempProject();
const pool = new SandboxPool({ sandboxScript, timeoutMs: 5000 });
after(() => {
  pool.dispose();
  project.remove();
});

async function check(text: string, plan = planFor()) {
  const bundle = await project.bundle(text, 'pair.ts');
  assert.deepEqual(bundle.errors, []);
  return pool.run(bundle, plan);
}

describe('sandbox with the engine', () => {
  test('a correct pair passes, with evaluations counted inside the sandbox', async () => {
    // f(x) = x₀² + 3x₁², ∇f = (2x₀, 6x₁): textbook calculus.
    const text = [
      'export const objective = (x: number[]) => x[0] * x[0] + 3 * x[1] * x[1];',
      'export const gradient = (x: number[]) => [2 * x[0], 6 * x[1]];',
      '',
    ].join('\n');
    const { report } = await check(text);
    assert.equal(report.status, 'pass', JSON.stringify(report.findings));
    assert.ok(report.evaluations.objective > 0);
    assert.ok(report.evaluations.gradient > 0);
  });

  test('a throw in the objective is a runtime-error on the throwing line', async () => {
    const text = [
      'export function objective(x: number[]): number {',
      '  if (x.length > 0) {',
      "    throw new Error('objective exploded'); // THROW",
      '  }',
      '  return 0;',
      '}',
      'export const gradient = (x: number[]) => x.map(() => 0);',
      '',
    ].join('\n');
    const { report } = await check(text);
    const finding = report.findings.find((f) => f.code === 'runtime-error');
    assert.ok(finding, JSON.stringify(report.findings));
    assert.equal(report.status, 'error');
    assert.match(finding.message, /objective exploded/);
    assert.equal(finding.location?.file, path.join(project.dir, 'pair.ts'));
    assert.equal(finding.location?.line, lineOf(text, '// THROW'));
  });

  test('endless recursion in the gradient is a RangeError on the recursing line', async () => {
    const text = [
      'export const objective = (x: number[]) => x[0] * x[0];',
      'function deeper(n: number): number {',
      '  return deeper(n + 1) + 1; // RECURSE',
      '}',
      'export const gradient = (x: number[]) => [deeper(x[0])];',
      '',
    ].join('\n');
    const { report } = await check(text, planFor({ probes: [[1]], dimension: 1 }));
    const finding = report.findings.find((f) => f.code === 'runtime-error');
    assert.ok(finding, JSON.stringify(report.findings));
    assert.match(finding.message, /RangeError/);
    assert.equal(finding.subject, 'gradient');
    assert.equal(finding.location?.line, lineOf(text, '// RECURSE'));
  });

  test('an objective returning a Promise is an async-result', async () => {
    const text = [
      'export async function objective(x: number[]) { return x[0]; }',
      'export const gradient = (x: number[]) => [1];',
      '',
    ].join('\n');
    const { report } = await check(text, planFor({ probes: [[1]], dimension: 1 }));
    assert.ok(report.findings.some((f) => f.code === 'async-result' && f.subject === 'objective'), JSON.stringify(report.findings));
    assert.equal(report.status, 'error');
  });

  test('a combined result whose value getter throws is a runtime-error on the getter line', async () => {
    const text = [
      'export function valueAndGradient(x: number[]) {',
      '  return {',
      "    get value(): number { throw new Error('no value'); }, // GETTER",
      '    gradient: [2 * x[0]],',
      '  };',
      '}',
      '',
    ].join('\n');
    const plan = planFor({ recipe: recipeOf('valueAndGradient', null, { value: 'value', derivative: 'gradient' }), probes: [[1]], dimension: 1 });
    const { report } = await check(text, plan);
    const finding = report.findings.find((f) => f.code === 'runtime-error');
    assert.ok(finding, JSON.stringify(report.findings));
    assert.match(finding.message, /no value/);
    assert.equal(finding.location?.line, lineOf(text, '// GETTER'));
  });

  test('an objective that hangs on its third call times out, and the pool carries on', async () => {
    const text = [
      'let calls = 0;',
      'export function objective(x: number[]) { if (++calls > 2) for (;;) {} return x[0] * x[0]; }',
      'export const gradient = (x: number[]) => [2 * x[0]];',
      '',
    ].join('\n');
    const fast = new SandboxPool({ sandboxScript, timeoutMs: 800 });
    try {
      const bundle = await project.bundle(text, 'hang.ts');
      const { report } = await fast.run(bundle, planFor({ probes: [[1]], dimension: 1 }));
      assert.deepEqual(report.findings.map((f) => f.code), ['timeout']);
      const healthy = await fast.run(await project.bundle('export const objective = (x: number[]) => x[0];\nexport const gradient = () => [1];\n', 'ok.ts'), planFor({ probes: [[1]], dimension: 1 }));
      assert.notEqual(healthy.report.findings[0]?.code, 'timeout');
      assert.ok(healthy.report.evaluations.objective > 0);
    } finally {
      fast.dispose();
    }
  });

  test('a slow objective is checked within the time budget: what was decided comes back, never a timeout', async () => {
    // 25 ms per call by the clock, at n = 12: the whole plan takes far longer than the 1.5 s budget.
    // f = Σ (i + 1)·xᵢ², ∇f = 2(i + 1)·xᵢ (textbook calculus).
    const text = [
      'const wait = (ms: number) => { const end = Date.now() + ms; while (Date.now() < end) {} };',
      'export function objective(x: number[]): number { wait(25); return x.reduce((s, v, i) => s + (i + 1) * v * v, 0); }',
      'export function gradient(x: number[]): number[] { wait(25); return x.map((v, i) => 2 * (i + 1) * v); }',
      '',
    ].join('\n');
    const budgeted = new SandboxPool({ sandboxScript, timeoutMs: 1500 });
    try {
      const bundle = await project.bundle(text, 'slow.ts');
      const probe = Array.from({ length: 12 }, (_, i) => 0.5 + i / 10);
      const { report } = await budgeted.run(bundle, planFor({ probes: [probe], dimension: 12 }));
      assert.notEqual(report.status, 'error', JSON.stringify(report.findings));
      assert.equal(report.findings.some((f) => f.code === 'timeout'), false);
      const spent = report.findings.find((f) => f.code === 'budget-spent');
      assert.ok(spent, JSON.stringify(report.findings));
      assert.match(spent.message, /calls of the objective and gradient, about \d/);
    } finally {
      budgeted.dispose();
    }
  });
});

