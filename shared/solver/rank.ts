import type { PreparedModel } from './prepare';
import { sparseEliminate, type SparseRow } from './sparse';

/**
 * Rank of the joint-equilibrium matrix A (2j × (m + r)) and, when it is short of 2j, the joints
 * that move in a mechanism, in time about linear in the size of the truss.
 *
 * Method: the three global equilibrium rows g (ΣFx, ΣFy, ΣM over the reactions only) lie in the
 * row space of A, so rank A = rank [A; g]. Row groups (each joint's two rows, and g) are taken
 * in an order in which a group's still-unknown columns are no more than its rows and its block
 * on them has full column rank — the method of joints run on the structure alone. Each pivot
 * row then holds only columns pivoted at or before it, so those pivots are independent, rows
 * left over in a processed group are dependent, and the rest is a small Schur complement
 * (the unprocessed rows on the unpivoted columns) handed to sparse elimination.
 * Left null vectors (mechanism modes) come from the dependent rows, back-substituted through
 * the processed groups in reverse and expanded from g back to joint rows.
 */
export interface RankResult {
  rank: number;
  /** Joint indices with a non-zero movement in some mechanism mode (empty when rank = 2j). */
  mechanismJoints: number[];
}

const BLOCK_TOLERANCE = 1e-9;
/** Null vectors examined for mechanism joints; beyond this the list may be incomplete. */
const NULL_VECTOR_LIMIT = 400;

interface GroupPivot {
  rows: number[];
  cols: number[];
}

export function equilibriumRank(pm: PreparedModel, rows: SparseRow[], wantMechanism: boolean): RankResult {
  const n = pm.jointIds.length;
  const m = pm.members.length;
  const r = pm.reactions.length;
  const nCols = m + r;
  const G = n; // the global group's index
  // Global rows, moments about the first support joint, lever arms scaled by the extent.
  const o = pm.reactions.length ? pm.reactions[0].joint : 0;
  const scale = Math.max(pm.extent, 1e-9);
  const gRows: SparseRow[] = [
    { cols: [], vals: [] },
    { cols: [], vals: [] },
    { cols: [], vals: [] },
  ];
  pm.reactions.forEach((rc, k) => {
    const push = (i: number, v: number) => {
      if (Math.abs(v) > 1e-15) {
        gRows[i].cols.push(m + k);
        gRows[i].vals.push(v);
      }
    };
    push(0, rc.dx);
    push(1, rc.dy);
    push(2, ((pm.x[rc.joint] - pm.x[o]) * rc.dy - (pm.y[rc.joint] - pm.y[o]) * rc.dx) / scale);
  });
  const allRows = [...rows, ...gRows];
  const groupRows = (g: number): number[] => (g === G ? [2 * n, 2 * n + 1, 2 * n + 2] : [2 * g, 2 * g + 1]);

  // Column → groups.
  const colGroups = (c: number): number[] => {
    if (c < m) return [pm.members[c].a, pm.members[c].b];
    return [pm.reactions[c - m].joint, G];
  };
  const groupCols = (g: number): number[] => {
    if (g === G) return Array.from({ length: r }, (_, k) => m + k);
    const out: number[] = [];
    for (let k = pm.incidentStart[g]; k < pm.incidentStart[g + 1]; k++) out.push(pm.incident[k]);
    if (pm.supportAt[g] >= 0) for (const k of pm.supports[pm.supportAt[g]].reactions) out.push(m + k);
    return out;
  };
  const pivoted = new Uint8Array(nCols);
  const count = new Int32Array(n + 1);
  for (let g = 0; g <= n; g++) count[g] = groupCols(g).length;
  const done = new Uint8Array(n + 1);
  const queue: number[] = [];
  const inQueue = new Uint8Array(n + 1);
  const enqueue = (g: number) => {
    if (!done[g] && !inQueue[g] && count[g] > 0 && count[g] <= groupRows(g).length) {
      inQueue[g] = 1;
      queue.push(g);
    }
  };
  for (let g = 0; g <= n; g++) enqueue(g);
  const pivots: GroupPivot[] = [];
  const leftover: number[] = [];
  let rank = 0;
  const entry = (row: number, col: number): number => {
    const rw = allRows[row];
    let v = 0;
    for (let k = 0; k < rw.cols.length; k++) if (rw.cols[k] === col) v += rw.vals[k];
    return v;
  };

  for (let qi = 0; qi < queue.length; qi++) {
    const g = queue[qi];
    inQueue[g] = 0;
    if (done[g]) continue;
    const cols = groupCols(g).filter((c) => !pivoted[c]);
    const gr = groupRows(g);
    if (cols.length === 0 || cols.length > gr.length) continue;
    // Full column rank of the small block? Choose independent pivot rows greedily.
    const block = gr.map((row) => cols.map((c) => entry(row, c)));
    const chosen = blockPivotRows(block, cols.length);
    if (!chosen) continue; // singular for now: wait until fewer unknowns remain
    for (const c of cols) pivoted[c] = 1;
    pivots.push({ rows: chosen.map((i) => gr[i]), cols });
    rank += cols.length;
    gr.forEach((row, i) => {
      if (!chosen.includes(i)) leftover.push(row);
    });
    done[g] = 1;
    for (const c of cols) for (const h of colGroups(c)) {
      count[h]--;
      enqueue(h);
    }
  }
  // Groups never processed whose unknowns are all gone: their rows are dependent.
  const remRows: number[] = [];
  for (let g = 0; g <= n; g++) {
    if (done[g]) continue;
    if (count[g] === 0) leftover.push(...groupRows(g));
    else remRows.push(...groupRows(g));
  }
  const remCols: number[] = [];
  for (let c = 0; c < nCols; c++) if (!pivoted[c]) remCols.push(c);
  const local = new Map(remCols.map((c, i) => [c, i]));
  const remSparse: SparseRow[] = remRows.map((row) => {
    const rw = allRows[row];
    const out: SparseRow = { cols: [], vals: [] };
    rw.cols.forEach((c, k) => {
      const l = local.get(c);
      if (l !== undefined) {
        out.cols.push(l);
        out.vals.push(rw.vals[k]);
      }
    });
    return out;
  });
  const track = wantMechanism;
  const rem = remRows.length ? sparseEliminate(remCols.length, remSparse, { track }) : null;
  if (rem) rank += rem.rank;
  if (!wantMechanism || rank >= 2 * n) return { rank, mechanismJoints: [] };

  // Null vectors: each leftover row alone, and each dependent combination of the remainder.
  const combos: Map<number, number>[] = leftover.map((row) => new Map([[row, 1]]));
  if (rem) for (const nc of rem.nullCombinations) {
    const mp = new Map<number, number>();
    for (const [i, v] of nc) mp.set(remRows[i], v);
    combos.push(mp);
  }
  const moving = new Set<number>();
  for (const z of combos.slice(0, NULL_VECTOR_LIMIT)) {
    const y = new Map(z);
    // Residual on pivoted columns, cancelled group by group in reverse order.
    const c = new Map<number, number>();
    for (const [row, w] of z) {
      const rw = allRows[row];
      rw.cols.forEach((col, k) => {
        if (pivoted[col]) c.set(col, (c.get(col) ?? 0) + w * rw.vals[k]);
      });
    }
    for (let t = pivots.length - 1; t >= 0; t--) {
      const pv = pivots[t];
      if (!pv.cols.some((col) => Math.abs(c.get(col) ?? 0) > 0)) continue;
      const k = pv.cols.length;
      // Solve Bᵀ w = c on this group's columns, B = pivot rows × pivot cols.
      const Bt = pv.cols.map((col) => pv.rows.map((row) => entry(row, col)));
      const w = smallSolve(Bt, pv.cols.map((col) => c.get(col) ?? 0));
      for (let i = 0; i < k; i++) {
        const row = pv.rows[i];
        y.set(row, (y.get(row) ?? 0) - w[i]);
        const rw = allRows[row];
        rw.cols.forEach((col, kk) => {
          c.set(col, (c.get(col) ?? 0) - w[i] * rw.vals[kk]);
        });
      }
    }
    // Expand the global rows into joint rows.
    const yj = new Float64Array(2 * n);
    for (const [row, v] of y) {
      if (row < 2 * n) yj[row] += v;
      else if (row === 2 * n) for (let j = 0; j < n; j++) yj[2 * j] += v;
      else if (row === 2 * n + 1) for (let j = 0; j < n; j++) yj[2 * j + 1] += v;
      else
        for (let j = 0; j < n; j++) {
          yj[2 * j + 1] += (v * (pm.x[j] - pm.x[o])) / scale;
          yj[2 * j] -= (v * (pm.y[j] - pm.y[o])) / scale;
        }
    }
    let zmax = 0;
    for (const v of z.values()) zmax = Math.max(zmax, Math.abs(v));
    let ymax = 0;
    for (let i = 0; i < 2 * n; i++) ymax = Math.max(ymax, Math.abs(yj[i]));
    if (ymax <= 1e-8 * Math.max(zmax, 1)) continue; // a trivial one: g is a sum of joint rows
    for (let j = 0; j < n; j++) {
      if (Math.abs(yj[2 * j]) > 1e-6 * ymax || Math.abs(yj[2 * j + 1]) > 1e-6 * ymax) moving.add(j);
    }
  }
  return { rank, mechanismJoints: [...moving].sort((p, q) => p - q) };
}

