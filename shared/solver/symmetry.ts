import type { PreparedCase, PreparedModel } from './prepare';
import type { Symmetry } from './types';

/** Mirror of each joint (index), or −1; null when geometry or supports are not symmetric. */
export interface MirrorMap {
  axisX: number;
  jointMirror: Int32Array;
  memberMirror: Int32Array;
}

/** Coordinate tolerance for mirror matching: 1e-6 of the truss's extent. */
const MIRROR_TOLERANCE = 1e-6;

function lineAngle(deg: number): number {
  return ((deg % 180) + 180) % 180;
}

/**
 * Mirror symmetry about the vertical line through the middle of the truss: every joint has a
 * mirror joint, every member a mirror member (with equal EA when `withStiffness`), every support
 * a mirror support (pin ↔ pin, roller ↔ roller with the mirrored line, and pin ↔ vertical roller,
 * which under mirrored loads carries no horizontal reaction). Returns null when not symmetric.
 */
export function mirrorFind(pm: PreparedModel, withStiffness: boolean): MirrorMap | null {
  const n = pm.jointIds.length;
  let minX = Infinity;
  let maxX = -Infinity;
  for (let j = 0; j < n; j++) {
    minX = Math.min(minX, pm.x[j]);
    maxX = Math.max(maxX, pm.x[j]);
  }
  const axisX = (minX + maxX) / 2;
  let minY = Infinity;
  for (let j = 0; j < n; j++) minY = Math.min(minY, pm.y[j]);
  const tol = MIRROR_TOLERANCE * Math.max(pm.extent, 1e-3);
  // Grid of cells 4·tol wide over coordinates relative to the lower-left corner; numeric keys.
  const cellX = (v: number) => Math.round((v - minX) / (tol * 4));
  const cellY = (v: number) => Math.round((v - minY) / (tol * 4));
  const key = (cx: number, cy: number) => cx * 4_194_304 + cy;
  const grid = new Map<number, number[]>();
  for (let j = 0; j < n; j++) {
    const k = key(cellX(pm.x[j]), cellY(pm.y[j]));
    const list = grid.get(k);
    if (list) list.push(j);
    else grid.set(k, [j]);
  }
  const jointMirror = new Int32Array(n).fill(-1);
  for (let j = 0; j < n; j++) {
    const mx = 2 * axisX - pm.x[j];
    const my = pm.y[j];
    const cx = cellX(mx);
    const cy = cellY(my);
    search: for (let a = -1; a <= 1; a++) for (let b = -1; b <= 1; b++) {
      for (const k of grid.get(key(cx + a, cy + b)) ?? []) {
        if (Math.abs(pm.x[k] - mx) <= tol && Math.abs(pm.y[k] - my) <= tol) {
          jointMirror[j] = k;
          break search;
        }
      }
    }
    if (jointMirror[j] < 0) return null;
  }
  const memberKey = (a: number, b: number) => (a < b ? `${a}:${b}` : `${b}:${a}`);
  const byEnds = new Map<string, number>();
  pm.members.forEach((mb, e) => byEnds.set(memberKey(mb.a, mb.b), e));
  const memberMirror = new Int32Array(pm.members.length).fill(-1);
  for (let e = 0; e < pm.members.length; e++) {
    const mb = pm.members[e];
    const f = byEnds.get(memberKey(jointMirror[mb.a], jointMirror[mb.b]));
    if (f === undefined) return null;
    if (withStiffness) {
      const ea = mb.EA ?? 0;
      const eb = pm.members[f].EA ?? 0;
      if (Math.abs(ea - eb) > 1e-9 * Math.max(Math.abs(ea), Math.abs(eb))) return null;
    }
    memberMirror[e] = f;
  }
  for (const sp of pm.supports) {
    const k = jointMirror[sp.joint];
    const s2 = pm.supportAt[k];
    if (s2 < 0) return null;
    const other = pm.supports[s2];
    if (sp.kind === 'pin' && other.kind === 'pin') continue;
    if (sp.kind === 'roller' && other.kind === 'roller') {
      const a = lineAngle(sp.angleDeg ?? 90);
      const b = lineAngle(180 - (other.angleDeg ?? 90));
      const diff = Math.abs(a - b);
      if (Math.min(diff, 180 - diff) > 1e-9) return null;
      continue;
    }
    const roller = sp.kind === 'roller' ? sp : other;
    if (Math.abs(lineAngle(roller.angleDeg ?? 90) - 90) > 1e-9) return null;
  }
  return { axisX, jointMirror, memberMirror };
}

/** The model-level symmetry report. */
export function symmetryDescribe(pm: PreparedModel, mirror: MirrorMap | null): Symmetry {
  if (!mirror) {
    return { detected: false, axisX: null, jointPairs: [], memberPairs: [], note: 'Geometry and supports are not mirror-symmetric about a vertical axis.' };
  }
  const jointPairs: [string, string][] = [];
  mirror.jointMirror.forEach((k, j) => {
    if (j <= k) jointPairs.push([pm.jointIds[j], pm.jointIds[k]]);
  });
  const memberPairs: [string, string][] = [];
  mirror.memberMirror.forEach((f, e) => {
    if (e <= f) memberPairs.push([pm.members[e].id, pm.members[f].id]);
  });
  return {
    detected: true,
    axisX: mirror.axisX,
    jointPairs,
    memberPairs,
    note: `Geometry and supports are mirror-symmetric about x = ${mirror.axisX.toFixed(3)} m; under mirror-symmetric loads each member pair carries equal force.`,
  };
}

/** True when the case's loads are the mirror image of themselves (fx changes sign, fy not). */
export function loadsSymmetric(mirror: MirrorMap, lc: PreparedCase): boolean {
  let scale = 0;
  for (let j = 0; j < lc.fx.length; j++) scale = Math.max(scale, Math.abs(lc.fx[j]), Math.abs(lc.fy[j]));
  const tol = 1e-9 * Math.max(scale, 1e-12);
  for (let j = 0; j < lc.fx.length; j++) {
    const k = mirror.jointMirror[j];
    if (Math.abs(lc.fx[j] + lc.fx[k]) > tol || Math.abs(lc.fy[j] - lc.fy[k]) > tol) return false;
  }
  return true;
}
