// Exact derivatives of the croissant ridge regression (bakery/ridge.ts), data copied in.
// f(b) = (1/2n) |X b - y|^2 + (lambda/2) sum_{j>=1} b_j^2 with rows x = [1, temp/10, weekend, rain]
// grad = (1/n) X^T (X b - y) + lambda [0, b_1, b_2, b_3];  H = (1/n) X^T X + lambda diag(0, 1, 1, 1)

// [tempC, weekend, rain, sold]
const DAYS = [
  [8, 0, 1, 52], [11, 0, 0, 61], [12, 0, 0, 63], [9, 0, 1, 50], [14, 0, 0, 66],
  [15, 1, 0, 88], [13, 1, 1, 74], [10, 0, 0, 58], [7, 0, 1, 47], [9, 0, 0, 57],
  [12, 0, 1, 55], [16, 0, 0, 70], [17, 1, 0, 93], [14, 1, 0, 85], [11, 0, 0, 60],
  [10, 0, 1, 51], [13, 0, 0, 64], [15, 0, 0, 67], [12, 0, 1, 56], [16, 1, 1, 79],
];
const LAMBDA = 0.5;
const rows = DAYS.map(([t, we, rain]) => [1, t / 10, we, rain]);
const sold = DAYS.map((d) => d[3]);

export const start = [30, 20, 20, -5];

export function gradient(b: number[]): number[] {
  const g = b.map((v, j) => (j > 0 ? LAMBDA * v : 0));
  rows.forEach((x, i) => {
    const r = x.reduce((s, v, j) => s + v * b[j], 0) - sold[i];
    x.forEach((v, j) => (g[j] += (r * v) / rows.length));
  });
  return g;
}

export function hessian(_b: number[]): number[][] {
  const H = [0, 1, 2, 3].map((a) => [0, 1, 2, 3].map((c) => (a === c && a > 0 ? LAMBDA : 0)));
  for (const x of rows) for (let a = 0; a < 4; a++) for (let c = 0; c < 4; c++) H[a][c] += (x[a] * x[c]) / rows.length;
  return H;
}
