// The host's check of reports from the sandbox: real reports pass unchanged, anything that is
// not a PairReport is refused with the place it went wrong, and what could be huge is capped.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { checkPair } from '../../server/src/engine/checkPair';
import { checkByKind } from '../../server/src/engine/kinds';
import { defaultCheckOptions, type Finding, type PairReport } from '../../server/src/engine/types';
import { errorReport, timeoutFinding } from '../../server/src/sandbox/reports';
import { reportLimits, validateConsole, validateReport } from '../../server/src/sandbox/validateReport';

type Vector = ArrayLike<number>;
const check = (objective: (x: Vector) => number, gradient: (x: Vector) => unknown, probes: number[][], rate: number | null = null) =>
  checkPair(
    { objective, gradient, makeVector: (values) => Array.from(values) },
    probes,
    { dimension: null, learningRate: rate === null ? null : { name: 'lr', value: rate, momentum: { name: 'beta', value: 0.9 } }, options: { ...defaultCheckOptions } },
  );

// f(x) = x0² + 10·x1², ∇f = (2·x0, 20·x1), Hessian diag(2, 20), all by hand.
const bowl = (x: Vector) => x[0] ** 2 + 10 * x[1] ** 2;
const probes = [[1, -0.5], [0.3, 2]];
// f(x) = ½ Σ (i+1)·xᵢ² over 80 coordinates, ∇f = ((i+1)·xᵢ): above the 64 of a full check, so directions are checked.
const wide = (x: Vector) => Array.from(x).reduce((sum, v, i) => sum + 0.5 * (i + 1) * v * v, 0);
const wideGradient = (x: Vector) => Array.from(x, (v, i) => (i + 1) * v);

/** Real reports of the engine, as they cross the process boundary (JSON: NaN and ±Infinity become null). */
const realReports: Record<string, PairReport> = {
  'passing, with a learning rate and smoothness': check(bowl, (x) => [2 * x[0], 20 * x[1]], probes, 0.08),
  'sign flipped': check(bowl, (x) => [-2 * x[0], -20 * x[1]], probes),
  'components swapped': check(bowl, (x) => [20 * x[1], 2 * x[0]], probes),
  'one component wrong': check(bowl, (x) => [2 * x[0], 40 * x[1]], probes),
  'NaN in the gradient': check(bowl, () => [NaN, 1], probes),
  'the gradient throws': check(bowl, () => { throw new RangeError('no gradient today'); }, probes),
  'directional check at n = 80': check(wide, wideGradient, [Array.from({ length: 80 }, (_, i) => Math.sin(i + 1))]),
  'a timeout': errorReport([timeoutFinding(5000)], 5000),
  // Linear residuals r = (2x₀ + x₁, x₀ + 20x₁), Jacobian [[2, 1], [1, 20]] by hand: right, and with column 1 doubled.
  'a Jacobian that holds': checkByKind.jacobian({ objective: (x) => [2 * x[0] + x[1], x[0] + 20 * x[1]], gradient: () => [[2, 1], [1, 20]], makeVector: (v) => Array.from(v) }, probes, { dimension: null, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } }),
  'a Jacobian with a column doubled': checkByKind.jacobian({ objective: (x) => [2 * x[0] + x[1], x[0] + 20 * x[1]], gradient: () => [[2, 2], [1, 40]], makeVector: (v) => Array.from(v) }, probes, { dimension: null, learningRate: null, options: defaultCheckOptions }),
};
const overJson = (report: unknown) => JSON.parse(JSON.stringify(report));

/** The validated report, or a failed assertion with the problem found. */
function accepted(value: unknown): PairReport {
  const result = validateReport(value);
  assert.ok('report' in result, 'problem' in result ? result.problem : '');
  return result.report;
}

function refused(value: unknown, where: RegExp): string {
  const result = validateReport(value);
  assert.ok('problem' in result, 'expected a problem');
  assert.match(result.problem, where);
  return result.problem;
}

/** A copy of a real report with `change` applied, as it would arrive over IPC. */
function altered(change: (report: any) => void, base: PairReport = realReports['one component wrong']): unknown {
  const report = overJson(base);
  change(report);
  return report;
}

