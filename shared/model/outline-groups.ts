import type { Joint, Member, MemberGroup } from './truss';

interface Point {
  x: number;
  y: number;
}

const cross = (o: Point, a: Point, b: Point) => (a.x - o.x) * (b.y - o.y) - (a.y - o.y) * (b.x - o.x);

/** Lower and upper hull chains, left to right (Andrew's monotone chain; collinear points dropped). */
function hullChains(points: Point[]): { lower: Point[]; upper: Point[] } {
  const p = [...points].sort((a, b) => a.x - b.x || a.y - b.y);
  const lower: Point[] = [];
  for (const q of p) {
    while (lower.length >= 2 && cross(lower[lower.length - 2]!, lower[lower.length - 1]!, q) <= 0) lower.pop();
    lower.push(q);
  }
  const upper: Point[] = [];
  for (let i = p.length - 1; i >= 0; i--) {
    const q = p[i]!;
    while (upper.length >= 2 && cross(upper[upper.length - 2]!, upper[upper.length - 1]!, q) <= 0) upper.pop();
    upper.push(q);
  }
  return { lower, upper: upper.reverse() };
}

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

/**
 * Guesses member groups from the truss outline: members along the lower edge of the convex
 * outline are bottom chord, along the upper edge top chord, the rest webs. Right for the usual
 * pitched, mono-pitch and parallel-chord trusses; a truss with a re-entrant chord (a scissor
 * truss's bottom chord) needs the engineer to correct it. Lengths in m; `tol` relative to the
 * largest coordinate. Time about m log m (the drawing import runs it on every upload).
 */
export function membersGroupByOutline(joints: readonly Joint[], members: readonly Member[], tol = 1e-6): Map<string, MemberGroup> {
  const byId = new Map(joints.map((j) => [j.id, j]));
  const usedIds = new Set<string>();
  for (const m of members) {
    usedIds.add(m.from);
    usedIds.add(m.to);
  }
  const used = joints.filter((j) => usedIds.has(j.id));
  let span = 1;
  for (const j of used) span = Math.max(span, Math.abs(j.x), Math.abs(j.y));
  const t = tol * span;
  const { lower, upper } = hullChains(used);
  const groups = new Map<string, MemberGroup>();
  for (const m of members) {
    const a = byId.get(m.from);
    const b = byId.get(m.to);
    if (!a || !b) continue;
    if (onChain(a, b, lower, t)) groups.set(m.id, 'bottom-chord');
    else if (onChain(a, b, upper, t)) groups.set(m.id, 'top-chord');
    else groups.set(m.id, 'web');
  }
  return groups;
}
