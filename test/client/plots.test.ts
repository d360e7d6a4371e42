// The report's plots: well-formed SVG with titles and axis labels, marks at the
// right coordinates (checked against tick positions), degenerate data handled.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { descentPlot, eigenvaluePlot, gradientPlot, stepErrorPlot, worstProbeIndex } from '../../client/src/report/plots';
import { checkPair } from '../../server/src/engine/checkPair';
import { defaultCheckOptions, type DescentRun, type ProbeReport } from '../../server/src/engine/types';
import { component, expStepStudy, probe, quadraticDescent } from './fixtures';
import { byClass, byName, descendants, expectedPosition, parseXml, textOf, ticks, type XmlElement } from './xml';

/** Every plot must parse, carry a title, a description and its data-plot name, and never print NaN. */
function wellFormed(svg: string, plot: string): XmlElement {
  assert.doesNotMatch(svg, /undefined|\[object/, 'no missing value leaks into the SVG');
  const root = parseXml(svg);
  for (const element of [root, ...descendants(root)]) {
    for (const [name, value] of Object.entries(element.attributes)) {
      assert.doesNotMatch(value, /NaN|Infinity/, `<${element.name} ${name}="${value}">: coordinates and data stay finite`);
    }
  }
  assert.equal(root.name, 'svg');
  assert.equal(root.attributes['data-plot'], plot);
  assert.equal(root.attributes.class, 'plot');
  assert.ok(textOf(byName(root, 'title')[0]).length > 10, 'has a title');
  assert.equal(byName(root, 'desc').length, 1, 'has a description');
  return root;
}

function axisLabels(root: XmlElement): string[] {
  return byClass(root, 'axis-label').map(textOf);
}

const near = (actual: number, expected: number, tolerance = 0.02) =>
  assert.ok(Math.abs(actual - expected) <= tolerance, `${actual} ≠ ${expected}`);

// Exactly the double nearest 10^k, as the tick label claims.
const isPowerOfTen = (v: number) => v === Number(`1e${Math.round(Math.log10(v))}`);

describe('gradient plot', () => {
  // ∇ of f(x) = x0² + 3·x1 + sin(x2) at (1, 2, 0) is (2, 3, 1) (by hand); component 1 is given with its sign flipped.
  const report = probe({
    components: [component(0, 2, 2.0000000001, 1e-9), component(1, -3, 3, 2e-9, true), component(2, 1, 1, 1e-10)],
    maxRelError: 2,
  });
  const root = wellFormed(gradientPlot(report, 0), 'gradient');

  test('axes are labelled and ticks are named by component', () => {
    assert.deepEqual(axisLabels(root), ['component i', '∂f/∂xᵢ']);
    assert.deepEqual(byClass(root, 'x-tick').map(textOf), ['0', '1', '2']);
  });

  test('one error bar per component, spanning numerical ± bound', () => {
    const bars = byClass(root, 'error-bar');
    assert.equal(bars.length, 3);
    // Component 1: numerical 3 ± 2e-9 — the bar's ends sit at y(3) within a pixel's fraction.
    const main = bars[1].children[0];
    near(Number(main.attributes.y1), expectedPosition(root, 'y', 3 + 2e-9, false));
    near(Number(main.attributes.y2), expectedPosition(root, 'y', 3 - 2e-9, false));
  });

  test('analytic and numerical marks sit at their values', () => {
    const analytic = byClass(root, 'analytic').filter((e) => e.name === 'circle');
    assert.deepEqual(
      analytic.map((c) => Number(c.attributes.cy)).map((y, i) => Math.abs(y - expectedPosition(root, 'y', [2, -3, 1][i], false)) < 0.02),
      [true, true, true],
    );
    const numerical = byClass(root, 'numerical').filter((e) => e.name === 'rect');
    assert.equal(numerical.length, 3);
    near(Number(numerical[1].attributes.y) + 3, expectedPosition(root, 'y', 3, false));
  });

  test('only the mismatched component is marked', () => {
    const marked = byClass(root, 'component').filter((g) => g.attributes.class.includes('mismatch'));
    assert.deepEqual(marked.map((g) => g.attributes['data-index']), ['1']);
    assert.equal(byClass(root, 'mismatch-band').length, 1);
    assert.match(textOf(byName(root, 'desc')[0]), /mismatch at component 1/);
  });

  test('directional mode plots the random directions', () => {
    const directional = probe({
      mode: 'directional',
      directions: [
        { analytic: 1.5, numerical: 1.5, errorBound: 1e-8, mismatch: false },
        { analytic: -2, numerical: 4, errorBound: 1e-8, mismatch: true },
      ],
    });
    const svg = wellFormed(gradientPlot(directional, 2), 'gradient');
    assert.equal(axisLabels(svg)[0], 'random direction');
    assert.deepEqual(byClass(svg, 'x-tick').map(textOf), ['1', '2']);
    assert.deepEqual(byClass(svg, 'component').filter((g) => g.attributes.class.includes('mismatch')).map((g) => g.attributes['data-index']), ['1']);
  });
});

describe('step-error plot', () => {
  const study = expStepStudy();
  const root = wellFormed(stepErrorPlot(study), 'step-error');

  test('both axes are logarithmic with ticks at powers of ten', () => {
    assert.deepEqual(axisLabels(root), ['step h', '|error|']);
    for (const axis of ['x', 'y'] as const) {
      const values = ticks(root, axis).map((t) => t.value);
      assert.ok(values.length >= 3, `${axis} has ticks`);
      assert.ok(values.every(isPowerOfTen), `${axis} ticks ${values}`);
    }
    const xs = ticks(root, 'x').map((t) => t.value);
    assert.ok(Math.min(...xs) <= 1e-12 && Math.max(...xs) >= 0.1, 'x axis covers every step');
  });

  test('the error curve has its V shape: smallest error near ε^(1/3)', () => {
    // Nocedal & Wright 2006, §8.1: the optimal central-difference step is of order ε^(1/3) ≈ 6e-6.
    const points = byClass(root, 'step-point');
    assert.equal(points.length, 12);
    const best = points.reduce((a, b) => (Number(a.attributes['data-error']) < Number(b.attributes['data-error']) ? a : b));
    const bestStep = Number(best.attributes['data-step']);
    assert.ok(bestStep >= 1e-7 && bestStep <= 1e-4, `best step ${bestStep}`);
    // On log–log axes the lowest error is the lowest point (largest SVG y).
    assert.equal(Math.max(...points.map((p) => Number(p.attributes.cy))), Number(best.attributes.cy));
  });

  test('the chosen step is marked at its x on the log axis', () => {
    const [marker] = byClass(root, 'chosen-step').filter((e) => e.name === 'g');
    assert.equal(Number(marker.attributes['data-step']), 1e-5);
    const line = byName(marker, 'line')[0];
    near(Number(line.attributes.x1), expectedPosition(root, 'x', 1e-5, true));
    assert.equal(line.attributes.x1, line.attributes.x2, 'vertical');
  });

  test('zero errors are left out and said so; no study gives an empty plot', () => {
    const withZero = { ...study, errors: study.errors.map((e, i) => (i === 4 ? 0 : e)) };
    const svg = wellFormed(stepErrorPlot(withZero), 'step-error');
    assert.equal(byClass(svg, 'step-point').length, 11);
    assert.match(textOf(byName(svg, 'desc')[0]), /1 with zero or missing error not shown/);
    const empty = wellFormed(stepErrorPlot(null), 'step-error');
    assert.equal(byClass(empty, 'empty-note').length, 1);
    const allZero = wellFormed(stepErrorPlot({ ...study, errors: study.errors.map(() => 0) }), 'step-error');
    assert.equal(byClass(allZero, 'empty-note').length, 1);
  });
});

describe('eigenvalue plot on a quadratic with known Hessian', () => {
  // f(x) = ½ Σ aᵢ xᵢ² with a = (1, 10, 100): the Hessian is diag(a), so its eigenvalues are 1, 10 and 100
  // and L = 100 exactly (a diagonal matrix's eigenvalues are its diagonal; any linear-algebra text).
  const a = [1, 10, 100];
  const report = checkPair(
    {
      objective: (x) => 0.5 * a.reduce((s, ai, i) => s + ai * (x[i] as number) ** 2, 0),
      gradient: (x) => a.map((ai, i) => ai * (x[i] as number)),
      makeVector: (values) => Array.from(values),
    },
    [
      [1, -2, 0.5],
      [0.3, 0.7, -1.1],
    ],
    { dimension: null, learningRate: null, options: { ...defaultCheckOptions, smoothness: true } },
  );
  const root = wellFormed(eigenvaluePlot(report.probes, report.smoothness), 'eigenvalues');

  test('the engine found the eigenvalues (sanity of the input)', () => {
    assert.ok(report.smoothness && Math.abs(report.smoothness.lipschitz - 100) < 1e-3, JSON.stringify(report.smoothness));
  });

  test('Ritz values are drawn per probe on a log axis, L̂ and μ̂ lines at their values', () => {
    const dots = byClass(root, 'ritz').filter((e) => e.name === 'circle');
    assert.ok(dots.length >= 3, `${dots.length} Ritz values`);
    // The curvature is measured at the first probe only.
    assert.deepEqual([...new Set(dots.map((d) => d.attributes['data-probe']))], ['0']);
    assert.ok(ticks(root, 'y').every((t) => isPowerOfTen(t.value)), 'log axis: eigenvalues span two decades');
    const [lipschitz] = byClass(root, 'lipschitz-line').filter((e) => e.name === 'g');
    near(Number(byName(lipschitz, 'line')[0].attributes.y1), expectedPosition(root, 'y', report.smoothness!.lipschitz, true));
    const [mu] = byClass(root, 'mu-line').filter((e) => e.name === 'g');
    near(Number(mu.attributes['data-value']), 1, 1e-3);
    for (const dot of dots) near(Number(dot.attributes.cy), expectedPosition(root, 'y', Number(dot.attributes['data-value']), true));
  });

  test('negative curvature keeps a linear axis with a zero line', () => {
    const saddle = [probe({ smoothness: { lambdaMax: 2, lambdaMin: -2, ritzValues: [-2, 2], secantMax: 2, hessianVectorProducts: 4 } })];
    const svg = wellFormed(eigenvaluePlot(saddle, { lipschitz: 2, mu: -2, kappa: null, safeStep: 0.5, divergenceStep: 1 }), 'eigenvalues');
    assert.equal(byClass(svg, 'zero-line').length, 1);
    assert.ok(ticks(svg, 'y').some((t) => t.value < 0));
  });

  test('no curvature estimate gives an empty plot', () => {
    const svg = wellFormed(eigenvaluePlot([probe()], null), 'eigenvalues');
    assert.equal(byClass(svg, 'empty-note').length, 1);
  });
});

describe('descent plot', () => {
  test('one series per run; values spanning decades get a log axis and sit at the right height', () => {
    // f = ½·4·w²: at α = 0.2 each step multiplies f by (1 − 0.8)² = 0.04; at α = 0.6 by (1 − 2.4)² = 1.96.
    const runs = [quadraticDescent('declared', 0.2), quadraticDescent('safe', 0.125), quadraticDescent('limit', 0.45)];
    const root = wellFormed(descentPlot(runs), 'descent');
    assert.deepEqual(byClass(root, 'run').map((g) => g.attributes['data-run']), ['declared', 'safe', 'limit']);
    assert.ok(ticks(root, 'y').every((t) => isPowerOfTen(t.value)), 'log y axis');
    assert.match(axisLabels(root)[1], /log scale/);
    const declared = byClass(root, 'run-declared').find((e) => e.name === 'g')!;
    const points = byName(declared, 'polyline')[0].attributes.points.split(' ').map((p) => p.split(',').map(Number));
    assert.equal(points.length, 9);
    near(points[3][1], expectedPosition(root, 'y', 2 * 0.04 ** 3, true));
    near(points[3][0], expectedPosition(root, 'x', 3, false));
  });

  test('exactly at 1/L the quadratic is solved in one step; at 2/L f stays flat (linear axis)', () => {
    const runs = [quadraticDescent('safe', 0.25), quadraticDescent('limit', 0.5)];
    const root = wellFormed(descentPlot(runs), 'descent');
    assert.equal(axisLabels(root)[1], 'f(w_k)');
    const limit = byClass(root, 'run-limit').find((e) => e.name === 'g')!;
    const ys = byName(limit, 'polyline')[0].attributes.points.split(' ').map((p) => Number(p.split(',')[1]));
    assert.equal(new Set(ys).size, 1, 'f_k = 2 for every k at α = 2/L');
    assert.equal(limit.attributes['data-decreased'], 'false');
  });

  test('overflowed values (null after JSON) end the line with a mark, never NaN', () => {
    const diverging: DescentRun = { label: 'declared', rate: 3, values: [1, 1e150, 1e300, null as unknown as number, null as unknown as number], decreased: false };
    const root = wellFormed(descentPlot([diverging]), 'descent');
    assert.equal(byClass(root, 'diverged-mark').length, 1);
    assert.equal(byName(root, 'polyline')[0].attributes.points.split(' ').length, 3);
  });

  test('no runs, or runs without a finite value, give an empty plot', () => {
    wellFormed(descentPlot(undefined), 'descent');
    const svg = wellFormed(descentPlot([{ label: 'safe', rate: 1, values: [null as unknown as number], decreased: false }]), 'descent');
    assert.equal(byClass(svg, 'empty-note').length, 1);
  });
});

describe('degenerate data', () => {
  test('equal values, a single component, NaN and nulls still give finite coordinates', () => {
    const odd = probe({
      components: [component(0, 5, 5, 0)],
      stepStudy: { component: -1, steps: [1e-3], errors: [1e-9], chosenStep: Number.NaN },
      smoothness: { lambdaMax: 3, lambdaMin: 3, ritzValues: [3], secantMax: 3, hessianVectorProducts: 1 },
      descent: [{ label: 'declared', rate: 0.1, values: [7, 7, 7], decreased: false }],
    });
    wellFormed(gradientPlot(odd, 0), 'gradient');
    const step = wellFormed(stepErrorPlot(odd.stepStudy), 'step-error');
    assert.equal(byClass(step, 'chosen-step').filter((e) => e.name === 'g').length, 0, 'no marker for a NaN step');
    wellFormed(eigenvaluePlot([odd], { lipschitz: 3, mu: 3, kappa: 1, safeStep: 1 / 3, divergenceStep: 2 / 3 }), 'eigenvalues');
    wellFormed(descentPlot(odd.descent), 'descent');
    const nulls = probe({ components: [{ index: 0, analytic: null as unknown as number, numerical: Number.NaN, errorBound: null as unknown as number, relError: 0, mismatch: true }] });
    wellFormed(gradientPlot(nulls, 0), 'gradient');
    wellFormed(gradientPlot(undefined, 0), 'gradient');
  });

  test('worst probe is the one with the largest relative error (null counts as worst)', () => {
    const probes: ProbeReport[] = [probe({ maxRelError: 1e-9 }), probe({ maxRelError: 0.5 }), probe({ maxRelError: 1e-3 })];
    assert.equal(worstProbeIndex(probes), 1);
    assert.equal(worstProbeIndex([probe({ maxRelError: 0.1 }), probe({ maxRelError: null as unknown as number })]), 1);
    assert.equal(worstProbeIndex([]), -1);
  });
});
