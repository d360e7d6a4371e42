// Exact derivatives of the hive-weight fit (beekeeping/hive-weight.ts), data copied in.
// f(p) = (1/n) sum_i (p . phi_i - kg_i)^2, phi = [1, t, sin(2 pi t), cos(2 pi t)]
// grad = (2/n) sum_i r_i phi_i;  H = (2/n) sum_i phi_i phi_i^T (constant)

const KG = [
  40.98, 41.29, 41.68, 41.88, 41.98, 41.87, 41.59, 41.34, 41.08, 40.83, 40.86, 41.0, 41.33,
  41.69, 42.0, 42.22, 42.29, 42.23, 42.01, 41.71, 41.37, 41.22, 41.22, 41.34, 41.65,
];
const phis = KG.map((_, i) => {
  const t = i / 12;
  return [1, t, Math.sin(2 * Math.PI * t), Math.cos(2 * Math.PI * t)];
});

export const start = [41, 0.3, 0.5, -0.2];

export function gradient(p: number[]): number[] {
  const g = [0, 0, 0, 0];
  phis.forEach((phi, i) => {
    const r = phi.reduce((s, v, k) => s + v * p[k], 0) - KG[i];
    for (let k = 0; k < 4; k++) g[k] += (2 * r * phi[k]) / phis.length;
  });
  return g;
}

export function hessian(_p: number[]): number[][] {
  return [0, 1, 2, 3].map((a) => [0, 1, 2, 3].map((b) => phis.reduce((s, phi) => s + (2 * phi[a] * phi[b]) / phis.length, 0)));
}
