// A report whose every word and number was replaced by markup (as a sandbox that user code
// took over could send it) renders as text: the page keeps the structure render.ts writes,
// no element or attribute comes from the report, and the values show escaped.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { reportShellHtml } from '../../client/src/report/html';
import { descentPlot, gradientPlot } from '../../client/src/report/plots';
import { renderReport, renderReportOrFailure } from '../../client/src/report/render';
import { checkPair } from '../../server/src/engine/checkPair';
import { defaultCheckOptions, type PairReport } from '../../server/src/engine/types';
import type { PairReportResult } from '../../server/src/shared/protocol';
import { probe } from './fixtures';
import { descendants, parseXml, type XmlElement } from './xml';

const attack = (n: number) => `"><img src=x onerror=alert(${n})>'<script>alert(${n})</script>`;
/** How `attack(n)` reads inside the markup once escaped. */
const escaped = (n: number) => `&quot;&gt;&lt;img src=x onerror=alert(${n})&gt;&#39;&lt;script&gt;alert(${n})&lt;/script&gt;`;

// f(x) = x0² + 10·x1², ∇f = (2·x0, 20·x1) by hand; the declared rate gives descent runs, and a
// second report with component 1 doubled gives mismatch rows and the error plot.
const objective = (x: ArrayLike<number>) => x[0] ** 2 + 10 * x[1] ** 2;
const plan = { dimension: null, learningRate: { name: 'lr', value: 0.08 }, options: { ...defaultCheckOptions } };
const check = (gradient: (x: ArrayLike<number>) => number[]) => checkPair({ objective, gradient, makeVector: (values) => Array.from(values) }, [[1, -0.5]], plan);

/** A real report with markup wherever a word or a number of the report goes (as JSON would carry it). */
function poisoned(report: PairReport): PairReport {
  const hostile = JSON.parse(JSON.stringify(report));
  const text = (n: number) => attack(n) as never;
  hostile.status = text(1);
  hostile.findings.push({ code: text(2), severity: text(3), subject: 'objective', message: text(4) });
  hostile.evaluations.objective = text(5);
  hostile.dimension = text(6);
  hostile.maxRelError = text(7);
  const [first] = hostile.probes;
  first.maxRelError = 1e9;
  for (const component of first.components) {
    component.index = text(8);
    component.analytic = text(9);
    component.errorBound = text(10);
  }
  for (const run of first.descent) {
    run.label = text(11);
    run.rate = text(12);
    run.decreased = text(13);
  }
  if (first.stepStudy) first.stepStudy.component = text(14);
  if (hostile.learningRate) hostile.learningRate.status = text(15);
  return hostile;
}

function result(report: PairReport): PairReportResult {
  return {
    uri: 'file:///example/model.ts',
    objective: attack(20),
    value: attack(20),
    gradient: attack(21),
    line: 3,
    report,
    console: [attack(22)],
    settings: { seed: attack(23) as never, timeoutMs: 5000, probeCount: attack(24) as never },
  };
}

/** The elements and attributes render.ts itself writes. */
const allowedElements = new Set(
  'div header h1 h2 span button p section ul li code table thead tbody tr th td figure figcaption pre footer svg title desc g line text rect circle polyline'.split(' '),
);

function assertOnlyOurMarkup(root: XmlElement): void {
  for (const element of descendants(root)) {
    assert.ok(allowedElements.has(element.name), `<${element.name}> came from the report`);
    for (const name of Object.keys(element.attributes)) assert.doesNotMatch(name, /^on/i, `${name} on <${element.name}>`);
  }
}

describe('a report full of markup', () => {
  const reports = { passing: check((x) => [2 * x[0], 20 * x[1]]), failing: check((x) => [2 * x[0], 40 * x[1]]) };

  test('the input is real: a descent run, components and a mismatch to poison', () => {
    assert.ok(reports.passing.probes[0].descent.length > 0);
    assert.ok(reports.failing.probes[0].components.some((c) => c.mismatch));
  });

  for (const [name, report] of Object.entries(reports)) {
    test(`${name}: the page parses, with only the elements render.ts writes`, () => {
      const html = renderReport(result(poisoned(report)));
      const root = parseXml(`<div>${html}</div>`);
      assertOnlyOurMarkup(root);
      assert.doesNotMatch(html, /<img|<script/);
    });
  }

  test('severity, code, status and index reach their attributes escaped', () => {
    const html = renderReport(result(poisoned(reports.failing)));
    const root = parseXml(`<div>${html}</div>`);
    const finding = descendants(root).find((e) => e.name === 'li' && e.attributes['data-code'] === escaped(2));
    assert.ok(finding, 'the poisoned finding is listed');
    assert.equal(finding.attributes.class, `finding severity-${escaped(3)}`);
    const verdict = descendants(root).find((e) => e.attributes.class?.startsWith('verdict '));
    assert.equal(verdict?.attributes['data-status'], escaped(1));
    assert.ok(descendants(root).some((e) => e.name === 'tr' && e.attributes['data-index'] === escaped(8)), 'component row');
    assert.ok(descendants(root).some((e) => e.name === 'g' && e.attributes['data-index'] === escaped(8)), 'component in the plot');
    for (const n of [4, 5, 20, 21, 22, 23, 24]) assert.ok(html.includes(escaped(n)), `value ${n} shown as text`);
    // Figures that are text where a number belongs show as missing.
    assert.match(html, /<th scope="row">Dimension<\/th><td>—<\/td>/);
  });

  test('descent runs with a poisoned label, rate and outcome', () => {
    const runs = poisoned(reports.passing).probes[0].descent;
    const root = parseXml(descentPlot(runs));
    assertOnlyOurMarkup({ ...root, name: 'div', children: [root] });
    const run = descendants(root).find((e) => e.name === 'g' && e.attributes['data-run'] !== undefined);
    assert.equal(run?.attributes.class, `run run-${escaped(11)}`);
    assert.equal(run?.attributes['data-rate'], escaped(12));
    assert.equal(run?.attributes['data-decreased'], escaped(13));
  });

  test('a component whose figures are text shows no figure, and its index escaped', () => {
    const svg = gradientPlot(probe({ components: [{ index: attack(30) as never, analytic: attack(31) as never, numerical: 1, errorBound: attack(32) as never, relError: 1, mismatch: true }] }));
    const root = parseXml(svg);
    assert.equal(descendants(root).find((e) => e.name === 'g' && e.attributes.class === 'component mismatch')?.attributes['data-index'], escaped(30));
    assert.ok(!svg.includes(escaped(31)) && !svg.includes(escaped(32)), 'a figure that is not a number is not printed');
  });

  test('a report render.ts cannot read gives a failure line, not a blank page', () => {
    const broken = { ...result(reports.passing.findings.length ? reports.passing : reports.failing), report: { ...reports.passing, findings: null } as never };
    const html = renderReportOrFailure(broken);
    assert.match(html, /^<p class="failure">No report for .*its report could not be shown/);
    assert.ok(html.includes(escaped(20)));
    assert.doesNotMatch(html, /<img|<script/);
  });
});

test('the page shell escapes its title and every attribute it is given', () => {
  const html = reportShellHtml({ cspSource: attack(40), nonce: attack(41), scriptUri: attack(42), title: attack(43) });
  assert.doesNotMatch(html, /<img|<script>alert/);
  for (const n of [40, 41, 42, 43]) assert.ok(html.includes(escaped(n)), `value ${n}`);
});
