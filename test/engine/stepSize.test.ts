// Learning-rate verdicts against the local Lipschitz estimate, confirmed by short
// gradient-descent runs.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { checkPair } from '../../server/src/engine/checkPair';
import { defaultCheckOptions, type PairReport } from '../../server/src/engine/types';
import { makeArray } from '../support/problems';

// f = ½(x0² + 10·x1²): λmax = 10 by construction. Gradient descent on a quadratic
// converges iff 0 < α < 2/λmax (Nocedal & Wright 2006, §3.3; common practice).
const lambdaMax = 10;
const objective = (x: ArrayLike<number>) => 0.5 * (x[0] ** 2 + lambdaMax * x[1] ** 2);
const gradient = (x: ArrayLike<number>) => [x[0], lambdaMax * x[1]];

function withRate(value: number, plots = false): PairReport {
  return checkPair({ objective, gradient, makeVector: makeArray }, [[1, 1], [-0.5, 2]], { dimension: 2, learningRate: { name: 'alpha', value }, options: { ...defaultCheckOptions, plots } });
}

describe('learning-rate verdicts', () => {
  test('0.99·2/λmax: aggressive, and the runs still decrease f', () => {
    const report = withRate((0.99 * 2) / lambdaMax);
    assert.equal(report.learningRate!.status, 'aggressive');
    assert.deepEqual(report.learningRate!.decreased, [true]);
    const finding = report.findings.find((f) => f.code === 'rate-aggressive')!;
    assert.equal(finding.severity, 'warning');
    assert.equal(finding.subject, 'learningRate');
    assert.match(finding.message, /local estimate/);
    assert.equal(report.findings.some((f) => f.code === 'rate-unconfirmed'), false);
  });

  test('1.01·2/λmax: divergent, and the runs increase f', () => {
    const report = withRate((1.01 * 2) / lambdaMax);
    assert.equal(report.learningRate!.status, 'divergent');
    assert.deepEqual(report.learningRate!.decreased, [false]);
    assert.equal(report.findings.find((f) => f.code === 'rate-divergent')!.severity, 'error');
    assert.equal(report.findings.some((f) => f.code === 'rate-unconfirmed'), false);
    const run = report.probes[0].descent.find((r) => r.label === 'declared')!;
    assert.equal(run.values.length, defaultCheckOptions.descentSteps + 1);
    assert.ok(run.values[run.values.length - 1] > run.values[0]);
  });

  test('below 1/λmax: safe, no rate finding; safe and limit runs are recorded when the report asks for plots', () => {
    const report = withRate(0.05, true);
    assert.equal(report.learningRate!.status, 'safe');
    assert.equal(report.findings.some((f) => f.code.startsWith('rate-')), false);
    assert.ok(Math.abs(report.smoothness!.safeStep - 1 / lambdaMax) < 1e-6);
    const labels = report.probes[0].descent.map((r) => r.label);
    assert.deepEqual(labels, ['declared', 'safe', 'limit']);
    assert.equal(report.probes[0].descent[1].decreased, true);
    assert.ok(report.probes[0].stepStudy !== null);
  });

  test('without plots, the same verdict from fewer calls: only the declared rate is run, and no step study', () => {
    const [plain, plotted] = [withRate(0.05), withRate(0.05, true)];
    assert.deepEqual(plain.learningRate, plotted.learningRate);
    // The curvature and the descent runs belong to the first probe only.
    assert.deepEqual(plain.probes.map((p) => p.descent.map((r) => r.label)), [['declared'], []]);
    assert.equal(plain.probes[0].stepStudy, null);
    const calls = (r: PairReport) => r.evaluations.objective + r.evaluations.gradient;
    assert.ok(calls(plain) < calls(plotted), `${calls(plain)} calls against ${calls(plotted)}`);
  });

  test('a verdict the short run contradicts is reported as unconfirmed', () => {
    // From (1, 0) the steep direction is not excited, so even a divergent rate decreases f.
    const report = checkPair({ objective, gradient, makeVector: makeArray }, [[1, 0]], { dimension: 2, learningRate: { name: 'alpha', value: 0.25 }, options: defaultCheckOptions });
    assert.equal(report.learningRate!.status, 'divergent');
    const finding = report.findings.find((f) => f.code === 'rate-unconfirmed')!;
    assert.equal(finding.severity, 'info');
  });

  test('no rate verdict when the gradient is wrong', () => {
    const report = checkPair({ objective, gradient: (x) => gradient(x).map((v) => -v), makeVector: makeArray }, [[1, 1]], { dimension: 2, learningRate: { name: 'alpha', value: 0.1 }, options: defaultCheckOptions });
    assert.equal(report.status, 'fail');
    assert.equal(report.smoothness, null);
    assert.equal(report.learningRate, null);
  });
});
