/**
 * Geometry healing of a bag of straight segments into joints and members, with spatial
 * hashing on uniform grids (cost about linear in the number of segments; no pairwise loops
 * over the whole drawing). All coordinates and the tolerance in metres.
 */

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
  splits: { members: number; cuts: number; joints: number[]; pieces: number[] };
  /** Pairs of members crossing away from their ends, with the crossing point. */
  crossings: { a: number; b: number; x: number; y: number }[];
  /** Members with an end joined to nothing else: member and free joint. */
  dangling: { member: number; joint: number }[];
  /** Connected pieces other than the largest: their members. */
  pieces: number[][];
}

/**
 * Open-addressing hash from a grid cell (gx, gy) to an int (the head of a linked list).
 * Typed arrays and small-integer keys keep it free of allocation, which a Map keyed by
 * gx·ny + gy is not once keys pass 2³⁰ (they become heap numbers).
 */
class CellHash {
  kx: Int32Array;
  ky: Int32Array;
  val: Int32Array;
  mask: number;
  size = 0;

  constructor(expected: number) {
    let cap = 16;
    while (cap < 2 * expected) cap *= 2;
    this.kx = new Int32Array(cap);
    this.ky = new Int32Array(cap);
    this.val = new Int32Array(cap).fill(-1);
    this.mask = cap - 1;
  }

  private slot(gx: number, gy: number): number {
    // murmur3-style finaliser over both coordinates, so neighbouring cells spread out
    let h = Math.imul(gx, 0x9e3779b1) ^ gy;
    h ^= h >>> 16;
    h = Math.imul(h, 0x85ebca6b);
    h ^= h >>> 13;
    h = Math.imul(h, 0xc2b2ae35);
    h ^= h >>> 16;
    h &= this.mask;
    while (this.val[h] !== -1 && (this.kx[h] !== gx || this.ky[h] !== gy)) h = (h + 1) & this.mask;
    return h;
  }

  get(gx: number, gy: number): number {
    return this.val[this.slot(gx, gy)];
  }

  set(gx: number, gy: number, v: number): void {
    let h = this.slot(gx, gy);
    if (this.val[h] === -1) {
      if (2 * (this.size + 1) > this.val.length) {
        this.grow();
        h = this.slot(gx, gy);
      }
      this.size++;
      this.kx[h] = gx;
      this.ky[h] = gy;
    }
    this.val[h] = v;
  }

  private grow(): void {
    const { kx, ky, val } = this;
    const cap = val.length * 2;
    this.kx = new Int32Array(cap);
    this.ky = new Int32Array(cap);
    this.val = new Int32Array(cap).fill(-1);
    this.mask = cap - 1;
    for (let i = 0; i < val.length; i++) {
      if (val[i] === -1) continue;
      const h = this.slot(kx[i], ky[i]);
      this.kx[h] = kx[i];
      this.ky[h] = ky[i];
      this.val[h] = val[i];
    }
  }
}

/** Members per grid cell, as linked lists of entries. */
interface Buckets {
  cell: number;
  ox: number;
  oy: number;
  heads: CellHash;
  member: Int32Array;
  next: Int32Array;
  count: number;
}

