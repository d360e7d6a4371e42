// Accuracy: false alarms on correct gradients and bugs caught among their mutants,
// for the engine's checkPair and for the textbook forward-difference check, in one run.
import { checkPair } from '../server/src/engine/checkPair';
import { defaultCheckOptions, type PairReport } from '../server/src/engine/types';
import { makeArray, makeFloat64 } from '../test/support/problems';
import { forwardDifferenceCheck, type Verdict } from './baseline';
import { callsOf } from './budget';
import { correctCases, type CorrectCase } from './corpus';
import { mutantKinds, mutantsAt, type MutantKind } from './mutants';

export interface CheckerTally {
  correctCases: number;
  falseAlarms: number;
  bugCases: number;
  bugsCaught: number;
  /** Inconclusive verdicts over all cases, correct and buggy. */
  inconclusive: number;
  inconclusiveOnCorrect: number;
  /** Mean objective + gradient evaluations per case. */
  evaluationsPerCase: number;
  byKind: Record<string, { cases: number; caught: number; inconclusive: number }>;
}

export interface CaseNote {
  label: string;
  kind?: MutantKind;
  relativeSize?: number;
  verdict: Verdict;
  /** For a missed bug: whether the engine's own error estimate could have resolved it; for an undecided correct case, why. */
  why?: string;
  /** An undecided correct case whose every named component lies within its error bound: undecided by rule, not by fault. */
  forced?: boolean;
  detail: string;
}

export interface AccuracyResult {
  slopecheck: CheckerTally;
  baseline: CheckerTally;
  slopecheckFalseAlarms: CaseNote[];
  slopecheckMissed: CaseNote[];
  slopecheckInconclusiveOnCorrect: CaseNote[];
  seconds: number;
}

function emptyTally(): CheckerTally {
  const byKind = Object.fromEntries(mutantKinds.map((k) => [k, { cases: 0, caught: 0, inconclusive: 0 }]));
  return { correctCases: 0, falseAlarms: 0, bugCases: 0, bugsCaught: 0, inconclusive: 0, inconclusiveOnCorrect: 0, evaluationsPerCase: 0, byKind };
}

function runEngine(c: CorrectCase, g: (x: ArrayLike<number>) => ArrayLike<number>): PairReport {
  return checkPair(
    { objective: (x) => c.problem.f(x), gradient: (x) => g(x) as number[], makeVector: c.float64 ? makeFloat64 : makeArray },
    [c.point],
    { dimension: null, learningRate: null, options: { ...defaultCheckOptions } },
  );
}

const verdictOf = (report: PairReport): Verdict => (report.status === 'pass' ? 'pass' : report.status === 'fail' ? 'fail' : 'inconclusive');

function record(tally: CheckerTally, verdict: Verdict, evaluations: number, kind: MutantKind | null): void {
  tally.evaluationsPerCase += evaluations;
  if (verdict === 'inconclusive') tally.inconclusive++;
  if (kind === null) {
    tally.correctCases++;
    if (verdict === 'fail') tally.falseAlarms++;
    if (verdict === 'inconclusive') tally.inconclusiveOnCorrect++;
    return;
  }
  tally.bugCases++;
  const byKind = tally.byKind[kind];
  byKind.cases++;
  if (verdict === 'fail') { tally.bugsCaught++; byKind.caught++; }
  if (verdict === 'inconclusive') byKind.inconclusive++;
}

/** The engine's own error bound could tell this analytic value from the true derivative. */
export const outsideBound = (analytic: number, truth: number, errorBound: number) => Math.abs(analytic - truth) > errorBound;

