// plainJson must write what JSON.stringify writes for plain data (JSON.parse is the reference).
import assert from 'node:assert/strict';
import { test } from 'node:test';
import { plainJson } from '../../server/src/sandbox/plainJson';

test('plain data round-trips exactly as JSON.stringify would write it', () => {
  const data = {
    status: 'fail',
    text: 'quote " backslash \\ newline \n tab \t control \u0001 separator \u2028 é ∇f',
    numbers: [0, -0.5, 1e-300, 1.7976931348623157e308, 123456789.123],
    nested: { empty: [], none: null, yes: true, no: false, deep: [{ a: [1, [2, [3]]] }] },
  };
  const written = plainJson(data);
  assert.deepEqual(JSON.parse(written), JSON.parse(JSON.stringify(data)));
  assert.equal(written, JSON.stringify(data));
});

test('non-finite numbers become null and undefined or function fields are left out, as in JSON', () => {
  const data = { a: NaN, b: Infinity, c: undefined, d: () => 1, e: [undefined, -Infinity] };
  assert.equal(plainJson(data), JSON.stringify(data));
});