describe('real reports pass unchanged', () => {
  test('the engine produced what these cases need (sanity of the input)', () => {
    const kinds = Object.values(realReports).map((r) => r.diagnosis?.kind ?? null);
    assert.ok(kinds.includes('sign') && kinds.includes('permutation') && kinds.includes('subset'), JSON.stringify(kinds));
    assert.equal(realReports['passing, with a learning rate and smoothness'].learningRate?.status, 'aggressive');
    assert.equal(realReports['directional check at n = 80'].probes[0].mode, 'directional');
    assert.ok(realReports['the gradient throws'].findings.some((f) => f.stack), 'a stack to carry');
  });

  for (const [name, report] of Object.entries(realReports)) {
    test(name, () => {
      const crossed = overJson(report);
      const validated = accepted(crossed);
      assert.deepEqual(validated, crossed);
      assert.notEqual(validated, crossed, 'a fresh object');
      assert.notEqual(validated.findings, crossed.findings);
      if (validated.probes.length) assert.notEqual(validated.probes[0], crossed.probes[0]);
    });
  }

  test('non-finite numbers of an in-process report become null, as JSON makes them', () => {
    const report = structuredClone(realReports['passing, with a learning rate and smoothness']);
    report.probes[0].value = Infinity;
    report.maxRelError = NaN;
    const validated = accepted(report);
    assert.equal(validated.probes[0].value, null);
    assert.equal(validated.maxRelError, null);
  });
});

describe('malformed reports are refused, saying where', () => {
  test('not an object at all', () => {
    for (const value of [null, undefined, 'report', 42, [], () => 1]) refused(value, /^report is/);
  });

  test('a null finding', () => {
    refused(altered((r) => r.findings.push(null)), /report\.findings\[\d+\] is null, not an object/);
  });

  test('a status of "__proto__" and other words outside the enum', () => {
    for (const status of ['__proto__', 'constructor', 'toString', 'PASS', '']) {
      refused(altered((r) => (r.status = status)), /report\.status is a text of \d+ characters, not one of pass, fail, inconclusive, error/);
    }
    // JSON.parse makes "__proto__" an own key; the status it names is still not a status.
    refused(JSON.parse(JSON.stringify(overJson(realReports['a timeout'])).replace('"status":"error"', '"status":"__proto__"')), /report\.status/);
  });

  test('a status that is an object', () => {
    refused(altered((r) => (r.status = { toString: 'pass' })), /report\.status is an object/);
  });

  test('other enum fields: severity, code, subject, mode, label, kind, rate status', () => {
    refused(altered((r) => (r.findings[0].severity = 'fatal')), /report\.findings\[0\]\.severity/);
    refused(altered((r) => (r.findings[0].code = 'gradient-mismatch<script>')), /report\.findings\[0\]\.code/);
    refused(altered((r) => (r.findings[0].subject = 'everything')), /report\.findings\[0\]\.subject/);
    refused(altered((r) => (r.probes[0].mode = 'partial')), /report\.probes\[0\]\.mode/);
    refused(altered((r) => (r.diagnosis = { kind: 'factor' })), /report\.diagnosis\.factor is missing/);
    refused(altered((r) => (r.diagnosis = { kind: 'guess' })), /report\.diagnosis\.kind/);
    const rated = realReports['passing, with a learning rate and smoothness'];
    refused(altered((r) => (r.learningRate.status = 'fine'), rated), /report\.learningRate\.status/);
    refused(altered((r) => (r.probes[0].descent[0].label = 'other'), rated), /report\.probes\[0\]\.descent\[0\]\.label/);
  });

  test('numbers as strings', () => {
    refused(altered((r) => (r.maxRelError = '0.5')), /report\.maxRelError is a text of 3 characters, not a finite number/);
    refused(altered((r) => (r.evaluations.objective = '12')), /report\.evaluations\.objective/);
    refused(altered((r) => (r.probes[0].components[0].index = '0')), /report\.probes\[0\]\.components\[0\]\.index/);
    refused(altered((r) => (r.findings[0].probeIndex = '0')), /report\.findings\[0\]\.probeIndex/);
    refused(altered((r) => (r.elapsedMs = '10')), /report\.elapsedMs/);
  });

  test('counts that are not counts, and required fields that are missing', () => {
    refused(altered((r) => (r.dimension = -2)), /report\.dimension is the number -2, not a count/);
    refused(altered((r) => (r.probes[0].dimension = 1.5)), /report\.probes\[0\]\.dimension/);
    refused(altered((r) => (r.elapsedMs = -1)), /report\.elapsedMs is negative/);
    refused(altered((r) => delete r.evaluations), /report\.evaluations is missing/);
    refused(altered((r) => delete r.findings[0].message), /report\.findings\[0\]\.message is missing/);
    refused(altered((r) => (r.probes[0].components[0].mismatch = 'yes')), /mismatch is a text/);
    refused(altered((r) => (r.diagnosis = { kind: 'permutation', pairs: [[0, 1, 2]] })), /report\.diagnosis\.pairs\[0\] is a list, not a pair/);
  });

  test('fields inherited from a prototype do not count', () => {
    const inherited = Object.create(overJson(realReports['a timeout']));
    refused(inherited, /report\.status is missing/);
    refused(Object.create({ status: 'pass' }), /report\.status is missing/);
    refused(altered((r) => (r.findings[0] = Object.create({ code: 'timeout', severity: 'error', message: 'x', subject: 'objective' }))), /report\.findings\[0\]\.code is missing/);
  });

  test('an accessor is never called: it counts as missing', () => {
    let calls = 0;
    const report = altered(() => {}) as Record<string, unknown>;
    Object.defineProperty(report, 'status', { enumerable: true, get: () => (calls++, 'pass') });
    refused(report, /report\.status is missing/);
    assert.equal(calls, 0);
  });

  test('a value whose every read throws (a Proxy) still gives a problem', () => {
    const trap = () => {
      throw new Error('trap');
    };
    refused(new Proxy({}, { getOwnPropertyDescriptor: trap, get: trap, ownKeys: trap }), /could not be read/);
  });
});

