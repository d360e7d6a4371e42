// Exact derivatives of the rope-bridge spring-chain energy (bridge/sag.js).
// E(y) = sum_{s=0..6} (K_s/2) (h_{s+1} - h_s)^2 + sum_i W_i y_i, h = [LEFT, y_0..y_5, RIGHT]
// dE/dy_i = K_i (y_i - h_i) - K_{i+1} (h_{i+2} - y_i) + W_i
// H is tridiagonal and constant: H_ii = K_i + K_{i+1}, H_{i,i+1} = H_{i+1,i} = -K_{i+1}

const K = [4.0, 3.6, 3.4, 3.3, 3.4, 3.6, 4.0];
const W = [0.9, 0.9, 1.1, 1.1, 0.9, 0.9];
const LEFT = 0;
const RIGHT = -5;

export const start = [-2, -3, -4, -4.5, -5, -5];

export function gradient(y: number[]): number[] {
  return y.map((yi, i) => {
    const below = i === 0 ? LEFT : y[i - 1];
    const above = i === y.length - 1 ? RIGHT : y[i + 1];
    return K[i] * (yi - below) + K[i + 1] * (yi - above) + W[i];
  });
}

export function hessian(y: number[]): number[][] {
  return y.map((_, i) =>
    y.map((__, j) => {
      if (i === j) return K[i] + K[i + 1];
      if (j === i + 1) return -K[i + 1];
      if (j === i - 1) return -K[i];
      return 0;
    }),
  );
}
