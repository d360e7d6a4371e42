// Runs INSIDE the sandbox's bare vm context, bundled with the engine as an IIFE
// (global `__slopecheckRunner`). No Node APIs here. Everything crossing to the
// host is a JSON string, so no object of this realm ever reaches the host.
import type { PairFunctions } from '../engine/checkPair';
import { checkByKind, type TargetCheck } from '../engine/kinds';
import type { CheckPlan, DeclaredParameter, Finding, FindingSubject, PairReport } from '../engine/types';
import { installConsole, takeConsole } from './consoleShim';
import { plainJson } from './plainJson';
import { installProcessStandIn } from './processStandIn';
import { errorReport, internalFinding } from './reports';
import { scopeHookGlobal } from './scopeHook';
import { cut } from './untrustedValues';
import { reportLimits } from './reportLimits';

export { installConsole, installProcessStandIn, takeConsole };

// Captured before user code runs, so a module that replaces them cannot garble the report.
// Reports are written by plainJson, which also ignores an inherited toJSON.
const stringify = plainJson;
const parse = JSON.parse;
const hasOwn = Object.hasOwn;
const now = Date.now;
const keysOf = Object.keys;
const getPrototypeOf = Object.getPrototypeOf;

/** The module's scope hook: scope key → thunk reading that module-level value. */
export type ModuleScope = Record<string, () => unknown>;

interface LoadedModule {
  exports: unknown;
}
let loadedScope: ModuleScope | null = null;

/**
 * Evaluates the user's CommonJS bundle through its wrapper function and takes the scope
 * hook the bundle's last lines set. Returns 'null' on success, else the JSON of an error report.
 */
export function loadModule(factory: (exports: unknown, module: LoadedModule, require: (name: string) => never) => void): string {
  const module: LoadedModule = { exports: {} };
  const require = (name: string): never => {
    throw new Error(`require('${String(name)}') is not available: the sandbox runs only self-contained modules.`);
  };
  try {
    factory.call(module.exports, module.exports, module, require);
    const scope = (globalThis as Record<string, unknown>)[scopeHookGlobal];
    loadedScope = typeof scope === 'object' && scope !== null ? (scope as ModuleScope) : {};
    return 'null';
  } catch (thrown) {
    return stringify(errorReport([thrownFinding(thrown, 'objective', 'Loading the module threw')]));
  }
}

/**
 * Runs the plan against the module loaded by `loadModule`. `endsAt` is the clock time by which
 * the engine must have reported (null for no budget): it then reports what it has decided.
 */
export function runLoaded(planJson: string, endsAt: number | null): string {
  if (!loadedScope) return stringify(errorReport([internalFinding('the module was not loaded')]));
  return run(loadedScope, planJson, null, endsAt);
}

/**
 * Resolves the plan's call recipe in `scope` and checks the target with the check of its kind
 * (or `check`, in tests); returns the JSON of a PairReport.
 */
export function run(scope: ModuleScope, planJson: string, check: TargetCheck | null = null, endsAt: number | null = null): string {
  const started = now();
  let report: PairReport;
  try {
    report = runPlan(scope, parse(planJson) as CheckPlan, check, endsAt);
  } catch (thrown) {
    report = errorReport([thrownFinding(thrown, 'objective', 'The check failed unexpectedly')], now() - started);
  }
  try {
    return stringify(capped(report));
  } catch (thrown) {
    return stringify(errorReport([thrownFinding(thrown, 'objective', 'The report could not be serialised')], now() - started));
  }
}

/** A value of the user's module, or the finding that says why it could not be had. */
type Read = { value: unknown } | { finding: Finding };

function runPlan(scope: ModuleScope, plan: CheckPlan, given: TargetCheck | null, endsAt: number | null): PairReport {
  const started = now();
  const check = given ?? (hasOwn(checkByKind, plan.kind) ? checkByKind[plan.kind] : null);
  if (!check) return errorReport([internalFinding(`the plan's kind '${String(plan.kind)}' has no check`)], now() - started);
  const read = (key: string): Read => readScope(scope, key);
  const functions = resolveFunctions(read, plan.recipe, plan.argumentKind);
  if (isFailure(functions)) return errorReport(functions.findings, now() - started);
  if (plan.residuals) {
    // The residuals an objective is built from; when they cannot be had, their own target says why.
    const residuals = resolveFunctions(read, plan.residuals, plan.argumentKind);
    if (!isFailure(residuals)) functions.residuals = residuals;
  }
  const probeFindings: Finding[] = [];
  const probes = plan.probes.map((point) => [...point]);
  for (const key of plan.probeKeys) {
    const point = readPoint(read(key), key, 'probe');
    if (Array.isArray(point)) probes.push(point);
    else probeFindings.push(point);
  }
  let startPoint: number[] | null = null;
  if (plan.start !== null && probes.length === 0) {
    const point = readPoint(read(plan.start), plan.start, 'start');
    if (!Array.isArray(point)) return errorReport([point], now() - started);
    startPoint = point;
  }
  const report = check(functions, probes, { dimension: plan.dimension, learningRate: plan.learningRate, options: plan.options, startPoint, endsAt }, now);
  report.findings = [...probeFindings, ...report.findings];
  return report;
}

