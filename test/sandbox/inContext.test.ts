// The in-context runner's resolution of the plan's call recipe in a module's scope,
// run in-process with an observing stand-in for the engine.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import type { PairFunctions, PairPlan } from '../../server/src/engine/checkPair';
import type { PairReport } from '../../server/src/engine/types';
import { run, type ModuleScope } from '../../server/src/sandbox/inContext';
import { errorReport } from '../../server/src/sandbox/reports';
import { recipeOf } from '../support/plans';
import { planFor } from './support';

/** The scope hook a bundle would set for these module-level values: each key read through a thunk, getters included. */
function scopeOf(values: object): ModuleScope {
  const scope: ModuleScope = {};
  for (const key of Object.getOwnPropertyNames(values)) scope[key] = () => (values as Record<string, unknown>)[key];
  return scope;
}

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
  const report = JSON.parse(run(scopeOf(moduleExports), JSON.stringify(plan), check)) as PairReport;
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
    const plan = planFor({ recipe: recipeOf('valueAndGradient', null, { value: 'loss', derivative: 'grad' }) });
    const { fns } = runObserved(exports, plan).observed as Observed;
    assert.equal(fns.objective([5]), 25);
    assert.deepEqual(fns.gradient([5]), [10]);
    assert.equal(calls, 2);
  });

  test('a combined function returning a Promise passes the Promise on, so the engine can name it', () => {
    const pending = Promise.resolve({ loss: 1, grad: [0] });
    const plan = planFor({ recipe: recipeOf('valueAndGradient', null, { value: 'loss', derivative: 'grad' }) });
    const { fns } = runObserved({ valueAndGradient: () => pending }, plan).observed as Observed;
    assert.equal(fns.objective([0]), pending);
  });

  test('a missing gradient or a non-function objective gives unresolved-target without calling the engine', () => {
    const missing = runObserved({ objective: () => 0 });
    assert.equal(missing.observed, null);
    assert.equal(missing.report.status, 'error');
    assert.deepEqual(missing.report.findings.map((f) => [f.code, f.subject]), [['unresolved-target', 'gradient']]);
    assert.match(missing.report.findings[0].message, /'gradient' could not be reached/);

    const notFunction = runObserved({ objective: 42, gradient: () => [0] });
    assert.deepEqual(notFunction.report.findings.map((f) => [f.code, f.subject]), [['unresolved-target', 'objective']]);
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
    const plan = planFor({ probes: [[0, 0]], probeKeys: ['start', 'typed', 'words', 'holes', 'absent'] });
    const { report, observed } = runObserved(exports, plan);
    assert.deepEqual((observed as Observed).probes, [[0, 0], [1, 2], [3, 4]]);
    assert.deepEqual(report.findings.map((f) => [f.code, f.subject]), [['bad-probe', 'probe'], ['bad-probe', 'probe'], ['bad-probe', 'probe']]);
    assert.match(report.findings[0].message, /'words'/);
    assert.match(report.findings[1].message, /'holes'.*finite/);
    assert.match(report.findings[2].message, /'absent' could not be reached/);
  });

  test('an engine that throws still yields a report', () => {
    const exports = { objective: () => 0, gradient: () => [0] };
    const report = JSON.parse(
      run(scopeOf(exports), JSON.stringify(planFor()), () => {
        throw new Error('engine fault');
      }),
    ) as PairReport;
    assert.equal(report.status, 'error');
    assert.match(report.findings[0].message, /engine fault/);
  });

  test('methods of a host object are called on it, with the bound data after the point', () => {
    class Fit {
      constructor(private readonly scale: number) {}
      loss(w: number[], xs: number[]) {
        return this.scale * w[0] * xs[0];
      }
      lossGrad(w: number[], xs: number[]) {
        return [this.scale * xs[0]];
      }
    }
    const scope = { model: new Fit(3), data: [2] };
    const plan = planFor({ recipe: { host: { key: 'model', construct: false }, value: 'loss', derivative: 'lossGrad', split: null, extraArguments: ['data'] } });
    const { fns } = runObserved(scope, plan).observed as Observed;
    assert.equal(fns.objective([5]), 30);
    assert.deepEqual(fns.gradient([5]), [6]);
  });

  test('a class without constructor arguments is built once; a throwing constructor is reported on its key', () => {
    let built = 0;
    class Quadratic {
      constructor() {
        built++;
      }
      f(x: number[]) {
        return x[0] * x[0];
      }
      df(x: number[]) {
        return [2 * x[0]];
      }
    }
    const recipe = { host: { key: 'Quadratic', construct: true }, value: 'f', derivative: 'df', split: null, extraArguments: [] };
    const { fns } = runObserved({ Quadratic }, planFor({ recipe })).observed as Observed;
    assert.equal(fns.objective([3]), 9);
    assert.equal(built, 1);

    class Broken {
      constructor() {
        throw new RangeError('no weights file');
      }
    }
    const { report, observed } = runObserved({ Broken }, planFor({ recipe: { ...recipe, host: { key: 'Broken', construct: true } } }));
    assert.equal(observed, null);
    assert.deepEqual(report.findings.map((f) => [f.code, f.subject, f.recipeKey]), [['runtime-error', 'recipe', 'Broken']]);
    assert.match(report.findings[0].message, /new Broken\(\).*RangeError: no weights file/);
  });

  test('a host without the method, or a factory that returned something else, names what the value is', () => {
    const recipe = { host: { key: 'problem', construct: false }, value: 'f', derivative: 'grad', split: null, extraArguments: [] };
    const { report } = runObserved({ problem: { value: 1, weights: [1, 2] } }, planFor({ recipe }));
    assert.deepEqual(report.findings.map((f) => [f.code, f.recipeKey]), [['unresolved-target', 'problem']]);
    assert.match(report.findings[0].message, /'problem' has no 'f': it is an object with keys value, weights/);
    const notObject = runObserved({ problem: 7 }, planFor({ recipe })).report;
    assert.match(notObject.findings[0].message, /'problem' is a number, not an object with methods/);
  });

  test('the start point goes to the engine when no probe is given; a start of the wrong kind is an error on its key', () => {
    const exports = { objective: () => 0, gradient: () => [0, 0], x0: new Float64Array([0.5, 2]), bad: { a: 1 } };
    const { observed } = runObserved(exports, planFor({ probes: [], start: 'x0' }));
    assert.deepEqual((observed as Observed).plan.startPoint, [0.5, 2]);
    const wrong = runObserved(exports, planFor({ probes: [], start: 'bad' }));
    assert.equal(wrong.observed, null);
    assert.deepEqual(wrong.report.findings.map((f) => [f.code, f.recipeKey]), [['unresolved-target', 'bad']]);
    assert.match(wrong.report.findings[0].message, /The starting point 'bad' is an object with keys a, not a number\[\] or Float64Array/);
  });

  test('a huge thrown message and stack are cut inside the realm, before they cross to the host', () => {
    const huge = new Error('x'.repeat(5_000_000));
    huge.stack = 'y'.repeat(5_000_000);
    const exports = { objective: () => { throw huge; }, gradient: () => [0, 0] };
    const plan = planFor();
    const report = JSON.parse(run(scopeOf(exports), JSON.stringify(plan))) as PairReport;
    const finding = report.findings.find((f) => f.code === 'runtime-error')!;
    assert.ok(finding.message.length < 2_100, `message of ${finding.message.length} characters`);
    assert.match(finding.message, / … \[cut: \d+ characters in all\]$/);
    assert.ok((finding.stack ?? '').length < 8_100);
  });
});
