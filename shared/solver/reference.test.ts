import { lusolve, matrix } from 'mathjs';
import { describe, expect, it } from 'vitest';
import type { TrussModel } from '@shared/model/truss';
import { trussSolve } from './solve';
import type { TrussAnalysis } from './types';

/** mulberry32: small seeded PRNG (public-domain algorithm by Tommy Ettinger). */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

type Pt = [number, number];

function angleBetween(p: Pt, a: Pt, b: Pt): number {
  const ux = a[0] - p[0];
  const uy = a[1] - p[1];
  const vx = b[0] - p[0];
  const vy = b[1] - p[1];
  return Math.abs(Math.atan2(ux * vy - uy * vx, ux * vx + uy * vy));
}

/**
 * A random stable determinate truss: a triangle grown by adding joints with two new members
 * (simple truss, angle between them at least 20°), sometimes by splitting a member and tying
 * the new joint to a third joint (keeps rigidity, can leave no joint with two unknowns), then
 * supports of one of three layouts: pin + roller, three rollers, or (for two joined simple
 * trusses) two pins (a three-hinged arch). Loads random at random joints.
 */
function randomTruss(rand: () => number): TrussModel {
  const pts: Pt[] = [[0, 0], [4 + 4 * rand(), 0], [2 + 2 * rand(), 2 + 3 * rand()]];
  const mem: [number, number][] = [[0, 1], [1, 2], [0, 2]];
  const grow = (count: number, base: number) => {
    for (let g = 0; g < count; g++) {
      const kind = rand();
      if (kind < 0.75 || mem.length < 4) {
        for (let tries = 0; tries < 50; tries++) {
          const a = base + Math.floor(rand() * (pts.length - base));
          const b = base + Math.floor(rand() * (pts.length - base));
          if (a === b) continue;
          const p: Pt = [(pts[a][0] + pts[b][0]) / 2 + (rand() - 0.5) * 6, (pts[a][1] + pts[b][1]) / 2 + (rand() - 0.2) * 5];
          const ang = angleBetween(p, pts[a], pts[b]);
          if (ang < 0.35 || ang > Math.PI - 0.35) continue;
          if (Math.hypot(p[0] - pts[a][0], p[1] - pts[a][1]) < 0.5 || Math.hypot(p[0] - pts[b][0], p[1] - pts[b][1]) < 0.5) continue;
          pts.push(p);
          mem.push([a, pts.length - 1], [b, pts.length - 1]);
          break;
        }
      } else {
        // Split member (a, b) at an offset point q, and tie q to a third joint c.
        const choices = mem.map((m, i) => i).filter((i) => mem[i][0] >= base && mem[i][1] >= base);
        const e = choices[Math.floor(rand() * choices.length)];
        const [a, b] = mem[e];
        const c = base + Math.floor(rand() * (pts.length - base));
        if (c === a || c === b) continue;
        const t = 0.3 + 0.4 * rand();
        const q: Pt = [pts[a][0] + t * (pts[b][0] - pts[a][0]) + (rand() - 0.5), pts[a][1] + t * (pts[b][1] - pts[a][1]) + (rand() - 0.5)];
        if (angleBetween(q, pts[a], pts[c]) < 0.35 || angleBetween(q, pts[b], pts[c]) < 0.35) continue;
        pts.push(q);
        mem.splice(e, 1);
        mem.push([a, pts.length - 1], [b, pts.length - 1], [c, pts.length - 1]);
      }
    }
  };
  grow(2 + Math.floor(rand() * 12), 0);
  const layout = rand();
  const supports: TrussModel['supports'] = [];
  const ids = (i: number) => `J${i}`;
  if (layout < 0.6) {
    supports.push({ joint: ids(0), kind: 'pin' }, { joint: ids(1), kind: 'roller', angleDeg: 60 + 60 * rand() });
  } else if (layout < 0.8) {
    supports.push(
      { joint: ids(0), kind: 'roller', angleDeg: 90 },
      { joint: ids(1), kind: 'roller', angleDeg: 90 + 40 * (rand() - 0.5) },
      { joint: ids(2), kind: 'roller', angleDeg: 10 + 30 * rand() },
    );
  } else {
    // Second simple truss sharing joint 2 (the crown hinge); pins at joints 0 and the far one.
    const base = pts.length;
    const shift = pts[1][0] + 2;
    pts.push([shift + 4 + 2 * rand(), 0]);
    mem.push([2, base]);
    pts.push([shift + 1 + 2 * rand(), 1 + 2 * rand()]);
    mem.push([2, base + 1], [base, base + 1]);
    supports.push({ joint: ids(0), kind: 'pin' }, { joint: ids(base), kind: 'pin' });
    // Remove the first truss's roller-side freedom: joints 0 and 1 are tied already by member 0-1.
  }
  const joints = pts.map(([x, y], i) => ({ id: ids(i), tag: ids(i), x, y }));
  const members = mem.map(([a, b], i) => ({ id: `M${i}`, tag: `M${i}`, from: ids(a), to: ids(b) }));
  const loads = joints
    .filter(() => rand() < 0.5)
    .map((j) => ({ joint: j.id, fx: Math.round((rand() - 0.5) * 40), fy: -Math.round(rand() * 50) - 1 }));
  if (!loads.length) loads.push({ joint: joints[joints.length - 1].id, fx: 3, fy: -20 });
  return {
    joints,
    members,
    supports,
    loadCases: [{ id: 'D', name: 'random', category: 'other', loads }],
    combinations: [],
  };
}

