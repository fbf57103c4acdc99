// healSegments (shared/dxf-import/heal.ts: grids, sorting, counting sorts) checked against a
// brute-force reference: pairwise definition. The reference below is every healing rule written
// as plain O(n²) loops over all pairs of endpoints, joints and members, straight from the rules
// documented in heal.ts (HealResult, healSegments, jointsOfClusters, splitMembers,
// findCrossings) — no grids, no sorting tricks. Results are compared in index-free form (joint
// coordinates, members as pairs of joint coordinates, counts, crossing points), on small
// drawings with numbers worked out by hand and on seeded random truss-like drawings.
// PRNG: 32-bit linear congruential generator with the Numerical Recipes constants
// (a = 1664525, c = 1013904223, m = 2³²).
import { describe, expect, it } from 'vitest';
import { healSegments, type HealResult } from '@shared/dxf-import/heal';

// ---------------------------------------------------------------------------------------------
// Brute-force reference
// ---------------------------------------------------------------------------------------------

type Pt = [number, number];

const keyOf = (p: Pt) => `${p[0]},${p[1]}`;
const memberKeyOf = (p: Pt, q: Pt) => {
  const a = keyOf(p);
  const b = keyOf(q);
  return a < b ? `${a}|${b}` : `${b}|${a}`;
};

/** Everything healing reports, in index-free form (joints by coordinates, members by their joints). */
interface Canon {
  joints: string[];
  members: string[];
  memberSource: Map<string, number>;
  mergedCount: number;
  mergedJoints: string[];
  zeroLengthCount: number;
  zeroLengthPoints: string[];
  duplicatesCount: number;
  duplicatePoints: Pt[];
  overlapsCount: number;
  overlapPoints: Pt[];
  overlapSurvivors: string[];
  splitMembers: number;
  splitCuts: number;
  splitJoints: string[];
  splitPieces: string[];
  crossings: { pair: string; x: number; y: number }[];
  dangling: string[];
  pieces: string[];
}

interface Reference extends Canon {
  /** For each duplicate segment (in order), the member keys it may point at (its member or that member's pieces). */
  duplicateTargets: Set<string>[];
  /** Smallest distance (m) of any decision quantity from its threshold: how far the drawing is from a borderline. */
  margin: number;
}

function sortPts(p: Pt[]): Pt[] {
  return p.slice().sort((a, b) => a[0] - b[0] || a[1] - b[1]);
}

