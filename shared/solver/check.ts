import type { PreparedModel } from './prepare';

export interface ResidualResult {
  /** Largest resultant out-of-balance force at any joint, kN. */
  residual: number;
  /** Joint index where it occurs, −1 when the model has no joints. */
  joint: number;
  /** Largest resultant joint load, kN. */
  largestLoad: number;
}

/**
 * Independent equilibrium check: at every joint, loads + reactions + member forces (tension
 * pulling the joint toward the member's far end) must sum to zero. Uses only the final numbers,
 * not the steps that produced them.
 */
export function residualCheck(
  pm: PreparedModel,
  fx: Float64Array,
  fy: Float64Array,
  N: ArrayLike<number>,
  R: ArrayLike<number>,
): ResidualResult {
  const n = pm.jointIds.length;
  const sx = Float64Array.from(fx);
  const sy = Float64Array.from(fy);
  let largestLoad = 0;
  for (let j = 0; j < n; j++) largestLoad = Math.max(largestLoad, Math.hypot(fx[j], fy[j]));
  pm.members.forEach((mb, e) => {
    const t = N[e];
    sx[mb.a] += t * mb.cx;
    sy[mb.a] += t * mb.cy;
    sx[mb.b] -= t * mb.cx;
    sy[mb.b] -= t * mb.cy;
  });
  pm.reactions.forEach((rc, k) => {
    sx[rc.joint] += R[k] * rc.dx;
    sy[rc.joint] += R[k] * rc.dy;
  });
  let residual = 0;
  let joint = -1;
  for (let j = 0; j < n; j++) {
    const v = Math.hypot(sx[j], sy[j]);
    if (v > residual || joint < 0) {
      residual = v;
      joint = j;
    }
  }
  return { residual, joint, largestLoad };
}
