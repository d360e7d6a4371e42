// Small dense-vector helpers on Float64Array (engine-internal vectors only).

export function dot(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let sum = 0;
  for (let i = 0; i < a.length; i++) sum += a[i] * b[i];
  return sum;
}

/** ½‖r‖². */
export function halfSquaredNorm(r: ArrayLike<number>): number {
  return 0.5 * dot(r, r);
}

export function norm2(a: ArrayLike<number>): number {
  return Math.sqrt(dot(a, a));
}


/** x + t·v as a new vector. */
export function offset(x: ArrayLike<number>, t: number, v: ArrayLike<number>): Float64Array {
  const out = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) out[i] = x[i] + t * v[i];
  return out;
}

/** eⱼ of length n. */
export function unitVector(n: number, j: number): Float64Array {
  const e = new Float64Array(n);
  e[j] = 1;
  return e;
}

/** x with component `index` moved by t. */
export function offsetComponent(x: Float64Array, index: number, t: number): Float64Array {
  const out = new Float64Array(x);
  out[index] += t;
  return out;
}


export function allFinite(a: ArrayLike<number>): boolean {
  for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) return false;
  return true;
}


/** The largest value (−Infinity for none), read in a loop: spreading a long array into Math.max overflows the stack. */
export function largest(values: Iterable<number>): number {
  let result = Number.NEGATIVE_INFINITY;
  for (const v of values) if (v > result) result = v;
  return result;
}

/** The smallest value (Infinity for none), read in a loop (see largest). */
export function smallest(values: Iterable<number>): number {
  let result = Number.POSITIVE_INFINITY;
  for (const v of values) if (v < result) result = v;
  return result;
}
