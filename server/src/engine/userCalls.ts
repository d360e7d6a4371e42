// Every call into the user's objective and gradient goes through here: it counts
// evaluations, hands over vectors made in the user's realm, copies results out,
// and turns anything unusual (throws, thenables, wrong shapes, mutation) into findings.
import type { PairFunctions } from './checkPair';
import type { Finding, FindingCode, FindingSubject } from './types';

/** Thrown inside the engine to stop a check with a finding; caught by checkPair. */
export class CheckStopped {
  constructor(readonly finding: Finding) {}
}

/**
 * Thrown before a call that would end past the time budget: the check reports what it has
 * decided so far (checkPair), instead of being stopped from outside with nothing.
 */
export class BudgetSpent {}

/** When the engine must stop starting calls, on the clock it is given. */
export interface CallBudget {
  clock(): number;
  /** Clock time by which the last call must have ended; null for none. */
  endsAt: number | null;
}

/** Where a call happens, for messages: probe index and what the point is. */
export interface CallSite {
  probeIndex: number;
  /** e.g. 'the probe', 'a finite-difference point', 'a descent iterate'. */
  point: string;
}

export interface UserCalls {
  readonly dimension: number;
  /** What messages call the two functions. */
  readonly roles: CallRoles;
  readonly counts: { objective: number; gradient: number };
  /** f(x); may be non-finite (callers decide what that means). */
  objective(x: Float64Array, site: CallSite): number;
  /**
   * ∇f(x) copied into plain numbers; checked for length, may hold non-finite values. With
   * `direction`, the derivative function is a product (x, v) ↦ H(x)v and this is its result.
   */
  gradient(x: Float64Array, site: CallSite, direction?: Float64Array): Float64Array;
  /**
   * The value function's result as a vector (the residuals r(x), or the gradient a Hessian is
   * checked against), copied out; every call must give as many values as the first.
   */
  outputs(x: Float64Array, site: CallSite): Float64Array;
  /** The derivative function's raw result (a matrix, or a product with `direction`), for the caller to read. */
  derivativeResult(x: Float64Array, site: CallSite, direction?: Float64Array): unknown;
  /** Warnings noticed along the way (input mutation), each reported once. */
  readonly warnings: Finding[];
  /** Calls of the objective and the gradient so far. */
  made(): number;
  /** Mean clock time of one call so far (of `which`, else of both together), 0 before any. */
  meanCallMs(which?: 'objective' | 'gradient'): number;
  /** Clock time left in the budget; Infinity without one. */
  remainingMs(): number;
}

/** What messages call the two functions: 'objective' and 'gradient', or e.g. 'residual function' and 'Jacobian'. */
export interface CallRoles {
  objective: string;
  gradient: string;
}

const gradientRoles: CallRoles = { objective: 'objective', gradient: 'gradient' };

export function createUserCalls(fns: PairFunctions, dimension: number, budget: CallBudget = { clock: () => 0, endsAt: null }, roles: CallRoles = gradientRoles): UserCalls {
  const counts = { objective: 0, gradient: 0 };
  const spentMs = { objective: 0, gradient: 0 };
  const made = () => counts.objective + counts.gradient;
  const meanCallMs = (which?: 'objective' | 'gradient') => {
    const calls = which ? counts[which] : made();
    const spent = which ? spentMs[which] : spentMs.objective + spentMs.gradient;
    return calls > 0 ? spent / calls : 0;
  };
  const remainingMs = () => (budget.endsAt === null ? Number.POSITIVE_INFINITY : budget.endsAt - budget.clock());
  const warnings: Finding[] = [];
  const mutationSeen = { objective: false, gradient: false };

  let outputCount: number | null = null;

  function call(which: 'objective' | 'gradient', x: Float64Array, site: CallSite, direction?: Float64Array): unknown {
    let argument: unknown;
    let directionArgument: unknown;
    try {
      argument = fns.makeVector(x);
      if (direction) directionArgument = fns.makeVector(direction);
    } catch (err) {
      throw stop('runtime-error', which, `could not build the argument vector for the ${roles[which]} at ${describeSite(site)}: ${describeThrown(err).text}`, site);
    }
    // A call expected to end past the budget is not started.
    const started = budget.clock();
    if (budget.endsAt !== null && budget.endsAt - started < meanCallMs(counts[which] > 0 ? which : undefined)) throw new BudgetSpent();
    counts[which]++;
    let result: unknown;
    try {
      result = which === 'objective' ? fns.objective(argument as Float64Array) : direction ? fns.gradient(argument as Float64Array, directionArgument as Float64Array) : fns.gradient(argument as Float64Array);
      spentMs[which] += Math.max(0, budget.clock() - started);
    } catch (err) {
      // A function the engine built over the user's (½‖r‖² over the residuals) passes their stops on.
      if (err instanceof CheckStopped || err instanceof BudgetSpent) throw err;
      const thrown = describeThrown(err);
      const finding = makeFinding('runtime-error', which, `the ${roles[which]} threw at ${describeSite(site)}: ${thrown.text}`, site);
      if (thrown.stack !== undefined) finding.stack = thrown.stack;
      throw new CheckStopped(finding);
    }
    if (isThenable(result)) {
      throw stop('async-result', which, `the ${roles[which]} returned a promise (or other thenable) at ${describeSite(site)}; it must return its result synchronously`, site);
    }
    checkMutation(which, argument, x, site);
    return result;
  }

  function checkMutation(which: 'objective' | 'gradient', argument: unknown, original: Float64Array, site: CallSite): void {
    if (mutationSeen[which]) return;
    let changed = -1;
    try {
      const seen = argument as ArrayLike<unknown>;
      for (let i = 0; i < original.length; i++) {
        if (!sameNumber(seen[i], original[i])) {
          changed = i;
          break;
        }
      }
    } catch {
      changed = 0;
    }
    if (changed < 0) return;
    mutationSeen[which] = true;
    const finding = makeFinding('input-mutated', which, `the ${roles[which]} changes its input vector (component ${changed} at ${describeSite(site)}); callers that reuse the point will see a different point`, site);
    finding.severity = 'warning';
    finding.components = [changed];
    warnings.push(finding);
  }

  return {
    dimension,
    roles,
    counts,
    warnings,
    made,
    meanCallMs,
    remainingMs,
    objective(x, site) {
      const result = call('objective', x, site);
      if (typeof result !== 'number') {
        throw stop('objective-not-a-number', 'objective', `the objective returned ${describeKind(result)} instead of a number at ${describeSite(site)}`, site);
      }
      return result;
    },
    gradient(x, site, direction) {
      const result = call('gradient', x, site, direction);
      const values = readNumbers(result, site, 'gradient', roles.gradient);
      if (values.length !== dimension) {
        throw stop('gradient-wrong-length', 'gradient', `the ${roles.gradient} has ${values.length} components but the point has ${dimension} (at ${describeSite(site)})`, site);
      }
      return values;
    },
    outputs(x, site) {
      const values = readNumbers(call('objective', x, site), site, 'objective', roles.objective);
      if (outputCount === null) outputCount = values.length;
      if (values.length !== outputCount || values.length === 0) {
        throw stop('value-not-a-vector', 'objective', `the ${roles.objective} returned ${values.length} values at ${describeSite(site)} but ${outputCount} at its first call`, site);
      }
      return values;
    },
    derivativeResult(x, site, direction) {
      return call('gradient', x, site, direction);
    },
  };
}