type Resolved = PairFunctions | { findings: Finding[] };

/** An own property only: user code may have put `findings` on Object.prototype. */
function isFailure(resolved: Resolved): resolved is { findings: Finding[] } {
  return hasOwn(resolved, 'findings');
}

/** Turns a call recipe into the two functions the engine calls with a point. */
function resolveFunctions(read: (key: string) => Read, recipe: CheckPlan['recipe'], argumentKind: CheckPlan['argumentKind']): Resolved {
  const makeVector: PairFunctions['makeVector'] =
    argumentKind === 'float64array' ? (values) => new Float64Array(values) : copyToArray;
  const extra: unknown[] = [];
  for (let index = 0; index < recipe.extraArguments.length; index++) {
    const key = recipe.extraArguments[index];
    if (key === null) {
      extra.push(undefined);
      continue;
    }
    const argument = read(key);
    if ('finding' in argument) return { findings: [argument.finding] };
    const parameter = recipe.extraParameters?.[index];
    if (parameter && !hasShape(argument.value, parameter.shape)) {
      return { findings: [recipeFinding(key, `'${key}' is ${describeShape(argument.value)}, but the parameter \`${parameter.name}\` it is passed to is declared \`${parameter.declared}\`.`)] };
    }
    extra.push(argument.value);
  }
  let host: unknown = null;
  if (recipe.host) {
    const made = resolveHost(read, recipe.host);
    if ('finding' in made) return { findings: [made.finding] };
    host = made.value;
  }
  const functionOf = (name: string, subject: FindingSubject): ((x: unknown, ...direction: unknown[]) => unknown) | Finding => {
    const found = host === null ? read(name) : readMember(host, name, recipe.host!.key);
    if ('finding' in found) return { ...found.finding, subject };
    if (typeof found.value === 'function') {
      const fn = found.value as (...args: unknown[]) => unknown;
      // A product (x, v) ↦ H(x)v takes its direction after the point, before the data.
      return (x, ...direction) => fn.call(host, x, ...direction, ...extra);
    }
    const where = host === null ? `'${name}'` : `'${recipe.host!.key}.${name}'`;
    return { code: 'unresolved-target', severity: 'error', subject, message: `${where} is ${describeShape(found.value)}, not a function.` };
  };
  const value = functionOf(recipe.value, 'objective');
  if (typeof value !== 'function') return { findings: [value] };
  if (recipe.split) {
    const split = recipe.split;
    return {
      objective: (x) => pick(value(x), split.value),
      gradient: (x) => pick(value(x), split.derivative),
      makeVector,
    };
  }
  if (recipe.derivative === null) return { findings: [internalFinding('the plan names no derivative')] };
  const derivative = functionOf(recipe.derivative, 'gradient');
  if (typeof derivative !== 'function') return { findings: [derivative] };
  return { objective: value, gradient: derivative, makeVector };
}

/** The host object: a module-level value, or a new instance of a class that takes no arguments. */
function resolveHost(read: (key: string) => Read, host: NonNullable<CheckPlan['recipe']['host']>): Read {
  const found = read(host.key);
  if ('finding' in found || !host.construct) {
    if ('value' in found && (found.value === null || (typeof found.value !== 'object' && typeof found.value !== 'function'))) {
      return { finding: recipeFinding(host.key, `'${host.key}' is ${describeShape(found.value)}, not an object with methods.`) };
    }
    return found;
  }
  if (typeof found.value !== 'function') return { finding: recipeFinding(host.key, `'${host.key}' is ${describeShape(found.value)}, not a class.`) };
  try {
    return { value: new (found.value as new () => unknown)() };
  } catch (thrown) {
    return { finding: { ...thrownFinding(thrown, 'recipe', `Constructing 'new ${host.key}()' threw`), recipeKey: host.key } };
  }
}

// What user code can make long — messages and stacks of what it throws — is cut here, inside the
// context, to the caps the host holds reports to, so a huge string never crosses to the host.
function capped(report: PairReport): PairReport {
  for (const finding of report.findings) {
    finding.message = cut(String(finding.message), reportLimits.messageLength);
    if (typeof finding.stack === 'string') finding.stack = cut(finding.stack, reportLimits.stackLength);
  }
  return report;
}

/** A value of the module through its scope hook; a throw (TDZ, a getter, a missing name) becomes a finding. */
function readScope(scope: ModuleScope, key: string): Read {
  if (!hasOwn(scope, key) || typeof scope[key] !== 'function') {
    return { finding: recipeFinding(key, `'${key}' could not be reached in the module's scope.`) };
  }
  try {
    return { value: scope[key]() };
  } catch (thrown) {
    return { finding: { ...thrownFinding(thrown, 'recipe', `Reading '${key}' threw`), recipeKey: key } };
  }
}