function reference(seg: Float64Array, n: number, tol: number): Reference {
  let margin = Infinity;
  const P = 2 * n;
  const px = (k: number) => seg[2 * k];
  const py = (k: number) => seg[2 * k + 1];

  // ---- 1. endpoints within tol joined, transitively: union-find over every pair
  const parent: number[] = [];
  for (let k = 0; k < P; k++) parent.push(k);
  const root = (k: number): number => (parent[k] === k ? k : root(parent[k]));
  for (let k = 0; k < P; k++) {
    for (let q = k + 1; q < P; q++) {
      const d = Math.hypot(px(q) - px(k), py(q) - py(k));
      margin = Math.min(margin, Math.abs(d - tol));
      if (d <= tol) parent[root(q)] = root(k);
    }
  }
  // joints numbered by their first endpoint
  const jointOfRoot = new Map<number, number>();
  const pointJoint: number[] = [];
  for (let k = 0; k < P; k++) {
    const r = root(k);
    if (!jointOfRoot.has(r)) jointOfRoot.set(r, jointOfRoot.size);
    pointJoint.push(jointOfRoot.get(r)!);
  }
  const J = jointOfRoot.size;
  const joint: Pt[] = [];
  const jointMerged: boolean[] = [];
  let mergedCount = 0;
  for (let j = 0; j < J; j++) {
    // places of the cluster's endpoints, with how many endpoints sit exactly there
    const places: { x: number; y: number; n: number }[] = [];
    for (let k = 0; k < P; k++) {
      if (pointJoint[k] !== j) continue;
      const p = places.find((s) => s.x === px(k) && s.y === py(k));
      if (p) p.n++;
      else places.push({ x: px(k), y: py(k), n: 1 });
    }
    let best = places[0];
    for (const p of places) {
      if (p.n > best.n || (p.n === best.n && (p.x < best.x || (p.x === best.x && p.y < best.y)))) best = p;
    }
    joint.push([best.x, best.y]);
    jointMerged.push(places.length > 1);
    mergedCount += places.length - 1;
  }

  // ---- 2. members; zero-length dropped; duplicates (either direction): the first survives
  const zeroLengthPoints: string[] = [];
  const duplicatePoints: Pt[] = [];
  const duplicateOf: number[] = []; // surviving member index (before cutting) of each duplicate
  const members: [number, number][] = [];
  const memberSource: number[] = [];
  const mid = (a: number, b: number): Pt => [(joint[a][0] + joint[b][0]) / 2, (joint[a][1] + joint[b][1]) / 2];
  for (let i = 0; i < n; i++) {
    const a = pointJoint[2 * i];
    const b = pointJoint[2 * i + 1];
    if (a === b) {
      zeroLengthPoints.push(keyOf(joint[a]));
      continue;
    }
    const f = members.findIndex(([c, d]) => (c === a && d === b) || (c === b && d === a));
    if (f >= 0) {
      duplicatePoints.push(mid(a, b));
      duplicateOf.push(f);
      continue;
    }
    members.push([a, b]);
    memberSource.push(i);
  }

  // ---- 3. cut each member at every joint some member ends at lying within tol of its interior
  const isEnd = new Array<boolean>(J).fill(false);
  for (const [a, b] of members) isEnd[a] = isEnd[b] = true;
  const uncut: { ends: [number, number]; source: number; from: number }[] = [];
  const cutPieces: { ends: [number, number]; source: number; from: number }[] = [];
  const splitJointList: number[] = [];
  let splitMembersCount = 0;
  members.forEach(([a, b], i) => {
    const [ax, ay] = joint[a];
    const ux = joint[b][0] - ax;
    const uy = joint[b][1] - ay;
    const L = Math.hypot(ux, uy);
    const cuts: { along: number; j: number }[] = [];
    for (let j = 0; j < J; j++) {
      if (!isEnd[j] || j === a || j === b) continue;
      const wx = joint[j][0] - ax;
      const wy = joint[j][1] - ay;
      const along = (wx * ux + wy * uy) / L;
      const across = Math.abs(wx * uy - wy * ux) / L;
      margin = Math.min(margin, Math.abs(Math.min(along - tol, L - tol - along, tol - across)));
      if (along > tol && along < L - tol && across <= tol) cuts.push({ along, j });
    }
    if (cuts.length === 0) {
      uncut.push({ ends: [a, b], source: memberSource[i], from: i });
      return;
    }
    splitMembersCount++;
    cuts.sort((p, q) => p.along - q.along);
    let prev = a;
    for (const c of cuts) {
      splitJointList.push(c.j);
      cutPieces.push({ ends: [prev, c.j], source: memberSource[i], from: i });
      prev = c.j;
    }
    cutPieces.push({ ends: [prev, b], source: memberSource[i], from: i });
  });
  // pieces joining the same pair as an earlier member or piece (uncut members first) are merged
  const final: { ends: [number, number]; source: number }[] = [];
  const overlapPoints: Pt[] = [];
  const overlapSurvivors: string[] = [];
  const piecesOfMember: Set<string>[] = members.map(() => new Set<string>());
  const splitPieces: string[] = [];
  const all = [...uncut.map((p) => ({ ...p, cut: false })), ...cutPieces.map((p) => ({ ...p, cut: true }))];
  for (const p of all) {
    const [a, b] = p.ends;
    const key = memberKeyOf(joint[a], joint[b]);
    piecesOfMember[p.from].add(key);
    if (p.cut) splitPieces.push(key);
    if (final.some((m) => (m.ends[0] === a && m.ends[1] === b) || (m.ends[0] === b && m.ends[1] === a))) {
      overlapPoints.push(mid(a, b));
      overlapSurvivors.push(key);
      continue;
    }
    final.push({ ends: [a, b], source: p.source });
  }

  // ---- 4. crossings: every pair of members sharing no joint, non-parallel, meeting more than
  // tol from every end of both
  const crossings: Canon['crossings'] = [];
  const key = (m: { ends: [number, number] }) => memberKeyOf(joint[m.ends[0]], joint[m.ends[1]]);
  for (let i = 0; i < final.length; i++) {
    for (let k = i + 1; k < final.length; k++) {
      const [a, b] = final[i].ends;
      const [c, d] = final[k].ends;
      if (a === c || a === d || b === c || b === d) continue;
      const [ax, ay] = joint[a];
      const rx = joint[b][0] - ax;
      const ry = joint[b][1] - ay;
      const [cx, cy] = joint[c];
      const sx = joint[d][0] - cx;
      const sy = joint[d][1] - cy;
      const den = rx * sy - ry * sx;
      if (den === 0) continue;
      // A + t·r = C + u·s
      const t = ((cx - ax) * sy - (cy - ay) * sx) / den;
      const u = ((cx - ax) * ry - (cy - ay) * rx) / den;
      const Li = Math.hypot(rx, ry);
      const Lk = Math.hypot(sx, sy);
      const nearest = Math.min(t * Li, (1 - t) * Li, u * Lk, (1 - u) * Lk);
      margin = Math.min(margin, Math.abs(nearest - tol));
      if (nearest > tol) {
        const pair = [key(final[i]), key(final[k])].sort().join(' × ');
        crossings.push({ pair, x: cx + u * sx, y: cy + u * sy });
      }
    }
  }

  // ---- 5. joints in use, dangling members, separate pieces
  const degree = new Array<number>(J).fill(0);
  for (const m of final) {
    degree[m.ends[0]]++;
    degree[m.ends[1]]++;
  }
  const used = (j: number) => degree[j] > 0;
  const dangling: string[] = [];
  for (const m of final) {
    for (const e of m.ends) if (degree[e] === 1) dangling.push(`${key(m)}@${keyOf(joint[e])}`);
  }
  const comp: number[] = [];
  for (let j = 0; j < J; j++) comp.push(j);
  const croot = (j: number): number => (comp[j] === j ? j : croot(comp[j]));
  for (const m of final) comp[croot(m.ends[1])] = croot(m.ends[0]);
  // pieces in order of their first member; the largest (first of equals) is the structure
  const pieceRoots: number[] = [];
  const pieceMembers: string[][] = [];
  for (const m of final) {
    const r = croot(m.ends[0]);
    let p = pieceRoots.indexOf(r);
    if (p < 0) {
      p = pieceRoots.push(r) - 1;
      pieceMembers.push([]);
    }
    pieceMembers[p].push(key(m));
  }
  let largest = 0;
  pieceMembers.forEach((p, i) => {
    if (p.length > pieceMembers[largest].length) largest = i;
  });
  const pieces = pieceMembers.filter((_, i) => i !== largest).map((p) => p.sort().join(' ; '));

  const memberSourceMap = new Map<string, number>();
  for (const m of final) memberSourceMap.set(key(m), m.source);
  return {
    joints: joint.filter((_, j) => used(j)).map(keyOf).sort(),
    members: final.map(key).sort(),
    memberSource: memberSourceMap,
    mergedCount,
    mergedJoints: joint.filter((_, j) => jointMerged[j] && used(j)).map(keyOf).sort(),
    zeroLengthCount: zeroLengthPoints.length,
    zeroLengthPoints: zeroLengthPoints.sort(),
    duplicatesCount: duplicatePoints.length,
    duplicatePoints: sortPts(duplicatePoints),
    overlapsCount: overlapPoints.length,
    overlapPoints: sortPts(overlapPoints),
    overlapSurvivors: overlapSurvivors.sort(),
    splitMembers: splitMembersCount,
    splitCuts: splitJointList.length,
    splitJoints: splitJointList.map((j) => keyOf(joint[j])).sort(),
    splitPieces: splitPieces.sort(),
    crossings: crossings.sort((p, q) => (p.pair < q.pair ? -1 : p.pair > q.pair ? 1 : p.x - q.x || p.y - q.y)),
    dangling: dangling.sort(),
    pieces: pieces.sort(),
    duplicateTargets: duplicateOf.map((f) => piecesOfMember[f]),
    margin,
  };
}

