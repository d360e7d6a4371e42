// Exact derivatives of the roast-level softmax regression (classifier/softmax.ts), data copied in.
// Weights W[k*3 + j]; p = softmax(W x).
// f = -(1/n) sum_i log p_{y_i}(x_i) + (l2/2) |W|^2
// grad_{kj} = (1/n) sum_i (p_k - [k = y_i]) x_j + l2 W_kj
// H_{(k,j),(l,m)} = (1/n) sum_i (p_k [k = l] - p_k p_l) x_j x_m + l2 [k = l][j = m]

const BEANS: Array<[number, number, number, number]> = [
  // x (3 numbers), roast class
  [1, 1.6, 0.9, 0], [1, 1.4, 1.1, 0], [1, 1.8, 0.7, 0], [1, 1.2, 1.2, 0], [1, 1.5, 0.6, 0], [1, 1.1, 0.8, 0],
  [1, 0.4, 0.5, 1], [1, 0.6, 0.2, 1], [1, 0.1, 0.4, 1], [1, 0.5, -0.1, 1], [1, 0.8, 0.3, 1], [1, -0.1, 0.1, 1],
  [1, -0.9, -0.6, 2], [1, -1.2, -0.4, 2], [1, -0.7, -0.9, 2], [1, -1.5, -0.2, 2], [1, -0.4, -0.8, 2], [1, -1.0, -1.1, 2],
];
const L2 = 0.01;

export const start = [0.1, 0.8, 0.3, 0.2, 0.1, 0.1, -0.1, -0.7, -0.4];

function softmax(W: number[], x: number[]): number[] {
  const z = [0, 1, 2].map((k) => W[3 * k] * x[0] + W[3 * k + 1] * x[1] + W[3 * k + 2] * x[2]);
  const top = Math.max(...z);
  const e = z.map((v) => Math.exp(v - top));
  const sum = e[0] + e[1] + e[2];
  return e.map((v) => v / sum);
}

export function gradient(W: number[]): number[] {
  const g = W.map((w) => L2 * w);
  for (const [x0, x1, x2, y] of BEANS) {
    const x = [x0, x1, x2];
    const p = softmax(W, x);
    for (let k = 0; k < 3; k++) for (let j = 0; j < 3; j++) g[3 * k + j] += ((p[k] - (k === y ? 1 : 0)) * x[j]) / BEANS.length;
  }
  return g;
}

export function hessian(W: number[]): number[][] {
  const H = W.map((_, a) => W.map((__, b) => (a === b ? L2 : 0)));
  for (const [x0, x1, x2] of BEANS) {
    const x = [x0, x1, x2];
    const p = softmax(W, x);
    for (let k = 0; k < 3; k++)
      for (let l = 0; l < 3; l++) {
        const c = ((k === l ? p[k] : 0) - p[k] * p[l]) / BEANS.length;
        for (let j = 0; j < 3; j++) for (let m = 0; m < 3; m++) H[3 * k + j][3 * l + m] += c * x[j] * x[m];
      }
  }
  return H;
}
