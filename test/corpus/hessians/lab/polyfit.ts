// Exact derivatives of the thermocouple calibration cost (lab/polyfit.ts), data copied in.
// f(c) = (1/n) sum_i (sum_k c_k t_i^k - v_i)^2, t = T/100
// grad_k = (2/n) sum_i r_i t_i^k;  H_kl = (2/n) sum_i t_i^(k+l) (constant)

const T = [0, 50, 100, 150, 200, 250, 300, 350, 400, 450, 500];
const EMF = [0.0, 2.02, 4.1, 6.14, 8.14, 10.15, 12.21, 14.29, 16.4, 18.52, 20.64];

export const start = [0.1, 3.8, 0.3, -0.04];

export function gradient(c: number[]): number[] {
  const g = [0, 0, 0, 0];
  T.forEach((temp, i) => {
    const t = temp / 100;
    const r = c[0] + c[1] * t + c[2] * t ** 2 + c[3] * t ** 3 - EMF[i];
    for (let k = 0; k < 4; k++) g[k] += (2 * r * t ** k) / T.length;
  });
  return g;
}

export function hessian(_c: number[]): number[][] {
  return [0, 1, 2, 3].map((k) => [0, 1, 2, 3].map((l) => T.reduce((s, temp) => s + (2 * (temp / 100) ** (k + l)) / T.length, 0)));
}