// ---------------------------------------------------------------------------------------------
// healSegments' result in the same index-free form
// ---------------------------------------------------------------------------------------------

function canonOf(r: HealResult): Canon & { duplicateSurvivors: string[] } {
  const J = r.joints.length / 2;
  const M = r.members.length / 2;
  const jp = (j: number): Pt => [r.joints[2 * j], r.joints[2 * j + 1]];
  const mk = (i: number) => memberKeyOf(jp(r.members[2 * i]), jp(r.members[2 * i + 1]));
  const joints: string[] = [];
  for (let j = 0; j < J; j++) joints.push(keyOf(jp(j)));
  const members: string[] = [];
  const memberSource = new Map<string, number>();
  for (let i = 0; i < M; i++) {
    members.push(mk(i));
    memberSource.set(mk(i), r.memberSource[i]);
  }
  const pts = (a: number[]): Pt[] => {
    const out: Pt[] = [];
    for (let p = 0; p < a.length; p += 2) out.push([a[p], a[p + 1]]);
    return sortPts(out);
  };
  return {
    joints: joints.sort(),
    members: members.sort(),
    memberSource,
    mergedCount: r.merged.count,
    mergedJoints: r.merged.joints.map((j) => keyOf(jp(j))).sort(),
    zeroLengthCount: r.zeroLength.count,
    zeroLengthPoints: pts(r.zeroLength.points).map(keyOf).sort(),
    duplicatesCount: r.duplicates.count,
    duplicatePoints: pts(r.duplicates.points),
    duplicateSurvivors: r.duplicates.members.map((i) => (i >= 0 && i < M ? mk(i) : `bad member index ${i}`)),
    overlapsCount: r.overlaps.count,
    overlapPoints: pts(r.overlaps.points),
    overlapSurvivors: r.overlaps.members.map((i) => (i >= 0 && i < M ? mk(i) : `bad member index ${i}`)).sort(),
    splitMembers: r.splits.members,
    splitCuts: r.splits.cuts,
    splitJoints: Array.from(r.splits.joints, (j) => keyOf(jp(j))).sort(),
    splitPieces: Array.from(r.splits.pieces, (i) => mk(i)).sort(),
    crossings: r.crossings
      .map((c) => ({ pair: [mk(c.a), mk(c.b)].sort().join(' × '), x: c.x, y: c.y }))
      .sort((p, q) => (p.pair < q.pair ? -1 : p.pair > q.pair ? 1 : p.x - q.x || p.y - q.y)),
    dangling: r.dangling.map((d) => `${mk(d.member)}@${keyOf(jp(d.joint))}`).sort(),
    pieces: r.pieces.map((p) => p.map(mk).sort().join(' ; ')).sort(),
  };
}

