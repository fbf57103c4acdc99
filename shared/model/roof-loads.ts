import type { JointLoad, LoadCase } from './truss';

/**
 * Loads that come from the roof loading, kept honest: a case marked `source: 'roof-loading'`
 * holds exactly the joint loads the takeoff computes, so what the loads table shows is what a
 * run solves. Editing such a case by hand needs an explicit detach first.
 */

export interface RoofLoadsProblem {
  code: 'roof-loads-edited' | 'roof-loads-detach-first' | 'roof-loads-without-takeoff';
  caseId: string;
  message: string;
}

/** Joint loads are the same when they act on the same joints with the same fx and fy (to 1e-9 kN, relative to the size). */
export function sameJointLoads(a: readonly JointLoad[], b: readonly JointLoad[]): boolean {
  const sum = (loads: readonly JointLoad[]) => {
    const m = new Map<string, [number, number]>();
    for (const l of loads) {
      const v = m.get(l.joint) ?? [0, 0];
      m.set(l.joint, [v[0] + l.fx, v[1] + l.fy]);
    }
    return m;
  };
  const x = sum(a);
  const y = sum(b);
  if (x.size !== y.size) return false;
  const close = (p: number, q: number) => Math.abs(p - q) <= 1e-9 * Math.max(1, Math.abs(p), Math.abs(q));
  for (const [joint, [fx, fy]] of x) {
    const other = y.get(joint);
    if (!other || !close(fx, other[0]) || !close(fy, other[1])) return false;
  }
  return true;
}

/**
 * The first thing wrong with a save's roof-takeoff cases, or null:
 *  - a case marked before is sent unmarked (only the detach action, or a save that removes the
 *    takeoff, `takeoffRemoved`, unmarks one);
 *  - a marked case that the takeoff does not write (no takeoff, or not one of its cases);
 *  - a marked case whose loads differ from what the takeoff computes.
 * `caseLoads` is the roof loading's result for the save (null when the save has no takeoff).
 */
export function roofLoadsProblem(
  before: readonly Pick<LoadCase, 'id' | 'source'>[],
  sent: readonly LoadCase[],
  caseLoads: Readonly<Record<string, readonly JointLoad[]>> | null,
  takeoffRemoved = false,
): RoofLoadsProblem | null {
  const markedBefore = new Set(before.filter((c) => c.source === 'roof-loading').map((c) => c.id));
  for (const c of sent) {
    if (markedBefore.has(c.id) && c.source !== 'roof-loading' && !takeoffRemoved) {
      return {
        code: 'roof-loads-detach-first',
        caseId: c.id,
        message: `The loads of load case "${c.id}" come from the roof loading; use "Detach and edit by hand" on the loads table before editing them, and nothing was saved.`,
      };
    }
    if (c.source !== 'roof-loading') continue;
    const computed = caseLoads?.[c.id];
    if (!computed) {
      return {
        code: 'roof-loads-without-takeoff',
        caseId: c.id,
        message: `Load case "${c.id}" is marked as from the roof loading, but the roof loading writes no loads into it; detach it or add it to the roof loading, and nothing was saved.`,
      };
    }
    if (!sameJointLoads(c.loads, computed)) {
      return {
        code: 'roof-loads-edited',
        caseId: c.id,
        message: `The loads of load case "${c.id}" come from the roof loading and differ from what it computes; change the roof loading and use its loads again, or detach them to edit by hand, and nothing was saved.`,
      };
    }
  }
  return null;
}

/** What "Use these loads" changes in one case: its loads before and after, counted and summed. */
export interface RoofLoadsChange {
  caseId: string;
  /** 'added': the case had no loads; 'replaced': its loads are swapped for the roof loading's; 'unchanged': they are the same already. */
  kind: 'added' | 'replaced' | 'unchanged';
  before: { count: number; totalFy: number };
  after: { count: number; totalFy: number };
}

const totals = (loads: readonly Pick<JointLoad, 'fy'>[]) => ({ count: loads.length, totalFy: loads.reduce((s, l) => s + l.fy, 0) });

/** Per case the roof loading writes (in the roof loading's order), what using its loads changes. */
export function roofLoadsChanges(cases: readonly LoadCase[], caseLoads: Readonly<Record<string, readonly JointLoad[]>>): RoofLoadsChange[] {
  return Object.entries(caseLoads).map(([caseId, next]) => {
    const current = cases.find((c) => c.id === caseId)?.loads ?? [];
    const kind = current.length === 0 ? 'added' : sameJointLoads(current, next) ? 'unchanged' : 'replaced';
    return { caseId, kind, before: totals(current), after: totals(next) };
  });
}
