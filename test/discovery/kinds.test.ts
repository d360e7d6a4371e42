// Discovery of the kinds whose derivative is a matrix: residuals and Jacobians, Hessians and
// Hessian-vector products, by tags, names and combined results, next to gradient pairs.
import * as assert from 'node:assert/strict';
import { test } from 'node:test';
import { discoverPairs, fileFindingCodes, source } from './support';

const kinds = (text: string) => discoverPairs(text, 'fit.ts').pairs.map((p) => [p.kind, p.objective.name, p.gradient?.name ?? null, p.key]);

test('residual and Jacobian names pair: residuals/jacobian, resid/jac, r/J, a shared stem, a prefix', () => {
  assert.deepEqual(kinds(source('export function residuals(p: number[]) { return [p[0] - 1, p[1]]; }', 'export function jacobian(p: number[]) { return [[1, 0], [0, 1]]; }')), [['jacobian', 'residuals', 'jacobian', 'jacobian']]);
  assert.deepEqual(kinds(source('export function resid(p: number[]) { return [p[0]]; }', 'export function jac(p: number[]) { return [[1, 0]]; }')), [['jacobian', 'resid', 'jac', 'jac']]);
  assert.deepEqual(kinds(source('export const r = (p: number[]) => [p[0]];', 'export const J = (p: number[]) => [[1]];')), [['jacobian', 'r', 'J', 'J']]);
  assert.deepEqual(kinds(source('export function poseResiduals(p: number[]) { return [p[0]]; }', 'export function poseJacobian(p: number[]) { return [[1]]; }')), [['jacobian', 'poseResiduals', 'poseJacobian', 'poseJacobian']]);
  assert.deepEqual(kinds(source('export function decay(p: number[]) { return [p[0]]; }', 'export function jacobianDecay(p: number[]) { return [[1]]; }')), [['jacobian', 'decay', 'jacobianDecay', 'jacobianDecay']]);
});

test('a generic Jacobian next to two residual functions is ambiguous and says how to settle it', () => {
  const result = discoverPairs(source('export function residuals(p: number[]) { return [p[0]]; }', 'export function priorResiduals(p: number[]) { return [p[1]]; }', 'export function jacobian(p: number[]) { return [[1, 0]]; }'), 'fit.ts');
  assert.deepEqual(result.pairs, []);
  assert.deepEqual(fileFindingCodes(result), ['ambiguous-pair']);
  assert.match(result.fileFindings[0].message, /@jacobianOf residuals/);
});

test('@jacobianOf names the residual function whatever the names', () => {
  const text = source('export function misfit(p: number[]) { return [p[0] - 2]; }', '/** @jacobianOf misfit */', 'export function sensitivities(p: number[]) { return [[1]]; }');
  const [pair] = discoverPairs(text, 'fit.ts').pairs;
  assert.equal(pair.kind, 'jacobian');
  assert.equal(pair.matchedBy, 'tag');
  assert.equal(pair.plan.kind, 'jacobian');
});

test('a tag that names nothing is an error on the tag', () => {
  const result = discoverPairs(source('/** @jacobianOf nowhere */', 'export function sensitivities(p: number[]) { return [[1]]; }'), 'fit.ts');
  assert.deepEqual(fileFindingCodes(result), ['missing-export']);
  assert.match(result.fileFindings[0].message, /no function named `nowhere`/);
});

test('one function returning residuals and Jacobian together, by keys or by name', () => {
  const byKeys = discoverPairs(source('export function model(p: number[]) { const r = [p[0]]; const J = [[1]]; return { r, J }; }'), 'fit.ts').pairs;
  assert.deepEqual(byKeys.map((p) => [p.kind, p.plan.recipe.split]), [['jacobian', { value: 'r', derivative: 'J' }]]);
  const byName = discoverPairs(source('export function residualsAndJacobian(p: number[]): [number[], number[][]] { return [[p[0]], [[1]]]; }'), 'fit.ts').pairs;
  assert.deepEqual(byName.map((p) => [p.kind, p.plan.recipe.split]), [['jacobian', { value: '0', derivative: '1' }]]);
});

test('methods of a class pair as residuals and Jacobian too', () => {
  const text = source(
    'export class ArmFit {',
    '  resid(q: Float64Array) { return new Float64Array([q[0]]); }',
    '  jac(q: Float64Array) { return new Float64Array([1, 0]); }',
    '}',
    'export const arm = new ArmFit();',
  );
  assert.deepEqual(kinds(text), [['jacobian', 'arm.resid', 'arm.jac', 'arm.jac']]);
});

