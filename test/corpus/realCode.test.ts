// The product on code written the way practitioners write it: the CLI runs over the realistic
// corpus (fixtures/realistic) as a user would, and every module's result must agree with the
// truth written beside it — every intended pair found, judged right, no false alarm, and every
// declared learning rate given the verdict its exact Hessian at the start point implies.
import assert from 'node:assert/strict';
import { before, describe, test } from 'node:test';
import { corpusDir, loadCorpus, scoreModule, type ReportedPair } from '../support/corpus';
import { runCli } from '../support/runCli';

const modules = loadCorpus();

describe('the realistic corpus through the CLI', () => {
  const reported = new Map<string, { pairs: ReportedPair[]; findings: Array<{ code: string; message: string }> }>();
  before(async () => {
    const run = await runCli(['--format', 'json', ...modules.map((m) => m.file)], { cwd: corpusDir, timeoutMs: 600_000 });
    assert.ok(run.code === 0 || run.code === 1, `exit ${run.code}: ${run.stderr}`);
    for (const file of JSON.parse(run.stdout).files) reported.set(file.path, file);
  });

  test('the corpus is large enough to judge by: at least 40 modules, two thirds without tags', () => {
    assert.ok(modules.length >= 40, `${modules.length} modules`);
    assert.ok(modules.filter((m) => !m.truth.tagged).length * 3 >= modules.length * 2);
  });

  for (const module of modules) {
    test(`${module.file}: ${module.truth.scenario}`, () => {
      const file = reported.get(module.file);
      assert.ok(file, 'the CLI reported on the file');
      const score = scoreModule(module, file.pairs);
      assert.deepEqual(score.problems, [], `file findings: ${file.findings.map((f) => `${f.code}: ${f.message}`).join(' | ')}`);
    });
  }
});