function expectPointsClose(got: Pt[], want: Pt[], what: string): void {
  expect(got.length, `${what}: how many`).toBe(want.length);
  got.forEach((p, i) => {
    expect(Math.abs(p[0] - want[i][0]), `${what} ${i}: x ${p[0]} vs ${want[i][0]}`).toBeLessThanOrEqual(1e-9);
    expect(Math.abs(p[1] - want[i][1]), `${what} ${i}: y ${p[1]} vs ${want[i][1]}`).toBeLessThanOrEqual(1e-9);
  });
}

/** healSegments on `seg` equals the pairwise reference in every index-free respect. */
function expectMatchesReference(seg: Float64Array, tol: number, label: string, known?: Reference): Reference {
  const n = seg.length / 4;
  const ref = known ?? reference(seg, n, tol);
  const got = canonOf(healSegments(seg, n, tol));
  const w = (s: string) => `${label}: ${s}`;
  expect(got.joints, w('joints')).toEqual(ref.joints);
  expect(got.members, w('members')).toEqual(ref.members);
  expect(got.memberSource, w('member sources')).toEqual(ref.memberSource);
  expect(got.mergedCount, w('merged.count')).toBe(ref.mergedCount);
  expect(got.mergedJoints, w('merged.joints')).toEqual(ref.mergedJoints);
  expect(got.zeroLengthCount, w('zeroLength.count')).toBe(ref.zeroLengthCount);
  expect(got.zeroLengthPoints, w('zeroLength.points')).toEqual(ref.zeroLengthPoints);
  expect(got.duplicatesCount, w('duplicates.count')).toBe(ref.duplicatesCount);
  expectPointsClose(got.duplicatePoints, ref.duplicatePoints, w('duplicates.points'));
  got.duplicateSurvivors.forEach((k, d) => {
    expect(ref.duplicateTargets[d].has(k), w(`duplicate ${d} points at ${k}, not its member or a piece of it`)).toBe(true);
  });
  expect(got.overlapsCount, w('overlaps.count')).toBe(ref.overlapsCount);
  expectPointsClose(got.overlapPoints, ref.overlapPoints, w('overlaps.points'));
  expect(got.overlapSurvivors, w('overlaps.members')).toEqual(ref.overlapSurvivors);
  expect(got.splitMembers, w('splits.members')).toBe(ref.splitMembers);
  expect(got.splitCuts, w('splits.cuts')).toBe(ref.splitCuts);
  expect(got.splitJoints, w('splits.joints')).toEqual(ref.splitJoints);
  expect(got.splitPieces, w('splits.pieces')).toEqual(ref.splitPieces);
  expect(
    got.crossings.map((c) => c.pair),
    w('crossing pairs'),
  ).toEqual(ref.crossings.map((c) => c.pair));
  expectPointsClose(
    got.crossings.map((c) => [c.x, c.y]),
    ref.crossings.map((c) => [c.x, c.y]),
    w('crossing points'),
  );
  expect(got.dangling, w('dangling')).toEqual(ref.dangling);
  expect(got.pieces, w('separate pieces')).toEqual(ref.pieces);
  return ref;
}

