// Exact derivatives of the line-scan camera's reprojection error (camera/pose2d.ts), data copied in.
// Pose q = [yaw, tx, tz]; for a marker (X, Z):
//   xc = cos(yaw) X - sin(yaw) Z + tx,  zc = sin(yaw) X + cos(yaw) Z + tz,  u = F xc / zc
// f = 1/2 sum_i (u_i - obs_i)^2;  grad = sum_i r_i du_i;  H = sum_i (du_i du_i^T + r_i d2u_i)
// With first derivatives xa = d xc/d q_a, za = d zc/d q_a and second ones xab, zab (non-zero only
// for yaw-yaw: xc_yy = -(xc - tx), zc_yy = -(zc - tz)), the quotient rule gives
//   du_a   = F (xa zc - xc za) / zc^2
//   d2u_ab = F [ (xab zc + xa zb - xb za - xc zab) / zc^2 - 2 (xa zc - xc za) zb / zc^3 ]

const F = 600;
const MARKERS = [
  [-0.6, 2.1], [-0.3, 2.4], [0.0, 2.0], [0.25, 2.6], [0.5, 2.2], [0.7, 2.8], [-0.45, 2.9], [0.35, 1.9],
];
const OBS = [-178.3, -91.6, -21.0, 28.4, 98.1, 111.5, -112.6, 76.0];

export const start = [0.05, 0.05, 0.2];

function marker(q: number[], X: number, Z: number) {
  const c = Math.cos(q[0]);
  const s = Math.sin(q[0]);
  const xc = c * X - s * Z + q[1];
  const zc = s * X + c * Z + q[2];
  const xa = [-s * X - c * Z, 1, 0];
  const za = [c * X - s * Z, 0, 1];
  const xab = [[-(c * X - s * Z), 0, 0], [0, 0, 0], [0, 0, 0]];
  const zab = [[-(s * X + c * Z), 0, 0], [0, 0, 0], [0, 0, 0]];
  const du = [0, 1, 2].map((a) => (F * (xa[a] * zc - xc * za[a])) / (zc * zc));
  const d2u = [0, 1, 2].map((a) =>
    [0, 1, 2].map(
      (b) =>
        F * ((xab[a][b] * zc + xa[a] * za[b] - xa[b] * za[a] - xc * zab[a][b]) / (zc * zc) -
          (2 * (xa[a] * zc - xc * za[a]) * za[b]) / (zc * zc * zc)),
    ),
  );
  return { u: (F * xc) / zc, du, d2u };
}

export function gradient(q: number[]): number[] {
  const g = [0, 0, 0];
  MARKERS.forEach(([X, Z], i) => {
    const { u, du } = marker(q, X, Z);
    for (let a = 0; a < 3; a++) g[a] += (u - OBS[i]) * du[a];
  });
  return g;
}

export function hessian(q: number[]): number[][] {
  const H = [0, 1, 2].map(() => [0, 0, 0]);
  MARKERS.forEach(([X, Z], i) => {
    const { u, du, d2u } = marker(q, X, Z);
    const r = u - OBS[i];
    for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) H[a][b] += du[a] * du[b] + r * d2u[a][b];
  });
  return H;
}