/** Copies an array-like of numbers out of the user's realm. */
function readNumbers(result: unknown, site: CallSite, which: 'objective' | 'gradient', role: string): Float64Array {
  const notAVector = () => stop(which === 'gradient' ? 'gradient-not-a-vector' : 'value-not-a-vector', which, `the ${role} returned ${describeKind(result)}, not an array of numbers (at ${describeSite(site)})`, site);
  if (result === null || typeof result !== 'object') throw notAVector();
  try {
    const source = result as ArrayLike<unknown>;
    const length = source.length;
    if (typeof length !== 'number' || !Number.isInteger(length) || length < 0 || length > 2 ** 31) throw notAVector();
    const out = new Float64Array(length);
    for (let i = 0; i < length; i++) {
      const value = source[i];
      if (typeof value !== 'number') throw notAVector();
      out[i] = value;
    }
    return out;
  } catch (err) {
    if (err instanceof CheckStopped) throw err;
    const thrown = describeThrown(err);
    const finding = makeFinding('runtime-error', which, `reading the ${role}'s result threw at ${describeSite(site)}: ${thrown.text}`, site);
    if (thrown.stack !== undefined) finding.stack = thrown.stack;
    throw new CheckStopped(finding);
  }
}

/** "probe 2" or "a secant point near probe 2": probes are numbered from 1, as the user counts @probe tags. */
export function describeSite(site: CallSite): string {
  const probe = `probe ${site.probeIndex + 1}`;
  return site.point === 'the probe' ? probe : `${site.point} near ${probe}`;
}

export function makeFinding(code: FindingCode, subject: FindingSubject, message: string, site?: CallSite): Finding {
  const finding: Finding = { code, severity: 'error', message, subject };
  if (site !== undefined && site.probeIndex >= 0) finding.probeIndex = site.probeIndex;
  return finding;
}

function stop(code: FindingCode, subject: FindingSubject, message: string, site: CallSite): CheckStopped {
  return new CheckStopped(makeFinding(code, subject, message, site));
}

function sameNumber(a: unknown, b: number): boolean {
  return a === b || (typeof a === 'number' && a !== a && b !== b);
}

function isThenable(value: unknown): boolean {
  if (value === null || (typeof value !== 'object' && typeof value !== 'function')) return false;
  try {
    return typeof (value as { then?: unknown }).then === 'function';
  } catch {
    return false;
  }
}

/** Text and stack of anything thrown, without trusting its getters or toString. */
export function describeThrown(err: unknown): { text: string; stack?: string } {
  let stack: string | undefined;
  try {
    if (err !== null && (typeof err === 'object' || typeof err === 'function')) {
      const raw = (err as { stack?: unknown }).stack;
      if (raw !== undefined && raw !== null) stack = String(raw);
    }
  } catch {
    stack = undefined;
  }
  let text: string;
  try {
    text = String(err);
  } catch {
    try {
      text = Object.prototype.toString.call(err);
    } catch {
      text = 'an unprintable value';
    }
  }
  return stack === undefined ? { text } : { text, stack };
}

function describeKind(value: unknown): string {
  if (value === null) return 'null';
  if (value === undefined) return 'undefined';
  if (typeof value === 'object') {
    try {
      return Array.isArray(value) ? 'an array' : 'an object';
    } catch {
      return 'an object';
    }
  }
  return `a ${typeof value}`;
}
