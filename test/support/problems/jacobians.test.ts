// The Jacobians of the Moré–Garbow–Hillstrom residuals (ACM TOMS 7(1), 1981), as written out in
// mgh.ts, against two references that share nothing with them or with the engine: mathjs's
// symbolic differentiation (a general-purpose library from the npm registry: mathjs 15,
// `derivative`) of each residual written out as an expression, and a sixth-order central
// difference (Burden & Faires, Numerical Analysis, §4.1–4.2) of the residual functions.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { derivative, parse } from 'mathjs';
import { moreGarbowHillstromSet, seededUniform, type TestProblem } from './index';

const byName = (prefix: string) => moreGarbowHillstromSet.find((p) => p.name.startsWith(prefix))!;
const indices = (count: number) => Array.from({ length: count }, (_, i) => i + 1);

/** Each residual as a mathjs expression in x1 … xn, as the paper states it (1-based i in the sums). */
const expressions: Array<[string, string[]]> = [
  ['Rosenbrock', ['10 * (x2 - x1^2)', '1 - x1']],
  ['Freudenstein', ['-13 + x1 + ((5 - x2) * x2 - 2) * x2', '-29 + x1 + ((x2 + 1) * x2 - 14) * x2']],
  ['Powell badly', ['10^4 * x1 * x2 - 1', 'exp(-x1) + exp(-x2) - 1.0001']],
  ['Brown badly', ['x1 - 10^6', 'x2 - 2 * 10^-6', 'x1 * x2 - 2']],
  ['Beale', [1.5, 2.25, 2.625].map((y, k) => `${y} - x1 * (1 - x2^${k + 1})`)],
  ['Jennrich', indices(10).map((i) => `${2 + 2 * i} - (exp(${i} * x1) + exp(${i} * x2))`)],
  ['Bard', [0.14, 0.18, 0.22, 0.25, 0.29, 0.32, 0.35, 0.39, 0.37, 0.58, 0.73, 0.96, 1.34, 2.1, 4.39].map((y, k) => {
    const [u, v] = [k + 1, 15 - k];
    return `${y} - (x1 + ${u} / (${v} * x2 + ${Math.min(u, v)} * x3))`;
  })],
  ['Meyer', [34780, 28610, 23650, 19630, 16370, 13720, 11540, 9744, 8261, 7030, 6005, 5147, 4427, 3820, 3307, 2872].map((y, k) => `x1 * exp(x2 / (${45 + 5 * (k + 1)} + x3)) - ${y}`)],
  ['box three', indices(10).map((i) => `exp(-${0.1 * i} * x1) - exp(-${0.1 * i} * x2) - x3 * (exp(-${0.1 * i}) - exp(-${i}))`)],
  ['Kowalik', [0.1957, 0.1947, 0.1735, 0.16, 0.0844, 0.0627, 0.0456, 0.0342, 0.0323, 0.0235, 0.0246].map((y, k) => {
    const u = [4, 2, 1, 0.5, 0.25, 0.167, 0.125, 0.1, 0.0833, 0.0714, 0.0625][k];
    return `${y} - x1 * (${u}^2 + ${u} * x2) / (${u}^2 + ${u} * x3 + x4)`;
  })],
  ['Brown and Dennis', indices(20).map((i) => `(x1 + ${i / 5} * x2 - exp(${i / 5}))^2 + (x3 + x4 * sin(${i / 5}) - cos(${i / 5}))^2`)],
  ['Biggs', indices(13).map((i) => {
    const t = 0.1 * i;
    return `x3 * exp(-${t} * x1) - x4 * exp(-${t} * x2) + x6 * exp(-${t} * x5) - (exp(-${t}) - 5 * exp(-${10 * t}) + 3 * exp(-${4 * t}))`;
  })],
];

/** Points where both references are compared: the start and two seeded points near it. */
function pointsNear(p: TestProblem): number[][] {
  const uniform = seededUniform(29);
  return [p.start, ...[0, 1].map(() => p.start.map((v) => v + (uniform() - 0.5) * 0.1 * Math.max(1, Math.abs(v))))];
}

function scope(x: number[]): Record<string, number> {
  return Object.fromEntries(x.map((v, j) => [`x${j + 1}`, v]));
}

describe('published Jacobians against mathjs symbolic derivatives', () => {
  for (const [prefix, residuals] of expressions) {
    test(`${byName(prefix).name}: every entry`, () => {
      const p = byName(prefix);
      const n = p.start.length;
      const symbolic = residuals.map((text) => indices(n).map((j) => derivative(parse(text), `x${j}`).compile()));
      for (const x of pointsNear(p)) {
        const { r, J } = p.residuals!(x);
        assert.equal(r.length, residuals.length);
        residuals.forEach((text, i) => {
          const value = parse(text).compile().evaluate(scope(x)) as number;
          assert.ok(Math.abs(value - r[i]) <= 1e-9 * Math.max(1, Math.abs(value)), `r${i} = ${r[i]}, mathjs ${value}`);
          for (let j = 0; j < n; j++) {
            const reference = symbolic[i][j].evaluate(scope(x)) as number;
            assert.ok(Math.abs(reference - J[i][j]) <= 1e-9 * Math.max(1, Math.abs(reference)), `J[${i}][${j}] = ${J[i][j]}, mathjs ${reference}`);
          }
        });
      }
    });
  }
});

describe('every published Jacobian against a sixth-order difference of its residuals', () => {
  const sixthOrder = (f: (x: number[]) => number, x: number[], j: number) => {
    const fourth = (h: number) => {
      const at = (s: number) => f(x.map((v, k) => (k === j ? v + s : v)));
      return (-at(2 * h) + 8 * at(h) - 8 * at(-h) + at(-2 * h)) / (12 * h);
    };
    const h = 1e-3 * Math.max(1, Math.abs(x[j]));
    return (16 * fourth(h / 2) - fourth(h)) / 15;
  };
  for (const p of moreGarbowHillstromSet.filter((q) => q.residuals)) {
    test(`${p.name}`, () => {
      for (const x of pointsNear(p)) {
        const { r, J } = p.residuals!(x);
        const scale = Math.max(...J.flat().map(Math.abs));
        r.forEach((_, i) => x.forEach((__, j) => {
          const numeric = sixthOrder((y) => p.residuals!(y).r[i], x, j);
          // Truncation within 1e-7 of the largest entry, plus the rounding of rᵢ over the step (Brown badly
          // scaled has r₁ ≈ −10⁶ beside entries of 1).
          const rounding = (16 * 2 ** -52 * Math.abs(r[i])) / (1e-3 * Math.max(1, Math.abs(x[j])));
          assert.ok(Math.abs(numeric - J[i][j]) <= 1e-7 * scale + rounding, `J[${i}][${j}] = ${J[i][j]}, difference ${numeric}`);
        }));
      }
    });
  }
});
