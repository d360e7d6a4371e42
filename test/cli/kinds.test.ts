// Jacobians and Hessians through the CLI, in modules written as practitioners write them (every
// scenario invented; each truth is by construction): what depends on what, what is a learning
// rate and what is not, and a bad target that does not stop the others.
import assert from 'node:assert/strict';
import { mkdtempSync, writeFileSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { before, describe, test } from 'node:test';
import { runCli } from '../support/runCli';

const folder = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-kinds-'));
const files: Record<string, string> = {
  // A correct Hessian next to a gradient with its first component doubled.
  'wrong-gradient.ts': [
    'export function bowl(x: number[]): number { return x[0] ** 2 + 3 * x[1] ** 2 + x[0] * x[1]; }',
    'export function bowlGrad(x: number[]): number[] { return [2 * (2 * x[0] + x[1]), 6 * x[1] + x[0]]; }',
    'export function bowlHessian(x: number[]): number[][] { return [[2, 1], [1, 6]]; }',
    'export const x0 = [0.5, -1];',
  ].join('\n'),
  // A Levenberg–Marquardt loop: `damping` scales a Gauss–Newton step, it is no learning rate.
  'gauss-newton.ts': [
    'const t = [0, 1, 2, 3, 4];',
    'const y = [2.0, 1.2, 0.75, 0.45, 0.28];',
    'export function residuals(p: number[]): number[] { return t.map((ti, i) => p[0] * Math.exp(-p[1] * ti) - y[i]); }',
    'export function jacobian(p: number[]): number[][] { return t.map((ti) => [Math.exp(-p[1] * ti), -p[0] * ti * Math.exp(-p[1] * ti)]); }',
    'const damping = 1;',
    'export function solve(p0: number[]): number[] {',
    '  const p = p0.slice();',
    '  for (let k = 0; k < 20; k++) {',
    '    const r = residuals(p);',
    '    const J = jacobian(p);',
    '    const a = [0, 0, 0], b = [0, 0];',
    '    for (let i = 0; i < r.length; i++) { a[0] += J[i][0] ** 2; a[1] += J[i][0] * J[i][1]; a[2] += J[i][1] ** 2; b[0] += J[i][0] * r[i]; b[1] += J[i][1] * r[i]; }',
    '    const det = a[0] * a[2] - a[1] * a[1];',
    '    const delta = [(a[2] * b[0] - a[1] * b[1]) / det, (a[0] * b[1] - a[1] * b[0]) / det];',
    '    for (let j = 0; j < 2; j++) p[j] -= damping * delta[j];',
    '  }',
    '  return p;',
    '}',
    'export const p0 = [1.8, 0.4];',
  ].join('\n'),
  // A gradient pair and a Jacobian in one file: the module-level rate is the gradient pair's.
  'rate-beside-jacobian.ts': [
    'const t = [0, 1, 2, 3];',
    'const y = [1.0, 2.1, 2.9, 4.2];',
    'export function lineResiduals(p: number[]): number[] { return t.map((ti, i) => p[0] + p[1] * ti - y[i]); }',
    'export function lineJacobian(p: number[]): number[][] { return t.map((ti) => [1, ti]); }',
    'export function ridge(w: number[]): number { return 0.5 * (w[0] ** 2 + 4 * w[1] ** 2); }',
    'export function ridgeGrad(w: number[]): number[] { return [w[0], 4 * w[1]]; }',
    'export const learningRate = 0.1;',
    'export const w0 = [1, 1];',
  ].join('\n'),
  // `H` returns an entropy in bits, not a Hessian; its probes live on the objective.
  'entropy-and-probes.ts': [
    '/** @probe [0.3, 0.2] */',
    'export function loss(p: number[]) { return p[0] ** 2 * p[1] + Math.exp(p[1]); }',
    'export function lossGrad(p: number[]) { return [2 * p[0] * p[1], p[0] ** 2 + Math.exp(p[1])]; }',
    'export function lossHessian(p: number[]) { return [[2 * p[1], 2 * p[0]], [2 * p[0], Math.exp(p[1])]]; }',
    'export function H(p: number[]): number { return -p.reduce((s, v) => s + v * Math.log2(v), 0); }',
  ].join('\n'),
  // Two Jacobians: one returns its transpose, the other is right and still checked.
  'two-jacobians.ts': [
    'const t = [1, 2, 3];',
    '/** @probe [0.2, 0.1] */',
    'export function fitResiduals(p: number[]): number[] { return t.map((ti) => p[0] * ti + p[1] * ti * ti - 1); }',
    'export function fitJacobian(p: number[]): number[][] { return [t.map(() => 1), t.map((ti) => ti * ti)]; }',
    '/** @probe [0.7, 1.5] */',
    'export function poseResiduals(q: number[]): number[] { return [Math.cos(q[0]) - 0.5, Math.sin(q[0]) * q[1]]; }',
    'export function poseJacobian(q: number[]): number[][] { return [[-Math.sin(q[0]), 0], [Math.cos(q[0]) * q[1], Math.sin(q[0])]]; }',
  ].join('\n'),
};

describe('Jacobians and Hessians beside other targets, through the CLI', () => {
  const reported = new Map<string, any>();
  before(async () => {
    for (const [name, text] of Object.entries(files)) writeFileSync(path.join(folder, name), text + '\n');
    const run = await runCli(['--format', 'json', folder], { timeoutMs: 300_000 });
    assert.ok(run.code === 0 || run.code === 1, run.stderr);
    for (const file of JSON.parse(run.stdout).files) reported.set(path.basename(file.path), file);
  });
  const target = (file: string, kind: string) => reported.get(file).pairs.find((p: any) => p.kind === kind);

  test('a Hessian checked against a wrong gradient is not called wrong: it waits for the gradient', () => {
    assert.equal(target('wrong-gradient.ts', 'gradient').status, 'fail');
    const hessian = target('wrong-gradient.ts', 'hessian');
    assert.equal(hessian.status, 'inconclusive');
    assert.deepEqual(hessian.findings.map((f: any) => f.code), ['matrix-undecided']);
    assert.match(hessian.findings[0].message, /differences of `bowlGrad`, which disagrees with its own objective/);
  });

  test('a Gauss–Newton damping factor is not judged as a learning rate', () => {
    const jacobian = target('gauss-newton.ts', 'jacobian');
    assert.equal(jacobian.status, 'pass');
    assert.equal(jacobian.learningRate, null);
    assert.ok(!jacobian.findings.some((f: any) => f.code.startsWith('rate-')));
  });

  test('a module-level rate goes to the gradient pair though a Jacobian sits beside it', () => {
    const ridge = target('rate-beside-jacobian.ts', 'gradient');
    // ridge's Hessian is diag(1, 4): L = 4, so 0.1 ≤ 1/L = 0.25 is safe (by construction).
    assert.deepEqual([ridge.learningRate?.name, ridge.learningRate?.status], ['learningRate', 'safe']);
    assert.equal(target('rate-beside-jacobian.ts', 'jacobian').learningRate, null);
  });

  test('a function returning a number is no Hessian, and a Hessian takes its pair\'s probes', () => {
    const file = reported.get('entropy-and-probes.ts');
    assert.deepEqual(file.pairs.map((p: any) => [p.kind, p.gradient]), [['gradient', 'lossGrad'], ['hessian', 'lossHessian']]);
    const hessian = target('entropy-and-probes.ts', 'hessian');
    assert.equal(hessian.status, 'pass', JSON.stringify(hessian.findings));
    assert.equal(hessian.dimension, 2);
  });

  test('a transposed Jacobian is a shape finding on its line, and the file\'s other Jacobian is still checked', () => {
    const file = reported.get('two-jacobians.ts');
    const [fit, pose] = file.pairs;
    assert.equal(fit.status, 'error');
    const shape = fit.findings.find((f: any) => f.code === 'matrix-wrong-shape');
    assert.match(shape.message, /2 × 3 .*must be 3 × 2.*transposed/);
    assert.equal(shape.line, 4);
    assert.equal(pose.gradient, 'poseJacobian');
    assert.equal(pose.status, 'pass');
  });
});
