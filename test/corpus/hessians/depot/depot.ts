// Exact derivatives of the depot placement (depot/depot.ts), data copied in.
// f(p) = Σ wᵢ ‖p − sᵢ‖²: ∇f = 2 Σ wᵢ (p − sᵢ),  H = 2 (Σ wᵢ) I.
const shops = [[0, 0], [4, 1], [2, 5], [6, 4], [1, 3]];
const weights = [3, 1, 2, 1, 2];
const total = weights.reduce((s, w) => s + w, 0);

export const start = [1, 1];

export function gradient(p: number[]): number[] {
  const g = [0, 0];
  shops.forEach((s, i) => {
    g[0] += 2 * weights[i] * (p[0] - s[0]);
    g[1] += 2 * weights[i] * (p[1] - s[1]);
  });
  return g;
}

export function hessian(_p: number[]): number[][] {
  return [
    [2 * total, 0],
    [0, 2 * total],
  ];
}
