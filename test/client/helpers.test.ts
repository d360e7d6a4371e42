// The client's pure helpers: the status bar's text, the pair under the cursor, number formatting.
import assert from 'node:assert/strict';
import { describe, test } from 'node:test';
import { pairAtCursor, symbolSpans } from '../../client/src/pairAtCursor';
import { formatBound, formatFigure, formatPowerOfTen } from '../../client/src/report/format';
import { statusView } from '../../client/src/statusText';
import type { PairListing } from '../../server/src/shared/protocol';
import type { DocumentCheckSummary } from '../../server/src/shared/summary';

const summary = (byStatus: Partial<DocumentCheckSummary['byStatus']>, state: DocumentCheckSummary['state'] = 'done'): DocumentCheckSummary => ({
  state,
  byStatus: { pass: 0, fail: 0, inconclusive: 0, error: 0, ...byStatus },
  smallestSafeStep: 0.05,
});

describe('status bar text', () => {
  test('counts in a fixed order with the icon of the worst verdict', () => {
    assert.equal(statusView('running', true, summary({ pass: 5 })).text, '$(check) Slopecheck: 5 matching');
    assert.equal(statusView('running', true, summary({ pass: 3, fail: 2 })).text, '$(error) Slopecheck: 2 wrong, 3 matching');
    assert.equal(statusView('running', true, summary({ pass: 1, inconclusive: 1 })).text, '$(warning) Slopecheck: 1 undecided, 1 matching');
    assert.equal(statusView('running', true, summary({ error: 1 })).text, '$(error) Slopecheck: 1 not checked');
    assert.equal(statusView('running', true, summary({})).text, '$(dash) Slopecheck: no pairs');
    assert.match(statusView('running', true, summary({ pass: 1 })).tooltip, /Smallest safe step 1\/L̂ in this file: 0\.05/);
  });

  test('checking, starting, stopped and Restricted Mode', () => {
    assert.equal(statusView('running', true, summary({}, 'checking')).text, '$(sync~spin) Slopecheck: checking…');
    assert.equal(statusView('starting', true, undefined).text, '$(sync~spin) Slopecheck: starting…');
    const stopped = statusView('stopped', true, undefined);
    assert.equal(stopped.alarm, true);
    assert.match(stopped.tooltip, /\(command:slopecheck\.restartServer\)/);
    for (const view of [statusView('running', false, undefined), statusView('running', true, summary({}, 'untrusted'))]) {
      assert.equal(view.text, '$(shield) Slopecheck: off in Restricted Mode');
      assert.match(view.tooltip, /runs this workspace's code/);
      assert.match(view.tooltip, /\(command:workbench\.trust\.manage\)/);
    }
  });

  test('the tooltip offers check again, restart and show log', () => {
    const { tooltip } = statusView('running', true, summary({ pass: 1 }));
    for (const command of ['checkAgain', 'restartServer', 'showLog']) assert.ok(tooltip.includes(`(command:slopecheck.${command})`), command);
  });
});

describe('pair under the cursor', () => {
  const pairs: PairListing[] = [
    { objective: 'loss', kind: 'gradient', value: 'loss', gradient: 'lossGrad', line: 2, status: 'pass' },
    { objective: 'energy', kind: 'gradient', value: 'energy', gradient: 'forces', line: 20, status: 'fail' },
  ];
  // Shapes as vscode.executeDocumentSymbolProvider returns them: DocumentSymbol trees with ranges.
  const symbols = symbolSpans([
    { name: 'loss', range: { start: { line: 2 }, end: { line: 8 } } },
    { name: 'lossGrad', range: { start: { line: 10 }, end: { line: 16 } }, children: [{ name: 'inner', range: { start: { line: 11 }, end: { line: 12 } } }] },
    { name: 'energy', location: { range: { start: { line: 20 }, end: { line: 25 } } } },
    { name: 'forces', range: { start: { line: 27 }, end: { line: 30 } } },
  ]);

  test('inside an objective or its gradient, nested symbols included', () => {
    assert.equal(pairAtCursor(pairs, symbols, 5)?.objective, 'loss');
    assert.equal(pairAtCursor(pairs, symbols, 11)?.objective, 'loss');
    assert.equal(pairAtCursor(pairs, symbols, 28)?.objective, 'energy');
  });

  test('between pairs: none; without symbols, the objective line still counts', () => {
    assert.equal(pairAtCursor(pairs, symbols, 18), undefined);
    assert.equal(pairAtCursor(pairs, [], 20)?.objective, 'energy');
    assert.equal(pairAtCursor(pairs, [], 21), undefined);
  });
});

describe('number formatting', () => {
  test('figures, bounds and powers of ten', () => {
    assert.equal(formatFigure(0.05), '0.05');
    assert.equal(formatFigure(-215.6), '−215.6');
    assert.equal(formatFigure(1.5e-7), '1.5e-7');
    assert.equal(formatFigure(null), '—');
    assert.equal(formatFigure(Infinity), '∞');
    assert.equal(formatBound(2.345e-9), '2.3e-9');
    assert.equal(formatPowerOfTen(-8), '1e−8');
    assert.equal(formatPowerOfTen(2), '100');
  });
});
