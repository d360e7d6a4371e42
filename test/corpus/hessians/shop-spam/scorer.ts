// Exact derivatives of the spam scorer's objective (shop-spam/scorer.ts), data copied in.
// f(w) = (1/n) sum_i [log(1 + e^{z_i}) - y_i z_i] + (lambda/2) sum_{j>=1} w_j^2,  z_i = w . x_i
// grad = (1/n) sum_i (s_i - y_i) x_i + lambda [0, w_1, w_2, w_3],  s_i = sigmoid(z_i)
// H    = (1/n) sum_i s_i (1 - s_i) x_i x_i^T + lambda diag(0, 1, 1, 1)

const X = [
  [1, 0.0, 0, 0.2], [1, 0.3, 0, 0.3], [1, 1.7, 3, 2.1], [1, 0.0, 1, 0.4],
  [1, 2.3, 2, 3.0], [1, 0.3, 0, 0.1], [1, 1.0, 4, 1.2], [1, 0.0, 0, 0.5],
  [1, 2.7, 1, 2.6], [1, 0.7, 0, 0.4], [1, 0.0, 2, 0.3], [1, 1.3, 3, 1.8],
  [1, 0.3, 1, 0.2], [1, 3.0, 5, 3.4], [1, 0.0, 0, 0.3], [1, 0.7, 2, 1.5],
  [1, 0.0, 0, 0.1], [1, 2.0, 1, 0.9], [1, 0.3, 0, 0.6], [1, 1.0, 2, 2.4],
];
const Y = [0, 0, 1, 0, 1, 0, 1, 0, 1, 0, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1];
const LAMBDA = 0.05;

export const start = [-0.6, 0.3, 0.2, 0.3];

const sigmoid = (z: number) => 1 / (1 + Math.exp(-z));
const score = (w: number[], x: number[]) => x.reduce((s, v, j) => s + v * w[j], 0);

export function gradient(w: number[]): number[] {
  const g = w.map((v, j) => (j === 0 ? 0 : LAMBDA * v));
  X.forEach((x, i) => {
    const e = sigmoid(score(w, x)) - Y[i];
    x.forEach((v, j) => (g[j] += (e * v) / X.length));
  });
  return g;
}

export function hessian(w: number[]): number[][] {
  const H = w.map((_, a) => w.map((__, b) => (a === b && a > 0 ? LAMBDA : 0)));
  for (const x of X) {
    const s = sigmoid(score(w, x));
    const c = (s * (1 - s)) / X.length;
    for (let a = 0; a < 4; a++) for (let b = 0; b < 4; b++) H[a][b] += c * x[a] * x[b];
  }
  return H;
}
