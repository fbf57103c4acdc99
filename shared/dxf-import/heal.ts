/**
 * Geometry healing of a bag of straight segments into joints and members, with sorting and
 * uniform grids (cost about linear in the number of segments; no pairwise loops over the
 * whole drawing). All coordinates and the tolerance in metres.
 */
import { sortIndicesByFloat, sortIndicesByInt } from './sort';

/** What healing did, by internal indices into the returned joints and members. */
export interface HealResult {
  /** Joint coordinates, interleaved x, y. */
  joints: Float64Array;
  /** Member ends, interleaved from, to (joint indices). */
  members: Int32Array;
  /** Source segment of each member (for its layer). */
  memberSource: Int32Array;
  /** Joints made from endpoints at different places, and how many places were merged. */
  merged: { count: number; joints: number[] };
  /** Segments dropped because both ends fell in one joint: their places. */
  zeroLength: { count: number; points: number[] };
  /** Exact duplicates removed: surviving member of each. */
  duplicates: { count: number; members: number[]; points: number[] };
  /** Split pieces that lay on another member's piece: surviving member of each. */
  overlaps: { count: number; members: number[]; points: number[] };
  /** Members cut at joints lying on their interior. */
  splits: { members: number; cuts: number; joints: Int32Array; pieces: Int32Array };
  /** Pairs of members crossing away from their ends, with the crossing point. */
  crossings: { a: number; b: number; x: number; y: number }[];
  /** Members with an end joined to nothing else: member and free joint. */
  dangling: { member: number; joint: number }[];
  /** Connected pieces other than the largest: their members. */
  pieces: number[][];
}

/** Grid cells (gx, gy) → dense ids 0, 1, 2, … in first-seen order. */
interface CellMap {
  /** The id of (gx, gy), or −1 when it has none. */
  get(gx: number, gy: number): number;
  /** The id of (gx, gy); when it has none, gives it `fresh` (≥ 0) and returns that. */
  intern(gx: number, gy: number, fresh: number): number;
}

/**
 * Open-addressing hash from a grid cell (gx, gy), or any pair of int32s, to an int ≥ 0.
 * Typed arrays and small-integer keys keep it free of allocation, which a Map keyed by
 * gx·ny + gy is not once keys pass 2³⁰ (they become heap numbers). Each slot holds its key
 * and value + 1 side by side (gx, gy, value + 1, unused), so a probe touches one cache line
 * and a new table needs no filling (0 = empty).
 */
class CellHash implements CellMap {
  slots: Int32Array;
  mask: number;
  size = 0;

  constructor(expected: number) {
    let cap = 16;
    while (cap < 2 * expected) cap *= 2;
    this.slots = new Int32Array(4 * cap);
    this.mask = cap - 1;
  }

  /** Slot index ×4 holding (gx, gy), or the empty slot where it would go. */
  private slot(gx: number, gy: number): number {
    // murmur3-style finaliser over both coordinates, so neighbouring cells spread out
    let h = Math.imul(gx, 0x9e3779b1) ^ gy;
    h ^= h >>> 16;
    h = Math.imul(h, 0x85ebca6b);
    h ^= h >>> 13;
    h = Math.imul(h, 0xc2b2ae35);
    h ^= h >>> 16;
    const t = this.slots;
    const mask = this.mask;
    h &= mask;
    while (t[4 * h + 2] !== 0 && (t[4 * h] !== gx || t[4 * h + 1] !== gy)) h = (h + 1) & mask;
    return 4 * h;
  }

  get(gx: number, gy: number): number {
    return this.slots[this.slot(gx, gy) + 2] - 1;
  }

  intern(gx: number, gy: number, fresh: number): number {
    let s = this.slot(gx, gy);
    const v = this.slots[s + 2];
    if (v !== 0) return v - 1;
    if (2 * (this.size + 1) > this.mask + 1) {
      this.grow();
      s = this.slot(gx, gy);
    }
    this.size++;
    this.slots[s] = gx;
    this.slots[s + 1] = gy;
    this.slots[s + 2] = fresh + 1;
    return fresh;
  }

  private grow(): void {
    const old = this.slots;
    const cap = 2 * (this.mask + 1);
    this.slots = new Int32Array(4 * cap);
    this.mask = cap - 1;
    for (let i = 0; i < old.length; i += 4) {
      if (old[i + 2] === 0) continue;
      const s = this.slot(old[i], old[i + 1]);
      this.slots[s] = old[i];
      this.slots[s + 1] = old[i + 1];
      this.slots[s + 2] = old[i + 2];
    }
  }
}

/**
 * A table over every cell of a small grid (index (gx − gx0)·ny + gy − gy0): one array read per
 * look-up, no hashing. Used when the grid has not many more cells than there are things to put
 * in them (the usual case: a truss drawing gridded at its typical member length).
 */
class DenseCells implements CellMap {
  ids: Int32Array;

