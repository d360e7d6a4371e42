// Mean softmax cross-entropy with a small ridge term on all three iris classes:
// W is 3 × 5 (one row per class, intercept first), flattened row by row.
// f = (1/m)·Σ [log Σₖ e^{zₖ} − z_y] + (ρ/2)‖W‖²; ∇_{Wₖ} f = (1/m)·Σ (pₖ − [y = k])·x̃ + ρWₖ;
// ∇²f = (1/m)·Σ (diag(p) − ppᵀ) ⊗ x̃x̃ᵀ + ρI (Bishop, Pattern Recognition and Machine Learning, 2006, §4.3.4).
import { irisClasses, irisData } from './iris';
import type { TestProblem } from './types';

const ridge = 1e-3;
const classCount = irisClasses.length;
const width = 5;

export function irisSoftmax(): TestProblem {
  const { rows, labels } = irisData();
  const m = rows.length;
  const probabilities = (w: ArrayLike<number>, x: number[]) => {
    const z = Array.from({ length: classCount }, (_, k) => x.reduce((s, v, j) => s + v * w[k * width + j], 0));
    const top = Math.max(...z);
    const e = z.map((v) => Math.exp(v - top));
    const total = e.reduce((s, v) => s + v, 0);
    return { z, logSum: top + Math.log(total), p: e.map((v) => v / total) };
  };
  const ridgeValue = (w: ArrayLike<number>) => (ridge / 2) * Array.from(w).reduce((s, v) => s + v * v, 0);
  return {
    name: 'softmax cross-entropy, iris (3 classes)',
    start: new Array(classCount * width).fill(0),
    // At W = 0 every sample costs log 3.
    startValue: Math.log(3),
    f: (w) => rows.reduce((s, x, i) => { const { z, logSum } = probabilities(w, x); return s + logSum - z[labels[i]]; }, 0) / m + ridgeValue(w),
    g: (w) => {
      const g = Array.from(w, (v) => ridge * v);
      rows.forEach((x, i) => {
        const { p } = probabilities(w, x);
        for (let k = 0; k < classCount; k++) {
          const residual = (p[k] - (labels[i] === k ? 1 : 0)) / m;
          for (let j = 0; j < width; j++) g[k * width + j] += residual * x[j];
        }
      });
      return g;
    },
    hessian: (w) => {
      const n = classCount * width;
      const h = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? ridge : 0)));
      for (const x of rows) {
        const { p } = probabilities(w, x);
        for (let k = 0; k < classCount; k++)
          for (let l = 0; l < classCount; l++) {
            const weight = ((k === l ? p[k] : 0) - p[k] * p[l]) / m;
            for (let a = 0; a < width; a++) for (let b = 0; b < width; b++) h[k * width + a][l * width + b] += weight * x[a] * x[b];
          }
      }
      return h;
    },
  };
}
