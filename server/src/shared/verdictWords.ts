// The words for a pair's verdict, one set for every place a user reads them
// (diagnostics, hover, code lens, quick pick, report).
import type { PairStatus } from '../engine/types';

export const verdictWords: Record<PairStatus, string> = {
  pass: 'gradient matches',
  fail: 'gradient wrong',
  inconclusive: 'undecided',
  error: 'not checked',
};

/** The same verdicts as counts: "3 matching, 2 wrong". */
export const verdictCountWords: Record<PairStatus, string> = {
  pass: 'matching',
  fail: 'wrong',
  inconclusive: 'undecided',
  error: 'not checked',
};