  constructor(
    private gx0: number,
    private gy0: number,
    private nx: number,
    private ny: number,
  ) {
    this.ids = new Int32Array(nx * ny);
  }

  /** Number of cells in the table. */
  get size(): number {
    return this.nx * this.ny;
  }

  /** Index of (gx, gy) in the table; the cell must lie within it. */
  index(gx: number, gy: number): number {
    return (gx - this.gx0) * this.ny + gy - this.gy0;
  }

  get(gx: number, gy: number): number {
    const ix = gx - this.gx0;
    const iy = gy - this.gy0;
    if (ix < 0 || iy < 0 || ix >= this.nx || iy >= this.ny) return -1;
    return this.ids[ix * this.ny + iy] - 1;
  }

  intern(gx: number, gy: number, fresh: number): number {
    // callers only intern cells within `pad` of the extent, which the grid covers
    const k = (gx - this.gx0) * this.ny + gy - this.gy0;
    const v = this.ids[k];
    if (v !== 0) return v - 1;
    this.ids[k] = fresh + 1;
    return fresh;
  }
}

/** Grid geometry shared by the member-length grids: cell size, origin and the extent covered. */
interface GridFrame {
  cell: number;
  ox: number;
  oy: number;
  maxX: number;
  maxY: number;
}

/**
 * A cell map for cells within `pad` of the frame's extent, expecting about `expected` cells:
 * a dense table when that grid is small enough, else a hash.
 */
function cellMapFor(f: GridFrame, pad: number, expected: number): CellMap {
  const gx0 = Math.floor(-pad / f.cell) - 1;
  const gy0 = Math.floor(-pad / f.cell) - 1;
  const nx = Math.floor((f.maxX + pad - f.ox) / f.cell) + 2 - gx0;
  const ny = Math.floor((f.maxY + pad - f.oy) / f.cell) + 2 - gy0;
  if (nx * ny <= 8 * expected + 65_536) return new DenseCells(gx0, gy0, nx, ny);
  return new CellHash(expected);
}

/** Int list on a doubling typed array (no boxed numbers, no per-item allocation). */
class IntList {
  data: Int32Array;
  length = 0;

  constructor(capacity: number) {
    this.data = new Int32Array(Math.max(16, capacity));
  }

  push(v: number): void {
    if (this.length === this.data.length) {
      const bigger = new Int32Array(2 * this.length);
      bigger.set(this.data);
      this.data = bigger;
    }
    this.data[this.length++] = v;
  }
}

/** Float list on a doubling typed array. */
class FloatList {
  data: Float64Array;
  length = 0;

  constructor(capacity: number) {
    this.data = new Float64Array(Math.max(16, capacity));
  }

  push(v: number): void {
    if (this.length === this.data.length) {
      const bigger = new Float64Array(2 * this.length);
      bigger.set(this.data);
      this.data = bigger;
    }
    this.data[this.length++] = v;
  }
}

/**
 * Points grouped by grid cell, in compressed rows: cell c (dense id, `ids` maps (gx, gy) to it)
 * holds points items[start[c] … start[c+1]), ascending. One hash probe per point and a counting
 * sort, instead of a probe per point and neighbour cell.
 */
interface PointCells {
  ids: CellMap;
  count: number;
  gx: Int32Array;
  gy: Int32Array;
  start: Int32Array;
  items: Int32Array;
}

/** Groups points (interleaved x, y) by cells of size `cell` from origin (ox, oy); `take` filters. */
function pointCells(xy: Float64Array, n: number, take: Uint8Array | null, ids: CellMap, cell: number, ox: number, oy: number): PointCells {
  const cellOf = new Int32Array(n);
  const gxs = new Int32Array(n);
  const gys = new Int32Array(n);
  let C = 0;
  for (let k = 0; k < n; k++) {
    if (take !== null && take[k] === 0) {
      cellOf[k] = -1;
      continue;
    }
    const gx = Math.floor((xy[2 * k] - ox) / cell);
    const gy = Math.floor((xy[2 * k + 1] - oy) / cell);
    const c = ids.intern(gx, gy, C);
    if (c === C) {
      gxs[C] = gx;
      gys[C] = gy;
      C++;
    }
    cellOf[k] = c;
  }
  const start = new Int32Array(C + 1);
  for (let k = 0; k < n; k++) if (cellOf[k] >= 0) start[cellOf[k] + 1]++;
  for (let c = 0; c < C; c++) start[c + 1] += start[c];
  const fill = start.slice(0, C);
  const items = new Int32Array(start[C]);
  for (let k = 0; k < n; k++) if (cellOf[k] >= 0) items[fill[cellOf[k]]++] = k;
  return { ids, count: C, gx: gxs, gy: gys, start, items };
}

/**
 * Appends to `out`, as gx, gy pairs, every grid cell that comes within `pad` of the segment,
 * and for short segments a few more: a sweep over the columns it spans, each taking the rows
 * covered by its piece in that column (widened by `pad`). Each cell once, so callers need no
 * duplicate check.
 */