describe('what is not part of a PairReport is dropped', () => {
  test('unknown fields, at every level, and a location the host did not map', () => {
    const base = realReports['one component wrong'];
    const validated = accepted(
      altered((r) => {
        r.extra = 'x';
        r.evaluations.extra = 1;
        r.probes[0].extra = [1];
        r.findings[0].extra = { nested: true };
        r.findings[0].location = { file: '/etc/passwd', line: 1, column: 1 };
      }, base),
    );
    assert.deepEqual(validated, overJson(base));
  });
});

describe('caps', () => {
  const huge = 'x'.repeat(38_000_000);
  // A one-off read flattens the repeated string, so the timing below is the validator's alone.
  assert.equal(huge.charCodeAt(huge.length - 1), 120);

  test('fifteen 38 MB messages and stacks are cut at once, with a marker, and the report serialises small', () => {
    const report = altered((r) => {
      r.findings = Array.from({ length: 15 }, (_, i): Finding => ({ code: 'runtime-error', severity: 'error', subject: 'objective', message: huge, stack: huge, probeIndex: i }));
    });
    const started = performance.now();
    const validated = accepted(report);
    const elapsed = performance.now() - started;
    // Reading or copying 15 × 38 MB twice (about a gigabyte) takes far longer than this on any machine we run.
    assert.ok(elapsed < 250, `${elapsed} ms`);
    assert.equal(validated.findings.length, 15);
    for (const finding of validated.findings) {
      assert.ok(finding.message.length <= reportLimits.messageLength, `${finding.message.length}`);
      assert.match(finding.message, /^x+ … \[cut: 38000000 characters in all\]$/);
      assert.ok(finding.stack!.length <= reportLimits.stackLength && finding.stack!.length > reportLimits.messageLength);
    }
    assert.ok(JSON.stringify(validated).length < 200_000);
  });

  test('a cut never splits a surrogate pair', () => {
    for (const emoji of ['😀'.repeat(5000), `a${'😀'.repeat(5000)}`]) {
      const [finding] = accepted(altered((r) => (r.findings = [{ code: 'timeout', severity: 'info', subject: 'objective', message: emoji }]))).findings;
      assert.doesNotMatch(finding.message, /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/);
    }
  });

  test('findings: the most severe are kept, in their order', () => {
    const severities = ['info', 'warning', 'error', 'info'] as const;
    const many: Finding[] = Array.from({ length: 400 }, (_, i) => ({ code: 'timeout', severity: severities[i % 4], subject: 'objective', message: `finding ${i}`, probeIndex: i }));
    const validated = accepted(altered((r) => (r.findings = many)));
    assert.equal(validated.findings.length, reportLimits.findings);
    // 100 errors and 100 warnings among the 400: the first 50 errors, by position.
    assert.deepEqual(validated.findings.map((f) => f.probeIndex), Array.from({ length: 50 }, (_, k) => 4 * k + 2));
    const fewErrors = many.map((f, i) => ({ ...f, severity: i === 399 ? 'error' : f.severity === 'error' ? 'info' : f.severity }));
    const kept = accepted(altered((r) => (r.findings = fewErrors))).findings;
    assert.equal(kept.at(-1)?.probeIndex, 399, 'the one error, last of all, is kept');
    assert.deepEqual(kept.slice(0, -1).map((f) => f.severity), Array(49).fill('warning'));
  });

  test('a malformed finding is not trimmed away with the tail of a long list', () => {
    const many = Array.from({ length: 300 }, () => ({ code: 'timeout', severity: 'error', subject: 'objective', message: 'm' }));
    refused(altered((r) => (r.findings = [...many, null])), /report\.findings\[300\] is null/);
  });

  test('components: mismatched ones are kept first; a list a hundred times the cap is refused', () => {
    const component = { index: 0, analytic: 1, numerical: 1, errorBound: 1e-9, relError: 0, mismatch: false };
    const components = Array.from({ length: 5000 }, (_, index) => ({ ...component, index, mismatch: index >= 4997 }));
    const [probe] = accepted(altered((r) => (r.probes = [{ ...r.probes[0], components }]))).probes;
    assert.equal(probe.components.length, reportLimits.components);
    assert.deepEqual(probe.components.filter((c) => c.mismatch).map((c) => c.index), [4997, 4998, 4999]);
    const tooMany = new Array(100 * reportLimits.components + 1).fill(component);
    refused(altered((r) => (r.probes = [{ ...r.probes[0], components: tooMany }])), /components has 100001 entries/);
  });

  test('probes, numbers and descent values keep their first entries', () => {
    const rated = overJson(realReports['passing, with a learning rate and smoothness']);
    const probe = rated.probes[0];
    probe.point = Array.from({ length: 5000 }, (_, i) => i);
    probe.descent[0].values = Array.from({ length: 5000 }, (_, i) => i);
    const validated = accepted({ ...rated, probes: Array(500).fill(probe) });
    assert.equal(validated.probes.length, reportLimits.probes);
    assert.deepEqual(validated.probes[0].point, Array.from({ length: reportLimits.numbers }, (_, i) => i));
    assert.equal(validated.probes[0].descent[0].values.length, reportLimits.numbers);
  });

  test('the whole report: within every other cap, still too large as JSON', () => {
    const component = { index: 123456, analytic: 1.2345678901234567, numerical: 1.2345678901234567, errorBound: 1.2345678901234567e-9, relError: 1.2345678901234567e-12, mismatch: false };
    const components = Array(reportLimits.components).fill(component);
    const problem = refused(altered((r) => (r.probes = Array(reportLimits.probes).fill({ ...r.probes[0], components }))), /characters of JSON, more than the 8388608 allowed/);
    assert.match(problem, /^the report is \d+ characters/);
  });
});