// ---------------------------------------------------------------------------------------------
// Small drawings with numbers worked out by hand
// ---------------------------------------------------------------------------------------------

const S = (...xs: number[]) => new Float64Array(xs);

describe('healSegments on hand-checkable drawings (expected numbers by hand, and the pairwise reference)', () => {
  it('when two lines cross in the middle, then one crossing at the known point and both are left whole', () => {
    const seg = S(0, 0, 2, 2, 0, 2, 2, 0);
    const r = healSegments(seg, 2, 1e-3);
    expect(r.joints.length / 2).toBe(4);
    expect(r.members.length / 2).toBe(2);
    expect(r.crossings).toHaveLength(1);
    expect(r.crossings[0].x).toBeCloseTo(1, 12);
    expect(r.crossings[0].y).toBeCloseTo(1, 12);
    expect(r.dangling).toHaveLength(4);
    expect(r.pieces).toHaveLength(1);
    expectMatchesReference(seg, 1e-3, 'X');
  });

  it('when a chord runs through 3 panel points where posts end, then it is split into 4 at 3 cuts', () => {
    const seg = S(0, 0, 8, 0, 2, 0, 2, 1, 4, 0, 4, 1, 6, 1, 6, 0);
    const r = healSegments(seg, 4, 1e-3);
    expect(r.splits.members).toBe(1);
    expect(r.splits.cuts).toBe(3);
    expect(r.members.length / 2).toBe(7);
    expect(r.joints.length / 2).toBe(8);
    expect(r.crossings).toHaveLength(0);
    expectMatchesReference(seg, 1e-3, 'chord');
  });

  it('when two ends 0.5 mm apart meet with tol 1 mm, then they are one joint at the lower x (a tie of one endpoint each)', () => {
    const seg = S(0, 0, 1, 0, 2, 0, 1.0004, 0.0003);
    const r = healSegments(seg, 2, 1e-3);
    expect(r.merged.count).toBe(1);
    expect(Array.from(r.joints)).toEqual([0, 0, 1, 0, 2, 0]);
    expect(r.members.length / 2).toBe(2);
    expectMatchesReference(seg, 1e-3, 'near ends');
  });

  it('when the joint has two endpoints at one place and one elsewhere, then it sits where the two are', () => {
    const seg = S(0, 0, 1.0004, 0, 1.0004, 0, 1.0004, 1, 2, 0, 1, 0);
    const r = healSegments(seg, 3, 1e-3);
    expect(r.merged.count).toBe(1);
    const xs = Array.from(r.joints).filter((_, i) => i % 2 === 0);
    expect(xs).toContain(1.0004);
    expect(xs).not.toContain(1);
    expectMatchesReference(seg, 1e-3, 'majority');
  });

  it('when a drawing repeats a line, draws it backwards and adds a dot, then 1 duplicate, 1 reversed duplicate and 1 zero-length are dropped', () => {
    const seg = S(0, 0, 3, 0, 0, 0, 3, 0, 3, 0, 0, 0, 1, 1, 1.0002, 1, 3, 0, 3, 2);
    const r = healSegments(seg, 5, 1e-3);
    expect(r.duplicates.count).toBe(2);
    expect(r.zeroLength.count).toBe(1);
    expect(r.members.length / 2).toBe(2);
    expect(r.joints.length / 2).toBe(3); // the dot's joint is used by no member
    expectMatchesReference(seg, 1e-3, 'duplicates');
  });

  it('when two collinear lines overlap by one panel, then both are cut and the common piece is merged once', () => {
    const seg = S(0, 0, 2, 0, 1, 0, 3, 0);
    const r = healSegments(seg, 2, 1e-3);
    expect(r.splits.members).toBe(2);
    expect(r.splits.cuts).toBe(2);
    expect(r.overlaps.count).toBe(1);
    expect(r.members.length / 2).toBe(3);
    expect(r.overlaps.points).toEqual([1.5, 0]);
    expectMatchesReference(seg, 1e-3, 'overlap');
  });

  it('when a dot (zero-length segment) lies on a chord, then the chord is not cut there', () => {
    const seg = S(0, 0, 4, 0, 2, 0, 2, 0, 0, 0, 0, 1);
    const r = healSegments(seg, 3, 1e-3);
    expect(r.splits.cuts).toBe(0);
    expect(r.members.length / 2).toBe(2);
    expectMatchesReference(seg, 1e-3, 'dot on chord');
  });

  it('when a post ends 0.5 mm off a chord, then the chord is cut there; when it overshoots by 3 mm, then it is a crossing at (2, 0)', () => {
    const near = S(0, 0, 4, 0, 2, 0.0005, 2, 1);
    const rn = healSegments(near, 2, 1e-3);
    expect(rn.splits.cuts).toBe(1);
    expect(rn.crossings).toHaveLength(0);
    expect(rn.members.length / 2).toBe(3);
    expectMatchesReference(near, 1e-3, 'post near chord');
    const over = S(0, 0, 4, 0, 2, -0.003, 2, 1);
    const ro = healSegments(over, 2, 1e-3);
    expect(ro.splits.cuts).toBe(0);
    expect(ro.crossings).toHaveLength(1);
    expect(ro.crossings[0].x).toBeCloseTo(2, 12);
    expect(ro.crossings[0].y).toBeCloseTo(0, 12);
    expectMatchesReference(over, 1e-3, 'post through chord');
  });

  it('when a post ends 0.9 mm along and 0.9 mm above a chord end (1.27 mm away, tol 1 mm), then it is its own joint and the chord is not cut', () => {
    const seg = S(0, 0, 4, 0, 0.0009, 0.0009, 0.0009, 1);
    const r = healSegments(seg, 2, 1e-3);
    expect(r.merged.count).toBe(0);
    expect(r.joints.length / 2).toBe(4);
    expect(r.splits.cuts).toBe(0);
    expect(r.members.length / 2).toBe(2);
    expect(r.pieces).toHaveLength(1);
    expectMatchesReference(seg, 1e-3, 'post near chord end');
  });

  it('when a line stops 1.5 mm past another (tol 1 mm), then it is a crossing; when it stops 0.5 mm past, then the other is cut there', () => {
    const past = S(0, 0, 4, 0, 3, 1, 3, -0.0015);
    const rp = healSegments(past, 2, 1e-3);
    expect(rp.crossings).toHaveLength(1);
    expect(rp.crossings[0].x).toBeCloseTo(3, 12);
    expect(rp.crossings[0].y).toBeCloseTo(0, 12);
    expectMatchesReference(past, 1e-3, 'line 1.5 mm past');
    const short = S(0, 0, 4, 0, 3, 1, 3, -0.0005);
    const rs = healSegments(short, 2, 1e-3);
    expect(rs.crossings).toHaveLength(0);
    expect(rs.splits.cuts).toBe(1);
    expectMatchesReference(short, 1e-3, 'line 0.5 mm past');
  });

  it('when a line at 60° ends 0.95 mm past a chord 1.2 mm from the chord end (tol 1 mm), then it is neither cut into nor a crossing, whichever way and order it is drawn', () => {
    // crossing X = (1.2 mm, 0); the line's end E = X − 0.95 mm·(cos 60°, sin 60°): 1.10 mm from
    // the chord end (own joint), 0.725 mm along the chord (no cut), 0.95 mm from X (no crossing)
    const E = [0.0012 - 0.95e-3 * 0.5, -0.95e-3 * Math.sqrt(3) / 2];
    const F = [0.0012 + 0.5, Math.sqrt(3) / 2];
    const chord = [0, 0, 4, 0];
    for (const seg of [
      S(...chord, E[0], E[1], F[0], F[1]),
      S(...chord, F[0], F[1], E[0], E[1]),
      S(E[0], E[1], F[0], F[1], ...chord),
      S(F[0], F[1], E[0], E[1], ...chord),
    ]) {
      const r = healSegments(seg, 2, 1e-3);
      expect(r.joints.length / 2).toBe(4);
      expect(r.members.length / 2).toBe(2);
      expect(r.splits.cuts).toBe(0);
      expect(r.crossings).toHaveLength(0);
      const ref = expectMatchesReference(seg, 1e-3, 'line ending just past a chord');
      expect(ref.margin).toBeGreaterThan(0.01e-3);
    }
  });

  it('when a triangle and a lone line far away are drawn, then the line is the one separate piece with 2 dangling ends', () => {
    const seg = S(0, 0, 4, 0, 4, 0, 2, 2, 2, 2, 0, 0, 100, 0, 101, 0);
    const r = healSegments(seg, 4, 1e-3);
    expect(r.pieces).toHaveLength(1);
    expect(r.pieces[0]).toHaveLength(1);
    expect(r.dangling).toHaveLength(2);
    expect(r.dangling[0].member).toBe(r.pieces[0][0]);
    expectMatchesReference(seg, 1e-3, 'separate piece');
  });
});

