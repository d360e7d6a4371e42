// The "real code" table: the CLI over the realistic corpus (fixtures/realistic), counted against
// the truth beside each module, separately for files without Slopecheck tags and with them.
import { corpusDir, loadCorpus, scoreModule, tallyKeys, type ModuleScore, type Tally } from '../test/support/corpus';
import { runCli } from '../test/support/runCli';

export interface RealCodeRow extends Tally {
  files: number;
  /** Files in which every intended pair was found. */
  filesFullyFound: number;
}

export interface RealCodeResult {
  untagged: RealCodeRow;
  tagged: RealCodeRow;
  /** Every disagreement with the truth, by file. */
  problems: Array<{ file: string; problem: string }>;
  seconds: number;
}

function tally(scores: ModuleScore[]): RealCodeRow {
  const row: RealCodeRow = { files: scores.length, filesFullyFound: scores.filter((s) => s.found === s.intended).length, ...Object.fromEntries(tallyKeys.map((key) => [key, 0])) } as RealCodeRow;
  for (const score of scores) for (const key of tallyKeys) row[key] += score[key];
  return row;
}

export async function runRealCode(log: (line: string) => void): Promise<RealCodeResult> {
  const modules = loadCorpus();
  const started = Date.now();
  const run = await runCli(['--format', 'json', ...modules.map((m) => m.file)], { cwd: corpusDir, timeoutMs: 900_000 });
  const seconds = (Date.now() - started) / 1000;
  const files = new Map<string, { pairs: Parameters<typeof scoreModule>[1] }>((JSON.parse(run.stdout).files as Array<{ path: string; pairs: Parameters<typeof scoreModule>[1] }>).map((f) => [f.path, f]));
  const scores = modules.map((module) => scoreModule(module, files.get(module.file)?.pairs ?? []));
  const problems = scores.flatMap((s) => s.problems.map((problem) => ({ file: s.file, problem })));
  log(`  real code: ${modules.length} files, ${problems.length} disagreements with the truth, ${seconds.toFixed(1)} s`);
  return { untagged: tally(scores.filter((s) => !s.tagged)), tagged: tally(scores.filter((s) => s.tagged)), problems, seconds };
}
