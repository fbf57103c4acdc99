import type { PreparedModel } from './prepare';
import type { Conditioning } from './types';
import { scientificFormat } from '../units/format';

/** Three figures, written m × 10ⁿ outside 0.001…10⁶ (toPrecision would write 1.23e-7). */
const fig3 = (v: number) => (v !== 0 && (Math.abs(v) < 1e-3 || Math.abs(v) >= 1e6) ? scientificFormat(v, 3) : v.toPrecision(3));

/**
 * How near a stable truss is to a mechanism, from the joint-equilibrium matrix A (2j × (m + r),
 * see classify.ts) alone — no member stiffness is needed, so a determinate truss has it too.
 *
 * Measure: the smallest and largest singular values σmin and σmax of A, found as the square
 * roots of the extreme eigenvalues of the symmetric positive definite matrix A·Aᵀ (2j × 2j):
 * the smallest by inverse iteration on a banded Cholesky factor, the largest by the Lanczos
 * method (full reorthogonalisation) and bisection on its tridiagonal matrix. A's entries are direction cosines, so σ has no unit and does not change with the
 * size of the truss. For a determinate truss [N; R] = −A⁻¹F, so the root-sum-square of the
 * member and reaction forces is at most ‖F‖/σmin (the 2-norm bound of any linear-algebra text,
 * e.g. Golub & Van Loan, Matrix Computations, §2.3, from memory): 1/σmin is how many kN of
 * force one kN of load can raise. The left singular vector of σmin is a joint movement u with
 * Aᵀu (the member elongations and support movements it causes, by the principle of virtual
 * work) as small as it can be: the near-mechanism's shape, and the joints that move most in it
 * are the ones to brace.
 */

/**
 * 1/σmin above which a truss is flagged near a mechanism. Common practice, no source: measured
 * here, parallel-chord Pratt trusses give 7 (4 panels, span/depth 6), 23 (span/depth 10), 84
 * (span/depth 20) and 330 (40 panels, span/depth 40); a toggle 1 mm from flat over 6 m gives
 * 3 000 and one 1 cm from flat 300. A truss so shallow that 1 kN can raise 500 kN is a shape to
 * change, not to check.
 */
export const NEAR_MECHANISM_AMPLIFICATION = 500;

/** Beyond this band storage (entries) the measure is not computed (a note says so). */
const BAND_LIMIT = 2e7;
const ITERATIONS = 40;

/** Joint order along the truss's longer extent, so A·Aᵀ has a narrow band. */
function jointOrder(pm: PreparedModel): Int32Array {
  const n = pm.jointIds.length;
  let x0 = Infinity;
  let x1 = -Infinity;
  let y0 = Infinity;
  let y1 = -Infinity;
  for (let i = 0; i < n; i++) {
    x0 = Math.min(x0, pm.x[i]);
    x1 = Math.max(x1, pm.x[i]);
    y0 = Math.min(y0, pm.y[i]);
    y1 = Math.max(y1, pm.y[i]);
  }
  const key = x1 - x0 >= y1 - y0 ? pm.x : pm.y;
  const other = key === pm.x ? pm.y : pm.x;
  const idx = Array.from({ length: n }, (_, i) => i).sort((a, b) => key[a] - key[b] || other[a] - other[b]);
  const pos = new Int32Array(n);
  idx.forEach((j, p) => {
    pos[j] = p;
  });
  return pos;
}

/** The columns of A as (dof, value) lists over the reordered dofs. */
function columnsOf(pm: PreparedModel, pos: Int32Array): { dofs: number[]; vals: number[] }[] {
  const cols: { dofs: number[]; vals: number[] }[] = [];
  for (const mb of pm.members) {
    cols.push({ dofs: [2 * pos[mb.a], 2 * pos[mb.a] + 1, 2 * pos[mb.b], 2 * pos[mb.b] + 1], vals: [mb.cx, mb.cy, -mb.cx, -mb.cy] });
  }
  for (const rc of pm.reactions) cols.push({ dofs: [2 * pos[rc.joint], 2 * pos[rc.joint] + 1], vals: [rc.dx, rc.dy] });
  return cols;
}

/** Lower band of A·Aᵀ: band[i·(w + 1) + k] = M[i][i − k]. */
function bandAssemble(size: number, w: number, cols: { dofs: number[]; vals: number[] }[]): Float64Array {
  const band = new Float64Array(size * (w + 1));
  for (const c of cols) {
    for (let p = 0; p < c.dofs.length; p++) {
      for (let q = 0; q < c.dofs.length; q++) {
        const i = c.dofs[p];
        const j = c.dofs[q];
        if (j > i) continue;
        band[i * (w + 1) + (i - j)] += c.vals[p] * c.vals[q];
      }
    }
  }
  return band;
}