describe('validateConsole', () => {
  test('strings only; anything but a list gives no lines', () => {
    assert.deepEqual(validateConsole(['a', 1, null, { line: 'b' }, 'c']), ['a', 'c']);
    for (const value of [null, 'line', { 0: 'a', length: 1 }, undefined]) assert.deepEqual(validateConsole(value), []);
  });

  test('a short console passes unchanged', () => {
    const lines = Array.from({ length: 10 }, (_, i) => `step ${i}: loss ${1 / (i + 1)}`);
    assert.deepEqual(validateConsole(lines), lines);
  });

  test('lines, their length and their total are capped, and the last line says so', () => {
    const many = validateConsole(Array.from({ length: 100_000 }, (_, i) => `line ${i}`));
    assert.equal(many.length, reportLimits.consoleLines);
    assert.equal(many.at(-2), `line ${reportLimits.consoleLines - 2}`);
    assert.match(many.at(-1)!, /console output cut: 100000 lines in all/);
    const long = validateConsole(['x'.repeat(38_000_000), 'after']);
    assert.ok(long[0].length <= reportLimits.consoleLineLength);
    assert.match(long[0], /cut: 38000000 characters in all/);
    assert.equal(long[1], 'after');
    const total = validateConsole(Array(100).fill('y'.repeat(1500)));
    assert.ok(total.reduce((sum, line) => sum + line.length, 0) <= reportLimits.consoleLength + 100);
    assert.match(total.at(-1)!, /console output cut/);
  });
});

describe('the matrix kinds\' fields', () => {
  test('a Jacobian\'s report passes with its matrix summary and entries, and a finding keeps its entries', () => {
    const report = accepted(overJson(realReports['a Jacobian with a column doubled']));
    assert.equal(report.kind, 'jacobian');
    assert.deepEqual(report.matrix?.diagnosis, { kind: 'columnFactor', columns: [{ index: 1, factor: 2 }] });
    assert.ok(report.probes[0].entries!.some((e) => e.mismatch && e.row === 1 && e.column === 1));
    assert.deepEqual(report.findings.find((f) => f.code === 'jacobian-mismatch')?.entries, [[0, 1], [1, 1]]);
    assert.ok(accepted(overJson(realReports['a Jacobian that holds'])).matrix?.leastSquares);
  });

  test('a kind, a matrix diagnosis or an entry that is not what the types allow is refused', () => {
    refused(altered((r) => (r.kind = 'laplacian'), realReports['a Jacobian that holds']), /report\.kind/);
    refused(altered((r) => (r.matrix.diagnosis = { kind: 'columnFactor', columns: [{ index: -1, factor: 2 }] }), realReports['a Jacobian with a column doubled']), /report\.matrix\.diagnosis/);
    refused(altered((r) => (r.probes[0].entries[0].row = 'one'), realReports['a Jacobian with a column doubled']), /entries\[0\]\.row/);
    refused(altered((r) => (r.leastSquaresForm = { probeIndex: 0, objective: 'double', gradient: null })), /leastSquaresForm\.objective/);
  });
});