function segmentCells(out: IntList, cell: number, ox: number, oy: number, x1: number, y1: number, x2: number, y2: number, pad: number): void {
  if (x2 < x1) {
    let t = x1;
    x1 = x2;
    x2 = t;
    t = y1;
    y1 = y2;
    y2 = t;
  }
  const gxa = Math.floor((x1 - pad - ox) / cell);
  const gxb = Math.floor((x2 + pad - ox) / cell);
  const ylo = y1 < y2 ? y1 : y2;
  const yhi = y1 < y2 ? y2 : y1;
  const gyBoxA = Math.floor((ylo - pad - oy) / cell);
  const gyBoxB = Math.floor((yhi + pad - oy) / cell);
  // most members are short: when the padded box spans at most two columns or two rows, take
  // all its cells (at most twice those the member comes near; callers test exactly) and skip
  // following the slope
  if (gxb - gxa <= 1 || gyBoxB - gyBoxA <= 1) {
    for (let gx = gxa; gx <= gxb; gx++) {
      for (let gy = gyBoxA; gy <= gyBoxB; gy++) {
        out.push(gx);
        out.push(gy);
      }
    }
    return;
  }
  const dx = x2 - x1;
  const slope = dx > 0 ? (y2 - y1) / dx : 0;
  for (let gx = gxa; gx <= gxb; gx++) {
    let ya = y1;
    let yb = y2;
    if (dx > 0) {
      const xa = Math.max(x1, ox + gx * cell - pad);
      const xb = Math.min(x2, ox + (gx + 1) * cell + pad);
      ya = y1 + (xa - x1) * slope;
      yb = y1 + (xb - x1) * slope;
    }
    const gya = Math.floor((Math.min(ya, yb) - pad - oy) / cell);
    const gyb = Math.floor((Math.max(ya, yb) + pad - oy) / cell);
    for (let gy = gya; gy <= gyb; gy++) {
      out.push(gx);
      out.push(gy);
    }
  }
}

function find(parent: Int32Array, i: number): number {
  while (parent[i] !== i) {
    parent[i] = parent[parent[i]];
    i = parent[i];
  }
  return i;
}

function union(parent: Int32Array, a: number, b: number): void {
  const ra = find(parent, a);
  const rb = find(parent, b);
  if (ra !== rb) {
    if (ra < rb) parent[rb] = ra;
    else parent[ra] = rb;
  }
}

/** Joins points k and q (interleaved x, y in `xy`) when they lie within √tol2 of each other. */
function joinIfNear(xy: Float64Array, parent: Int32Array, tol2: number, k: number, q: number): void {
  const dx = xy[2 * q] - xy[2 * k];
  const dy = xy[2 * q + 1] - xy[2 * k + 1];
  if (dx * dx + dy * dy <= tol2) union(parent, k, q);
}

/**
 * For each of n pairs (ends[2i], ends[2i + 1]), unordered, of ints in [0, range): the first
 * index i' ≤ i holding the same pair (−1 where both ends are equal). A stable counting sort by
 * the lower end, then one scan per group with a table over the higher end: no hashing.
 */
function firstOfEqualPairs(ends: Int32Array, n: number, range: number): Int32Array {
  const start = new Int32Array(range + 1);
  for (let i = 0; i < n; i++) {
    const a = ends[2 * i];
    const b = ends[2 * i + 1];
    if (a !== b) start[(a < b ? a : b) + 1]++;
  }
  for (let v = 0; v < range; v++) start[v + 1] += start[v];
  const fill = start.slice(0, range);
  const byLo = new Int32Array(start[range]);
  for (let i = 0; i < n; i++) {
    const a = ends[2 * i];
    const b = ends[2 * i + 1];
    if (a !== b) byLo[fill[a < b ? a : b]++] = i;
  }
  const first = new Int32Array(n).fill(-1);
  const groupOf = new Int32Array(range).fill(-1);
  const seenAt = new Int32Array(range);
  for (let lo = 0; lo < range; lo++) {
    for (let p = start[lo]; p < start[lo + 1]; p++) {
      const i = byLo[p];
      const a = ends[2 * i];
      const b = ends[2 * i + 1];
      const hi = a < b ? b : a;
      if (groupOf[hi] === lo) {
        first[i] = seenAt[hi];
      } else {
        groupOf[hi] = lo;
        seenAt[hi] = i;
        first[i] = i;
      }
    }
  }
  return first;
}

