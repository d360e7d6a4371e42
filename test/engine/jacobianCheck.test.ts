// The Jacobian kind on the least-squares problems of Moré, Garbow & Hillstrom, "Testing
// Unconstrained Optimization Software", ACM TOMS 7(1), 1981, in residual form at their standard
// starting points: the published Jacobians pass (their entries are cross-checked against
// independent differences in test/support/problems/problems.test.ts), and planted bugs are
// caught with the shape of the error named.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { checkByKind } from '../../server/src/engine/kinds';
import { defaultCheckOptions, type PairReport } from '../../server/src/engine/types';
import { makeArray, moreGarbowHillstromSet, trigonometric, type TestProblem } from '../support/problems';

type Residuals = NonNullable<TestProblem['residuals']>;
type Mutant = (J: number[][], x: ArrayLike<number>) => unknown;

const leastSquares = moreGarbowHillstromSet.filter((p) => p.residuals);

function checkJacobian(p: TestProblem, mutate: Mutant = (J) => J, probes: number[][] = [p.start]): PairReport {
  const model = p.residuals as Residuals;
  return checkByKind.jacobian(
    { objective: (x) => model(x as number[]).r, gradient: (x) => mutate(model(x as number[]).J.map((row) => row.slice()), x as number[]), makeVector: makeArray },
    probes,
    { dimension: null, learningRate: null, options: defaultCheckOptions },
  );
}

describe('Jacobian kind on the Moré–Garbow–Hillstrom residuals', () => {
  test('there are at least ten least-squares problems in residual form', () => {
    assert.ok(leastSquares.length >= 10, `${leastSquares.length}`);
  });

  for (const p of leastSquares) {
    test(`${p.name}: the published Jacobian passes at x0 (no false alarm)`, () => {
      const report = checkJacobian(p);
      assert.notEqual(report.status, 'fail', report.findings.map((f) => f.message).join('\n'));
      assert.notEqual(report.status, 'error', report.findings.map((f) => f.message).join('\n'));
      assert.equal(report.kind, 'jacobian');
      assert.equal(report.matrix?.rows, p.termCount);
      assert.equal(report.matrix?.columns, p.start.length);
    });
  }

  test('most published Jacobians pass outright, not merely without alarm', () => {
    const passed = leastSquares.filter((p) => checkJacobian(p).status === 'pass');
    assert.ok(passed.length >= leastSquares.length - 2, `passed: ${passed.map((p) => p.name).join(', ')}`);
  });
});

