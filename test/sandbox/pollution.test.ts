// User code that pollutes the prototypes of its own realm: the check of a correct pair in that
// module must still pass, since the engine's report must not depend on what user code inherited.
// These run real sandbox processes (dist/sandbox.js).
import assert from 'node:assert/strict';
import { after, describe, test } from 'node:test';
import { SandboxPool } from '../../server/src/sandbox/pool';
import { sandboxScript } from '../support/paths';
import { planFor, tempProject } from './support';

const project = tempProject();
const pool = new SandboxPool({ sandboxScript, timeoutMs: 5000 });
after(() => {
  pool.dispose();
  project.remove();
});

// f(x) = x₀² + 3x₁², ∇f = (2x₀, 6x₁) (common practice).
const correctPair = 'const objective = (x) => x[0] * x[0] + 3 * x[1] * x[1];\nconst gradient = (x) => [2 * x[0], 6 * x[1]];\nexports.objective = objective;\nexports.gradient = gradient;\n';

async function statusAfter(pollution: string): Promise<{ status: string; codes: string[] }> {
  const bundle = await project.bundle(pollution + '\n' + correctPair, 'main.js');
  assert.deepEqual(bundle.errors, []);
  const { report } = await pool.run(bundle, planFor());
  return { status: report.status, codes: report.findings.map((f) => f.code) };
}

describe('prototype pollution inside the sandbox', () => {
  test('an enumerable Object.prototype property and a replaced Array.prototype.map leave a correct pair passing', async () => {
    const { status, codes } = await statusAfter("Object.prototype.scale = 1000;\nObject.prototype.status = 'fail';\nArray.prototype.map = () => [];\n");
    assert.equal(status, 'pass', codes.join(', '));
  });

  test('an inherited toJSON does not garble the report', async () => {
    const { status, codes } = await statusAfter(
      "Object.prototype.toJSON = function () { return 'polluted'; };\nArray.prototype.toJSON = () => 1;\nString.prototype.toJSON = () => 2;\nObject.keys = () => [];\n",
    );
    assert.equal(status, 'pass', codes.join(', '));
  });

  test("an inherited 'findings' property does not turn the pair into an error without findings", async () => {
    const { status, codes } = await statusAfter('Object.prototype.findings = [];\n');
    assert.equal(status, 'pass', codes.join(', '));
  });
});