/** Sorts entries [from, to) of the cut lists by position along the member, then joint. */
function sortCuts(cutT: Float64Array, cutJ: Int32Array, from: number, to: number): void {
  // the cell walk meets the cuts in order along the member, or in reverse: check that first
  if (cutT[from] > cutT[to - 1]) {
    for (let p = from, q = to - 1; p < q; p++, q--) {
      const t = cutT[p];
      cutT[p] = cutT[q];
      cutT[q] = t;
      const j = cutJ[p];
      cutJ[p] = cutJ[q];
      cutJ[q] = j;
    }
  }
  let sorted = true;
  for (let p = from + 1; p < to && sorted; p++) {
    if (cutT[p - 1] > cutT[p] || (cutT[p - 1] === cutT[p] && cutJ[p - 1] > cutJ[p])) sorted = false;
  }
  if (sorted) return;
  const idx: number[] = [];
  for (let p = from; p < to; p++) idx.push(p);
  idx.sort((p, q) => cutT[p] - cutT[q] || cutJ[p] - cutJ[q]);
  const t = idx.map((p) => cutT[p]);
  const j = idx.map((p) => cutJ[p]);
  for (let p = from; p < to; p++) {
    cutT[p] = t[p - from];
    cutJ[p] = j[p - from];
  }
}

/**
 * Step 1 of healing: joins (union-find on `parent`) endpoints within tol of each other. Points
 * sorted by column, then by row (rows tol high, columns at least tol wide), so near pairs lie
 * in one column or the next and one row or the next: a sweep over sorted lists, no hashing.
 */
function clusterEndpoints(seg: Float64Array, P: number, parent: Int32Array, tol: number, frame: { ox: number; oy: number; width: number; height: number }): void {
  const tol2 = tol * tol;
  // about one column per point, so that one counting pass sorts by column; rows by two passes.
  // A little wider than tol, so that rounding cannot put a pair exactly tol apart two apart.
  const reach = tol * (1 + 1e-6);
  const colW = Math.max(reach, frame.width / Math.max(1, P));
  const rowH = Math.max(reach, frame.height / 2 ** 30);
  const nCols = Math.floor(frame.width / colW) + 3;
  const col = new Int32Array(P);
  const row = new Int32Array(P);
  const byCol = new Int32Array(P);
  for (let k = 0; k < P; k++) {
    col[k] = Math.floor((seg[2 * k] - frame.ox) / colW);
    row[k] = Math.floor((seg[2 * k + 1] - frame.oy) / rowH);
    byCol[k] = k;
  }
  sortIndicesByInt(byCol, row);
  sortIndicesByInt(byCol, col, nCols);
  for (let s = 0; s < P; ) {
    const g = col[byCol[s]];
    let e = s;
    while (e < P && col[byCol[e]] === g) e++;
    let e2 = e; // the next column's run [e, e2), when it is column g + 1
    while (e2 < P && col[byCol[e2]] === g + 1) e2++;
    let lo = e;
    for (let p = s; p < e; p++) {
      const k = byCol[p];
      const r = row[k];
      for (let q = p + 1; q < e && row[byCol[q]] <= r + 1; q++) joinIfNear(seg, parent, tol2, k, byCol[q]);
      while (lo < e2 && row[byCol[lo]] < r - 1) lo++;
      for (let q = lo; q < e2 && row[byCol[q]] <= r + 1; q++) joinIfNear(seg, parent, tol2, k, byCol[q]);
    }
    s = e;
  }
}

/**
 * Clusters of endpoints → joints, numbered by their first endpoint; each joint where most of
 * its endpoints are.
 */
function jointsOfClusters(seg: Float64Array, P: number, parent: Int32Array): { J: number; pointJoint: Int32Array; joints: Float64Array; merged: HealResult['merged'] } {
  const jointOfRoot = new Int32Array(P).fill(-1);
  const pointJoint = new Int32Array(P);
  let J = 0;
  for (let k = 0; k < P; k++) {
    const r = find(parent, k);
    if (jointOfRoot[r] < 0) jointOfRoot[r] = J++;
    pointJoint[k] = jointOfRoot[r];
  }
  const start = new Int32Array(J + 1);
  for (let k = 0; k < P; k++) start[pointJoint[k] + 1]++;
  for (let j = 0; j < J; j++) start[j + 1] += start[j];
  const fill = start.slice(0, J);
  const order = new Int32Array(P);
  for (let k = 0; k < P; k++) order[fill[pointJoint[k]]++] = k;
  const joints = new Float64Array(2 * J);
  const merged = { count: 0, joints: [] as number[] };
  for (let j = 0; j < J; j++) {
    const s = start[j];
    const e = start[j + 1];
    const k0 = order[s];
    let x0 = seg[2 * k0];
    let y0 = seg[2 * k0 + 1];
    let same = true;
    for (let t = s + 1; t < e && same; t++) {
      const k = order[t];
      if (seg[2 * k] !== x0 || seg[2 * k + 1] !== y0) same = false;
    }
    if (!same) {
      // distinct places; the joint goes where most endpoints are (ties: lowest x, then y)
      const places = new Map<string, { x: number; y: number; n: number }>();
      for (let t = s; t < e; t++) {
        const k = order[t];
        const x = seg[2 * k];
        const y = seg[2 * k + 1];
        const id = `${x},${y}`;
        const p = places.get(id);
        if (p) p.n++;
        else places.set(id, { x, y, n: 1 });
      }
      let best: { x: number; y: number; n: number } | null = null;
      for (const p of places.values()) {
        if (!best || p.n > best.n || (p.n === best.n && (p.x < best.x || (p.x === best.x && p.y < best.y)))) best = p;
      }
      x0 = best!.x;
      y0 = best!.y;
      merged.count += places.size - 1;
      merged.joints.push(j);
    }
    joints[2 * j] = x0;
    joints[2 * j + 1] = y0;
  }
  return { J, pointJoint, joints, merged };
}