describe('planted Jacobian bugs are caught and named', () => {
  const byName = (prefix: string) => leastSquares.find((p) => p.name.startsWith(prefix))!;

  test('two columns swapped (Bard, m = 15, n = 3)', () => {
    const report = checkJacobian(byName('Bard'), (J) => J.map((row) => [row[0], row[2], row[1]]));
    assert.equal(report.status, 'fail');
    assert.deepEqual(report.matrix?.diagnosis, { kind: 'columnSwap', pairs: [[1, 2]] });
    const finding = report.findings.find((f) => f.code === 'jacobian-mismatch')!;
    assert.match(finding.message, /columns swapped \(1 ↔ 2\)/);
    assert.ok(finding.entries && finding.entries.some(([, j]) => j === 1));
  });

  test('a square Jacobian transposed (helical valley, 3 × 3)', () => {
    const report = checkJacobian(byName('helical'), (J) => J[0].map((_, j) => J.map((row) => row[j])));
    assert.deepEqual(report.matrix?.diagnosis, { kind: 'transposed' });
  });

  test('a column with a flipped sign, and a column off by a factor (Meyer)', () => {
    const signed = checkJacobian(byName('Meyer'), (J) => J.map((row) => [row[0], -row[1], row[2]]));
    assert.deepEqual(signed.matrix?.diagnosis, { kind: 'columnFactor', columns: [{ index: 1, factor: -1 }] });
    const scaled = checkJacobian(byName('Meyer'), (J) => J.map((row) => [row[0], row[1], 2 * row[2]]));
    assert.deepEqual(scaled.matrix?.diagnosis, { kind: 'columnFactor', columns: [{ index: 2, factor: 2 }] });
  });

  test('rows shifted by one residual (Kowalik and Osborne, m = 11)', () => {
    const report = checkJacobian(byName('Kowalik'), (J) => [...J.slice(1), J[0]]);
    assert.deepEqual(report.matrix?.diagnosis, { kind: 'rowShift', shift: 1 });
  });

  test('one entry off by 1e-2, 1e-4 and 1e-6 relative (Jennrich and Sampson)', () => {
    for (const size of [1e-2, 1e-4, 1e-6]) {
      const report = checkJacobian(byName('Jennrich'), (J) => {
        J[4][1] *= 1 + size;
        return J;
      });
      assert.equal(report.status, 'fail', `size ${size}: ${report.findings.map((f) => f.message).join('\n')}`);
      assert.deepEqual(report.matrix?.diagnosis, { kind: 'entry', row: 4, column: 1 }, `size ${size}`);
    }
  });

  test('a column wrong in some rows only is named by its column (Brown and Dennis: residuals 5–9, column 3)', () => {
    const report = checkJacobian(byName('Brown and Dennis'), (J) => J.map((row, i) => (i >= 5 && i <= 9 ? [row[0], row[1], row[2], row[3] * 1.1] : row)));
    assert.equal(report.status, 'fail');
    assert.deepEqual(report.matrix?.diagnosis, { kind: 'columns', columns: [3] });
    assert.match(report.findings.find((f) => f.code === 'jacobian-mismatch')!.message, /column 3 wrong, not by one constant factor/);
  });

  test('a column missing a factor that varies by residual (Meyer: the chain rule of column 2 dropped)', () => {
    const meyer = byName('Meyer');
    const report = checkJacobian(meyer, (J, x) => J.map((row, i) => [row[0], row[1], row[2] * (45 + 5 * (i + 1) + x[2]) ** 2]));
    assert.deepEqual(report.matrix?.diagnosis, { kind: 'columns', columns: [2] });
  });

  test('errors confined to a block of rows and columns (Brown and Dennis: residuals 5–9, columns 1–3)', () => {
    const report = checkJacobian(byName('Brown and Dennis'), (J) => J.map((row, i) => (i >= 5 && i <= 9 ? [row[0], row[1] * (1 + i / 10), row[2] * (1 - i / 20), row[3] * 1.1] : row)));
    assert.deepEqual(report.matrix?.diagnosis, { kind: 'region', rows: [5, 9], columns: [1, 3] });
    assert.match(report.findings.find((f) => f.code === 'jacobian-mismatch')!.message, /confined to rows 5–9, columns 1–3/);
  });
});

describe('bad Jacobian shapes are findings that name both shapes', () => {
  const bard = leastSquares.find((p) => p.name.startsWith('Bard'))!;
  const shapeMessage = (mutate: Mutant) => {
    const report = checkJacobian(bard, mutate);
    assert.equal(report.status, 'error');
    return report.findings.find((f) => f.code === 'matrix-wrong-shape' || f.code === 'non-finite-value')!;
  };

  test('n × m is reported as transposed', () => {
    const finding = shapeMessage((J) => J[0].map((_, j) => J.map((row) => row[j])));
    assert.equal(finding.code, 'matrix-wrong-shape');
    assert.match(finding.message, /3 × 15.*must be 15 × 3.*transposed/);
  });

  test('one row missing', () => {
    assert.match(shapeMessage((J) => J.slice(1)).message, /14 × 3.*must be 15 × 3/);
  });

  test('ragged rows name the row', () => {
    assert.match(shapeMessage((J) => J.map((row, i) => (i === 7 ? row.slice(0, 2) : row))).message, /ragged rows.*row 7 has 2/);
  });

  test('NaN entries are named', () => {
    const finding = shapeMessage((J) => J.map((row, i) => (i === 2 ? [row[0], Number.NaN, row[2]] : row)));
    assert.equal(finding.code, 'non-finite-value');
    assert.deepEqual(finding.entries, [[2, 1]]);
  });

  test('a flat row-major Float64Array of m·n values is read as the matrix', () => {
    const report = checkJacobian(bard, (J) => Float64Array.from(J.flat()));
    assert.equal(report.status, 'pass', report.findings.map((f) => f.message).join('\n'));
  });

  test('a flat array of the wrong length says how many it must hold', () => {
    assert.match(shapeMessage((J) => Float64Array.from(J.flat().slice(3))).message, /flat array of 42 numbers.*holds 45/);
  });

  test('an object stating its shape is read by it', () => {
    const report = checkJacobian(bard, (J) => ({ rows: 15, cols: 3, data: J.flat() }));
    assert.equal(report.status, 'pass');
  });
});

