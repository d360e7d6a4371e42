// Readers of plain data from another process (parsed JSON), for validateReport. A reader
// accepts exactly one shape and returns a fresh value, or throws Malformed naming where and
// what was wrong. Only own data properties are read (no getter runs, nothing inherited counts),
// and lists and texts are cut to their cap before anything is copied.

/** What was wrong with a value, and where (`report.findings[3].severity`). */
export class Malformed extends Error {}

/** Reads the value found at `at` (a path, for messages). */
export type Reader<T> = (value: unknown, at: string) => T;

/** An own data property's value; never runs a getter or reads the prototype chain. */
export function ownValue(holder: object, key: string | number): unknown {
  const descriptor = Object.getOwnPropertyDescriptor(holder, key);
  return descriptor !== undefined && 'value' in descriptor ? descriptor.value : undefined;
}

export function isRecord(value: unknown): value is object {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

type RequiredKeys<T> = { [K in keyof T]-?: undefined extends T[K] ? never : K }[keyof T];
type OptionalKeys<T> = Exclude<keyof T, RequiredKeys<T>>;

/**
 * An object of type T, read field by field into a fresh object; fields not named are left behind.
 * Every field of T needs an entry, so the compiler points at a field added to T and not read here;
 * an optional field's entry may be 'not read', to drop it on purpose.
 */
export function objectOf<T>(
  required: { [K in RequiredKeys<T>]-?: Reader<T[K]> },
  optional: { [K in OptionalKeys<T>]-?: Reader<NonNullable<T[K]>> | 'not read' },
): Reader<T> {
  return (value, at) => {
    if (!isRecord(value)) throw new Malformed(`${at} is ${kindOf(value)}, not an object`);
    const result: Record<string, unknown> = {};
    for (const [key, read] of Object.entries(required) as Array<[string, Reader<unknown>]>) result[key] = read(ownValue(value, key), `${at}.${key}`);
    for (const [key, read] of Object.entries(optional) as Array<[string, Reader<unknown> | 'not read']>) {
      const field = ownValue(value, key);
      if (field !== undefined && read !== 'not read') result[key] = read(field, `${at}.${key}`);
    }
    return result as T;
  };
}

/** A list's first `max` entries, each read by `read`. */
export function listOf<T>(read: Reader<T>, max: number): Reader<T[]> {
  return (value, at) => {
    const entries = arrayAt(value, at);
    const length = Math.min(entries.length, max);
    const result: T[] = [];
    for (let i = 0; i < length; i++) result.push(read(ownValue(entries, i), `${at}[${i}]`));
    return result;
  };
}

/**
 * Up to `max` entries of lowest rank (ties by position), in their order, each read by `read`.
 * A list over a hundred times `max` is refused: ranking all of it would cost more than it is worth.
 */
export function mostTellingOf<T>(read: Reader<T>, max: number, rank: (entry: unknown) => number): Reader<T[]> {
  return (value, at) => {
    const entries = arrayAt(value, at);
    if (entries.length > 100 * max) throw new Malformed(`${at} has ${entries.length} entries, more than ${100 * max}`);
    const ranks = Array.from({ length: entries.length }, (_, i) => rank(ownValue(entries, i)));
    const kept: number[] = [];
    for (const r of [...new Set(ranks)].sort((a, b) => a - b)) {
      for (let i = 0; i < ranks.length && kept.length < max; i++) if (ranks[i] === r) kept.push(i);
    }
    return kept.sort((a, b) => a - b).map((i) => read(ownValue(entries, i), `${at}[${i}]`));
  };
}

export function oneOf<T extends string>(words: readonly T[]): Reader<T> {
  return (value, at) => {
    if (typeof value === 'string' && (words as readonly string[]).includes(value)) return value as T;
    throw new Malformed(`${at} is ${kindOf(value)}, not one of ${words.join(', ')}`);
  };
}

export function nullOr<T>(read: Reader<T>): Reader<T | null> {
  return (value, at) => (value === null ? null : read(value, at));
}

/** Text of at most `max` characters; longer text is cut, with a marker. */
export function textUpTo(max: number): Reader<string> {
  return (value, at) => {
    if (typeof value !== 'string') throw new Malformed(`${at} is ${kindOf(value)}, not text`);
    return cut(value, max);
  };
}

export const finite: Reader<number> = (value, at) => {
  if (typeof value === 'number' && Number.isFinite(value)) return value;
  throw new Malformed(`${at} is ${kindOf(value)}, not a finite number`);
};

/**
 * A measured number. NaN and ±Infinity cross the process boundary as JSON's null, and the
 * report's readers expect null there, so null (or a non-finite number) is kept as null.
 */
export const measurement: Reader<number> = (value, at) => {
  if (value === null || (typeof value === 'number' && !Number.isFinite(value))) return null as unknown as number;
  return finite(value, at);
};

export const nonNegative: Reader<number> = (value, at) => {
  const number = finite(value, at);
  if (number < 0) throw new Malformed(`${at} is negative`);
  return number;
};

/** A count or an index: a non-negative integer. */
export const count: Reader<number> = (value, at) => {
  if (typeof value === 'number' && Number.isSafeInteger(value) && value >= 0) return value;
  throw new Malformed(`${at} is ${kindOf(value)}, not a count`);
};

/** Two counts, as in a pair of swapped component indices. */
export const countPair: Reader<[number, number]> = (value, at) => {
  if (!Array.isArray(value) || value.length !== 2) throw new Malformed(`${at} is ${kindOf(value)}, not a pair of indices`);
  return [count(ownValue(value, 0), `${at}[0]`), count(ownValue(value, 1), `${at}[1]`)];
};

export const boolean: Reader<boolean> = (value, at) => {
  if (typeof value === 'boolean') return value;
  throw new Malformed(`${at} is ${kindOf(value)}, not true or false`);
};

/**
 * At most `max` characters, with a marker when cut. The kept part is copied (join builds a
 * new string): a slice would keep the whole original alive, tens of megabytes, as long as
 * the report is cached.
 */
export function cut(value: string, max: number): string {
  if (value.length <= max) return value;
  const marker = ` … [cut: ${value.length} characters in all]`;
  let end = Math.max(0, max - marker.length);
  // Never split a surrogate pair.
  if (end > 0 && /[\uD800-\uDBFF]/.test(value[end - 1])) end--;
  return [value.slice(0, end), marker].join('');
}

/** The members of a string union, listed once as the keys of a record the compiler checks complete. */
export function wordsOf<T extends string>(members: Record<T, true>): readonly T[] {
  return Object.keys(members) as T[];
}

function arrayAt(value: unknown, at: string): unknown[] {
  if (!Array.isArray(value)) throw new Malformed(`${at} is ${kindOf(value)}, not a list`);
  return value;
}

/** What a value is, for messages; never a text of the value itself, which may be huge or hostile. */
function kindOf(value: unknown): string {
  if (value === null) return 'null';
  if (value === undefined) return 'missing';
  if (Array.isArray(value)) return 'a list';
  if (typeof value === 'number') return `the number ${value}`;
  if (typeof value === 'string') return `a text of ${value.length} characters`;
  return typeof value === 'object' ? 'an object' : `a ${typeof value}`;
}
