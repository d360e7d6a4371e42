// Exact derivatives of the smile fit (options/smile.ts), data copied in.
// e(θ) = Σ (θ₀ + θ₁ m² + θ₂ m − v)² with m = ln(K/100) and a = [1, m², m]:
// ∇e = 2 Σ r a,  H = 2 Σ a aᵀ (constant: the model is linear in θ).
const strikes = [80, 90, 100, 110, 120];
const quotedVols = [0.31, 0.26, 0.22, 0.24, 0.28];
const features = strikes.map((k) => {
  const m = Math.log(k / 100);
  return [1, m * m, m];
});

export const start = [0.2, 0.5, 0.01];

export function gradient(theta: number[]): number[] {
  const g = [0, 0, 0];
  features.forEach((a, i) => {
    const r = a[0] * theta[0] + a[1] * theta[1] + a[2] * theta[2] - quotedVols[i];
    for (let j = 0; j < 3; j++) g[j] += 2 * r * a[j];
  });
  return g;
}

export function hessian(_theta: number[]): number[][] {
  const H = [0, 1, 2].map(() => [0, 0, 0]);
  for (const a of features) for (let j = 0; j < 3; j++) for (let k = 0; k < 3; k++) H[j][k] += 2 * a[j] * a[k];
  return H;
}
