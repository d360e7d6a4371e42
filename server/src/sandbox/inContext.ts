// Runs INSIDE the sandbox's bare vm context, bundled with the engine as an IIFE
// (global `__slopecheckRunner`). No Node APIs here. Everything crossing to the
// host is a JSON string, so no object of this realm ever reaches the host.
import { checkPair } from '../engine/checkPair';
import type { PairFunctions } from '../engine/checkPair';
import type { CheckPlan, Finding, FindingSubject, PairReport } from '../engine/types';
import { installConsole, takeConsole } from './consoleShim';
import { plainJson } from './plainJson';
import { errorReport, internalFinding } from './reports';

export { installConsole, takeConsole };

// Captured before user code runs, so a module that replaces them cannot garble the report.
// Reports are written by plainJson, which also ignores an inherited toJSON.
const stringify = plainJson;
const parse = JSON.parse;
const hasOwn = Object.hasOwn;
const now = Date.now;

interface LoadedModule {
  exports: unknown;
}
let loaded: LoadedModule | null = null;

/**
 * Evaluates the user's CommonJS bundle through its wrapper function.
 * Returns 'null' on success, else the JSON of an error report.
 */
export function loadModule(factory: (exports: unknown, module: LoadedModule, require: (name: string) => never) => void): string {
  const module: LoadedModule = { exports: {} };
  const require = (name: string): never => {
    throw new Error(`require('${String(name)}') is not available: the sandbox runs only self-contained modules.`);
  };
  try {
    factory.call(module.exports, module.exports, module, require);
    loaded = module;
    return 'null';
  } catch (thrown) {
    return stringify(errorReport([thrownFinding(thrown, 'objective', 'Loading the module threw')]));
  }
}

/** Runs the plan against the module loaded by `loadModule`. */
export function runLoaded(planJson: string): string {
  if (!loaded) return stringify(errorReport([internalFinding('the module was not loaded')]));
  return run(loaded.exports, planJson);
}

/** Resolves the plan's exports on `moduleExports` and checks the pair; returns the JSON of a PairReport. */
export function run(moduleExports: unknown, planJson: string, check: typeof checkPair = checkPair): string {
  const started = now();
  let report: PairReport;
  try {
    report = runPlan(moduleExports, parse(planJson) as CheckPlan, check);
  } catch (thrown) {
    report = errorReport([thrownFinding(thrown, 'objective', 'The check failed unexpectedly')], now() - started);
  }
  try {
    return stringify(report);
  } catch (thrown) {
    return stringify(errorReport([thrownFinding(thrown, 'objective', 'The report could not be serialised')], now() - started));
  }
}

function runPlan(moduleExports: unknown, plan: CheckPlan, check: typeof checkPair): PairReport {
  const started = now();
  const functions = resolveFunctions(moduleExports, plan);
  if (isFailure(functions)) return errorReport(functions.findings, now() - started);
  const probeFindings: Finding[] = [];
  const probes = plan.probes.map((point) => [...point]);
  for (const name of plan.probeExports) {
    const point = readProbe(moduleExports, name);
    if (Array.isArray(point)) probes.push(point);
    else probeFindings.push(point);
  }
  const report = check(functions, probes, plan, now);
  report.findings = [...probeFindings, ...report.findings];
  return report;
}

type Resolved = PairFunctions | { findings: Finding[] };

/** An own property only: user code may have put `findings` on Object.prototype. */
function isFailure(resolved: Resolved): resolved is { findings: Finding[] } {
  return hasOwn(resolved, 'findings');
}

function resolveFunctions(moduleExports: unknown, plan: CheckPlan): Resolved {
  const makeVector: PairFunctions['makeVector'] =
    plan.argumentKind === 'float64array' ? (values) => new Float64Array(values) : copyToArray;
  const objective = readFunction(moduleExports, plan.objective, 'objective');
  if (typeof objective !== 'function') return { findings: [objective] };
  if (plan.combined) {
    const { valueKey, gradientKey } = plan.combined;
    return {
      objective: (x) => pick(objective(x), valueKey),
      gradient: (x) => pick(objective(x), gradientKey),
      makeVector,
    };
  }
  if (plan.gradient === null) return { findings: [internalFinding('the plan names no gradient')] };
  const gradient = readFunction(moduleExports, plan.gradient, 'gradient');
  if (typeof gradient !== 'function') return { findings: [gradient] };
  return { objective: (x) => objective(x), gradient: (x) => gradient(x), makeVector };
}

/** One half of a combined result; anything that is not a plain result object goes to the engine as is. */
function pick(result: unknown, key: string): unknown {
  if (typeof result !== 'object' || result === null) return result;
  if (typeof (result as { then?: unknown }).then === 'function') return result;
  return (result as Record<string, unknown>)[key];
}

function readExport(moduleExports: unknown, name: string): { value: unknown } | { thrown: unknown } {
  try {
    return { value: (moduleExports as Record<string, unknown>)[name] };
  } catch (thrown) {
    return { thrown };
  }
}

function readFunction(moduleExports: unknown, name: string, subject: FindingSubject): ((x: unknown) => unknown) | Finding {
  const read = readExport(moduleExports, name);
  if ('thrown' in read) return thrownFinding(read.thrown, subject, `Reading the export '${name}' threw`);
  if (typeof read.value === 'function') return read.value as (x: unknown) => unknown;
  const found = read.value === undefined ? 'is not exported' : `is exported as ${describeType(read.value)}, not a function`;
  return { code: 'missing-export', severity: 'error', subject, message: `'${name}' ${found}.` };
}

function readProbe(moduleExports: unknown, name: string): number[] | Finding {
  const badProbe = (why: string): Finding => ({ code: 'bad-probe', severity: 'warning', subject: 'probe', message: `Probe '${name}' ${why}; it was skipped.` });
  const read = readExport(moduleExports, name);
  if ('thrown' in read) return thrownFinding(read.thrown, 'probe', `Reading the probe '${name}' threw`);
  const value = read.value;
  if (value === undefined) return badProbe('is not exported');
  if (!Array.isArray(value) && !(value instanceof Float64Array)) return badProbe(`is ${describeType(value)}, not a number[] or Float64Array`);
  const point = Array.from(value as ArrayLike<unknown>);
  if (point.length === 0) return badProbe('is empty');
  if (!point.every((x) => typeof x === 'number' && Number.isFinite(x))) return badProbe('holds a value that is not a finite number');
  return point as number[];
}

function describeType(value: unknown): string {
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'an array';
  return `a ${typeof value}`;
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