/**
 * Steps 4 and 5 of healing: cuts members where a joint lies within tol of their interior (each
 * member walks the cells within tol of it and tests the joints there: a grid of joints, not of
 * members), then merges pieces that now coincide. Fills `splits`, `overlaps` and re-points
 * `duplicates` at surviving pieces; returns the members after cutting.
 */
function splitMembers(
  joints: Float64Array,
  J: number,
  members: Int32Array,
  memberSource: Int32Array,
  M: number,
  lens: Float64Array,
  tol: number,
  frame: GridFrame,
  splits: HealResult['splits'],
  overlaps: HealResult['overlaps'],
  duplicates: HealResult['duplicates'],
): { members: Int32Array; memberSource: Int32Array; M: number } {
  const { cell: mcell, ox, oy } = frame;
  const cells = new IntList(1024);
  // only joints some member ends at may cut (not the lone point of a dropped zero-length segment)
  const isEnd = new Uint8Array(J);
  for (let i = 0; i < 2 * M; i++) isEnd[members[i]] = 1;
  const pad = tol + mcell * 1e-9;
  const jc = pointCells(joints, J, isEnd, cellMapFor(frame, pad, J), mcell, ox, oy);
  const cutM = new IntList(256);
  const cutT = new FloatList(256);
  const cutJ = new IntList(256);
  const dense = jc.ids instanceof DenseCells ? jc.ids : null;
  const start = jc.start;
  const items = jc.items;
  /** Cuts of member i (a → b) by the joints of cell id, appended to the cut lists. */
  const cutsInCell = (id: number, i: number, a: number, b: number, ax: number, ay: number, dx: number, dy: number, L: number) => {
    for (let p = start[id]; p < start[id + 1]; p++) {
      const j = items[p];
      if (j === a || j === b) continue;
      const x = joints[2 * j];
      const y = joints[2 * j + 1];
      const along = ((x - ax) * dx + (y - ay) * dy) / L;
      if (along <= tol || along >= L - tol) continue;
      const across = Math.abs((x - ax) * dy - (y - ay) * dx) / L;
      if (across > tol) continue;
      cutM.push(i);
      cutT.push(along / L);
      cutJ.push(j);
    }
  };
  for (let i = 0; i < M; i++) {
    const a = members[2 * i];
    const b = members[2 * i + 1];
    const ax = joints[2 * a];
    const ay = joints[2 * a + 1];
    const bx = joints[2 * b];
    const by = joints[2 * b + 1];
    const dx = bx - ax;
    const dy = by - ay;
    const L = lens[i];
    const first = cutM.length;
    if (dense !== null) {
      // on a dense grid, a box two cells wide or high: its cells looked up directly (as segmentCells would list them)
      const gxa = Math.floor(((ax < bx ? ax : bx) - pad - ox) / mcell);
      const gxb = Math.floor(((ax < bx ? bx : ax) + pad - ox) / mcell);
      const gya = Math.floor(((ay < by ? ay : by) - pad - oy) / mcell);
      const gyb = Math.floor(((ay < by ? by : ay) + pad - oy) / mcell);
      if (gxb - gxa <= 1 || gyb - gya <= 1) {
        for (let gx = gxa; gx <= gxb; gx++) {
          for (let gy = gya; gy <= gyb; gy++) {
            const id = dense.get(gx, gy);
            if (id >= 0) cutsInCell(id, i, a, b, ax, ay, dx, dy, L);
          }
        }
        if (cutM.length - first > 1) sortCuts(cutT.data, cutJ.data, first, cutM.length);
        continue;
      }
    }
    cells.length = 0;
    segmentCells(cells, mcell, ox, oy, ax, ay, bx, by, pad);
    for (let c = 0; c < cells.length; c += 2) {
      const id = jc.ids.get(cells.data[c], cells.data[c + 1]);
      if (id >= 0) cutsInCell(id, i, a, b, ax, ay, dx, dy, L);
    }
    if (cutM.length - first > 1) sortCuts(cutT.data, cutJ.data, first, cutM.length);
  }
  const C = cutM.length;
  if (C > 0) {
    // cuts are grouped by member (ascending) and ordered along it
    const cm = cutM.data;
    const cj = cutJ.data;
    const isCut = new Uint8Array(M);
    for (let p = 0; p < C; p++) isCut[cm[p]] = 1;
    const pieces = new Int32Array(2 * (M + C));
    const pieceSource = new Int32Array(M + C);
    let Q = 0;
    for (let i = 0; i < M; i++) {
      if (isCut[i]) continue;
      pieces[2 * Q] = members[2 * i];
      pieces[2 * Q + 1] = members[2 * i + 1];
      pieceSource[Q] = memberSource[i];
      Q++;
    }
    // pieces of split member r: [rangeStart[r], rangeStart[r + 1])
    const rangeStart = new IntList(64);
    for (let p = 0; p < C; ) {
      const i = cm[p];
      let prev = members[2 * i];
      rangeStart.push(Q);
      splits.members++;
      for (; p < C && cm[p] === i; p++) {
        const j = cj[p];
        splits.cuts++;
        pieces[2 * Q] = prev;
        pieces[2 * Q + 1] = j;
        pieceSource[Q] = memberSource[i];
        Q++;
        prev = j;
      }
      pieces[2 * Q] = prev;
      pieces[2 * Q + 1] = members[2 * i + 1];
      pieceSource[Q] = memberSource[i];
      Q++;
    }
    rangeStart.push(Q);
    splits.joints = cj.slice(0, C);
    // ---- 5. merge pieces that now coincide (collinear overlaps); uncut members come first,
    // so they survive
    const firstPiece = firstOfEqualPairs(pieces, Q, J);
    const keep = new Int32Array(Q).fill(-1);
    let K = 0;
    const out = new Int32Array(2 * Q);
    const outSource = new Int32Array(Q);
    for (let q = 0; q < Q; q++) {
      const a = pieces[2 * q];
      const b = pieces[2 * q + 1];
      const f = firstPiece[q];
      if (f !== q) {
        overlaps.count++;
        overlaps.members.push(keep[f]);
        overlaps.points.push((joints[2 * a] + joints[2 * b]) / 2, (joints[2 * a + 1] + joints[2 * b + 1]) / 2);
        keep[q] = keep[f];
        continue;
      }
      keep[q] = K;
      out[2 * K] = a;
      out[2 * K + 1] = b;
      outSource[K] = pieceSource[q];
      K++;
    }
    const firstSplitPiece = rangeStart.data[0];
    splits.pieces = keep.slice(firstSplitPiece, Q);
    // duplicates found earlier pointed at pre-split members; point them at a surviving piece
    const remap = new Int32Array(M).fill(-1);
    {
      let q = 0;
      for (let i = 0; i < M; i++) if (!isCut[i]) remap[i] = keep[q++];
      let r = 0;
      for (let i = 0; i < M; i++) {
        if (isCut[i]) remap[i] = keep[rangeStart.data[r++]];
      }
    }
    duplicates.members = duplicates.members.map((i) => remap[i]);
    return { members: out, memberSource: outSource, M: K };
  }
  return { members, memberSource, M };
}