test('a Hessian and a Hessian-vector product attach to the gradient of their pair, each a target of its own', () => {
  const text = source(
    'export function energy(x: number[]) { return x[0] * x[0]; }',
    'export function energyGrad(x: number[]) { return [2 * x[0], 0]; }',
    'export function energyHessian(x: number[]) { return [[2, 0], [0, 0]]; }',
    'export function energyHvp(x: number[], v: number[]) { return [2 * v[0], 0]; }',
  );
  assert.deepEqual(kinds(text), [
    ['gradient', 'energy', 'energyGrad', 'energy'],
    ['hessian', 'energyGrad', 'energyHessian', 'energyHessian'],
    ['hessianVectorProduct', 'energyGrad', 'energyHvp', 'energyHvp'],
  ]);
});

test('a generic hessian goes with the only gradient pair; with two pairs it asks for a tag', () => {
  const one = source('export function loss(x: number[]) { return 0; }', 'export function lossGrad(x: number[]) { return [0]; }', 'export function hessian(x: number[]) { return [[0]]; }');
  assert.deepEqual(kinds(one).map(([kind, value]) => [kind, value]), [['gradient', 'loss'], ['hessian', 'lossGrad']]);
  const two = discoverPairs(source(one, 'export function cost(x: number[]) { return 0; }', 'export function costGrad(x: number[]) { return [0]; }'), 'fit.ts');
  assert.deepEqual(two.pairs.map((p) => p.kind), ['gradient', 'gradient']);
  assert.match(two.fileFindings.find((f) => f.code === 'ambiguous-pair')!.message, /@hessianOf/);
});

test('@hessianOf names the objective; the Hessian is checked against its gradient', () => {
  const text = source('export function f(x: number[]) { return 0; }', 'export function df(x: number[]) { return [0]; }', '/** @hessianOf f */', 'export function curvature(x: number[]) { return [[0]]; }');
  const hessian = discoverPairs(text, 'fit.ts').pairs.find((p) => p.kind === 'hessian')!;
  assert.equal(hessian.objective.name, 'df');
  assert.equal(hessian.matchedBy, 'tag');
});

test('a product needs the direction parameter: a one-parameter hvp is not taken for one', () => {
  const text = source('export function loss(x: number[]) { return 0; }', 'export function lossGrad(x: number[]) { return [0]; }', 'export function hvp(x: number[]) { return [0]; }');
  assert.deepEqual(kinds(text).map(([kind]) => kind), ['gradient']);
});

test('residual names are not taken for objectives: a gradient pair and a Jacobian pair side by side', () => {
  const text = source(
    'export function residual(p: number[]) { return [p[0] - 1]; }',
    'export function jacobian(p: number[]) { return [[1, 0]]; }',
    'export function loss(p: number[]) { return p[0] * p[0]; }',
    'export function gradient(p: number[]) { return [2 * p[0], 0]; }',
  );
  assert.deepEqual(kinds(text).map(([kind, value, derivative]) => [kind, value, derivative]), [
    ['jacobian', 'residual', 'jacobian'],
    ['gradient', 'loss', 'gradient'],
  ]);
});

test('a gradient pair whose objective calls the residual function carries its recipe for the Jᵀr comparison', () => {
  const text = source(
    'export function residuals(p: number[]) { return [p[0] - 1, p[1]]; }',
    'export function jacobian(p: number[]) { return [[1, 0], [0, 1]]; }',
    'export function misfit(p: number[]) { const r = residuals(p); return r[0] ** 2 + r[1] ** 2; }',
    'export function misfitGrad(p: number[]) { return [2 * (p[0] - 1), 2 * p[1]]; }',
    'export function prior(p: number[]) { return p[0] ** 2; }',
    'export function priorGrad(p: number[]) { return [2 * p[0], 0]; }',
  );
  const pairs = discoverPairs(text, 'fit.ts').pairs;
  const misfit = pairs.find((p) => p.key === 'misfit')!;
  assert.deepEqual(misfit.plan.residuals, pairs.find((p) => p.kind === 'jacobian')!.plan.recipe);
  assert.equal(pairs.find((p) => p.key === 'prior')!.plan.residuals, undefined);
});

test('a matrix-returning function beside a vector-returning one, both unnamed as such, gets a note with the tag that pairs them', () => {
  const text = source(
    'export function driftErrors(theta: number[], run: { t: number[] }): number[] { return run.t.map((t) => theta[0] * t); }',
    'export function driftSensitivity(theta: number[], run: { t: number[] }): number[][] { return run.t.map((t) => [t]); }',
  );
  const result = discoverPairs(text, 'fit.ts');
  assert.deepEqual(result.pairs, []);
  assert.deepEqual(fileFindingCodes(result), ['unpaired-function']);
  assert.match(result.fileFindings[0].message, /`driftSensitivity` returns a matrix from the same parameter as `driftErrors`.*@jacobianOf driftErrors/);
  const tagged = discoverPairs(text.replace('export function driftSensitivity', '/** @jacobianOf driftErrors */\nexport function driftSensitivity'), 'fit.ts');
  assert.deepEqual(tagged.pairs.map((p) => p.kind), ['jacobian']);
  assert.deepEqual(fileFindingCodes(tagged), []);
});