/** Calls `visit(gx, gy)` for every grid cell the segment passes through (column sweep). */
function forCellsOfSegment(b: Buckets, x1: number, y1: number, x2: number, y2: number, visit: (gx: number, gy: number) => void): void {
  if (x2 < x1) {
    let t = x1;
    x1 = x2;
    x2 = t;
    t = y1;
    y1 = y2;
    y2 = t;
  }
  const c = b.cell;
  const eps = c * 1e-9;
  const gxa = Math.floor((x1 - b.ox) / c);
  const gxb = Math.floor((x2 - b.ox) / c);
  const dx = x2 - x1;
  const slope = dx > 0 ? (y2 - y1) / dx : 0;
  for (let gx = gxa; gx <= gxb; gx++) {
    let ya: number;
    let yb: number;
    if (gxa === gxb || dx <= 0) {
      ya = y1;
      yb = y2;
    } else {
      const xa = Math.max(x1, b.ox + gx * c);
      const xb = Math.min(x2, b.ox + (gx + 1) * c);
      ya = y1 + (xa - x1) * slope;
      yb = y1 + (xb - x1) * slope;
    }
    const lo = Math.min(ya, yb) - eps;
    const hi = Math.max(ya, yb) + eps;
    const gya = Math.floor((lo - b.oy) / c);
    const gyb = Math.floor((hi - b.oy) / c);
    for (let gy = gya; gy <= gyb; gy++) visit(gx, gy);
  }
}

