// The in-context runner's resolution of the plan against a module's exports,
// run in-process with an observing stand-in for the engine.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import type { PairFunctions, PairPlan } from '../../server/src/engine/checkPair';
import type { PairReport } from '../../server/src/engine/types';
import { run } from '../../server/src/sandbox/inContext';
import { errorReport } from '../../server/src/sandbox/reports';
import { planFor } from './support';

interface Observed {
  fns: PairFunctions;
  probes: number[][];
  plan: PairPlan;
}

/** Runs the plan with a stand-in engine that records what it was given and reports 'pass'. */
function runObserved(moduleExports: object, plan = planFor()): { report: PairReport; observed: Observed | null } {
  let observed: Observed | null = null;
  const check = (fns: PairFunctions, probes: number[][], pairPlan: PairPlan): PairReport => {
    observed = { fns, probes, plan: pairPlan };
    return { ...errorReport([]), status: 'pass' };
  };
  const report = JSON.parse(run(moduleExports, JSON.stringify(plan), check)) as PairReport;
  return { report, observed };
}

describe('in-context runner', () => {
  test('hands the named objective and gradient to the engine, with literal probes', () => {
    const exports = { objective: (x: number[]) => x[0] * x[0], gradient: (x: number[]) => [2 * x[0]] };
    const { report, observed } = runObserved(exports, planFor({ probes: [[3]], dimension: 1 }));
    assert.equal(report.status, 'pass');
    assert.ok(observed);
    const { fns, probes, plan } = observed as Observed;
    assert.deepEqual(probes, [[3]]);
    assert.equal(plan.dimension, 1);
    assert.equal(fns.objective([3]), 9);
    assert.deepEqual(fns.gradient([3]), [6]);
  });

  test('makeVector builds the argument kind the plan names', () => {
    const exports = { objective: () => 0, gradient: () => [0] };
    const asArray = runObserved(exports, planFor({ argumentKind: 'array' })).observed as Observed;
    const asTyped = runObserved(exports, planFor({ argumentKind: 'float64array' })).observed as Observed;
    const plain = asArray.fns.makeVector(new Float64Array([1, 2]));
    const typed = asTyped.fns.makeVector([1, 2]);
    assert.ok(Array.isArray(plain));
    assert.deepEqual(plain, [1, 2]);
    assert.ok(typed instanceof Float64Array);
    assert.deepEqual(Array.from(typed), [1, 2]);
  });

  test('splits a combined function into value and gradient', () => {
    let calls = 0;
    const exports = {
      valueAndGradient: (x: number[]) => {
        calls++;
        return { loss: x[0] * x[0], grad: [2 * x[0]] };
      },
    };
    const plan = planFor({ objective: 'valueAndGradient', gradient: null, combined: { valueKey: 'loss', gradientKey: 'grad' } });
    const { fns } = runObserved(exports, plan).observed as Observed;
    assert.equal(fns.objective([5]), 25);
    assert.deepEqual(fns.gradient([5]), [10]);
    assert.equal(calls, 2);
  });

  test('a combined function returning a Promise passes the Promise on, so the engine can name it', () => {
    const pending = Promise.resolve({ loss: 1, grad: [0] });
    const plan = planFor({ objective: 'valueAndGradient', gradient: null, combined: { valueKey: 'loss', gradientKey: 'grad' } });
    const { fns } = runObserved({ valueAndGradient: () => pending }, plan).observed as Observed;
    assert.equal(fns.objective([0]), pending);
  });

  test('a missing gradient or a non-function objective gives missing-export without calling the engine', () => {
    const missing = runObserved({ objective: () => 0 });
    assert.equal(missing.observed, null);
    assert.equal(missing.report.status, 'error');
    assert.deepEqual(missing.report.findings.map((f) => [f.code, f.subject]), [['missing-export', 'gradient']]);
    assert.match(missing.report.findings[0].message, /'gradient' is not exported/);

    const notFunction = runObserved({ objective: 42, gradient: () => [0] });
    assert.deepEqual(notFunction.report.findings.map((f) => [f.code, f.subject]), [['missing-export', 'objective']]);
    assert.match(notFunction.report.findings[0].message, /a number, not a function/);
  });

  test('an export getter that throws becomes a runtime-error with the stack', () => {
    const exports = Object.defineProperty({ gradient: () => [0] }, 'objective', {
      get() {
        throw new TypeError('getter boom');
      },
    });
    const { report, observed } = runObserved(exports);
    assert.equal(observed, null);
    assert.equal(report.findings[0].code, 'runtime-error');
    assert.match(report.findings[0].message, /TypeError: getter boom/);
    assert.match(report.findings[0].stack ?? '', /getter boom/);
  });

  test('probe exports: arrays and Float64Arrays join the literal probes, bad ones become bad-probe findings', () => {
    const exports = {
      objective: () => 0,
      gradient: () => [0, 0],
      start: [1, 2],
      typed: new Float64Array([3, 4]),
      words: 'not a point',
      holes: [1, Number.NaN],
    };
    const plan = planFor({ probes: [[0, 0]], probeExports: ['start', 'typed', 'words', 'holes', 'absent'] });
    const { report, observed } = runObserved(exports, plan);
    assert.deepEqual((observed as Observed).probes, [[0, 0], [1, 2], [3, 4]]);
    assert.deepEqual(report.findings.map((f) => [f.code, f.subject]), [['bad-probe', 'probe'], ['bad-probe', 'probe'], ['bad-probe', 'probe']]);
    assert.match(report.findings[0].message, /'words'/);
    assert.match(report.findings[1].message, /'holes'.*finite/);
    assert.match(report.findings[2].message, /'absent' is not exported/);
  });

  test('an engine that throws still yields a report', () => {
    const exports = { objective: () => 0, gradient: () => [0] };
    const report = JSON.parse(
      run(exports, JSON.stringify(planFor()), () => {
        throw new Error('engine fault');
      }),
    ) as PairReport;
    assert.equal(report.status, 'error');
    assert.match(report.findings[0].message, /engine fault/);
  });
});
