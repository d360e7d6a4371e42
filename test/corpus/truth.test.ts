// The realistic corpus (fixtures/realistic) carries its truth beside each module. These tests
// check that the truth is well formed and that every recorded learning-rate verdict follows
// from an exactly derived Hessian, recomputed here.
import assert from 'node:assert/strict';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import * as path from 'node:path';
import { test } from 'node:test';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { hessians, type ExactDerivatives } from './hessians/index';
import { tagNames } from '../../server/src/discovery/conventions';
import { corpusDir, type Truth, type TruthTarget } from '../support/corpus';
import { repoRoot } from '../support/paths';

// The truth's exact derivatives live with this test, outside the corpus the CLI is run over.
const hessianDir = path.join(repoRoot, 'test', 'corpus', 'hessians');
const moduleExtensions = ['.ts', '.js', '.mjs', '.cjs'];

type LearningRateTruth = NonNullable<TruthTarget['learningRate']>;
type Verdict = LearningRateTruth['expect'];

function walk(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) return walk(full);
    return [full];
  });
}

const files = walk(corpusDir);
const truthFiles = files.filter((f) => f.endsWith('.truth.json'));
const moduleFiles = files.filter((f) => moduleExtensions.includes(path.extname(f)));
const rel = (file: string) => path.relative(corpusDir, file).split(path.sep).join('/');

/** The module a truth file describes: same folder and stem, a script extension. */
function moduleOf(truthFile: string): string | undefined {
  const stem = truthFile.slice(0, -'.truth.json'.length);
  return moduleExtensions.map((ext) => stem + ext).find((f) => existsSync(f));
}

const truths = truthFiles.map((file) => ({
  file,
  module: moduleOf(file),
  truth: JSON.parse(readFileSync(file, 'utf8')) as Truth,
}));

const withRates = truths.flatMap(({ module, truth }) =>
  truth.targets
    .filter((t) => t.learningRate !== null)
    .map((t) => ({ module: module ? rel(module) : '', target: t, rate: t.learningRate as LearningRateTruth })),
);

// The rule the product applies to a declared rate: gradient descent on an L-smooth function
// decreases f for every step below 2/L, and 1/L is the classical step with the guaranteed
// decrease (Nesterov 2004, Introductory Lectures on Convex Optimization, §1.2.3; section number
// from memory). Here L is the largest Hessian eigenvalue at the start point.
function verdictOf(rateTimesLambda: number): Verdict {
  if (rateTimesLambda < 1) return 'safe';
  if (rateTimesLambda < 2) return 'aggressive';
  return 'divergent';
}

function eigenvalues(H: number[][]): number[] {
  return new EigenvalueDecomposition(new Matrix(H), { assumeSymmetric: true }).realEigenvalues;
}

function centralDifferenceHessian(d: ExactDerivatives, x: number[]): number[][] {
  const columns = x.map((xi, i) => {
    const h = 1e-5 * Math.max(1, Math.abs(xi));
    const up = x.slice();
    const down = x.slice();
    up[i] += h;
    down[i] -= h;
    const gUp = d.gradient(up);
    const gDown = d.gradient(down);
    return gUp.map((v, j) => (v - gDown[j]) / (2 * h));
  });
  // columns[i][j] = d g_j / d x_i; the Hessian entry (j, i)
  return x.map((_, j) => x.map((__, i) => columns[i][j]));
}

const isFiniteVector = (v: unknown): v is number[] =>
  Array.isArray(v) && v.length > 0 && v.every((n) => typeof n === 'number' && Number.isFinite(n));

test('the corpus has truth files to check', () => {
  assert.ok(truthFiles.length >= 42, `${truthFiles.length} truth files`);
  assert.ok(withRates.length >= 12, `${withRates.length} learning-rate targets`);
});

test('every truth file has the documented fields, and its module sits beside it', () => {
  const targetKeys = ['bug', 'dataFrom', 'derivative', 'expect', 'host', 'learningRate', 'start', 'value'];
  for (const { file, module, truth } of truths) {
    const where = rel(file);
    assert.ok(module, `${where}: no module beside it`);
    assert.deepEqual(Object.keys(truth).sort(), ['notes', 'scenario', 'tagged', 'targets'], where);
    assert.ok(typeof truth.scenario === 'string' && truth.scenario.length > 0, `${where}: scenario`);
    assert.equal(typeof truth.tagged, 'boolean', `${where}: tagged`);
    assert.equal(typeof truth.notes, 'string', `${where}: notes`);
    assert.ok(Array.isArray(truth.targets), `${where}: targets`);
    for (const t of truth.targets) {
      const at = `${where} ${t.value}`;
      // `kind` is optional: a target without it is a gradient pair.
      assert.deepEqual(Object.keys(t).filter((key) => key !== 'kind').sort(), targetKeys, at);
      assert.ok(t.kind === undefined || ['gradient', 'jacobian', 'hessian', 'hessianVectorProduct'].includes(t.kind), `${at}: kind`);
      assert.ok(typeof t.value === 'string' && t.value.length > 0, `${at}: value`);
      assert.ok(t.derivative === null || (typeof t.derivative === 'string' && t.derivative.length > 0), `${at}: derivative`);
      assert.ok(t.host === null || (typeof t.host === 'string' && t.host.length > 0), `${at}: host`);
      assert.ok(t.expect === 'pass' || t.expect === 'fail', `${at}: expect`);
      // a planted bug is described exactly when the pair is expected to fail
      assert.equal(typeof t.bug === 'string' && t.bug.length > 0, t.expect === 'fail', `${at}: bug`);
      assert.ok(t.start === null || isFiniteVector(t.start), `${at}: start`);
      assert.ok(typeof t.dataFrom === 'string' && t.dataFrom.length > 0, `${at}: dataFrom`);
      if (t.learningRate !== null) {
        const lr = t.learningRate;
        assert.deepEqual(Object.keys(lr).sort(), ['expect', 'lambdaMax', 'name', 'value'], at);
        assert.ok(typeof lr.name === 'string' && lr.name.length > 0, `${at}: learningRate.name`);
        assert.ok(Number.isFinite(lr.value) && lr.value > 0, `${at}: learningRate.value`);
        assert.ok(Number.isFinite(lr.lambdaMax) && lr.lambdaMax > 0, `${at}: learningRate.lambdaMax`);
        assert.ok(['safe', 'aggressive', 'divergent'].includes(lr.expect), `${at}: learningRate.expect`);
        // a rate is only judged for a correct pair that declares where it starts
        assert.equal(t.expect, 'pass', `${at}: learning rate on a failing pair`);
        assert.ok(t.start !== null, `${at}: learning rate without a start point`);
      }
    }
  }
});