function gridOfMembers(j: Float64Array, m: Int32Array, count: number, cell: number, ox: number, oy: number): Buckets {
  const b: Buckets = { cell, ox, oy, heads: new CellHash(2 * count), member: new Int32Array(Math.max(16, 3 * count)), next: new Int32Array(Math.max(16, 3 * count)), count: 0 };
  let current = 0;
  const visit = (gx: number, gy: number) => {
    const head = b.heads.get(gx, gy);
    if (head !== -1 && b.member[head] === current) return;
    if (b.count === b.member.length) {
      const mm = new Int32Array(2 * b.count);
      mm.set(b.member);
      b.member = mm;
      const nn = new Int32Array(2 * b.count);
      nn.set(b.next);
      b.next = nn;
    }
    b.member[b.count] = current;
    b.next[b.count] = head;
    b.heads.set(gx, gy, b.count);
    b.count++;
  };
  for (let i = 0; i < count; i++) {
    const a = m[2 * i];
    const e = m[2 * i + 1];
    current = i;
    forCellsOfSegment(b, j[2 * a], j[2 * a + 1], j[2 * e], j[2 * e + 1], visit);
  }
  return b;
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

/**
 * Heals segments (interleaved x1, y1, x2, y2, metres) with tolerance `tol` (m):
 * endpoints within `tol` become one joint (transitively); segments whose ends fall in one
 * joint are dropped; exact duplicates merged; members cut where another joint lies within
 * `tol` of their interior (which also turns collinear overlaps into duplicates, then merged);
 * crossings away from joints found and left apart; dangling members and separate pieces found.
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

  // ---- 1. cluster endpoints within tol (grid of cell ≥ tol, 3×3 neighbourhood)
  const P = 2 * n;
  const pcell = Math.max(tol, span / 2 ** 24);
  const head = new CellHash(P);
  const next = new Int32Array(P).fill(-1);
  const parent = new Int32Array(P);
  const tol2 = tol * tol;
  for (let k = 0; k < P; k++) {
    parent[k] = k;
    const x = seg[2 * k];
    const y = seg[2 * k + 1];
    const gx = Math.floor((x - ox) / pcell);
    const gy = Math.floor((y - oy) / pcell);
    for (let ix = gx - 1; ix <= gx + 1; ix++) {
      for (let iy = gy - 1; iy <= gy + 1; iy++) {
        let q = head.get(ix, iy);
        while (q >= 0) {
          const ddx = seg[2 * q] - x;
          const ddy = seg[2 * q + 1] - y;
          if (ddx * ddx + ddy * ddy <= tol2) union(parent, k, q);
          q = next[q];
        }
      }
    }
    next[k] = head.get(gx, gy);
    head.set(gx, gy, k);
  }
  // clusters → joints (counting sort of points by root)
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
  let joints = new Float64Array(2 * J);
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

  // ---- 2. members; drop zero-length; 3. merge exact duplicates
  let members = new Int32Array(2 * n);
  let memberSource = new Int32Array(n);
  let M = 0;
  const zeroLength = { count: 0, points: [] as number[] };
  const duplicates = { count: 0, members: [] as number[], points: [] as number[] };
  let pairIndex = new CellHash(n);
  for (let i = 0; i < n; i++) {
    const a = pointJoint[2 * i];
    const b = pointJoint[2 * i + 1];
    if (a === b) {
      zeroLength.count++;
      zeroLength.points.push(joints[2 * a], joints[2 * a + 1]);
      continue;
    }
    const lo = a < b ? a : b;
    const hi = a < b ? b : a;
    const seen = pairIndex.get(lo, hi);
    if (seen !== -1) {
      duplicates.count++;
      duplicates.members.push(seen);
      duplicates.points.push((joints[2 * a] + joints[2 * b]) / 2, (joints[2 * a + 1] + joints[2 * b + 1]) / 2);
      continue;
    }
    pairIndex.set(lo, hi, M);
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

  // ---- 4. split members at joints lying on their interior
  const splits = { members: 0, cuts: 0, joints: [] as number[], pieces: [] as number[] };
  const overlaps = { count: 0, members: [] as number[], points: [] as number[] };
  {
    const grid = gridOfMembers(joints, members, M, mcell, ox, oy);
    const stamp = new Int32Array(M).fill(-1);
    // only joints some member ends at may cut (not the lone point of a dropped zero-length segment)
    const isEnd = new Uint8Array(J);
    for (let i = 0; i < 2 * M; i++) isEnd[members[i]] = 1;
    const cutMember: number[] = [];
    const cutT: number[] = [];
    const cutJoint: number[] = [];
    for (let j = 0; j < J; j++) {
      if (!isEnd[j]) continue;
      const x = joints[2 * j];
      const y = joints[2 * j + 1];
      const gxa = Math.floor((x - tol - ox) / mcell);
      const gxb = Math.floor((x + tol - ox) / mcell);
      const gya = Math.floor((y - tol - oy) / mcell);
      const gyb = Math.floor((y + tol - oy) / mcell);
      for (let gx = gxa; gx <= gxb; gx++) {
        for (let gy = gya; gy <= gyb; gy++) {
          for (let e = grid.heads.get(gx, gy); e >= 0; e = grid.next[e]) {
            const i = grid.member[e];
            if (stamp[i] === j) continue;
            stamp[i] = j;
            const a = members[2 * i];
            const b = members[2 * i + 1];
            if (a === j || b === j) continue;
            const ax = joints[2 * a];
            const ay = joints[2 * a + 1];
            const dx = joints[2 * b] - ax;
            const dy = joints[2 * b + 1] - ay;
            const L = lens[i];
            const along = ((x - ax) * dx + (y - ay) * dy) / L;
            if (along <= tol || along >= L - tol) continue;
            const across = Math.abs((x - ax) * dy - (y - ay) * dx) / L;
            if (across > tol) continue;
            cutMember.push(i);
            cutT.push(along / L);
            cutJoint.push(j);
          }
        }
      }
    }
    if (cutMember.length > 0) {
      const idx = cutMember.map((_, k) => k);
      idx.sort((p, q) => cutMember[p] - cutMember[q] || cutT[p] - cutT[q]);
      const isCut = new Uint8Array(M);
      for (const i of cutMember) isCut[i] = 1;
      const pieces = new Int32Array(2 * (M + cutMember.length));
      const pieceSource = new Int32Array(M + cutMember.length);
      let Q = 0;
      for (let i = 0; i < M; i++) {
        if (isCut[i]) continue;
        pieces[2 * Q] = members[2 * i];
        pieces[2 * Q + 1] = members[2 * i + 1];
        pieceSource[Q] = memberSource[i];
        Q++;
      }
      const splitPieceRanges: [number, number][] = [];
      for (let p = 0; p < idx.length; ) {
        const i = cutMember[idx[p]];
        let prev = members[2 * i];
        const firstPiece = Q;
        splits.members++;
        for (; p < idx.length && cutMember[idx[p]] === i; p++) {
          const j = cutJoint[idx[p]];
          splits.cuts++;
          splits.joints.push(j);
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
        splitPieceRanges.push([firstPiece, Q]);
      }
      // ---- 5. merge pieces that now coincide (collinear overlaps); uncut members come first,
      // so they survive
      pairIndex = new CellHash(Q);
      const keep = new Int32Array(Q).fill(-1);
      let K = 0;
      const out = new Int32Array(2 * Q);
      const outSource = new Int32Array(Q);
      for (let q = 0; q < Q; q++) {
        const a = pieces[2 * q];
        const b = pieces[2 * q + 1];
        const lo = a < b ? a : b;
        const hi = a < b ? b : a;
        const seen = pairIndex.get(lo, hi);
        if (seen !== -1) {
          overlaps.count++;
          overlaps.members.push(seen);
          overlaps.points.push((joints[2 * a] + joints[2 * b]) / 2, (joints[2 * a + 1] + joints[2 * b + 1]) / 2);
          keep[q] = seen;
          continue;
        }
        pairIndex.set(lo, hi, K);
        keep[q] = K;
        out[2 * K] = a;
        out[2 * K + 1] = b;
        outSource[K] = pieceSource[q];
        K++;
      }
      for (const [s, e] of splitPieceRanges) for (let q = s; q < e; q++) splits.pieces.push(keep[q]);
      // duplicates found earlier pointed at pre-split members; point them at a surviving piece
      const remap = new Int32Array(M).fill(-1);
      {
        let q = 0;
        for (let i = 0; i < M; i++) if (!isCut[i]) remap[i] = keep[q++];
        let r = 0;
        for (let i = 0; i < M; i++) {
          if (isCut[i]) remap[i] = keep[splitPieceRanges[r++][0]];
        }
      }
      duplicates.members = duplicates.members.map((i) => remap[i]);
      members = out;
      memberSource = outSource;
      M = K;
    }
  }

  // ---- 6. crossings away from joints
  const crossings: HealResult['crossings'] = [];
  {
    const grid = gridOfMembers(joints, members, M, mcell, ox, oy);
    const found = new Set<number>();
    const list: number[] = [];
    for (let slot = 0; slot < grid.heads.val.length; slot++) {
      if (grid.heads.val[slot] === -1) continue;
      list.length = 0;
      for (let e = grid.heads.val[slot]; e >= 0; e = grid.next[e]) list.push(grid.member[e]);
      const L = list.length;
      if (L < 2) continue;
      for (let p = 0; p < L; p++) {
        const i = list[p];
        const a1 = members[2 * i];
        const b1 = members[2 * i + 1];
        const ax = joints[2 * a1];
        const ay = joints[2 * a1 + 1];
        const bx = joints[2 * b1];
        const by = joints[2 * b1 + 1];
        const rx = bx - ax;
        const ry = by - ay;
        for (let q = p + 1; q < L; q++) {
          const k = list[q];
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
          const lo = i < k ? i : k;
          const hi = i < k ? k : i;
          const key = lo * M + hi;
          if (found.has(key)) continue;
          found.add(key);
          crossings.push({ a: lo, b: hi, x: ax + t * rx, y: ay + t * ry });
        }
      }
    }
    crossings.sort((p, q) => p.a - q.a || p.b - q.b);
  }

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
  const compMembers = new Map<number, number[]>();
  for (let i = 0; i < M; i++) {
    const r = find(comp, members[2 * i]);
    const list = compMembers.get(r);
    if (list) list.push(i);
    else compMembers.set(r, [i]);
  }
  let largest: number[] | null = null;
  for (const list of compMembers.values()) if (!largest || list.length > largest.length) largest = list;
  const pieces = [...compMembers.values()].filter((l) => l !== largest);

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

/** Median by quickselect (reorders `a`). */
function quickMedian(a: Float64Array): number {
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
