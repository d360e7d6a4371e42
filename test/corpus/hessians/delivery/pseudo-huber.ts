// Exact derivatives of the pseudo-Huber delivery-time fit (delivery/pseudo-huber.js), data copied in.
// rho(r) = d^2 (sqrt(1 + (r/d)^2) - 1);  rho'(r) = r / sqrt(1 + (r/d)^2);  rho''(r) = (1 + (r/d)^2)^(-3/2)
// f(w) = (1/n) sum_i rho(w0 + w1 km_i - min_i)
// grad = (1/n) sum_i rho'(r_i) [1, km_i];  H = (1/n) sum_i rho''(r_i) [1, km_i][1, km_i]^T

const KM = [1.2, 2.5, 3.1, 0.8, 4.4, 5.0, 2.2, 3.8, 6.1, 1.7, 2.9, 4.9, 3.3, 0.6, 5.6, 2.0];
const MIN = [10, 14, 17, 8, 21, 24, 13, 19, 26, 11, 35, 23, 17, 7, 48, 12];
const D = 10;

export const start = [6, 3.2];

export function gradient(w: number[]): number[] {
  const g = [0, 0];
  KM.forEach((km, i) => {
    const r = w[0] + w[1] * km - MIN[i];
    const psi = r / Math.sqrt(1 + (r / D) ** 2);
    g[0] += psi / KM.length;
    g[1] += (psi * km) / KM.length;
  });
  return g;
}

export function hessian(w: number[]): number[][] {
  const H = [
    [0, 0],
    [0, 0],
  ];
  KM.forEach((km, i) => {
    const r = w[0] + w[1] * km - MIN[i];
    const curv = (1 + (r / D) ** 2) ** -1.5 / KM.length;
    const x = [1, km];
    for (let a = 0; a < 2; a++) for (let b = 0; b < 2; b++) H[a][b] += curv * x[a] * x[b];
  });
  return H;
}
