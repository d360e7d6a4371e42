// The "real code" table: the CLI over the realistic corpus (fixtures/realistic), counted against
// the truth beside each module, separately for files without Slopecheck tags and with them.
import { corpusDir, loadCorpus, scoreModule, type ModuleScore } from '../test/support/corpus';
import { runCli } from '../test/support/runCli';

export interface RealCodeRow {
  files: number;
  /** Files in which every intended pair was found. */
  filesFullyFound: number;
  intended: number;
  found: number;
  judgedRight: number;
  falseAlarms: number;
  misses: number;
  rates: number;
  ratesRight: number;
  spuriousRates: number;
}

export interface RealCodeResult {
  untagged: RealCodeRow;
  tagged: RealCodeRow;
  /** Every disagreement with the truth, by file. */
  problems: Array<{ file: string; problem: string }>;
  seconds: number;
}

function tally(scores: ModuleScore[]): RealCodeRow {
  const sum = (pick: (s: ModuleScore) => number) => scores.reduce((total, s) => total + pick(s), 0);
  return {
    files: scores.length,
    filesFullyFound: scores.filter((s) => s.found === s.intended).length,
    intended: sum((s) => s.intended),
    found: sum((s) => s.found),
    judgedRight: sum((s) => s.judgedRight),
    falseAlarms: sum((s) => s.falseAlarms),
    misses: sum((s) => s.misses),
    rates: sum((s) => s.rates),
    ratesRight: sum((s) => s.ratesRight),
    spuriousRates: sum((s) => s.spuriousRates),
  };
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