/** In-place banded Cholesky (M = L·Lᵀ); false when a pivot is not positive. */
function bandCholesky(band: Float64Array, size: number, w: number): boolean {
  const W = w + 1;
  for (let i = 0; i < size; i++) {
    const j0 = Math.max(0, i - w);
    for (let j = j0; j <= i; j++) {
      let s = band[i * W + (i - j)];
      const k0 = Math.max(j0, j - w);
      for (let k = k0; k < j; k++) s -= band[i * W + (i - k)] * band[j * W + (j - k)];
      if (j === i) {
        if (!(s > 0)) return false;
        band[i * W] = Math.sqrt(s);
      } else {
        band[i * W + (i - j)] = s / band[j * W];
      }
    }
  }
  return true;
}

function bandSolve(L: Float64Array, size: number, w: number, b: Float64Array): Float64Array {
  const W = w + 1;
  const y = new Float64Array(b);
  for (let i = 0; i < size; i++) {
    let s = y[i];
    for (let k = Math.max(0, i - w); k < i; k++) s -= L[i * W + (i - k)] * y[k];
    y[i] = s / L[i * W];
  }
  for (let i = size - 1; i >= 0; i--) {
    let s = y[i];
    for (let k = i + 1; k <= Math.min(size - 1, i + w); k++) s -= L[k * W + (k - i)] * y[k];
    y[i] = s / L[i * W];
  }
  return y;
}

function bandMultiply(M: Float64Array, size: number, w: number, v: Float64Array): Float64Array {
  const W = w + 1;
  const out = new Float64Array(size);
  for (let i = 0; i < size; i++) {
    out[i] += M[i * W] * v[i];
    for (let k = 1; k <= w && k <= i; k++) {
      const m = M[i * W + k];
      if (m === 0) continue;
      out[i] += m * v[i - k];
      out[i - k] += m * v[i];
    }
  }
  return out;
}

function normalise(v: Float64Array): number {
  let s = 0;
  for (let i = 0; i < v.length; i++) s += v[i] * v[i];
  const n = Math.sqrt(s);
  if (n > 0) for (let i = 0; i < v.length; i++) v[i] /= n;
  return n;
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

/** A fixed start vector with a part along every mode (no clock, no randomness: the same every run). */
function startVector(size: number): Float64Array {
  const v = new Float64Array(size);
  for (let i = 0; i < size; i++) v[i] = 1 + ((i * 7919) % 101) / 101;
  normalise(v);
  return v;
}

/** Lanczos steps: the largest eigenvalue converges first; fewer on very large trusses (σmax only sets the printed ratio). */
const LANCZOS_STEPS = 30;
const LANCZOS_STEPS_LARGE = 12;

/** Largest eigenvalue of a symmetric tridiagonal matrix (diagonal a, off-diagonal b) by Sturm-sequence bisection. */
function tridiagonalLargest(a: number[], b: number[]): number {
  const k = a.length;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < k; i++) {
    const r = (i > 0 ? Math.abs(b[i - 1]) : 0) + (i < k - 1 ? Math.abs(b[i]) : 0);
    lo = Math.min(lo, a[i] - r);
    hi = Math.max(hi, a[i] + r);
  }
  // Count of eigenvalues below x (Sturm sequence of the LDLᵀ pivots).
  const below = (x: number): number => {
    let count = 0;
    let d = 1;
    for (let i = 0; i < k; i++) {
      d = a[i] - x - (i > 0 ? (b[i - 1] * b[i - 1]) / d : 0);
      if (d === 0) d = -1e-300;
      if (d < 0) count++;
    }
    return count;
  };
  for (let it = 0; it < 200 && hi - lo > 1e-15 * Math.max(Math.abs(hi), 1e-300); it++) {
    const mid = (lo + hi) / 2;
    if (below(mid) >= k) hi = mid;
    else lo = mid;
  }
  return (lo + hi) / 2;
}

/** Largest eigenvalue of the banded symmetric M by Lanczos with full reorthogonalisation. */
function lanczosLargest(M: Float64Array, size: number, w: number): number {
  const steps = Math.min(size, size > 40_000 ? LANCZOS_STEPS_LARGE : LANCZOS_STEPS);
  const Q: Float64Array[] = [startVector(size)];
  const alpha: number[] = [];
  const beta: number[] = [];
  for (let k = 0; k < steps; k++) {
    const z = bandMultiply(M, size, w, Q[k]);
    alpha.push(dot(Q[k], z));
    // Full reorthogonalisation (keeps the small matrix's eigenvalues honest).
    for (const q of Q) {
      const c = dot(q, z);
      for (let i = 0; i < size; i++) z[i] -= c * q[i];
    }
    if (k === steps - 1) break;
    const nb = normalise(z);
    if (nb <= 1e-14 * Math.max(Math.abs(alpha[k]), 1e-300)) break; // invariant subspace found
    beta.push(nb);
    Q.push(z);
  }
  return tridiagonalLargest(alpha, beta.slice(0, alpha.length - 1));
}

