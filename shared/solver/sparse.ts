/**
 * Sparse Gaussian elimination over rows, used for the rank of the joint-equilibrium matrix and
 * for the simultaneous solve of the unknowns the method of joints cannot reach.
 *
 * Ordering: the active row with the fewest non-zeros is eliminated next (the sparse analogue of
 * "take the joint with the fewest unknowns"), pivoting on its largest entry. On truss matrices
 * this keeps fill local, so the work grows about linearly with the size of the truss.
 */

/** One sparse row: parallel arrays of column indices and values. */
export interface SparseRow {
  cols: number[];
  vals: number[];
}

export interface SparseEliminationOptions {
  /** Right-hand side per row (solve A·x = rhs). */
  rhs?: Float64Array;
  /** Keep, for each dependent row, the combination of original rows that vanishes. */
  track?: boolean;
  /** Smallest acceptable pivot; default 1e-9 (entries are direction cosines, order 1). */
  pivotTolerance?: number;
}

export interface SparseEliminationResult {
  rank: number;
  /** Pivots in elimination order. */
  pivots: { row: number; col: number }[];
  /** Rows that became zero (linearly dependent on the others). */
  dependentRows: number[];
  /** With `track`: per dependent row, original row → coefficient of a vanishing combination. */
  nullCombinations: Map<number, number>[];
  /** With `rhs`: a solution (free columns set to 0). */
  solution: Float64Array | null;
  /** With `rhs`: the largest |rhs| left on a dependent row (0 when consistent). */
  inconsistency: number;
}

const DROP_TOLERANCE = 1e-13;

/**
 * Eliminates the rows of a sparse matrix with `nCols` columns. Pure; the input rows are not
 * changed.
 */
export function sparseEliminate(
  nCols: number,
  input: SparseRow[],
  options: SparseEliminationOptions = {},
): SparseEliminationResult {
  const pivotTol = options.pivotTolerance ?? 1e-9;
  const nRows = input.length;
  const rows: Map<number, number>[] = new Array(nRows);
  const colRows: Set<number>[] = new Array(nCols);
  for (let c = 0; c < nCols; c++) colRows[c] = new Set();
  for (let i = 0; i < nRows; i++) {
    const mp = new Map<number, number>();
    const { cols, vals } = input[i];
    for (let k = 0; k < cols.length; k++) {
      if (Math.abs(vals[k]) <= DROP_TOLERANCE) continue;
      mp.set(cols[k], (mp.get(cols[k]) ?? 0) + vals[k]);
      colRows[cols[k]].add(i);
    }
    rows[i] = mp;
  }
  const rhs = options.rhs ? Float64Array.from(options.rhs) : null;
  const combos: Map<number, number>[] | null = options.track
    ? rows.map((_, i) => new Map([[i, 1]]))
    : null;

  // Bucket queue keyed by the row's non-zero count (lazy: stale entries are skipped).
  const buckets: number[][] = [];
  const push = (row: number) => {
    const size = rows[row].size;
    (buckets[size] ??= []).push(row);
  };
  for (let i = 0; i < nRows; i++) push(i);
  const active = new Uint8Array(nRows).fill(1);
  let low = 0;

  const pivots: { row: number; col: number }[] = [];
  const pivotRows: Map<number, number>[] = [];
  const pivotRhs: number[] = [];
  const dependentRows: number[] = [];
  const nullCombinations: Map<number, number>[] = [];
  let inconsistency = 0;

  const retire = (row: number) => {
    active[row] = 0;
    for (const c of rows[row].keys()) colRows[c].delete(row);
  };

  for (;;) {
    let p = -1;
    while (low < buckets.length) {
      const b = buckets[low];
      if (!b || b.length === 0) {
        low++;
        continue;
      }
      const cand = b.pop() as number;
      if (active[cand] && rows[cand].size === low) {
        p = cand;
        break;
      }
    }
    if (p < 0) break;
    const rowP = rows[p];
    let pc = -1;
    let pv = 0;
    for (const [c, v] of rowP) {
      if (Math.abs(v) > Math.abs(pv)) {
        pv = v;
        pc = c;
      }
    }
    if (pc < 0 || Math.abs(pv) < pivotTol) {
      retire(p);
      dependentRows.push(p);
      if (combos) nullCombinations.push(combos[p]);
      if (rhs) inconsistency = Math.max(inconsistency, Math.abs(rhs[p]));
      continue;
    }
    retire(p);
    const others = [...colRows[pc]];
    for (const k of others) {
      const rowK = rows[k];
      const f = (rowK.get(pc) as number) / pv;
      for (const [c, v] of rowP) {
        if (c === pc) {
          rowK.delete(c);
          colRows[c].delete(k);
          continue;
        }
        const nv = (rowK.get(c) ?? 0) - f * v;
        if (Math.abs(nv) <= DROP_TOLERANCE) {
          if (rowK.delete(c)) colRows[c].delete(k);
        } else {
          if (!rowK.has(c)) colRows[c].add(k);
          rowK.set(c, nv);
        }
      }
      if (rhs) rhs[k] -= f * rhs[p];
      if (combos) {
        const ck = combos[k];
        for (const [r, v] of combos[p]) ck.set(r, (ck.get(r) ?? 0) - f * v);
      }
      push(k);
      if (rowK.size < low) low = rowK.size;
    }
    pivots.push({ row: p, col: pc });
    pivotRows.push(rowP);
    pivotRhs.push(rhs ? rhs[p] : 0);
  }

  let solution: Float64Array | null = null;
  if (rhs) {
    solution = new Float64Array(nCols);
    for (let t = pivots.length - 1; t >= 0; t--) {
      const { col } = pivots[t];
      const row = pivotRows[t];
      let s = pivotRhs[t];
      let diag = 0;
      for (const [c, v] of row) {
        if (c === col) diag = v;
        else s -= v * solution[c];
      }
      solution[col] = s / diag;
    }
  }
  return { rank: pivots.length, pivots, dependentRows, nullCombinations, solution, inconsistency };
}