/**
 * Reference: the full 2j × (m + r) joint-equilibrium matrix solved densely by mathjs lusolve
 * (a general-purpose linear-algebra library from npm), assembled here from the geometry alone.
 */
function mathjsReference(model: TrussModel): { N: number[]; R: { joint: string; rx: number; ry: number }[] } {
  const idx = new Map(model.joints.map((j, i) => [j.id, i]));
  const nj = model.joints.length;
  const cols: { joint: number; dx: number; dy: number }[][] = [];
  for (const mb of model.members) {
    const a = idx.get(mb.from)!;
    const b = idx.get(mb.to)!;
    const dx = model.joints[b].x - model.joints[a].x;
    const dy = model.joints[b].y - model.joints[a].y;
    const L = Math.hypot(dx, dy);
    cols.push([{ joint: a, dx: dx / L, dy: dy / L }, { joint: b, dx: -dx / L, dy: -dy / L }]);
  }
  const rcols: { support: string; dx: number; dy: number }[] = [];
  for (const sp of model.supports) {
    const j = idx.get(sp.joint)!;
    if (sp.kind === 'pin') {
      cols.push([{ joint: j, dx: 1, dy: 0 }], [{ joint: j, dx: 0, dy: 1 }]);
      rcols.push({ support: sp.joint, dx: 1, dy: 0 }, { support: sp.joint, dx: 0, dy: 1 });
    } else {
      const t = (sp.angleDeg * Math.PI) / 180;
      cols.push([{ joint: j, dx: Math.cos(t), dy: Math.sin(t) }]);
      rcols.push({ support: sp.joint, dx: Math.cos(t), dy: Math.sin(t) });
    }
  }
  const A = Array.from({ length: 2 * nj }, () => new Array(cols.length).fill(0));
  cols.forEach((entries, c) => {
    for (const en of entries) {
      A[2 * en.joint][c] += en.dx;
      A[2 * en.joint + 1][c] += en.dy;
    }
  });
  const b = new Array(2 * nj).fill(0);
  for (const ld of model.loadCases[0].loads) {
    const j = idx.get(ld.joint)!;
    b[2 * j] -= ld.fx;
    b[2 * j + 1] -= ld.fy;
  }
  const x = (lusolve(matrix(A), b) as unknown as { toArray(): number[][] }).toArray().map((r) => r[0]);
  const m = model.members.length;
  const R = new Map<string, { joint: string; rx: number; ry: number }>();
  rcols.forEach((rc, k) => {
    const cur = R.get(rc.support) ?? { joint: rc.support, rx: 0, ry: 0 };
    cur.rx += rc.dx * x[m + k];
    cur.ry += rc.dy * x[m + k];
    R.set(rc.support, cur);
  });
  return { N: x.slice(0, m), R: [...R.values()] };
}

describe('random determinate trusses against mathjs lusolve', () => {
  it('when 400 seeded random stable determinate trusses are solved, then member forces and reactions match the dense reference and the residual stays below 1e-9 of the largest load', () => {
    const rand = mulberry32(20240611);
    let simultaneous = 0;
    let reactionsAtJoints = 0;
    for (let t = 0; t < 400; t++) {
      const model = randomTruss(rand);
      let result: TrussAnalysis;
      try {
        result = trussSolve(model);
      } catch (err) {
        throw new Error(`truss #${t}: ${(err as Error).message}`);
      }
      expect(result.classification.kind, `truss #${t}`).toBe('determinate');
      const ref = mathjsReference(model);
      const c = result.cases[0];
      const scale = Math.max(...ref.N.map(Math.abs), 1);
      model.members.forEach((mb, i) => {
        expect(Math.abs(c.forces[mb.id] - ref.N[i]), `truss #${t} member ${mb.id}`).toBeLessThan(1e-8 * scale);
      });
      for (const r of ref.R) {
        const got = c.reactions.find((x) => x.joint === r.joint)!;
        expect(Math.abs(got.rx - r.rx)).toBeLessThan(1e-8 * scale);
        expect(Math.abs(got.ry - r.ry)).toBeLessThan(1e-8 * scale);
      }
      const largest = Math.max(...model.loadCases[0].loads.map((l) => Math.hypot(l.fx, l.fy)));
      expect(c.residual, `truss #${t}`).toBeLessThanOrEqual(1e-9 * largest);
      if (c.simultaneousSteps.length) simultaneous++;
      if (c.reactionSteps.length === 0) reactionsAtJoints++;
    }
    // The generator must exercise the fallback paths, or the comparison proves less than it says.
    expect(simultaneous).toBeGreaterThan(10);
    expect(reactionsAtJoints).toBeGreaterThan(10);
  });
});
