// User settings of Slopecheck (contributes.configuration in package.json mirrors these).
// Every field has a default, so a client that sends no settings still gets checks.
import { defaultCheckOptions } from '../engine/types';

export interface SlopecheckSettings {
  /** When documents are checked: on open and save, or also while typing (debounced). */
  checkWhen: 'openAndSave' | 'typing';
  /** Pause after the last keystroke before a check, with checkWhen = typing. */
  typingDelayMs: number;
  /** Time limit for checking one pair. */
  timeoutMs: number;
  /** Heap limit of the sandbox process. */
  memoryMb: number;
  /** Random probes per pair when no @probe is given. */
  probeCount: number;
  seed: number;
  /** Up to this dimension every component is differenced; above it, random directions. */
  fullCheckMaxDimension: number;
}

/** The least memory a sandbox process may be given, in MB: it boots in about 60. */
export const memoryFloorMb = 128;

export const defaultSettings: SlopecheckSettings = {
  checkWhen: 'openAndSave',
  typingDelayMs: 600,
  // Enough for the gradient verdict at one probe of an objective taking 50 ms per call at n = 20 (about 170 calls).
  timeoutMs: 10000,
  memoryMb: 512,
  probeCount: defaultCheckOptions.probeCount,
  seed: defaultCheckOptions.seed,
  fullCheckMaxDimension: defaultCheckOptions.fullCheckMaxDimension,
};

/** Merges what a client sent over the defaults, ignoring values of the wrong type or range. */
export function readSettings(raw: unknown): SlopecheckSettings {
  const given = (raw && typeof raw === 'object' ? raw : {}) as Record<string, unknown>;
  const number = (key: keyof SlopecheckSettings, min: number, max: number): number => {
    const v = given[key];
    return typeof v === 'number' && Number.isFinite(v) && v >= min && v <= max ? v : (defaultSettings[key] as number);
  };
  return {
    checkWhen: given.checkWhen === 'typing' ? 'typing' : 'openAndSave',
    typingDelayMs: number('typingDelayMs', 0, 60_000),
    timeoutMs: number('timeoutMs', 100, 600_000),
    memoryMb: number('memoryMb', memoryFloorMb, 16_384),
    probeCount: Math.round(number('probeCount', 1, 50)),
    seed: Math.round(number('seed', 0, 2 ** 31)),
    fullCheckMaxDimension: Math.round(number('fullCheckMaxDimension', 1, 10_000)),
  };
}
