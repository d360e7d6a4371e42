// The sizes a sandbox report may have. One set, held on both sides: the sandbox cuts to them
// inside the user's realm, so nothing huge crosses, and the host holds every reply to them again.
import { shownEntries } from '../engine/matrixProbe';

/** Caps. A finding's message and stack carry a marker when cut; lists keep their first (or most telling) entries. */
export const reportLimits = {
  messageLength: 2_000,
  /** Stacks, and the scope keys of recipe findings (a longer key no longer names its line; the finding stays on the objective). */
  stackLength: 8_000,
  nameLength: 500,
  /** Findings per report: the most severe are kept, in their order. */
  findings: 50,
  probes: 100,
  /** Components per probe (the fullCheckMaxDimension setting allows 10 000), mismatched ones kept first. */
  components: 1_000,
  directions: 100,
  /** Entries of a Jacobian or Hessian per probe (a 64 by 64 heat map), as the engine keeps them. */
  entries: shownEntries,
  descentRuns: 10,
  /** Any list of numbers: a probe's coordinates, Ritz values, descent values, steps, component indices. */
  numbers: 1_000,
  /** The whole report as JSON, in characters. */
  reportLength: 8 * 1024 * 1024,
  consoleLines: 200,
  consoleLineLength: 2_000,
  consoleLength: 20_000,
} as const;