test('every module of the corpus has a truth file', () => {
  const described = new Set(truths.map(({ module }) => module));
  for (const module of moduleFiles) assert.ok(described.has(module), `${rel(module)} has no truth file`);
});

test('the tagged flag says whether the module uses the product\'s JSDoc tags', () => {
  const tag = new RegExp(`@(${Object.values(tagNames).join('|')})\\b`);
  for (const { file, module, truth } of truths) {
    if (!module) continue;
    assert.equal(tag.test(readFileSync(module, 'utf8')), truth.tagged, rel(file));
  }
});

test('each learning-rate module has an exactly derived Hessian file at the mirrored path, and no other does', () => {
  const expected = withRates.map(({ module }) => module).sort();
  assert.deepEqual(Object.keys(hessians).sort(), expected);
  for (const module of expected) {
    const file = path.join(hessianDir, module.replace(/\.[cm]?[jt]s$/, '.ts'));
    assert.ok(existsSync(file), `missing ${path.relative(corpusDir, file)}`);
  }
});

for (const { module, target, rate } of withRates) {
  const exact = hessians[module];

  test(`${module}: λmax of the exact Hessian at the start matches the truth`, () => {
    assert.ok(exact, `no Hessian file for ${module}`);
    assert.deepEqual(exact.start, target.start, 'the Hessian file starts where the truth says');
    const ev = eigenvalues(exact.hessian(exact.start));
    const lambdaMax = Math.max(...ev);
    const lambdaMin = Math.min(...ev);
    assert.ok(Math.abs(lambdaMax - rate.lambdaMax) <= 1e-6 * lambdaMax, `λmax ${lambdaMax} vs recorded ${rate.lambdaMax}`);
    // the largest curvature is positive and dominates, so the step rule applies
    assert.ok(lambdaMax >= Math.abs(lambdaMin), `λmin ${lambdaMin} outweighs λmax ${lambdaMax}`);
  });

  test(`${module}: the Hessian agrees with central differences of the gradient`, () => {
    const H = exact.hessian(exact.start);
    const D = centralDifferenceHessian(exact, exact.start);
    const largest = Math.max(...H.flat().map(Math.abs));
    H.forEach((row, i) =>
      row.forEach((v, j) => {
        // relative to the entry, with a floor for entries that are (close to) zero
        const tol = 1e-4 * (Math.abs(v) + 1e-3 * largest);
        assert.ok(Math.abs(v - D[i][j]) <= tol, `H[${i}][${j}] = ${v}, differences give ${D[i][j]}`);
        assert.ok(Math.abs(v - H[j][i]) <= 1e-12 * largest, `H is not symmetric at (${i}, ${j})`);
      }),
    );
  });

  test(`${module}: the recorded verdict follows from rate × λmax, with a clear margin`, () => {
    const product = rate.value * rate.lambdaMax;
    assert.equal(verdictOf(product), rate.expect, `rate × λmax = ${product}`);
    // at least 25 % away from both thresholds, so small estimation errors cannot flip it
    assert.ok(Math.abs(product - 1) >= 0.25 && Math.abs(product - 2) >= 0.5, `rate × λmax = ${product} is too close to a threshold`);
  });

  test(`${module}: λmax stays within 15 % when each coordinate moves by 10 %`, () => {
    const lambda0 = Math.max(...eigenvalues(exact.hessian(exact.start)));
    let seed = 12345;
    const coin = () => {
      seed = (seed * 1103515245 + 12345) % 2147483648;
      return seed / 2147483648 < 0.5 ? -1 : 1;
    };
    for (let k = 0; k < 20; k++) {
      const x = exact.start.map((v) => v + 0.1 * Math.abs(v) * coin());
      const lambda = Math.max(...eigenvalues(exact.hessian(x)));
      assert.ok(Math.abs(lambda / lambda0 - 1) <= 0.15, `λmax ${lambda} at ${x.join(', ')} vs ${lambda0} at the start`);
    }
  });
}

test('the three verdicts are each represented at least three times', () => {
  for (const verdict of ['safe', 'aggressive', 'divergent'] as const) {
    const count = withRates.filter(({ rate }) => rate.expect === verdict).length;
    assert.ok(count >= 3, `${count} ${verdict}`);
  }
});
