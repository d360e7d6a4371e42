// The realistic corpus (fixtures/realistic): modules written the way practitioners write
// them, each with its truth beside it (`foo.truth.json`). Shared by the corpus test, which
// asserts every expectation, and the bench's "real code" table, which counts them.
import { readdirSync, readFileSync } from 'node:fs';
import * as path from 'node:path';
import { fixturesDir } from './paths';

export const corpusDir = path.join(fixturesDir, 'realistic');

export interface TruthTarget {
  /** What is checked; absent means 'gradient'. */
  kind?: 'gradient' | 'jacobian' | 'hessian' | 'hessianVectorProduct';
  /** The value function: the objective, the residual function, or the gradient of a Hessian. */
  value: string;
  /** Null when one function returns value and gradient. */
  derivative: string | null;
  /** The instance, factory result or class the methods live on, or null. */
  host: string | null;
  expect: 'pass' | 'fail';
  bug: string | null;
  start: number[] | null;
  dataFrom: string;
  learningRate: { name: string; value: number; lambdaMax: number; expect: 'safe' | 'aggressive' | 'divergent' } | null;
}

export interface Truth {
  scenario: string;
  tagged: boolean;
  targets: TruthTarget[];
  notes: string;
}

export interface CorpusModule {
  /** Path relative to the corpus folder, as the CLI reports it when run there. */
  file: string;
  truth: Truth;
}

/** Every module with a truth file, in a stable order. */
export function loadCorpus(): CorpusModule[] {
  const modules: CorpusModule[] = [];
  const walk = (dir: string) => {
    for (const entry of readdirSync(dir, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (entry.name.endsWith('.truth.json')) {
        const stem = full.slice(0, -'.truth.json'.length);
        const file = ['.ts', '.js', '.mjs', '.cjs'].map((ext) => stem + ext).find((candidate) => readdirSync(dir).includes(path.basename(candidate)));
        if (!file) throw new Error(`no module beside ${full}`);
        modules.push({ file: path.relative(corpusDir, file), truth: JSON.parse(readFileSync(full, 'utf8')) as Truth });
      }
    }
  };
  walk(corpusDir);
  return modules;
}

/** What the CLI's JSON says of one pair (the fields the corpus reads). */
export interface ReportedPair {
  kind: string;
  objective: string;
  gradient: string;
  combined: boolean;
  status: string;
  learningRate: { name: string; value: number; status: string } | null;
  findings: Array<{ code: string; message: string }>;
}

/** Counts against the truth, for one module or summed over many. */
export interface Tally {
  intended: number;
  found: number;
  judgedRight: number;
  falseAlarms: number;
  misses: number;
  rates: number;
  ratesRight: number;
  /** Learning rates reported where the truth declares none (a line search's trial step, say). */
  spuriousRates: number;
}

export const tallyKeys: ReadonlyArray<keyof Tally> = ['intended', 'found', 'judgedRight', 'falseAlarms', 'misses', 'rates', 'ratesRight', 'spuriousRates'];

export interface ModuleScore extends Tally {
  file: string;
  tagged: boolean;
  /** One line per disagreement with the truth, empty when the module is judged right throughout. */
  problems: string[];
}

/** The labels the product gives a target: `loss`/`lossGrad`, or `model.loss`/`model.lossGrad`. */
export function labelsOf(target: TruthTarget): { objective: string; gradient: string } {
  const prefix = target.host ? `${target.host}.` : '';
  return { objective: prefix + target.value, gradient: prefix + (target.derivative ?? target.value) };
}

/** Compares the CLI's pairs for one module with its truth. */
export function scoreModule(module: CorpusModule, reported: ReportedPair[]): ModuleScore {
  const score: ModuleScore = { file: module.file, tagged: module.truth.tagged, intended: 0, found: 0, judgedRight: 0, falseAlarms: 0, misses: 0, rates: 0, ratesRight: 0, spuriousRates: 0, problems: [] };
  const matched = new Set<ReportedPair>();
  for (const target of module.truth.targets) {
    score.intended++;
    const labels = labelsOf(target);
    const kind = target.kind ?? 'gradient';
    const pair = reported.find((p) => p.kind === kind && p.objective === labels.objective && p.gradient === labels.gradient);
    const name = `${labels.objective} → ${labels.gradient}`;
    if (!pair) {
      score.problems.push(`${name}: not found (found: ${reported.map((p) => `${p.objective} → ${p.gradient}`).join(', ') || 'nothing'})`);
      if (target.expect === 'fail') score.misses++;
      continue;
    }
    matched.add(pair);
    score.found++;
    if (pair.status === target.expect) score.judgedRight++;
    else {
      score.problems.push(`${name}: expected ${target.expect}, got ${pair.status} (${pair.findings.map((f) => `${f.code}: ${f.message}`).join(' | ')})`);
      if (target.expect === 'pass' && pair.status === 'fail') score.falseAlarms++;
      if (target.expect === 'fail') score.misses++;
    }
    if (target.learningRate) {
      score.rates++;
      const verdict = pair.learningRate?.status ?? 'none';
      if (verdict === target.learningRate.expect) score.ratesRight++;
      else score.problems.push(`${name}: learning rate ${target.learningRate.name} expected ${target.learningRate.expect}, got ${verdict}${pair.learningRate ? ` (${pair.learningRate.name} = ${pair.learningRate.value})` : ''}`);
    } else if (pair.learningRate) {
      score.spuriousRates++;
      score.problems.push(`${name}: reports learning rate ${pair.learningRate.name} = ${pair.learningRate.value} (${pair.learningRate.status}), but the module declares none`);
    }
  }
  for (const pair of reported) {
    if (matched.has(pair) || pair.status !== 'fail') continue;
    score.falseAlarms++;
    score.problems.push(`${pair.objective} → ${pair.gradient}: reported wrong, but the truth has no such pair`);
  }
  return score;
}