const JOINT_LIST_LIMIT = 12;

/** 1/σmin as the sheet writes it: whole kN from 100 up (3000), else three figures (22.7). */
export function amplificationText(a: number | null): string {
  if (a === null || !Number.isFinite(a)) return '—';
  return a >= 100 ? String(Math.round(a)) : fig3(a);
}

/** The conditioning of a stable truss (see the top of this file); null for an empty model. */
export function conditioningOf(pm: PreparedModel): Conditioning | null {
  const n = pm.jointIds.length;
  if (n === 0) return null;
  const pos = jointOrder(pm);
  const cols = columnsOf(pm, pos);
  const size = 2 * n;
  let w = 1;
  for (const c of cols) w = Math.max(w, Math.max(...c.dofs) - Math.min(...c.dofs));
  if (size * (w + 1) > BAND_LIMIT) {
    return {
      measure: 'smallest/largest singular value of the joint-equilibrium matrix',
      sigmaMin: null,
      sigmaMax: null,
      ratio: null,
      amplification: null,
      nearMechanism: false,
      joints: [],
      jointTags: [],
      message: `The conditioning was not computed: ${n} joints in this order give a band too wide to factor here.`,
    };
  }
  const M = bandAssemble(size, w, cols);
  const L = new Float64Array(M);
  const spd = bandCholesky(L, size, w);

  const lambdaMax = lanczosLargest(M, size, w);

  // Smallest by inverse iteration: u ← (A·Aᵀ)⁻¹u; its Rayleigh quotient is λmin.
  let lambdaMin = 0;
  let u = startVector(size);
  if (spd) {
    let prev = Infinity;
    for (let it = 0; it < ITERATIONS; it++) {
      u = bandSolve(L, size, w, u);
      normalise(u);
      lambdaMin = dot(u, bandMultiply(M, size, w, u));
      if (Math.abs(prev - lambdaMin) <= 1e-11 * Math.max(lambdaMin, 1e-300)) break;
      prev = lambdaMin;
    }
  }
  const sigmaMax = Math.sqrt(Math.max(lambdaMax, 0));
  const sigmaMin = Math.sqrt(Math.max(lambdaMin, 0));
  const amplification = sigmaMin > 0 ? 1 / sigmaMin : Infinity;
  const nearMechanism = amplification > NEAR_MECHANISM_AMPLIFICATION;

  // Joints by their movement in the smallest mode (the largest half and up).
  const moves: { j: number; d: number }[] = [];
  let dMax = 0;
  for (let j = 0; j < n; j++) {
    const d = Math.hypot(u[2 * pos[j]], u[2 * pos[j] + 1]);
    moves.push({ j, d });
    dMax = Math.max(dMax, d);
  }
  const moving = moves.filter((m) => m.d >= 0.5 * dMax).sort((a, b) => b.d - a.d || a.j - b.j);
  const joints = moving.map((m) => pm.jointIds[m.j]);
  const jointTags = moving.map((m) => pm.jointTags[m.j]);
  const shown = jointTags.slice(0, JOINT_LIST_LIMIT).join(', ') + (jointTags.length > JOINT_LIST_LIMIT ? ` and ${jointTags.length - JOINT_LIST_LIMIT} more` : '');
  const amp = amplificationText(amplification);
  const message = nearMechanism
    ? `Near a mechanism: the smallest singular value of the joint-equilibrium matrix is σmin = ${fig3(sigmaMin)} (σmin/σmax = ${fig3(sigmaMin / sigmaMax)}), so 1 kN of load can raise up to ${amp} kN of member and reaction force. ` +
      `The joints that move most in that near-mechanism are ${shown}: the members there are almost in line, or a support line almost runs through the rest. Change the shape there (more depth or rise, a member across the panel, or a support turned), or the forces will be large and very sensitive to the drawn geometry.`
    : `Well away from a mechanism: σmin = ${fig3(sigmaMin)} of the joint-equilibrium matrix (σmin/σmax = ${fig3(sigmaMin / sigmaMax)}); 1 kN of load raises at most ${amp} kN of member and reaction force (root-sum-square), below the ${NEAR_MECHANISM_AMPLIFICATION} at which Panelpoint warns.`;
  return {
    measure: 'smallest/largest singular value of the joint-equilibrium matrix',
    sigmaMin,
    sigmaMax,
    ratio: sigmaMax > 0 ? sigmaMin / sigmaMax : 0,
    amplification: Number.isFinite(amplification) ? amplification : null,
    nearMechanism,
    joints,
    jointTags,
    message,
  };
}
