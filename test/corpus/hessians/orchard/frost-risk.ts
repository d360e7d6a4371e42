// Exact derivatives of the frost model's mean squared error (orchard/frost-risk.ts), data copied in.
// f(w) = (1/n) |X w - y|^2 with rows [1, t18/10, dew/10, cloud, wind/5]
// grad = (2/n) X^T (X w - y);  H = (2/n) X^T X (constant)

// [t18, dew, cloud, wind, tmin]
const NIGHTS = [
  [13.3, 7.5, 0.25, 2.6, 7.5], [9.2, 6.6, 0.875, 1.9, 6.8], [7, 3.7, 0.125, 5.8, 4.0], [4, 1.8, 0, 4.5, 1.7],
  [7.2, 5.9, 0.5, 1, 4.9], [4.1, -0.4, 0.25, 3.1, 0.9], [8.5, 6.6, 0.75, 0.2, 5.9], [6.8, 1.8, 0.625, 3.9, 3.8],
  [4.8, 2.4, 0.375, 0.3, 1.9], [9.7, 6.5, 0.125, 3.9, 5.9], [12.4, 10.5, 0.625, 4.6, 9.7], [4.1, 0.2, 0.25, 5.1, 1.8],
  [7.5, 0.9, 0, 1.8, 2.0], [11.8, 7.1, 0.5, 5.4, 8.0], [12, 6.9, 0.375, 3.1, 7.2], [13.6, 9.8, 0.125, 5.8, 8.8],
  [6.6, 3.3, 0.5, 2.5, 3.7], [6.7, 3.8, 0.25, 2.6, 3.5], [12.2, 7.7, 0.375, 1.7, 7.2], [13.5, 7.3, 0.75, 2, 8.1],
  [6.3, 2.1, 0.875, 1.2, 3.9], [7.1, 1.1, 0.75, 1.3, 3.5], [4.4, 1.6, 0.375, 5.9, 3.0], [13.5, 7.7, 0.75, 1, 8.4],
];
const rows = NIGHTS.map(([t, dew, cloud, wind]) => [1, t / 10, dew / 10, cloud, wind / 5]);
const tmin = NIGHTS.map((n) => n[4]);

export const start = [-1, 3, 3, 2, 0.5];

export function gradient(w: number[]): number[] {
  const g = [0, 0, 0, 0, 0];
  rows.forEach((x, i) => {
    const e = x.reduce((s, v, j) => s + v * w[j], 0) - tmin[i];
    for (let j = 0; j < 5; j++) g[j] += (2 * e * x[j]) / rows.length;
  });
  return g;
}

export function hessian(_w: number[]): number[][] {
  return [0, 1, 2, 3, 4].map((a) => [0, 1, 2, 3, 4].map((b) => rows.reduce((s, x) => s + (2 * x[a] * x[b]) / rows.length, 0)));
}