function readMember(host: unknown, name: string, hostKey: string): Read {
  try {
    const value = (host as Record<string, unknown>)[name];
    if (value === undefined) {
      return { finding: recipeFinding(hostKey, `'${hostKey}' has no '${name}': it is ${describeShape(host)}.`) };
    }
    return { value };
  } catch (thrown) {
    return { finding: { ...thrownFinding(thrown, 'recipe', `Reading '${hostKey}.${name}' threw`), recipeKey: hostKey } };
  }
}

function recipeFinding(key: string, message: string): Finding {
  return { code: 'unresolved-target', severity: 'error', subject: 'recipe', recipeKey: key, message };
}

/** One half of a combined result; anything that is not a plain result object goes to the engine as is. */
function pick(result: unknown, key: string): unknown {
  if (typeof result !== 'object' || result === null) return result;
  if (typeof (result as { then?: unknown }).then === 'function') return result;
  return (result as Record<string, unknown>)[key];
}

/**
 * A point from the module, or the finding that says what it is instead: a bad probe const is
 * skipped with a warning; a bad start leaves nothing to check, so it is an error on its line.
 */
function readPoint(read: Read, key: string, role: 'probe' | 'start'): number[] | Finding {
  const bad = (why: string): Finding =>
    role === 'start'
      ? { code: 'unresolved-target', severity: 'error', subject: 'recipe', recipeKey: key, message: `The starting point '${key}' ${why}.` }
      : { code: 'bad-probe', severity: 'warning', subject: 'probe', message: `Probe '${key}' ${why}; it was skipped.` };
  if ('finding' in read) return role === 'start' ? read.finding : bad(read.finding.message.replace(/^'[^']*' /, ''));
  const value = read.value;
  if (!Array.isArray(value) && !(value instanceof Float64Array) && !(value instanceof Float32Array)) return bad(`is ${describeShape(value)}, not a number[] or Float64Array`);
  const point = Array.from(value as ArrayLike<unknown>);
  if (point.length === 0) return bad('is empty');
  if (!point.every((x) => typeof x === 'number' && Number.isFinite(x))) return bad('holds a value that is not a finite number');
  return point as number[];
}

/** Whether a data value can be what its parameter is declared as (checked on the first elements only). */
function hasShape(value: unknown, shape: DeclaredParameter['shape']): boolean {
  const isVector = (v: unknown) => ArrayBuffer.isView(v) || (Array.isArray(v) && (v.length === 0 || typeof v[0] === 'number'));
  switch (shape) {
    case 'number':
      return typeof value === 'number';
    case 'vector':
      return isVector(value);
    case 'matrix':
      return Array.isArray(value) && (value.length === 0 || isVector(value[0]));
    case 'object':
      return typeof value === 'object' && value !== null;
  }
}

/** What a value is, for messages: `an array of 20 arrays`, `an object with keys X, y`, `a number`. */
export function describeShape(value: unknown): string {
  try {
    if (value === null) return 'null';
    if (value === undefined) return 'undefined';
    if (Array.isArray(value)) {
      const first = value.length > 0 ? describeShape(value[0]).replace(/^an? /, '') : '';
      return value.length === 0 ? 'an empty array' : `an array of ${value.length} ${first}${value.length === 1 ? '' : 's'}`.replace(/ss$/, 's');
    }
    if (value instanceof Float64Array || value instanceof Float32Array) return `a ${value instanceof Float64Array ? 'Float64Array' : 'Float32Array'} of length ${value.length}`;
    if (typeof value === 'function') return 'a function';
    if (typeof value === 'object') {
      const keys = keysOf(value);
      const kind = getPrototypeOf(value) === Object.prototype || getPrototypeOf(value) === null ? 'an object' : `an instance of ${String((value as { constructor?: { name?: unknown } }).constructor?.name ?? 'a class')}`;
      return keys.length === 0 ? `${kind} with no own keys` : `${kind} with keys ${keys.slice(0, 8).join(', ')}${keys.length > 8 ? ', …' : ''}`;
    }
    return `a ${typeof value}`;
  } catch {
    return 'a value that cannot be described';
  }
}

/** A finding for a value thrown by user code, keeping its stack for the host to map to a line. */
function thrownFinding(thrown: unknown, subject: FindingSubject, context: string): Finding {
  let text: string;
  let stack: string | undefined;
  try {
    if (thrown instanceof Error) {
      text = `${thrown.name}: ${thrown.message}`;
      stack = typeof thrown.stack === 'string' ? thrown.stack : undefined;
    } else {
      text = `the value ${String(thrown)}`;
    }
  } catch {
    text = 'a value that cannot be described';
  }
  return { code: 'runtime-error', severity: 'error', subject, message: `${context}: ${text}`, ...(stack ? { stack } : {}) };
}

/** A plain array copy; a loop, because Array.from over a large typed array dominates a check's time. */
function copyToArray(values: ArrayLike<number>): number[] {
  const out = new Array<number>(values.length);
  for (let i = 0; i < values.length; i++) out[i] = values[i];
  return out;
}