/**
 * Step 6 of healing: pairs of members crossing away from their ends. Members bucketed by the
 * cells they pass through (counting sort by cell), then the pairs sharing a cell tested.
 */
function findCrossings(joints: Float64Array, members: Int32Array, M: number, tol: number, frame: GridFrame): HealResult['crossings'] {
  const { cell: mcell, ox, oy } = frame;
  const cells = new IntList(1024);
  const crossings: HealResult['crossings'] = [];
  const pad = mcell * 1e-9;
  const ids = cellMapFor(frame, pad, M);
  const entCell = new IntList(3 * M);
  const entMember = new IntList(3 * M);
  let C = 0;
  // on a dense grid a cell's id is its index in the table: no interning
  const dense = ids instanceof DenseCells ? ids : null;
  if (dense !== null) C = dense.size;
  for (let i = 0; i < M; i++) {
    const a = members[2 * i];
    const b = members[2 * i + 1];
    cells.length = 0;
    segmentCells(cells, mcell, ox, oy, joints[2 * a], joints[2 * a + 1], joints[2 * b], joints[2 * b + 1], pad);
    for (let c = 0; c < cells.length; c += 2) {
      let id: number;
      if (dense !== null) id = dense.index(cells.data[c], cells.data[c + 1]);
      else {
        id = ids.intern(cells.data[c], cells.data[c + 1], C);
        if (id === C) C++;
      }
      entCell.push(id);
      entMember.push(i);
    }
  }
  const E = entCell.length;
  const cstart = new Int32Array(C + 1);
  for (let e = 0; e < E; e++) cstart[entCell.data[e] + 1]++;
  for (let c = 0; c < C; c++) cstart[c + 1] += cstart[c];
  const cfill = cstart.slice(0, C);
  const items = new Int32Array(E);
  for (let e = 0; e < E; e++) items[cfill[entCell.data[e]]++] = entMember.data[e];
  const found = new Set<number>();
  for (let c = 0; c < C; c++) {
    const s = cstart[c];
    const e = cstart[c + 1];
    // members ascending in a cell; i is the later member of each pair, k the earlier
    for (let q = s + 1; q < e; q++) {
      const i = items[q];
      const a1 = members[2 * i];
      const b1 = members[2 * i + 1];
      const ax = joints[2 * a1];
      const ay = joints[2 * a1 + 1];
      const bx = joints[2 * b1];
      const by = joints[2 * b1 + 1];
      const rx = bx - ax;
      const ry = by - ay;
      for (let p = s; p < q; p++) {
        const k = items[p];
        const a2 = members[2 * k];
        const b2 = members[2 * k + 1];
        if (a2 === a1 || a2 === b1 || b2 === a1 || b2 === b1) continue;
        const cx = joints[2 * a2];
        const cy = joints[2 * a2 + 1];
        const sx = joints[2 * b2] - cx;
        const sy = joints[2 * b2 + 1] - cy;
        // bounding boxes first: most pairs sharing a cell do not overlap at all
        if (Math.max(cx, cx + sx) < Math.min(ax, bx) || Math.min(cx, cx + sx) > Math.max(ax, bx)) continue;
        if (Math.max(cy, cy + sy) < Math.min(ay, by) || Math.min(cy, cy + sy) > Math.max(ay, by)) continue;
        const den = rx * sy - ry * sx;
        if (den === 0) continue;
        const t = ((cx - ax) * sy - (cy - ay) * sx) / den;
        const u = ((cx - ax) * ry - (cy - ay) * rx) / den;
        const li = Math.sqrt(rx * rx + ry * ry);
        const lk = Math.sqrt(sx * sx + sy * sy);
        if (t * li <= tol || (1 - t) * li <= tol || u * lk <= tol || (1 - u) * lk <= tol) continue;
        const key = k * M + i;
        if (found.has(key)) continue;
        found.add(key);
        crossings.push({ a: k, b: i, x: ax + t * rx, y: ay + t * ry });
      }
    }
  }
  crossings.sort((p, q) => p.a - q.a || p.b - q.b);
  return crossings;
}
/**
 * Heals segments (interleaved x1, y1, x2, y2, metres) with tolerance `tol` (m):
 * endpoints within `tol` become one joint (transitively); segments whose ends fall in one
 * joint are dropped; exact duplicates merged; members cut where another joint lies within
 * `tol` of their interior (which also turns collinear overlaps into duplicates, then merged);
 * crossings away from joints found and left apart; dangling members and separate pieces found.
 * Every search goes through uniform grids (cells found by hashing, grouped by counting sort),
 * so the cost grows about linearly with the number of segments.
 */
