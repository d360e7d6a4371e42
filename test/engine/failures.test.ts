// What the engine does when the user's functions misbehave: every case becomes a
// finding with a stable code, and checkPair itself never throws.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { checkPair, type PairFunctions } from '../../server/src/engine/checkPair';
import { defaultCheckOptions, type FindingCode, type PairReport } from '../../server/src/engine/types';
import { makeArray, makeFloat64 } from '../support/problems';

const plan = (dimension: number | null = null) => ({ dimension, learningRate: null, options: defaultCheckOptions });
const sphere = (x: ArrayLike<number>) => x[0] ** 2 + x[1] ** 2;
const sphereGradient = (x: ArrayLike<number>) => [2 * x[0], 2 * x[1]];

function run(objective: PairFunctions['objective'], gradient: PairFunctions['gradient'], probes: number[][] = [[1, 2]], dimension: number | null = null): PairReport {
  return checkPair({ objective, gradient, makeVector: makeArray }, probes, plan(dimension));
}

function codes(report: PairReport): FindingCode[] {
  return report.findings.map((f) => f.code);
}

describe('findings for misbehaving functions', () => {
  test('non-smooth point: |x0| + x1² at x0 = 0 is inconclusive, not a failure', () => {
    const report = run((x) => Math.abs(x[0]) + x[1] ** 2, (x) => [Math.sign(x[0]), 2 * x[1]], [[0, 1]]);
    assert.equal(report.status, 'inconclusive');
    const finding = report.findings.find((f) => f.code === 'non-smooth-probe')!;
    assert.equal(finding.severity, 'info');
    assert.deepEqual(finding.components, [0]);
    // Away from the kink the same pair passes.
    assert.equal(run((x) => Math.abs(x[0]) + x[1] ** 2, (x) => [Math.sign(x[0]), 2 * x[1]], [[0.5, 1]]).status, 'pass');
  });

  test('NaN in the objective or the gradient', () => {
    const nanObjective = run(() => Number.NaN, sphereGradient);
    assert.equal(nanObjective.status, 'error');
    assert.deepEqual(codes(nanObjective), ['non-finite-value']);
    assert.equal(nanObjective.findings[0].subject, 'objective');
    const nanGradient = run(sphere, (x) => [2 * x[0], Number.POSITIVE_INFINITY]);
    assert.equal(nanGradient.status, 'error');
    assert.deepEqual(nanGradient.findings[0].components, [1]);
    assert.equal(nanGradient.findings[0].subject, 'gradient');
  });

  test('gradient of the wrong length, or not a vector', () => {
    assert.deepEqual(codes(run(sphere, (x) => [2 * x[0]])), ['gradient-wrong-length']);
    assert.deepEqual(codes(run(sphere, () => 5)), ['gradient-not-a-vector']);
    assert.deepEqual(codes(run(sphere, () => ['1', '2'])), ['gradient-not-a-vector']);
    // Any array-like of numbers is accepted (here a constant, hence wrong, gradient).
    assert.deepEqual(codes(run(sphere, () => ({ length: 2, 0: 1, 1: 2 }))), ['gradient-mismatch']);
  });

  test('objective that is not a number', () => {
    const report = run(() => '3', sphereGradient);
    assert.equal(report.status, 'error');
    assert.deepEqual(codes(report), ['objective-not-a-number']);
  });

  test('input mutation is a warning and the check still runs on the right points', () => {
    const report = run((x) => {
      const value = sphere(x);
      (x as number[])[0] = 42;
      return value;
    }, sphereGradient);
    assert.equal(report.status, 'pass');
    const finding = report.findings.find((f) => f.code === 'input-mutated')!;
    assert.equal(finding.severity, 'warning');
    assert.equal(finding.subject, 'objective');
    assert.equal(report.findings.filter((f) => f.code === 'input-mutated').length, 1);
  });

  test('async results are errors and are not awaited', () => {
    const report = run(async (x) => sphere(x), sphereGradient);
    assert.equal(report.status, 'error');
    assert.deepEqual(codes(report), ['async-result']);
    const gradientPromise = run(sphere, (x) => Promise.resolve(sphereGradient(x)));
    assert.deepEqual(codes(gradientPromise), ['async-result']);
    assert.equal(gradientPromise.findings[0].subject, 'gradient');
  });

  test('repeated calls that disagree (Math.random inside) are unrepeatable and inconclusive', () => {
    const report = run((x) => sphere(x) + 1e-6 * Math.random(), sphereGradient);
    assert.equal(report.status, 'inconclusive');
    assert.equal(report.findings.find((f) => f.code === 'unrepeatable-objective')!.severity, 'warning');
  });

  test('deterministic noise too large to decide anything: noisy-objective, inconclusive', () => {
    // A hash-like term of amplitude 0.3 on a level of 100: repeatable, but rough at
    // every step the check can use, like a simulation with a loose solver tolerance.
    const rough = (x: ArrayLike<number>) => {
      const s = Math.sin(x[0] * 12.9898 + x[1] * 78.233) * 43758.5453;
      return 100 + sphere(x) + 0.3 * (s - Math.floor(s));
    };
    const report = run(rough, sphereGradient);
    assert.equal(report.status, 'inconclusive', JSON.stringify(report.findings));
    assert.equal(report.findings.find((f) => f.code === 'noisy-objective')!.severity, 'info');
    assert.equal(codes(report).includes('gradient-mismatch'), false);
  });

  test('throws become runtime errors naming the function and the probe', () => {
    const thrown = new RangeError('x out of range');
    const report = run(sphere, () => {
      throw thrown;
    }, [[1, 2], [3, 4]]);
    assert.equal(report.status, 'error');
    assert.equal(report.findings[0].code, 'runtime-error');
    assert.equal(report.findings[0].subject, 'gradient');
    assert.equal(report.findings[0].probeIndex, 0);
    assert.match(report.findings[0].message, /gradient threw at probe 1: RangeError: x out of range/);
    assert.equal(report.findings[0].stack, String(thrown.stack));

    // Throwing only away from the probe: the message says it was a finite-difference point.
    const partial = run((x) => {
      if (x[0] > 1) throw new Error('outside');
      return sphere(x);
    }, sphereGradient, [[1, 2]]);
    assert.match(partial.findings[0].message, /objective threw at a finite-difference point near probe 1/);
  });

  test('non-Error throws, including values whose getters and toString throw', () => {
    const plain = run(() => {
      throw 'plain string';
    }, sphereGradient);
    assert.match(plain.findings[0].message, /plain string/);
    assert.equal(plain.findings[0].stack, undefined);
    const hostile = {
      get stack(): string {
        throw new Error('stack getter');
      },
      toString(): string {
        throw new Error('toString');
      },
    };
    const report = run(() => {
      throw hostile;
    }, sphereGradient);
    assert.equal(report.status, 'error');
    assert.equal(report.findings[0].code, 'runtime-error');
    const result = run(sphere, () => ({
      get length(): number {
        throw new Error('length getter');
      },
    }));
    assert.deepEqual(codes(result), ['runtime-error']);
  });

  test('dimension unknown and no probes; malformed probes', () => {
    const unknown = run(sphere, sphereGradient, [], null);
    assert.equal(unknown.status, 'error');
    assert.deepEqual(codes(unknown), ['unknown-dimension']);
    assert.deepEqual(unknown.evaluations, { objective: 0, gradient: 0 });
    assert.deepEqual(codes(run(sphere, sphereGradient, [[1, 2], [1]])), ['bad-probe']);
    assert.deepEqual(codes(run(sphere, sphereGradient, [[1, Number.NaN]])), ['bad-probe']);
  });

  test('a makeVector that throws, or a clock that throws, still yields a report', () => {
    const report = checkPair({ objective: sphere, gradient: sphereGradient, makeVector: () => { throw new Error('no vectors'); } }, [[1, 2]], plan());
    assert.equal(report.status, 'error');
    assert.deepEqual(codes(report), ['runtime-error']);
    const timed = checkPair({ objective: sphere, gradient: sphereGradient, makeVector: makeFloat64 }, [[1, 2]], plan(), () => {
      throw new Error('clock');
    });
    assert.equal(timed.status, 'pass');
    assert.equal(timed.elapsedMs, 0);
  });

  test('every evaluation is counted', () => {
    let objectiveCalls = 0;
    let gradientCalls = 0;
    const report = checkPair(
      { objective: (x) => (objectiveCalls++, sphere(x)), gradient: (x) => (gradientCalls++, sphereGradient(x)), makeVector: makeArray },
      [[1, 2]],
      { dimension: 2, learningRate: { name: 'lr', value: 0.1 }, options: defaultCheckOptions },
    );
    assert.deepEqual(report.evaluations, { objective: objectiveCalls, gradient: gradientCalls });
  });
});
