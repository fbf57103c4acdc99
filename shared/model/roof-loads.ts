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

/** Why the roof-loading marks of a model (or a job file) cannot stand: a case and what is wrong. */
export interface RoofLoadsMarkProblem {
  code: 'roof-loads-without-takeoff' | 'roof-loads-not-written' | 'roof-loads-differ';
  caseId: string;
}

/**
 * The one rule for the loads of a roof loading, in the app's runs, the job file, the command line
 * and the import alike: a case marked `source: 'roof-loading'` holds the roof loading's joint
 * loads; every other case holds its own loads as written, even a case the roof loading writes
 * (its loads were detached and are entered by hand, so the roof loading no longer updates them).
 * A run solves exactly these loads; the roof loading never replaces a case at solve time.
 *
 * A marked case given without loads (a hand-written job file may leave them out) takes the roof
 * loading's loads; a marked case given with loads must hold exactly those (sameJointLoads), else
 * 'roof-loads-differ'. A marked case the roof loading does not write, or a mark without a roof
 * loading (`caseLoads` null), is a problem too. Returns the cases with their loads, or the first problem.
 */
export function roofLoadsResolve<C extends Pick<LoadCase, 'id' | 'loads' | 'source'>>(
  cases: readonly C[],
  caseLoads: Readonly<Record<string, readonly JointLoad[]>> | null,
): { cases: C[]; problem: null } | { cases: null; problem: RoofLoadsMarkProblem } {
  const out: C[] = [];
  for (const c of cases) {
    if (c.source !== 'roof-loading') {
      out.push(c);
      continue;
    }
    if (!caseLoads) return { cases: null, problem: { code: 'roof-loads-without-takeoff', caseId: c.id } };
    const computed = caseLoads[c.id];
    if (!computed) return { cases: null, problem: { code: 'roof-loads-not-written', caseId: c.id } };
    if (c.loads.length === 0) out.push({ ...c, loads: computed.map((l) => ({ ...l })) });
    else if (sameJointLoads(c.loads, computed)) out.push(c);
    else return { cases: null, problem: { code: 'roof-loads-differ', caseId: c.id } };
  }
  return { cases: out, problem: null };
}

/**
 * The roof loading's steps a sheet prints for a model: the steps shared by every case (widths,
 * the continuous purlin; caseId '') and those of the cases marked as holding its loads. A case
 * the roof loading writes but whose loads were detached solves its hand loads, so its takeoff
 * steps (which end in loads it does not carry) are left out, as roofLoadsResolve leaves them out
 * of the loads. Steps come back in their order.
 */
export function roofLoadsSteps<S extends { caseId: string }>(steps: readonly S[], cases: readonly Pick<LoadCase, 'id' | 'source'>[]): S[] {
  const marked = new Set(cases.filter((c) => c.source === 'roof-loading').map((c) => c.id));
  return steps.filter((s) => s.caseId === '' || marked.has(s.caseId));
}
