// The report's content: the four plots under stable selectors, the local-estimate
// caution, the figures table, the copy button, and the user's text escaped.
import assert from 'node:assert/strict';
import { test } from 'node:test';
import { localEstimateCaution, renderFailure, renderReport } from '../../client/src/report/render';
import { checkPair } from '../../server/src/engine/checkPair';
import { defaultCheckOptions } from '../../server/src/engine/types';
import type { PairReportResult } from '../../server/src/shared/protocol';

// f(x) = x0² + 10·x1² has ∇f = (2·x0, 20·x1) and Hessian diag(2, 20), so L = 20, 1/L = 0.05, 2/L = 0.1 (by hand);
// the declared rate 0.08 lies in (1/L, 2/L). The wrong gradient doubles component 1.
const objective = (x: ArrayLike<number>) => x[0] ** 2 + 10 * x[1] ** 2;
// With plots, as the report asks for them.
const plan = { dimension: null, learningRate: { name: 'lr', value: 0.08 }, options: { ...defaultCheckOptions, plots: true } };
const check = (gradient: (x: ArrayLike<number>) => number[]) =>
  checkPair({ objective, gradient, makeVector: (values) => Array.from(values) }, [[1, -0.5]], plan);
const passing = check((x) => [2 * x[0], 20 * x[1]]);
const failing = check((x) => [2 * x[0], 40 * x[1]]);

const wrap = (report: typeof passing): PairReportResult => ({
  uri: 'file:///example/model.ts',
  objective: 'loss<img src=x>',
  value: 'loss<img src=x>',
  gradient: 'lossGrad',
  line: 3,
  report,
  console: ['fitting </pre><script>alert(1)</script>'],
  settings: { seed: 1, timeoutMs: 5000, probeCount: 3 },
});
const html = renderReport(wrap(failing));
const passingHtml = renderReport(wrap(passing));

test('the engine saw the mismatch and the smoothness (sanity of the input)', () => {
  assert.equal(failing.status, 'fail');
  assert.equal(passing.status, 'pass');
  assert.ok(passing.smoothness && Math.abs(passing.smoothness.lipschitz - 20) < 1e-3, JSON.stringify(passing.smoothness));
});

test('the four plots are there under their stable selectors', () => {
  for (const plot of ['gradient', 'step-error', 'eigenvalues', 'descent']) {
    assert.equal(html.split(`class="plot" data-plot="${plot}"`).length - 1, 1, plot);
  }
  assert.match(html, /<g class="component mismatch" data-index="1">/, 'component 1 marked');
});

test('headline caution, verdict and figures table', () => {
  for (const page of [html, passingHtml]) assert.ok(page.includes(localEstimateCaution.replace(/'/g, '&#39;')));
  assert.match(html, /class="verdict verdict-fail" data-status="fail">gradient wrong</);
  assert.match(html, /<th scope="row">Shape of the error<\/th><td>component 1 wrong<\/td>/);
  assert.match(html, /<tr class="mismatch" data-index="1">/);
  assert.match(html, /<button type="button" data-action="copy-json">Copy as JSON<\/button>/);
  assert.match(passingHtml, /class="verdict verdict-pass" data-status="pass">gradient matches</);
  assert.match(passingHtml, /<th scope="row">L̂ \(local Lipschitz estimate\)<\/th><td>(20|19\.9999\d*|20\.0000\d*)<\/td>/);
  assert.match(passingHtml, /<th scope="row">Safe step 1\/L̂<\/th><td>0\.05(0000\d*)?<\/td>/);
  assert.match(passingHtml, /<th scope="row">Divergence step 2\/λ⁺<\/th><td>0\.1(00000\d*)?<\/td>/);
  assert.match(passingHtml, /<th scope="row">Learning rate<\/th><td>lr = 0\.08: aggressive<\/td>/);
  assert.equal(passingHtml.split('class="run run-').length - 1, 3, 'descent runs at the declared rate, 1/L̂ and 2/λ⁺');
});

test("the user's names, messages and console output are escaped", () => {
  assert.doesNotMatch(html, /<img|<script|<\/pre><script/);
  assert.match(html, /loss&lt;img src=x&gt;/);
  assert.match(html, /fitting &lt;\/pre&gt;&lt;script&gt;/);
  assert.doesNotMatch(renderFailure('a<b', 'x & y'), /a<b|x & y/);
});

test('no network address in the report besides the SVG namespace name', () => {
  assert.deepEqual([...new Set(html.match(/https?:\/\/[^\s"']+/g))], ['http://www.w3.org/2000/svg']);
});
