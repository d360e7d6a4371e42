// Exact derivatives of the help-desk Poisson regression (callcentre/poisson.ts), data copied in.
// f(t) = (1/n) sum_i [exp(t . x_i) - c_i (t . x_i)],  x_i = [1, sin(2 pi h/24), cos(2 pi h/24), monday]
// grad = (1/n) sum_i (mu_i - c_i) x_i;  H = (1/n) sum_i mu_i x_i x_i^T,  mu_i = exp(t . x_i)

const HOUR = [8, 8, 9, 9, 10, 10, 11, 11, 12, 12, 13, 13, 14, 14, 15, 15, 16, 16, 17, 17, 18, 18, 19, 19];
const MONDAY = HOUR.map((_, i) => i % 2);
const CALLS = [3, 13, 4, 8, 5, 10, 4, 10, 5, 7, 5, 9, 3, 5, 3, 8, 1, 4, 1, 7, 2, 1, 3, 1];
const rows = HOUR.map((h, i) => [1, Math.sin((2 * Math.PI * h) / 24), Math.cos((2 * Math.PI * h) / 24), MONDAY[i]]);

export const start = [1.0, 0.3, -0.3, 0.2];

const rate = (t: number[], x: number[]) => Math.exp(x.reduce((s, v, j) => s + v * t[j], 0));

export function gradient(t: number[]): number[] {
  const g = [0, 0, 0, 0];
  rows.forEach((x, i) => {
    const e = rate(t, x) - CALLS[i];
    for (let j = 0; j < 4; j++) g[j] += (e * x[j]) / rows.length;
  });
  return g;
}

export function hessian(t: number[]): number[][] {
  const H = [0, 1, 2, 3].map(() => [0, 0, 0, 0]);
  for (const x of rows) {
    const mu = rate(t, x) / rows.length;
    for (let a = 0; a < 4; a++) for (let b = 0; b < 4; b++) H[a][b] += mu * x[a] * x[b];
  }
  return H;
}