/** Indices of k rows of `block` (rows × k) that are independent, or null if rank < k. */
function blockPivotRows(block: number[][], k: number): number[] | null {
  const a = block.map((row) => [...row]);
  const used: number[] = [];
  const free = a.map((_, i) => i);
  for (let c = 0; c < k; c++) {
    let best = -1;
    let bv = BLOCK_TOLERANCE;
    for (const i of free) if (Math.abs(a[i][c]) > bv) {
      bv = Math.abs(a[i][c]);
      best = i;
    }
    if (best < 0) return null;
    used.push(best);
    free.splice(free.indexOf(best), 1);
    for (const i of free) {
      const f = a[i][c] / a[best][c];
      for (let cc = c; cc < k; cc++) a[i][cc] -= f * a[best][cc];
    }
  }
  return used;
}

/** Solves a small square system by Gaussian elimination with partial pivoting. */
function smallSolve(A: number[][], b: number[]): number[] {
  const k = b.length;
  const a = A.map((row, i) => [...row, b[i]]);
  for (let c = 0; c < k; c++) {
    let best = c;
    for (let i = c + 1; i < k; i++) if (Math.abs(a[i][c]) > Math.abs(a[best][c])) best = i;
    [a[c], a[best]] = [a[best], a[c]];
    for (let i = 0; i < k; i++) {
      if (i === c) continue;
      const f = a[i][c] / a[c][c];
      for (let cc = c; cc <= k; cc++) a[i][cc] -= f * a[c][cc];
    }
  }
  return a.map((row, i) => row[k] / row[i]);
}