export function healSegments(seg: Float64Array, n: number, tol: number): HealResult {
  // ---- extent and grid origin
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (let i = 0; i < 4 * n; i += 2) {
    const x = seg[i];
    const y = seg[i + 1];
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  const span = Math.max(maxX - minX, maxY - minY, tol);
  const ox = minX - tol;
  const oy = minY - tol;

  // ---- 1. cluster endpoints within tol: points sorted by column, then by row (both at least
  // tol across), so near pairs lie in neighbouring columns and rows: a sweep over sorted
  // lists, no hashing. Union-find makes the clusters transitive.
  const P = 2 * n;
  const parent = new Int32Array(P);
  for (let k = 0; k < P; k++) parent[k] = k;
  clusterEndpoints(seg, P, parent, tol, { ox, oy, width: maxX - ox + tol, height: maxY - oy + tol });
  // clusters → joints, numbered by their first endpoint (counting sort of points by joint)
  const { J, pointJoint, joints: clustered, merged } = jointsOfClusters(seg, P, parent);
  let joints = clustered;

  // ---- 2. members; drop zero-length; 3. merge exact duplicates (same joint pair)
  let members: Int32Array = new Int32Array(2 * n);
  let memberSource: Int32Array = new Int32Array(n);
  let M = 0;
  const zeroLength = { count: 0, points: [] as number[] };
  const duplicates = { count: 0, members: [] as number[], points: [] as number[] };
  const firstSeg = firstOfEqualPairs(pointJoint, n, J);
  const memberOfSeg = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const a = pointJoint[2 * i];
    const b = pointJoint[2 * i + 1];
    if (a === b) {
      zeroLength.count++;
      zeroLength.points.push(joints[2 * a], joints[2 * a + 1]);
      continue;
    }
    const f = firstSeg[i];
    if (f !== i) {
      duplicates.count++;
      duplicates.members.push(memberOfSeg[f]);
      duplicates.points.push((joints[2 * a] + joints[2 * b]) / 2, (joints[2 * a + 1] + joints[2 * b + 1]) / 2);
      continue;
    }
    memberOfSeg[i] = M;
    members[2 * M] = a;
    members[2 * M + 1] = b;
    memberSource[M] = i;
    M++;
  }

  // ---- grid cell for member queries: typical member length, bounded so that the cells all
  // members pass through stay about linear in their number
  const lens = new Float64Array(M);
  let total = 0;
  for (let i = 0; i < M; i++) {
    const a = members[2 * i];
    const b = members[2 * i + 1];
    const dx = joints[2 * b] - joints[2 * a];
    const dy = joints[2 * b + 1] - joints[2 * a + 1];
    lens[i] = Math.sqrt(dx * dx + dy * dy);
    total += lens[i];
  }
  const median = M > 0 ? quickMedian(lens.slice()) : tol;
  const mcell = Math.max(median, total / (8 * Math.max(1, M)), 4 * tol, span / 2 ** 22);
  const frame: GridFrame = { cell: mcell, ox, oy, maxX, maxY };

  // ---- 4. split members at joints lying on their interior: each member walks the cells
  // within tol of it and tests the joints there (a grid of joints, not of members)
  const splits: HealResult['splits'] = { members: 0, cuts: 0, joints: new Int32Array(0), pieces: new Int32Array(0) };
  const overlaps = { count: 0, members: [] as number[], points: [] as number[] };
  ({ members, memberSource, M } = splitMembers(joints, J, members, memberSource, M, lens, tol, frame, splits, overlaps, duplicates));

  // ---- 6. crossings away from joints: members bucketed by the cells they pass through
  // (counting sort by cell), then the pairs sharing a cell tested
  const crossings = findCrossings(joints, members, M, tol, frame);

  // ---- drop joints no member uses (ends of dropped zero-length segments), renumber
  const degree = new Int32Array(J);
  for (let i = 0; i < 2 * M; i++) degree[members[i]]++;
  const newIndex = new Int32Array(J).fill(-1);
  let J2 = 0;
  for (let j = 0; j < J; j++) if (degree[j] > 0) newIndex[j] = J2++;
  if (J2 !== J) {
    const nj = new Float64Array(2 * J2);
    for (let j = 0; j < J; j++) {
      if (newIndex[j] < 0) continue;
      nj[2 * newIndex[j]] = joints[2 * j];
      nj[2 * newIndex[j] + 1] = joints[2 * j + 1];
    }
    joints = nj;
    for (let i = 0; i < 2 * M; i++) members[i] = newIndex[members[i]];
    merged.joints = merged.joints.map((j) => newIndex[j]).filter((j) => j >= 0);
    splits.joints = splits.joints.map((j) => newIndex[j]);
    const nd = new Int32Array(J2);
    for (let j = 0; j < J; j++) if (newIndex[j] >= 0) nd[newIndex[j]] = degree[j];
    degree.set(nd.subarray(0, J2));
  }
  const deg = degree.subarray(0, J2);

  // ---- 7. dangling members and separate pieces
  const dangling: HealResult['dangling'] = [];
  const comp = new Int32Array(J2);
  for (let j = 0; j < J2; j++) comp[j] = j;
  for (let i = 0; i < M; i++) {
    const a = members[2 * i];
    const b = members[2 * i + 1];
    union(comp, a, b);
    if (deg[a] === 1) dangling.push({ member: i, joint: a });
    if (deg[b] === 1) dangling.push({ member: i, joint: b });
  }
  // pieces numbered by their first member; the largest (first of equals) is the truss
  const pieceOfRoot = new Int32Array(J2).fill(-1);
  const pieceOf = new Int32Array(M);
  let nPieces = 0;
  for (let i = 0; i < M; i++) {
    const r = find(comp, members[2 * i]);
    if (pieceOfRoot[r] < 0) pieceOfRoot[r] = nPieces++;
    pieceOf[i] = pieceOfRoot[r];
  }
  const pieceSize = new Int32Array(nPieces);
  for (let i = 0; i < M; i++) pieceSize[pieceOf[i]]++;
  let largest = -1;
  for (let p = 0; p < nPieces; p++) if (largest < 0 || pieceSize[p] > pieceSize[largest]) largest = p;
  const pieces: number[][] = [];
  if (nPieces > 1) {
    const listOf: number[][] = [];
    for (let p = 0; p < nPieces; p++) listOf.push([]);
    for (let i = 0; i < M; i++) if (pieceOf[i] !== largest) listOf[pieceOf[i]].push(i);
    for (let p = 0; p < nPieces; p++) if (p !== largest) pieces.push(listOf[p]);
  }

  return {
    joints,
    members: members.subarray(0, 2 * M),
    memberSource: memberSource.subarray(0, M),
    merged,
    zeroLength,
    duplicates,
    overlaps,
    splits,
    crossings,
    dangling,
    pieces,
  };
}

/** The element of rank ⌊n/2⌋ (the upper median), by quickselect: reorders `a`. */
export function quickMedian(a: Float64Array): number {
  const k = a.length >> 1;
  let lo = 0;
  let hi = a.length - 1;
  while (lo < hi) {
    const pivot = a[(lo + hi) >> 1];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return a[k];
}