// ---------------------------------------------------------------------------------------------
// Seeded random truss-like drawings
// ---------------------------------------------------------------------------------------------

/** Linear congruential generator, Numerical Recipes constants; floats in [0, 1). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

interface Shape {
  tol: number;
  ox: number;
  oy: number;
  wide: boolean;
}

/**
 * A truss-like drawing on a lattice of panel points (panels 1.5 m or more, so distinct joints are
 * far more than 10·tol apart), every endpoint either exactly on its panel point or jittered by
 * less than tol/3 (so clusters are unambiguous), mixing every fault healing handles.
 */
function randomDrawing(rnd: () => number, { tol, ox, oy, wide }: Shape): Float64Array {
  const int = (lo: number, hi: number) => lo + Math.floor(rnd() * (hi - lo + 1));
  const nx = wide ? int(20, 40) : int(2, 8);
  const ny = wide ? 1 : int(1, 3);
  const sx = wide ? 3 + 5 * rnd() : 1.5 + 2.5 * rnd();
  const sy = 1.5 + 1.5 * rnd();
  const target = int(5, 80);
  const at = (i: number, j: number): Pt => {
    const x = ox + i * sx;
    const y = oy + j * sy;
    if (rnd() < 0.5) return [x, y];
    const r = (tol / 3) * rnd() * 0.99;
    const a = 2 * Math.PI * rnd();
    return [x + r * Math.cos(a), y + r * Math.sin(a)];
  };
  const segs: number[][] = [];
  const line = (i1: number, j1: number, i2: number, j2: number) => {
    const p = at(i1, j1);
    const q = at(i2, j2);
    segs.push(rnd() < 0.5 ? [...p, ...q] : [...q, ...p]);
  };
  while (segs.length < target) {
    const f = rnd();
    const i = int(0, nx - 1);
    const j = int(0, ny);
    if (f < 0.45) {
      // a panel member: chord, post or diagonal
      const kind = int(0, 3);
      if (kind === 0) line(i, j, i + 1, j);
      else if (kind === 1 && j < ny) line(i, j, i, j + 1);
      else if (kind === 2 && j < ny) line(i, j, i + 1, j + 1);
      else if (j < ny) line(i + 1, j, i, j + 1);
    } else if (f < 0.52 && segs.length > 0) {
      segs.push(segs[int(0, segs.length - 1)].slice()); // exact duplicate
    } else if (f < 0.58 && segs.length > 0) {
      const s = segs[int(0, segs.length - 1)];
      segs.push([s[2], s[3], s[0], s[1]]); // reversed duplicate
    } else if (f < 0.62) {
      // zero-length: at a panel point, or alone at mid-panel on a chord line (no member ends there)
      if (rnd() < 0.5) line(i, j, i, j);
      else line(i + 0.5, j, i + 0.5, j);
    } else if (f < 0.7) {
      // a long chord through several panel points (T-junctions to be cut)
      const k = int(2, 4);
      if (rnd() < 0.7 || ny < 2) line(i, j, Math.min(nx, i + k), j);
      else line(i, 0, i, Math.min(ny, k));
    } else if (f < 0.75) {
      // collinear pieces overlapping by one panel
      if (i + 3 <= nx) {
        line(i, j, i + 2, j);
        line(i + 1, j, i + 3, j);
      }
    } else if (f < 0.8) {
      // an X in a panel: a genuine crossing
      if (j < ny) {
        line(i, j, i + 1, j + 1);
        line(i + 1, j, i, j + 1);
      }
    } else if (f < 0.85) {
      line(i, 0, i, -1); // dangling below the bottom chord
    } else if (f < 0.88) {
      // a separate piece far to the right
      const b = nx + 5;
      line(b, 0, b + 1, 0);
      line(b + 1, 0, b, 1);
      if (rnd() < 0.5) line(b, 1, b, 0);
    } else {
      // any lattice line of up to 3 panels each way
      const i2 = Math.max(0, Math.min(nx, i + int(-3, 3)));
      const j2 = Math.max(0, Math.min(ny, j + int(-3, 3)));
      if (i2 !== i || j2 !== j) line(i, j, i2, j2);
    }
  }
  // shuffle (Fisher–Yates), so that duplicates and overlaps may come before what they repeat
  segs.length = target;
  for (let a = segs.length - 1; a > 0; a--) {
    const b = int(0, a);
    [segs[a], segs[b]] = [segs[b], segs[a]];
  }
  return new Float64Array(segs.flat());
}

