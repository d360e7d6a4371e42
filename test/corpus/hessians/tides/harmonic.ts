// Exact derivatives of the tidal harmonic misfit (tides/harmonic.ts), data copied in.
// f(c) = (1/2n) sum_i (c . phi(t_i) - h_i)^2, phi = [1, cos w1 t, sin w1 t, cos w2 t, sin w2 t]
// grad = (1/n) sum_i r_i phi_i;  H = (1/n) sum_i phi_i phi_i^T (constant)

const W1 = (2 * Math.PI) / 12.42;
const W2 = (2 * Math.PI) / 23.93;
const LEVEL = [
  3.75, 3.3, 1.87, 0.59, 0.65, 1.8, 3.04, 3.17, 2.19, 1.13, 1.11, 2.24, 3.47, 3.59, 2.42, 0.94, 0.37,
  1.21, 2.63, 3.35, 2.77, 1.56, 0.99, 1.72, 2.98, 3.66,
];
const phis = LEVEL.map((_, i) => {
  const t = 2 * i;
  return [1, Math.cos(W1 * t), Math.sin(W1 * t), Math.cos(W2 * t), Math.sin(W2 * t)];
});

export const start = [2, 1, 0.5, 0.5, -0.5];

export function gradient(c: number[]): number[] {
  const g = [0, 0, 0, 0, 0];
  phis.forEach((phi, i) => {
    const r = phi.reduce((s, v, k) => s + v * c[k], 0) - LEVEL[i];
    for (let k = 0; k < 5; k++) g[k] += (r * phi[k]) / phis.length;
  });
  return g;
}

export function hessian(_c: number[]): number[][] {
  return [0, 1, 2, 3, 4].map((a) => [0, 1, 2, 3, 4].map((b) => phis.reduce((s, phi) => s + (phi[a] * phi[b]) / phis.length, 0)));
}