describe('a gradient pair built from residuals is compared with Jᵀr', () => {
  // MGH state every problem as f = Σ rᵢ² (‖r‖²), whose gradient is 2Jᵀr (Moré, Garbow & Hillstrom 1981, §2).
  const bard = leastSquares.find((p) => p.name.startsWith('Bard'))!;
  const model = bard.residuals as Residuals;
  const residualFunctions = { objective: (x: unknown) => model(x as number[]).r, gradient: (x: unknown) => model(x as number[]).J, makeVector: makeArray };
  const jtr = (x: number[]) => {
    const { r, J } = model(x);
    return x.map((_, j) => r.reduce((sum, ri, i) => sum + J[i][j] * ri, 0));
  };
  const run = (f: (x: number[]) => number, g: (x: number[]) => number[]) =>
    checkByKind.gradient({ objective: (x) => f(x as number[]), gradient: (x) => g(x as number[]), makeVector: makeArray, residuals: residualFunctions }, [bard.start], { dimension: null, learningRate: null, options: defaultCheckOptions });

  test('‖r‖² with 2Jᵀr: consistent, no finding', () => {
    const report = run(bard.f, bard.g);
    assert.deepEqual(report.leastSquaresForm, { probeIndex: 0, objective: 'full', gradient: 'full' });
    assert.equal(report.findings.filter((f) => f.code === 'least-squares-inconsistent').length, 0);
  });

  test('½‖r‖² with Jᵀr: consistent', () => {
    const report = run((x) => bard.f(x) / 2, jtr);
    assert.deepEqual(report.leastSquaresForm, { probeIndex: 0, objective: 'half', gradient: 'half' });
    assert.equal(report.status, 'pass');
  });

  test('‖r‖² with Jᵀr: the finding names both forms', () => {
    const report = run(bard.f, jtr);
    const finding = report.findings.find((f) => f.code === 'least-squares-inconsistent')!;
    assert.match(finding.message, /is ‖r‖² .* so its gradient is 2Jᵀr; the gradient returns Jᵀr/);
  });

  test('½‖r‖² with 2Jᵀr: the finding names both forms', () => {
    const report = run((x) => bard.f(x) / 2, bard.g);
    assert.match(report.findings.find((f) => f.code === 'least-squares-inconsistent')!.message, /is ½‖r‖² .* so its gradient is Jᵀr; the gradient returns 2Jᵀr/);
  });

  test('an objective that is not a sum of these squares is left alone', () => {
    const report = run((x) => bard.f(x) + x[0] * x[0], (x) => bard.g(x).map((v, j) => v + (j === 0 ? 2 * x[0] : 0)));
    assert.equal(report.leastSquaresForm?.objective, null);
    assert.equal(report.findings.filter((f) => f.code === 'least-squares-inconsistent').length, 0);
  });
});

describe('large Jacobians: random directions, then the wrong columns located', () => {
  // Trigonometric (MGH 26) at n = 100: a dense 100 × 100 Jacobian.
  const p = trigonometric(100);

  test('the exact Jacobian passes in directional mode', () => {
    const report = checkJacobian(p);
    assert.equal(report.status, 'pass', report.findings.map((f) => f.message).join('\n'));
    assert.equal(report.probes[0].mode, 'directional');
  });

  test('one wrong entry is located by pooled directions and named', () => {
    const report = checkJacobian(p, (J) => {
      J[62][63] *= 1.01;
      return J;
    });
    assert.equal(report.status, 'fail');
    const finding = report.findings.find((f) => f.code === 'jacobian-mismatch')!;
    assert.deepEqual(finding.entries, [[62, 63]]);
    assert.deepEqual(report.matrix?.diagnosis, { kind: 'entry', row: 62, column: 63 });
    const located = report.probes[0].localisation!;
    assert.equal(located.incomplete, false);
    // Group testing: far fewer column differences than the 100 a full check takes.
    assert.ok(located.coordinateDifferences + located.pooledDifferences < 40, JSON.stringify(located));
  });
});

