import type { Joint, Member, MemberGroup } from './truss';

interface Point {
  x: number;
  y: number;
}

const cross = (o: Point, a: Point, b: Point): number => (a.x - o.x) * (b.y - o.y) - (a.y - o.y) * (b.x - o.x);

function onSegment(q: Point, a: Point, b: Point, tol: number): boolean {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const len2 = dx * dx + dy * dy;
  if (len2 === 0) return Math.hypot(q.x - a.x, q.y - a.y) <= tol;
  const t = ((q.x - a.x) * dx + (q.y - a.y) * dy) / len2;
  if (t < -1e-9 || t > 1 + 1e-9) return false;
  return Math.abs(cross(a, b, q)) / Math.sqrt(len2) <= tol;
}

/**
 * True when the member a–b lies along one non-vertical edge of `chain` (x ascending). A member
 * on the chain lies within one edge (the chain keeps no collinear points), the edge under its
 * mid-point, found by bisection; its neighbours are tried too for members ending within `tol`
 * of a corner.
 */
function onChain(a: Point, b: Point, chain: Point[], tol: number): boolean {
  if (chain.length < 2) return false;
  const mx = (a.x + b.x) / 2;
  let lo = 0;
  let hi = chain.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (chain[mid]!.x <= mx) lo = mid;
    else hi = mid;
  }
  for (let i = Math.max(1, lo); i <= Math.min(chain.length - 1, lo + 2); i++) {
    const s = chain[i - 1]!;
    const e = chain[i]!;
    // A vertical outline edge (an end post) is a web, not a chord.
    if (Math.abs(e.x - s.x) <= tol) continue;
    if (onSegment(a, s, e, tol) && onSegment(b, s, e, tol)) return true;
  }
  return false;
}

/** Group codes of {@link outlineGroupCodes}. */
export const OUTLINE_TOP = 1;
export const OUTLINE_BOTTOM = 2;
export const OUTLINE_WEB = 3;

/**
 * {@link membersGroupByOutline} on columns: joint coordinates interleaved x, y and member ends
 * interleaved from, to (joint indices); a code per member, 1 top chord, 2 bottom chord, 3 web.
 * No object per joint or member, for the drawing import's 100 000-member drawings.
 */
export function outlineGroupCodes(xy: Float64Array, ends: Int32Array, tol = 1e-6): Uint8Array {
  const J = xy.length / 2;
  const M = ends.length / 2;
  const used = new Uint8Array(J);
  for (let k = 0; k < ends.length; k++) used[ends[k]!] = 1;
  let nUsed = 0;
  let span = 1;
  for (let j = 0; j < J; j++) {
    if (!used[j]) continue;
    nUsed++;
    span = Math.max(span, Math.abs(xy[2 * j]!), Math.abs(xy[2 * j + 1]!));
  }
  const order = new Int32Array(nUsed);
  for (let j = 0, k = 0; j < J; j++) if (used[j]) order[k++] = j;
  order.sort((a, b) => xy[2 * a]! - xy[2 * b]! || xy[2 * a + 1]! - xy[2 * b + 1]!);
  const pt = (j: number): Point => ({ x: xy[2 * j]!, y: xy[2 * j + 1]! });
  const { lower, upper } = hullChainsSorted(order, xy, pt);
  const t = tol * span;
  const codes = new Uint8Array(M);
  for (let i = 0; i < M; i++) {
    const a = pt(ends[2 * i]!);
    const b = pt(ends[2 * i + 1]!);
    codes[i] = onChain(a, b, lower, t) ? OUTLINE_BOTTOM : onChain(a, b, upper, t) ? OUTLINE_TOP : OUTLINE_WEB;
  }
  return codes;
}

/** Andrew's monotone chain over joints already sorted by x, then y (indices into `xy`). */
function hullChainsSorted(order: Int32Array, xy: Float64Array, pt: (j: number) => Point): { lower: Point[]; upper: Point[] } {
  const crossOf = (o: number, a: number, b: number) =>
    (xy[2 * a]! - xy[2 * o]!) * (xy[2 * b + 1]! - xy[2 * o + 1]!) - (xy[2 * a + 1]! - xy[2 * o + 1]!) * (xy[2 * b]! - xy[2 * o]!);
  const lower: number[] = [];
  for (let k = 0; k < order.length; k++) {
    const q = order[k]!;
    while (lower.length >= 2 && crossOf(lower[lower.length - 2]!, lower[lower.length - 1]!, q) <= 0) lower.pop();
    lower.push(q);
  }
  const upper: number[] = [];
  for (let k = order.length - 1; k >= 0; k--) {
    const q = order[k]!;
    while (upper.length >= 2 && crossOf(upper[upper.length - 2]!, upper[upper.length - 1]!, q) <= 0) upper.pop();
    upper.push(q);
  }
  return { lower: lower.map(pt), upper: upper.reverse().map(pt) };
}

/**
 * Guesses member groups from the truss outline: members along the lower edge of the convex
 * outline are bottom chord, along the upper edge top chord, the rest webs. Right for the usual
 * pitched, mono-pitch and parallel-chord trusses; a truss with a re-entrant chord (a scissor
 * truss's bottom chord) needs the engineer to correct it. Lengths in m; `tol` relative to the
 * largest coordinate. Time about m log m (the drawing import runs it on every upload).
 */
export function membersGroupByOutline(joints: readonly Joint[], members: readonly Member[], tol = 1e-6): Map<string, MemberGroup> {
  const index = new Map<string, number>();
  const xy = new Float64Array(2 * joints.length);
  joints.forEach((j, k) => {
    index.set(j.id, k);
    xy[2 * k] = j.x;
    xy[2 * k + 1] = j.y;
  });
  const known = members.filter((m) => index.has(m.from) && index.has(m.to));
  const ends = new Int32Array(2 * known.length);
  known.forEach((m, i) => {
    ends[2 * i] = index.get(m.from)!;
    ends[2 * i + 1] = index.get(m.to)!;
  });
  const codes = outlineGroupCodes(xy, ends, tol);
  const groups = new Map<string, MemberGroup>();
  known.forEach((m, i) => groups.set(m.id, CODE_GROUP[codes[i]!]!));
  return groups;
}

const CODE_GROUP: Record<number, MemberGroup> = { [OUTLINE_TOP]: 'top-chord', [OUTLINE_BOTTOM]: 'bottom-chord', [OUTLINE_WEB]: 'web' };
