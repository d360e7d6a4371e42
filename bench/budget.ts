// Calls and time to a verdict. The engine runs in-process with a clock that advances by a fixed
// cost per call of the objective or the gradient, so an objective of 200 ms per call is measured
// without waiting for it: time to a verdict = the calls made × the cost per call, under the
// default budget less the sandbox's reserve for writing the report. Module loading and the
// sandbox's own overhead are left out (see the scale and latency sections for those).
import { checkPair } from '../server/src/engine/checkPair';
import { defaultCheckOptions, type PairReport } from '../server/src/engine/types';
import { engineEndsAt } from '../server/src/sandbox/reports';
import { defaultSettings } from '../server/src/shared/settings';

export interface CallsRow {
  n: number;
  /** f + ∇f calls for the gradient verdict of a correct pair (no curvature). */
  verdictCalls: number;
  /** 4(2n + 1) + 40 up to n = 64, flat above. */
  verdictTarget: number;
  /** f + ∇f calls of a whole check of a correct pair, with L̂ at one probe, no learning rate, no plots. */
  calls: number;
  textbook: number;
  /** The target for a whole check: twice the verdict's. */
  target: number;
}

export interface BudgetRow {
  n: number;
  costMs: number;
  gradient: 'correct' | 'one component wrong';
  status: PairReport['status'];
  calls: number;
  /** Clock time when the check reported. */
  verdictMs: number;
  probesChecked: number;
  cutShort: boolean;
}

export interface BudgetResult {
  budgetMs: number;
  calls: CallsRow[];
  budget: BudgetRow[];
}


/** f = Σ (i + 1)·cosh(0.3·xᵢ), ∇f = 0.3(i + 1)·sinh(0.3·xᵢ) (elementary calculus); `wrong` flips one component. */
function run(n: number, costMs: number, wrong: boolean, endsAt: number | null, smoothness = false): { report: PairReport; clockMs: number } {
  let clock = 0;
  const objective = (x: ArrayLike<number>) => {
    clock += costMs;
    let s = 0;
    for (let i = 0; i < n; i++) s += (i + 1) * Math.cosh(0.3 * x[i]);
    return s;
  };
  const gradient = (x: ArrayLike<number>) => {
    clock += costMs;
    return Array.from({ length: n }, (_, i) => (wrong && i === 1 ? -1 : 1) * 0.3 * (i + 1) * Math.sinh(0.3 * x[i]));
  };
  const report = checkPair({ objective, gradient, makeVector: (v) => Array.from(v) }, [], { dimension: n, learningRate: null, options: { ...defaultCheckOptions, smoothness }, endsAt }, () => clock);
  return { report, clockMs: clock };
}

/** The gradient verdict's target: 4(2n + 1) + 40 calls up to n = 64, flat above. */
export const verdictCallsTarget = (n: number) => 4 * (2 * Math.min(n, 64) + 1) + 40;

/** Calls of the objective and the gradient a check made. */
export const callsOf = (report: PairReport) => report.evaluations.objective + report.evaluations.gradient;

export function runBudget(log: (line: string) => void): BudgetResult {
  const calls = [2, 5, 10, 20, 50, 64, 100, 1000].map((n) => {
    const verdictTarget = verdictCallsTarget(n);
    const verdictCalls = callsOf(run(n, 0, false, null, false).report);
    return { n, verdictCalls, verdictTarget, calls: callsOf(run(n, 0, false, null, true).report), textbook: 2 * n + 1, target: 2 * verdictTarget };
  });
  log(`  budget: calls per check ${calls.map((r) => `n = ${r.n}: ${r.calls}`).join(', ')}`);
  const budgetMs = defaultSettings.timeoutMs;
  const budget: BudgetRow[] = [];
  for (const n of [3, 20, 100]) {
    for (const costMs of [10, 50, 200]) {
      for (const wrong of [false, true]) {
        const { report, clockMs } = run(n, costMs, wrong, engineEndsAt(budgetMs, budgetMs));
        budget.push({
          n, costMs, gradient: wrong ? 'one component wrong' : 'correct', status: report.status, calls: callsOf(report), verdictMs: clockMs,
          probesChecked: report.probes.length, cutShort: report.findings.some((f) => f.code === 'budget-spent'),
        });
      }
    }
  }
  log(`  budget: ${budget.length} cases under ${budgetMs} ms`);
  return { budgetMs, calls, budget };
}
