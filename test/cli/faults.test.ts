// The CLI over fixtures/faults: one misbehaving module per file. Each fault must
// give its finding (on the user's line where a stack can point at it), nothing
// may be written, and every other file is still checked.
import assert from 'node:assert/strict';
import { cpSync, existsSync, mkdtempSync, readFileSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { before, describe, test } from 'node:test';
import { fixturesDir } from '../support/paths';
import { runCli } from '../support/runCli';

interface ExpectedFault {
  file: string;
  objective: string;
  finding: string | null;
  status?: string;
  line: number;
  reportsLine: boolean;
  components?: number[];
  consoleTruncated?: boolean;
  mustNotExist?: string;
}

const expected: ExpectedFault[] = JSON.parse(readFileSync(path.join(fixturesDir, 'faults', 'expected.json'), 'utf8')).files;

describe('slopecheck over fixtures/faults', () => {
  let workDir: string;
  let files: any[];
  let code: number | null;
  before(async () => {
    // A copy, run from its own folder: a canary written by an escape would land here.
    workDir = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-faults-'));
    cpSync(path.join(fixturesDir, 'faults'), workDir, { recursive: true });
    // The memory blow-up must reach its cap before the time limit, whatever else the machine is
    // doing: near a cap V8's repeated full collections take seconds (3.5 s measured at 512 MB, alone),
    // so the cap is the smallest allowed and the time limit generous; the hang then waits it out.
    const run = await runCli(['--format', 'json', '--memory-mb', '128', '--timeout-ms', '30000', '.'], { cwd: workDir, timeoutMs: 300_000 });
    code = run.code;
    files = JSON.parse(run.stdout).files;
  });

  test('the run ends with exit 1 and a result for every file', () => {
    assert.equal(code, 1);
    assert.deepEqual(files.map((f) => f.path).sort(), expected.map((e) => e.file).sort());
  });

  for (const fault of expected) {
    test(`${fault.file}: ${fault.finding ?? fault.status}`, () => {
      const pair = files.find((f) => f.path === fault.file).pairs.find((p: any) => p.objective === fault.objective);
      assert.ok(pair, `pair ${fault.objective}`);
      if (fault.finding === null) {
        assert.equal(pair.status, fault.status);
      } else {
        const finding = pair.findings.find((f: any) => f.code === fault.finding);
        assert.ok(finding, `expected ${fault.finding}, got ${JSON.stringify(pair.findings.map((f: any) => f.code))}`);
        if (fault.reportsLine) assert.equal(finding.line, fault.line, finding.message);
        if (fault.components) assert.deepEqual(finding.components, fault.components);
      }
      if (fault.consoleTruncated) {
        assert.ok(pair.console.length > 0 && pair.console.length <= 201, `console kept ${pair.console.length} lines`);
      }
      if (fault.mustNotExist) {
        for (const dir of [workDir, process.cwd(), os.tmpdir()]) assert.equal(existsSync(path.join(dir, fault.mustNotExist)), false, `${fault.mustNotExist} in ${dir}`);
      }
    });
  }

});
