// Mean logistic loss with a small ridge term, versicolor (0) against virginica (1) on
// Fisher's iris data: not linearly separable, so the minimum is finite.
// f(w) = (1/m)·Σ [log(1 + e^z) − y·z] + (ρ/2)‖w‖², z = w·x̃; ∇f = (1/m)·Σ (σ(z) − y)·x̃ + ρw;
// ∇²f = (1/m)·Σ σ(1 − σ)·x̃x̃ᵀ + ρI (Hastie, Tibshirani & Friedman, Elements of Statistical Learning, 2009, §4.4.1).
import { irisData } from './iris';
import type { TestProblem } from './types';

const ridge = 1e-3;

const softplus = (z: number) => (z > 0 ? z + Math.log1p(Math.exp(-z)) : Math.log1p(Math.exp(z)));
const sigmoid = (z: number) => 1 / (1 + Math.exp(-z));

export function irisLogistic(): TestProblem {
  const { rows, labels } = irisData();
  const samples = rows.map((x, k) => ({ x, y: labels[k] === 2 ? 1 : 0 })).filter((_, k) => labels[k] !== 0);
  const m = samples.length;
  const dot = (w: ArrayLike<number>, x: number[]) => x.reduce((s, v, j) => s + v * w[j], 0);
  const ridgeValue = (w: ArrayLike<number>) => (ridge / 2) * Array.from(w).reduce((s, v) => s + v * v, 0);
  return {
    name: 'logistic loss, iris versicolor vs virginica',
    start: [0, 0, 0, 0, 0],
    // At w = 0 every sample costs log 2.
    startValue: Math.LN2,
    f: (w) => samples.reduce((s, { x, y }) => s + softplus(dot(w, x)) - y * dot(w, x), 0) / m + ridgeValue(w),
    g: (w) => {
      const g = Array.from(w, (v) => ridge * v);
      for (const { x, y } of samples) {
        const residual = (sigmoid(dot(w, x)) - y) / m;
        x.forEach((v, j) => (g[j] += residual * v));
      }
      return g;
    },
    hessian: (w) => {
      const h = Array.from({ length: w.length }, (_, i) => Array.from({ length: w.length }, (_, j) => (i === j ? ridge : 0)));
      for (const { x } of samples) {
        const s = sigmoid(dot(w, x));
        const weight = (s * (1 - s)) / m;
        for (let i = 0; i < x.length; i++) for (let j = 0; j < x.length; j++) h[i][j] += weight * x[i] * x[j];
      }
      return h;
    },
  };
}