/** Could the engine's own error bounds have told this mutant from the truth at the point? */
function whyMissed(report: PairReport, trueGradient: number[], relativeSize: number): string {
  const probe = report.probes[0];
  if (!probe) return 'no probe report';
  if (probe.mode === 'full') {
    const resolvable = probe.components.filter((c) => outsideBound(c.analytic, trueGradient[c.index], c.errorBound));
    return resolvable.length === 0
      ? 'within the error estimate: every wrong component is inside its numerical error bound'
      : `resolvable: components ${resolvable.slice(0, 5).map((c) => `${c.index} (off by ${(c.analytic - trueGradient[c.index]).toExponential(2)}, bound ${c.errorBound.toExponential(2)})`).join(', ')} exceed their bounds`;
  }
  // Directional mode: compare the bug's size with the relative resolution of the directional differences.
  const resolution = Math.max(...probe.directions.map((d) => d.errorBound / Math.max(Math.abs(d.numerical), Number.MIN_VALUE)));
  return relativeSize <= resolution
    ? `within the error estimate (directional: relative resolution ${resolution.toExponential(2)})`
    : `resolvable (directional: relative resolution ${resolution.toExponential(2)} < bug size)`;
}

/**
 * Whether an inconclusive verdict on a correct gradient is forced: every component it names has
 * an exact derivative (the problem's own gradient, derived by hand) no larger than that
 * component's error bound at the first probe, so no difference of f could confirm it there.
 */
function whyUndecided(report: PairReport, trueGradient: number[]): { forced: boolean; why: string } {
  const named = report.findings.find((f) => f.code === 'gradient-undecided')?.components ?? [];
  if (named.length === 0) return { forced: false, why: 'unforced: no component named' };
  const components = report.probes[0]?.components ?? [];
  const unforced = named.filter((i) => !(Math.abs(trueGradient[i]) <= (components.find((c) => c.index === i)?.errorBound ?? 0)));
  return unforced.length === 0
    ? { forced: true, why: `forced: exact ${named.map((i) => `∂${i} = ${trueGradient[i].toExponential(1)}`).join(', ')} within the error bounds` }
    : { forced: false, why: `unforced: components ${unforced.join(', ')} exceed their bounds` };
}

const firstFinding = (report: PairReport) => report.findings.map((f) => `${f.code}: ${f.message}`).join(' | ').slice(0, 400);

export function runAccuracy(log: (line: string) => void): AccuracyResult {
  const started = Date.now();
  const result: AccuracyResult = { slopecheck: emptyTally(), baseline: emptyTally(), slopecheckFalseAlarms: [], slopecheckMissed: [], slopecheckInconclusiveOnCorrect: [], seconds: 0 };
  const cases = correctCases();
  cases.forEach((c, index) => {
    const report = runEngine(c, c.problem.g);
    const verdict = verdictOf(report);
    record(result.slopecheck, verdict, callsOf(report), null);
    if (verdict === 'fail') result.slopecheckFalseAlarms.push({ label: c.label, verdict, detail: firstFinding(report) });
    if (verdict === 'inconclusive') result.slopecheckInconclusiveOnCorrect.push({ label: c.label, verdict, ...whyUndecided(report, c.problem.g(c.point)), detail: firstFinding(report) });
    const base = forwardDifferenceCheck(c.problem.f, c.problem.g, c.point);
    record(result.baseline, base.verdict, base.evaluations, null);

    const trueGradient = c.problem.g(c.point);
    for (const mutant of mutantsAt(c.problem, c.point, 7000 + index)) {
      const mutated = runEngine(c, mutant.g);
      const mutatedVerdict = verdictOf(mutated);
      record(result.slopecheck, mutatedVerdict, callsOf(mutated), mutant.kind);
      if (mutatedVerdict !== 'fail') {
        result.slopecheckMissed.push({ label: c.label, kind: mutant.kind, relativeSize: mutant.relativeSize, verdict: mutatedVerdict, why: whyMissed(mutated, trueGradient, mutant.relativeSize), detail: firstFinding(mutated) });
      }
      const mutatedBase = forwardDifferenceCheck(c.problem.f, mutant.g, c.point);
      record(result.baseline, mutatedBase.verdict, mutatedBase.evaluations, mutant.kind);
    }
    if (index % 25 === 24) log(`  accuracy: ${index + 1}/${cases.length} correct cases and their mutants`);
  });
  for (const tally of [result.slopecheck, result.baseline]) tally.evaluationsPerCase /= tally.correctCases + tally.bugCases;
  result.seconds = (Date.now() - started) / 1000;
  return result;
}
