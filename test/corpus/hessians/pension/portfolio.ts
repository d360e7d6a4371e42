// Exact derivatives of the pension fund's mean-variance objective (pension/portfolio.ts).
// f(w) = (gamma/2) w^T S w - mu^T w + (rho/2) (1^T w - 1)^2
// grad = gamma S w - mu + rho (1^T w - 1) 1;  H = gamma S + rho 1 1^T (constant)

const MU = [0.032, 0.071, 0.055, 0.06];
const S = [
  [0.0036, 0.0012, 0.0009, 0.0011],
  [0.0012, 0.0289, 0.0102, 0.0095],
  [0.0009, 0.0102, 0.0196, 0.0088],
  [0.0011, 0.0095, 0.0088, 0.0144],
];
const GAMMA = 4;
const RHO = 10;

export const start = [0.25, 0.25, 0.25, 0.25];

export function gradient(w: number[]): number[] {
  const excess = w[0] + w[1] + w[2] + w[3] - 1;
  return S.map((row, i) => GAMMA * (row[0] * w[0] + row[1] * w[1] + row[2] * w[2] + row[3] * w[3]) - MU[i] + RHO * excess);
}

export function hessian(_w: number[]): number[][] {
  return S.map((row) => row.map((s) => GAMMA * s + RHO));
}