const SHAPES: { name: string; shape: Shape }[] = [];
for (const tol of [1e-3, 1e-2]) {
  for (const [where, ox, oy] of [
    ['near the origin', -0.75, 0.25],
    ['at a site offset (152 340.125, 48 210.5)', 152_340.125, 48_210.5],
  ] as const) {
    for (const wide of [false, true]) {
      SHAPES.push({ name: `tol ${tol} m, ${where}, ${wide ? 'much wider than tall' : 'compact'}`, shape: { tol, ox, oy, wide } });
    }
  }
}
const PER_SHAPE = 25;

describe('healSegments on seeded random truss drawings (brute-force reference: pairwise definition)', () => {
  SHAPES.forEach(({ name, shape }, s) => {
    it(`when ${PER_SHAPE} drawings of 5–80 segments (${name}) are healed, then everything equals the pairwise reference`, () => {
      const rnd = lcg(0x5eed + 7919 * s);
      const seen = { merged: 0, zeroLength: 0, duplicates: 0, overlaps: 0, splits: 0, crossings: 0, dangling: 0, pieces: 0 };
      let done = 0;
      let skipped = 0;
      while (done < PER_SHAPE) {
        const seg = randomDrawing(rnd, shape);
        const ref = reference(seg, seg.length / 4, shape.tol);
        // a drawing with some decision within 1 % of tol of its threshold is ambiguous to
        // rounding, not a test of the rules: draw another (the generator keeps clear of them)
        if (ref.margin < 0.01 * shape.tol) {
          skipped++;
          continue;
        }
        expectMatchesReference(seg, shape.tol, `${name}, drawing ${done}`, ref);
        seen.merged += ref.mergedCount;
        seen.zeroLength += ref.zeroLengthCount;
        seen.duplicates += ref.duplicatesCount;
        seen.overlaps += ref.overlapsCount;
        seen.splits += ref.splitCuts;
        seen.crossings += ref.crossings.length;
        seen.dangling += ref.dangling.length;
        seen.pieces += ref.pieces.length;
        done++;
      }
      expect(skipped, 'drawings skipped as borderline').toBeLessThan(PER_SHAPE / 5);
      // the drawings exercised every rule, so agreement means something
      for (const [rule, count] of Object.entries(seen)) expect(count, `cases of ${rule}`).toBeGreaterThanOrEqual(10);
    });
  });
});