describe('a slow residual function within the time budget', () => {
  // Box three-dimensional (MGH 12) padded to n = 20 with residuals 0.1·(xⱼ − 1) (m = 30): each
  // residual call costs 50 ms on a clock that the calls advance, so the time is calls × cost.
  const box = leastSquares.find((p) => p.name.startsWith('box'))!;
  const n = 20;
  const padded = (x: ArrayLike<number>) => {
    const head = box.residuals!(Array.from(x).slice(0, 3));
    const r = [...head.r, ...Array.from({ length: n - 3 }, (_, k) => 0.1 * (x[k + 3] - 1))];
    const J = [...head.J.map((row) => [...row, ...new Array(n - 3).fill(0)]), ...Array.from({ length: n - 3 }, (_, k) => Array.from({ length: n }, (__, j) => (j === k + 3 ? 0.1 : 0)))];
    return { r, J };
  };
  const run = (costMs: number, wrong: boolean) => {
    const clock = { now: 0 };
    const start = [...box.start, ...new Array(n - 3).fill(0.5)];
    return checkByKind.jacobian(
      {
        objective: (x) => {
          clock.now += costMs;
          return padded(x).r;
        },
        gradient: (x) => {
          const { J } = padded(x);
          if (wrong) J[1][2] *= 1.5;
          return J;
        },
        makeVector: makeArray,
      },
      [],
      { dimension: null, learningRate: null, options: defaultCheckOptions, startPoint: start, endsAt: 10_000 },
      () => clock.now,
    );
  };

  test('50 ms per call: a verdict within 10 s, by random directions when the columns would not fit', () => {
    const correct = run(50, false);
    assert.equal(correct.status, 'pass', correct.findings.map((f) => f.message).join('\n'));
    assert.equal(correct.probes[0].mode, 'directional');
    const wrong = run(50, true);
    assert.equal(wrong.status, 'fail', wrong.findings.map((f) => f.message).join('\n'));
    assert.deepEqual(wrong.findings.find((f) => f.code === 'jacobian-mismatch')?.entries, [[1, 2]]);
  });

  test('fast calls: every column', () => {
    const report = run(0.01, false);
    assert.equal(report.status, 'pass');
    assert.equal(report.probes[0].mode, 'full');
  });
});

test('two residuals written in each other\'s place: rows swapped (Rosenbrock, m = 2)', () => {
  const rosenbrock = leastSquares.find((p) => p.name.startsWith('Rosenbrock'))!;
  const report = checkJacobian(rosenbrock, (J) => [J[1], J[0]]);
  assert.deepEqual(report.matrix?.diagnosis, { kind: 'rowSwap', pairs: [[0, 1]] });
  assert.match(report.findings.find((f) => f.code === 'jacobian-mismatch')!.message, /rows swapped \(residuals 0 ↔ 1\)/);
});

test('a tall Jacobian (20 000 residuals × 50) is checked along random directions and its wrong entry located', () => {
  // Invented: a sinusoidal series of 50 coefficients sampled at 20 000 points (no external source: the truth is the construction).
  const [m, n] = [20_000, 50];
  const t = Array.from({ length: m }, (_, i) => i / m);
  const series = (p: ArrayLike<number>, ti: number) => {
    let s = 0;
    for (let j = 0; j < n; j++) s += p[j] * Math.cos(j * ti);
    return s;
  };
  const report = checkByKind.jacobian(
    {
      objective: (p) => t.map((ti) => Math.sin(series(p as number[], ti)) - 0.3),
      gradient: (p) => t.map((ti, i) => Array.from({ length: n }, (_, j) => Math.cos(series(p as number[], ti)) * Math.cos(j * ti) * (i === 7 && j === 3 ? 1.01 : 1))),
      makeVector: makeArray,
    },
    [Array.from({ length: n }, (_, j) => 0.01 * j)],
    { dimension: null, learningRate: null, options: defaultCheckOptions },
  );
  assert.equal(report.probes[0].mode, 'directional');
  assert.deepEqual(report.matrix?.diagnosis, { kind: 'entry', row: 7, column: 3 });
  // The report stays small: only the located column's wrong and undecided entries are kept.
  assert.ok(JSON.stringify(report).length < 100_000);
});

test('only the edge row wrong, the other rows alike, is one wrong row, not a shift', () => {
  // Powell singular (MGH 13) has four rows; its last row doubled, nothing else changed.
  const powell = leastSquares.find((p) => p.name.startsWith('Powell singular'))!;
  const report = checkJacobian(powell, (J) => [J[0], J[1], J[2], J[3].map((v) => 2 * v)]);
  assert.notEqual(report.matrix?.diagnosis?.kind, 'rowShift');
});
