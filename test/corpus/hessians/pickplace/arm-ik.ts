// Exact derivatives of the SCARA inverse-kinematics cost (pickplace/arm-ik.ts).
// f(a, b) = 1/2 |p(a, b) - target|^2 + (mu/2) |(a, b) - rest|^2 with
//   p = (L1 cos a + L2 cos(a + b), L1 sin a + L2 sin(a + b))
// grad = J^T r + mu (theta - rest), r = p - target
// H = J^T J + r_x * Hess(p_x) + r_y * Hess(p_y) + mu I, where
//   Hess(p_x) = -[[L1 cos a + L2 cos(a+b), L2 cos(a+b)], [L2 cos(a+b), L2 cos(a+b)]]
//   Hess(p_y) = -[[L1 sin a + L2 sin(a+b), L2 sin(a+b)], [L2 sin(a+b), L2 sin(a+b)]]

const L1 = 35;
const L2 = 25;
const TARGET = [38, 27];
const REST = [0.5, 1.0];
const MU = 20;

export const start = [0.45, 1.1];

function parts(theta: number[]) {
  const [a, b] = theta;
  const c1 = Math.cos(a);
  const s1 = Math.sin(a);
  const c12 = Math.cos(a + b);
  const s12 = Math.sin(a + b);
  const r = [L1 * c1 + L2 * c12 - TARGET[0], L1 * s1 + L2 * s12 - TARGET[1]];
  // J[k][m] = d p_k / d theta_m
  const J = [
    [-L1 * s1 - L2 * s12, -L2 * s12],
    [L1 * c1 + L2 * c12, L2 * c12],
  ];
  return { c1, s1, c12, s12, r, J };
}

export function gradient(theta: number[]): number[] {
  const { r, J } = parts(theta);
  return [0, 1].map((m) => J[0][m] * r[0] + J[1][m] * r[1] + MU * (theta[m] - REST[m]));
}

export function hessian(theta: number[]): number[][] {
  const { c1, s1, c12, s12, r, J } = parts(theta);
  const hx = [
    [-(L1 * c1 + L2 * c12), -L2 * c12],
    [-L2 * c12, -L2 * c12],
  ];
  const hy = [
    [-(L1 * s1 + L2 * s12), -L2 * s12],
    [-L2 * s12, -L2 * s12],
  ];
  return [0, 1].map((m) =>
    [0, 1].map((q) => J[0][m] * J[0][q] + J[1][m] * J[1][q] + r[0] * hx[m][q] + r[1] * hy[m][q] + (m === q ? MU : 0)),
  );
}
