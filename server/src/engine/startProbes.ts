// Probe points around the user's own starting point. Probe 1 is the start itself; the
// others are seeded perturbations scaled per coordinate to |xᵢ|, so they stay where the
// user's descent will go, not at standard-normal points far from it.
import type { Random } from './random';

/** Relative size of the perturbations: near probes, and the one kept farther away. */
const nearRadius = 0.1;
const farRadius = 0.5;

/**
 * `count` points (at least two): the start, near perturbations, and a last one farther
 * away, so that a bug confined to part of the domain can still show. Each coordinate
 * moves by at most radius·sᵢ with sᵢ = |xᵢ| (uniform, not normal, so a positive
 * coordinate stays positive); a zero coordinate borrows the typical size of the others.
 */
export function probesAroundStart(start: Float64Array, count: number, random: Random): Float64Array[] {
  const scales = coordinateScales(start);
  const points = [Float64Array.from(start)];
  const total = Math.max(2, count);
  for (let p = 1; p < total; p++) {
    const radius = p === total - 1 ? farRadius : nearRadius;
    const point = new Float64Array(start.length);
    for (let i = 0; i < start.length; i++) point[i] = start[i] + radius * scales[i] * (2 * random.uniform() - 1);
    points.push(point);
  }
  return points;
}

/** sᵢ = |xᵢ|, or for xᵢ = 0 the root mean square of the non-zero |xⱼ| (1 when every coordinate is 0). */
export function coordinateScales(x: Float64Array): Float64Array {
  let sum = 0;
  let count = 0;
  for (let i = 0; i < x.length; i++) {
    if (x[i] !== 0) {
      sum += x[i] * x[i];
      count++;
    }
  }
  const typical = count > 0 ? Math.sqrt(sum / count) : 1;
  const scales = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) scales[i] = x[i] !== 0 ? Math.abs(x[i]) : typical;
  return scales;
}
