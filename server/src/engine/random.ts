// Seeded pseudo-random numbers, so every probe and direction is repeatable.

export interface Random {
  /** Uniform in [0, 1). */
  uniform(): number;
  /** Standard normal. */
  normal(): number;
}

/** mulberry32 generator (common practice for small seeded streams); `stream` separates independent uses. */
export function createRandom(seed: number, stream = 0): Random {
  let state = (Math.imul((Math.floor(seed) | 0) ^ 0x5bd1e995, 0x9e3779b1) + Math.imul(stream + 1, 0x85ebca6b)) | 0;
  let spare: number | null = null;
  function uniform(): number {
    state = (state + 0x6d2b79f5) | 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }
  // Box–Muller transform; the second variate is kept for the next call.
  function normal(): number {
    if (spare !== null) {
      const value = spare;
      spare = null;
      return value;
    }
    let u = uniform();
    while (u === 0) u = uniform();
    const radius = Math.sqrt(-2 * Math.log(u));
    const angle = 2 * Math.PI * uniform();
    spare = radius * Math.sin(angle);
    return radius * Math.cos(angle);
  }
  return { uniform, normal };
}

export function normalVector(random: Random, n: number): Float64Array {
  const v = new Float64Array(n);
  for (let i = 0; i < n; i++) v[i] = random.normal();
  return v;
}
