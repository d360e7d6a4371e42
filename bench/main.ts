// npm run bench: accuracy, smoothness, real code, calls and budget, the adversarial table, Jacobians, scale and editor latency, then the report files.
// Usage: node bench/run.mjs [accuracy] [smoothness] [realcode] [budget] [adversarial] [jacobian] [scale] [latency]   (default: all)
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { repoRoot } from '../test/support/paths';
import { runAccuracy } from './accuracy';
import { runAdversarial } from './adversarial';
import { runBudget } from './budget';
import { runJacobian } from './jacobian';
import { runLatency } from './latency';
import { runRealCode } from './realCode';
import { latestJson, markdown, scaleSvg, type BenchResults } from './report';
import { runScale } from './scale';
import { runSmoothness } from './smoothness';

const readmePath = path.join(repoRoot, 'README.md');

/** The README's "Measured" figures sit between these markers; only a full run replaces them. */
function withMeasuredTables(readme: string, tables: string): string {
  const [begin, end] = ['<!-- bench:begin -->', '<!-- bench:end -->'];
  const from = readme.indexOf(begin);
  const to = readme.indexOf(end);
  if (from < 0 || to < from) throw new Error(`README.md has no ${begin} … ${end} block for the figures`);
  return readme.slice(0, from + begin.length) + '\n' + tables + readme.slice(to);
}

async function main(): Promise<void> {
  const asked = process.argv.slice(2);
  const wants = (section: string) => asked.length === 0 || asked.includes(section);
  const log = (line: string) => console.log(line);
  const started = Date.now();
  const results: BenchResults = {
    machine: { cpus: os.availableParallelism?.() ?? os.cpus().length, cpuModel: os.cpus()[0]?.model.trim() ?? 'unknown', node: process.version, date: new Date().toISOString().slice(0, 10) },
    accuracy: null,
    smoothness: null,
    realCode: null,
    budget: null,
    adversarial: null,
    jacobian: null,
    scale: null,
    latency: null,
  };
  if (wants('accuracy')) {
    log('accuracy…');
    const { slopecheck, baseline, ...details } = runAccuracy(log);
    results.accuracy = { slopecheck, baseline, details };
  }
  if (wants('smoothness')) {
    log('smoothness…');
    results.smoothness = runSmoothness(log);
  }
  if (wants('realcode')) {
    log('real code…');
    results.realCode = await runRealCode(log);
  }
  if (wants('budget')) {
    log('calls and budget…');
    results.budget = runBudget(log);
  }
  if (wants('adversarial')) {
    log('adversarial cases…');
    results.adversarial = runAdversarial(log);
  }
  if (wants('jacobian')) {
    log('jacobians…');
    results.jacobian = runJacobian(log);
  }
  if (wants('scale')) {
    log('scale…');
    results.scale = await runScale(log);
  }
  // Last: the language server is measured as the user meets it.
  if (wants('latency')) {
    log('latency…');
    try {
      results.latency = await runLatency(log);
    } catch (error) {
      results.latency = { medianMs: null, p95Ms: null, firstCheckMs: null, rssMb: null, note: `the language server did not answer as expected: ${(error as Error).message}` };
    }
  }
  const report = markdown(results);
  console.log(`\n${report}`);
  // Only a full run replaces the published figures: other tools read every section of latest.json.
  if (asked.length > 0) {
    console.log(`bench finished in ${((Date.now() - started) / 1000).toFixed(0)} s; a partial run writes no files`);
    return;
  }
  const resultsDir = path.join(repoRoot, 'bench', 'results');
  mkdirSync(resultsDir, { recursive: true });
  writeFileSync(path.join(resultsDir, 'latest.json'), JSON.stringify(latestJson(results), null, 2) + '\n');
  writeFileSync(path.join(resultsDir, 'latest.md'), report);
  writeFileSync(readmePath, withMeasuredTables(readFileSync(readmePath, 'utf8'), report));
  mkdirSync(path.join(repoRoot, 'docs'), { recursive: true });
  writeFileSync(path.join(repoRoot, 'docs', 'scale.svg'), scaleSvg(results.scale!));
  console.log(`bench finished in ${((Date.now() - started) / 1000).toFixed(0)} s; wrote bench/results/latest.json, bench/results/latest.md, docs/scale.svg and the figures in README.md`);
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
