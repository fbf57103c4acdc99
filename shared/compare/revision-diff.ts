import type { Combination, JointLoad, LoadCase, Member, Support, TrussModel } from '../model/truss';
import type { DeterminacyKind } from '../solver/types';
import { quantityFormat, type UnitSystemId } from '../units';

/**
 * What changed between two sheet revisions of one truss: the model snapshots and the solved
 * results their analysis runs froze. Pure: no I/O, no clock.
 *
 * Things are matched by the names the sheet prints, not by internal ids (a re-imported drawing
 * gives every joint and member a new id, see shared/model/rebase.ts): joints and members by tag,
 * supports and loads by their joint's tag, load cases by id, combinations by name.
 */

/** Tolerances the comparison uses; the API returns them and the app prints them under the tables. */
export const REVISION_DIFF_TOLERANCES = {
  /** A joint counts as moved when x or y differs by more than this, m (0.1 mm: below any drawing's precision). */
  coordinateM: 1e-4,
  /** A joint load or total counts as changed when fx or fy differs by more than this, kN (loads are inputs: exact). */
  loadKn: 1e-6,
  /** A combination factor counts as changed when it differs by more than this. */
  factor: 1e-9,
  /**
   * A member force or reaction counts as changed when |after − before| > forceRelative × max(|before|, |after|)
   * and also > forceAbsoluteKn (so round-off on a zero-force member, ~1e-12 kN, is not a change).
   */
  forceRelative: 1e-4,
  forceAbsoluteKn: 1e-6,
} as const;

export type RevisionDiffTolerances = typeof REVISION_DIFF_TOLERANCES;

/** The tolerances in one sentence, for the app and the sheet. */
export function toleranceSentence(t: RevisionDiffTolerances = REVISION_DIFF_TOLERANCES): string {
  return (
    `Joints count as moved beyond ${t.coordinateM * 1000} mm; loads as changed beyond ${t.loadKn} kN; ` +
    `member forces and reactions as changed when the difference exceeds ${t.forceRelative * 100} % of the larger value (and ${t.forceAbsoluteKn} kN).`
  );
}

/** The part of a solved analysis the comparison reads (TrussAnalysis fits it). */
export interface ComparedAnalysis {
  classification: { kind: DeterminacyKind };
  cases: { caseId: string; caseName: string; forces: Record<string, number>; reactions: ComparedReaction[] }[];
  combinations: { name: string; forces: Record<string, number>; reactions: ComparedReaction[] }[];
}

export interface ComparedReaction {
  joint: string;
  tag: string;
  rx: number;
  ry: number;
}

/** One side of the comparison: a revision's frozen model and its results (null when not solved). */
export interface RevisionSide {
  model: TrussModel;
  analysis: ComparedAnalysis | null;
}

export interface Point {
  x: number;
  y: number;
}

export interface JointMove {
  tag: string;
  before: Point;
  after: Point;
  /** after − before, m. */
  dx: number;
  dy: number;
}

export interface MemberRef {
  tag: string;
  /** End joints' tags. */
  from: string;
  to: string;
}

export interface MemberPropertyChange {
  tag: string;
  field: 'group' | 'E' | 'A' | 'EA' | 'material' | 'section';
  before: string | number | null;
  after: string | number | null;
}

export interface SupportRef {
  joint: string;
  kind: 'pin' | 'roller';
  angleDeg?: number;
}

/** A load at one joint of one case: the resultant of the case's loads at that joint. */
export interface JointLoadChange {
  joint: string;
  before: { fx: number; fy: number } | null;
  after: { fx: number; fy: number } | null;
  /** after − before (a missing side counts as 0), kN. */
  dfx: number;
  dfy: number;
}

export interface LoadCaseRef {
  id: string;
  name: string;
  category: string;
  loadCount: number;
  /** Sum of the case's loads, kN. */
  totalFx: number;
  totalFy: number;
}

export interface LoadCaseChange {
  id: string;
  name: string;
  renamed: { before: string; after: string } | null;
  category: { before: string; after: string } | null;
  source: { before: string; after: string } | null;
  loads: JointLoadChange[];
  /** Change of the case's total, kN. */
  dTotalFx: number;
  dTotalFy: number;
}

export interface CombinationChange {
  name: string;
  factors: { caseId: string; before: number | null; after: number | null }[];
  clause: { before: string; after: string } | null;
}

/** One value of a result that differs, kN; null where the side has none. */
export interface ValueChange {
  /** Member tag, or support joint tag. */
  at: string;
  /** Reactions: 'rx' or 'ry'; member forces: 'N'. */
  component: 'N' | 'rx' | 'ry';
  before: number | null;
  after: number | null;
  /** after − before; null when a side has no value. */
  difference: number | null;
}

/** The results of one load case or combination that changed. */
export interface ResultChange {
  kind: 'case' | 'combination';
  /** Case id or combination name. */
  name: string;
  /** 'both': compared value by value; 'added'/'removed': the source exists on one side only. */
  presence: 'both' | 'added' | 'removed';
  forces: ValueChange[];
  reactions: ValueChange[];
  /** Largest |difference| of the member forces (0 when none), kN. */
  largestForceDifference: number;
}

export interface RevisionDiff {
  tolerances: RevisionDiffTolerances;
  geometry: {
    jointsMoved: JointMove[];
    jointsAdded: (Point & { tag: string })[];
    jointsRemoved: (Point & { tag: string })[];
    membersAdded: MemberRef[];
    membersRemoved: MemberRef[];
    /** Same tag, other end joints. */
    membersReconnected: { tag: string; before: MemberRef; after: MemberRef }[];
    memberProperties: MemberPropertyChange[];
  };
  supports: {
    added: SupportRef[];
    removed: SupportRef[];
    changed: { joint: string; before: SupportRef; after: SupportRef }[];
  };
  loadCases: {
    added: LoadCaseRef[];
    removed: LoadCaseRef[];
    changed: LoadCaseChange[];
  };
  combinations: {
    added: { name: string; factors: Record<string, number> }[];
    removed: { name: string; factors: Record<string, number> }[];
    changed: CombinationChange[];
  };
  /** The stability verdict, when it changed. */
  classification: { before: DeterminacyKind | null; after: DeterminacyKind | null } | null;
  /** Per load case then per combination, only those with a change. */
  results: ResultChange[];
  /** True when nothing at all differs. */
  unchanged: boolean;
}

const byKey = <T>(items: T[], key: (t: T) => string): Map<string, T> => {
  const map = new Map<string, T>();
  for (const item of items) if (!map.has(key(item))) map.set(key(item), item);
  return map;
};

const differs = (a: number, b: number, tol: number) => Math.abs(a - b) > tol;

/** Whether two result values differ beyond the force tolerance (see REVISION_DIFF_TOLERANCES). */
export function forceDiffers(before: number, after: number, t: RevisionDiffTolerances = REVISION_DIFF_TOLERANCES): boolean {
  const d = Math.abs(after - before);
  return d > t.forceAbsoluteKn && d > t.forceRelative * Math.max(Math.abs(before), Math.abs(after));
}

function geometryDiff(a: TrussModel, b: TrussModel, t: RevisionDiffTolerances): RevisionDiff['geometry'] {
  const ja = byKey(a.joints, (j) => j.tag);
  const jb = byKey(b.joints, (j) => j.tag);
  const tagA = new Map(a.joints.map((j) => [j.id, j.tag]));
  const tagB = new Map(b.joints.map((j) => [j.id, j.tag]));
  const jointsMoved: JointMove[] = [];
  for (const [tag, after] of jb) {
    const before = ja.get(tag);
    if (before && (differs(before.x, after.x, t.coordinateM) || differs(before.y, after.y, t.coordinateM))) {
      jointsMoved.push({ tag, before: { x: before.x, y: before.y }, after: { x: after.x, y: after.y }, dx: after.x - before.x, dy: after.y - before.y });
    }
  }
  const ref = (m: Member, tags: Map<string, string>): MemberRef => ({ tag: m.tag, from: tags.get(m.from) ?? m.from, to: tags.get(m.to) ?? m.to });
  const ma = byKey(a.members, (m) => m.tag);
  const mb = byKey(b.members, (m) => m.tag);
  const membersReconnected: RevisionDiff['geometry']['membersReconnected'] = [];
  const memberProperties: MemberPropertyChange[] = [];
  for (const [tag, after] of mb) {
    const before = ma.get(tag);
    if (!before) continue;
    const ra = ref(before, tagA);
    const rb = ref(after, tagB);
    // The same two joints either way round is the same member.
    const sameEnds = (ra.from === rb.from && ra.to === rb.to) || (ra.from === rb.to && ra.to === rb.from);
    if (!sameEnds) membersReconnected.push({ tag, before: ra, after: rb });
    for (const field of ['group', 'E', 'A', 'EA', 'material', 'section'] as const) {
      const x = before[field] ?? null;
      const y = after[field] ?? null;
      const changed = typeof x === 'number' && typeof y === 'number' ? Math.abs(x - y) > 1e-12 * Math.max(Math.abs(x), Math.abs(y)) : x !== y;
      if (changed) memberProperties.push({ tag, field, before: x, after: y });
    }
  }
  return {
    jointsMoved,
    jointsAdded: b.joints.filter((j) => !ja.has(j.tag)).map((j) => ({ tag: j.tag, x: j.x, y: j.y })),
    jointsRemoved: a.joints.filter((j) => !jb.has(j.tag)).map((j) => ({ tag: j.tag, x: j.x, y: j.y })),
    membersAdded: b.members.filter((m) => !ma.has(m.tag)).map((m) => ref(m, tagB)),
    membersRemoved: a.members.filter((m) => !mb.has(m.tag)).map((m) => ref(m, tagA)),
    membersReconnected,
    memberProperties,
  };
}

function supportRef(s: Support, tags: Map<string, string>): SupportRef {
  const joint = tags.get(s.joint) ?? s.joint;
  return s.kind === 'roller' ? { joint, kind: 'roller', angleDeg: s.angleDeg } : { joint, kind: 'pin' };
}

function supportsDiff(a: TrussModel, b: TrussModel): RevisionDiff['supports'] {
  const tagA = new Map(a.joints.map((j) => [j.id, j.tag]));
  const tagB = new Map(b.joints.map((j) => [j.id, j.tag]));
  const sa = byKey(a.supports.map((s) => supportRef(s, tagA)), (s) => s.joint);
  const sb = byKey(b.supports.map((s) => supportRef(s, tagB)), (s) => s.joint);
  const changed: RevisionDiff['supports']['changed'] = [];
  for (const [joint, after] of sb) {
    const before = sa.get(joint);
    if (before && (before.kind !== after.kind || Math.abs((before.angleDeg ?? 90) - (after.angleDeg ?? 90)) > 1e-9)) changed.push({ joint, before, after });
  }
  return {
    added: [...sb.values()].filter((s) => !sa.has(s.joint)),
    removed: [...sa.values()].filter((s) => !sb.has(s.joint)),
    changed,
  };
}

/** The resultant load at each joint (by tag) of a case, in the order the joints are first loaded. */
function loadsAtJoints(loads: JointLoad[], tags: Map<string, string>): Map<string, { fx: number; fy: number }> {
  const at = new Map<string, { fx: number; fy: number }>();
  for (const l of loads) {
    const tag = tags.get(l.joint) ?? l.joint;
    const sum = at.get(tag) ?? { fx: 0, fy: 0 };
    at.set(tag, { fx: sum.fx + l.fx, fy: sum.fy + l.fy });
  }
  return at;
}

function caseRef(c: LoadCase): LoadCaseRef {
  return {
    id: c.id,
    name: c.name,
    category: c.category,
    loadCount: c.loads.length,
    totalFx: c.loads.reduce((s, l) => s + l.fx, 0),
    totalFy: c.loads.reduce((s, l) => s + l.fy, 0),
  };
}

function loadCasesDiff(a: TrussModel, b: TrussModel, t: RevisionDiffTolerances): RevisionDiff['loadCases'] {
  const tagA = new Map(a.joints.map((j) => [j.id, j.tag]));
  const tagB = new Map(b.joints.map((j) => [j.id, j.tag]));
  const ca = byKey(a.loadCases, (c) => c.id);
  const cb = byKey(b.loadCases, (c) => c.id);
  const changed: LoadCaseChange[] = [];
  for (const [id, after] of cb) {
    const before = ca.get(id);
    if (!before) continue;
    const la = loadsAtJoints(before.loads, tagA);
    const lb = loadsAtJoints(after.loads, tagB);
    const loads: JointLoadChange[] = [];
    for (const joint of [...new Set([...la.keys(), ...lb.keys()])]) {
      const x = la.get(joint) ?? null;
      const y = lb.get(joint) ?? null;
      const dfx = (y?.fx ?? 0) - (x?.fx ?? 0);
      const dfy = (y?.fy ?? 0) - (x?.fy ?? 0);
      // A load of zero added or taken away changes nothing the solver sees, but is still a row of the table.
      if (x === null || y === null || Math.abs(dfx) > t.loadKn || Math.abs(dfy) > t.loadKn) loads.push({ joint, before: x, after: y, dfx, dfy });
    }
    const ra = caseRef(before);
    const rb = caseRef(after);
    const renamed = before.name !== after.name ? { before: before.name, after: after.name } : null;
    const category = before.category !== after.category ? { before: before.category, after: after.category } : null;
    const source = (before.source ?? 'hand') !== (after.source ?? 'hand') ? { before: before.source ?? 'hand', after: after.source ?? 'hand' } : null;
    if (loads.length || renamed || category || source) {
      changed.push({ id, name: after.name, renamed, category, source, loads, dTotalFx: rb.totalFx - ra.totalFx, dTotalFy: rb.totalFy - ra.totalFy });
    }
  }
  return {
    added: b.loadCases.filter((c) => !ca.has(c.id)).map(caseRef),
    removed: a.loadCases.filter((c) => !cb.has(c.id)).map(caseRef),
    changed,
  };
}

function combinationsDiff(a: Combination[], b: Combination[], t: RevisionDiffTolerances): RevisionDiff['combinations'] {
  const ca = byKey(a, (c) => c.name);
  const cb = byKey(b, (c) => c.name);
  const changed: CombinationChange[] = [];
  for (const [name, after] of cb) {
    const before = ca.get(name);
    if (!before) continue;
    const factors: CombinationChange['factors'] = [];
    for (const caseId of [...new Set([...Object.keys(before.factors), ...Object.keys(after.factors)])]) {
      const x = before.factors[caseId] ?? null;
      const y = after.factors[caseId] ?? null;
      if (x === null || y === null ? x !== y : Math.abs(x - y) > t.factor) factors.push({ caseId, before: x, after: y });
    }
    const clause = (before.clause ?? '') !== (after.clause ?? '') ? { before: before.clause ?? '', after: after.clause ?? '' } : null;
    if (factors.length || clause) changed.push({ name, factors, clause });
  }
  return {
    added: b.filter((c) => !ca.has(c.name)).map((c) => ({ name: c.name, factors: c.factors })),
    removed: a.filter((c) => !cb.has(c.name)).map((c) => ({ name: c.name, factors: c.factors })),
    changed,
  };
}

type ResultSource = { forces: Record<string, number>; reactions: ComparedReaction[] };

function valueChange(at: string, component: ValueChange['component'], before: number | undefined, after: number | undefined, t: RevisionDiffTolerances): ValueChange | null {
  if (before === undefined && after === undefined) return null;
  if (before !== undefined && after !== undefined) {
    return forceDiffers(before, after, t) ? { at, component, before, after, difference: after - before } : null;
  }
  return { at, component, before: before ?? null, after: after ?? null, difference: null };
}

function resultDiff(
  kind: ResultChange['kind'],
  name: string,
  before: ResultSource | undefined,
  after: ResultSource | undefined,
  memberTagA: Map<string, string>,
  memberTagB: Map<string, string>,
  t: RevisionDiffTolerances,
): ResultChange | null {
  const fa = new Map(Object.entries(before?.forces ?? {}).map(([id, v]) => [memberTagA.get(id) ?? id, v]));
  const fb = new Map(Object.entries(after?.forces ?? {}).map(([id, v]) => [memberTagB.get(id) ?? id, v]));
  const forces: ValueChange[] = [];
  for (const tag of [...new Set([...fa.keys(), ...fb.keys()])]) {
    const change = valueChange(tag, 'N', fa.get(tag), fb.get(tag), t);
    if (change) forces.push(change);
  }
  const ra = byKey(before?.reactions ?? [], (r) => r.tag);
  const rb = byKey(after?.reactions ?? [], (r) => r.tag);
  const reactions: ValueChange[] = [];
  for (const tag of [...new Set([...ra.keys(), ...rb.keys()])]) {
    for (const component of ['rx', 'ry'] as const) {
      const change = valueChange(tag, component, ra.get(tag)?.[component], rb.get(tag)?.[component], t);
      if (change) reactions.push(change);
    }
  }
  if (!forces.length && !reactions.length && before && after) return null;
  return {
    kind,
    name,
    presence: before && after ? 'both' : after ? 'added' : 'removed',
    forces,
    reactions,
    largestForceDifference: Math.max(0, ...forces.map((f) => Math.abs(f.difference ?? 0))),
  };
}

function resultsDiff(a: RevisionSide, b: RevisionSide, t: RevisionDiffTolerances): ResultChange[] {
  const memberTagA = new Map(a.model.members.map((m) => [m.id, m.tag]));
  const memberTagB = new Map(b.model.members.map((m) => [m.id, m.tag]));
  const out: ResultChange[] = [];
  const pairs = <T extends ResultSource>(xs: T[], ys: T[], key: (s: T) => string) => {
    const mx = byKey(xs, key);
    const my = byKey(ys, key);
    return [...new Set([...mx.keys(), ...my.keys()])].map((k) => [k, mx.get(k), my.get(k)] as const);
  };
  for (const [name, x, y] of pairs(a.analysis?.cases ?? [], b.analysis?.cases ?? [], (c) => c.caseId)) {
    const change = resultDiff('case', name, x, y, memberTagA, memberTagB, t);
    if (change) out.push(change);
  }
  for (const [name, x, y] of pairs(a.analysis?.combinations ?? [], b.analysis?.combinations ?? [], (c) => c.name)) {
    const change = resultDiff('combination', name, x, y, memberTagA, memberTagB, t);
    if (change) out.push(change);
  }
  return out;
}

/** Everything that differs from `before` (the earlier revision) to `after`. */
export function revisionDiff(before: RevisionSide, after: RevisionSide, t: RevisionDiffTolerances = REVISION_DIFF_TOLERANCES): RevisionDiff {
  const geometry = geometryDiff(before.model, after.model, t);
  const supports = supportsDiff(before.model, after.model);
  const loadCases = loadCasesDiff(before.model, after.model, t);
  const combinations = combinationsDiff(before.model.combinations ?? [], after.model.combinations ?? [], t);
  const ka = before.analysis?.classification.kind ?? null;
  const kb = after.analysis?.classification.kind ?? null;
  const classification = ka !== kb ? { before: ka, after: kb } : null;
  const results = resultsDiff(before, after, t);
  const lists = [
    ...Object.values(geometry),
    ...Object.values(supports),
    ...Object.values(loadCases),
    ...Object.values(combinations),
    results,
  ] as unknown[][];
  return { tolerances: t, geometry, supports, loadCases, combinations, classification, results, unchanged: lists.every((l) => l.length === 0) && !classification };
}

/** What the revision table says about one kind of change. */
export interface DiffLine {
  kind: 'geometry' | 'supports' | 'loads' | 'combinations' | 'results';
  /** "Geometry", "Supports", … */
  label: string;
  text: string;
  changed: boolean;
}

const list = (items: string[], max = 4) => (items.length <= max ? items.join(', ') : `${items.slice(0, max).join(', ')} and ${items.length - max} more`);
const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/**
 * One line per kind of change, in plain words, for the sheet's revision table and the app's
 * summary: "joint C moved; member CD added", "case L changed at 2 joints (total Fy −5.00 kN)".
 * Forces in the project's unit system (kN or kip) with the sheet's digits for that unit.
 */
export function revisionDiffLines(diff: RevisionDiff, system: UnitSystemId = 'si'): DiffLine[] {
  const kn = (v: number) => quantityFormat(v, 'force', system, { signed: true });
  const g = diff.geometry;
  const geometry = [
    g.jointsMoved.length ? `${g.jointsMoved.length === 1 ? 'joint' : 'joints'} ${list(g.jointsMoved.map((j) => j.tag))} moved` : '',
    g.jointsAdded.length ? `${g.jointsAdded.length === 1 ? 'joint' : 'joints'} ${list(g.jointsAdded.map((j) => j.tag))} added` : '',
    g.jointsRemoved.length ? `${g.jointsRemoved.length === 1 ? 'joint' : 'joints'} ${list(g.jointsRemoved.map((j) => j.tag))} removed` : '',
    g.membersAdded.length ? `${g.membersAdded.length === 1 ? 'member' : 'members'} ${list(g.membersAdded.map((m) => m.tag))} added` : '',
    g.membersRemoved.length ? `${g.membersRemoved.length === 1 ? 'member' : 'members'} ${list(g.membersRemoved.map((m) => m.tag))} removed` : '',
    g.membersReconnected.length ? `${g.membersReconnected.length === 1 ? 'member' : 'members'} ${list(g.membersReconnected.map((m) => m.tag))} reconnected` : '',
    g.memberProperties.length ? `properties of ${plural(new Set(g.memberProperties.map((p) => p.tag)).size, 'member')} changed` : '',
  ].filter(Boolean);
  const s = diff.supports;
  const supports = [
    ...s.added.map((x) => `${x.kind} added at ${x.joint}`),
    ...s.removed.map((x) => `${x.kind} removed at ${x.joint}`),
    ...s.changed.map((x) => `${x.joint} ${x.before.kind} → ${x.after.kind}${x.after.kind === 'roller' && x.before.kind === 'roller' ? ` (${x.before.angleDeg}° → ${x.after.angleDeg}°)` : ''}`),
  ];
  const l = diff.loadCases;
  const loads = [
    ...l.changed.map((c) => {
      const parts = [
        c.loads.length ? `changed at ${plural(c.loads.length, 'joint')} (total Fy ${kn(c.dTotalFy)}${Math.abs(c.dTotalFx) > diff.tolerances.loadKn ? `, Fx ${kn(c.dTotalFx)}` : ''})` : '',
        c.renamed ? `renamed` : '',
        c.category ? `category ${c.category.before} → ${c.category.after}` : '',
        c.source ? `now ${c.source.after === 'roof-loading' ? 'from the roof loading' : 'entered by hand'}` : '',
      ].filter(Boolean);
      return `case ${c.id} ${parts.join(', ')}`;
    }),
    ...l.added.map((c) => `case ${c.id} added (${plural(c.loadCount, 'load')})`),
    ...l.removed.map((c) => `case ${c.id} removed`),
  ];
  const k = diff.combinations;
  const combinations = [
    ...k.changed.map((c) => `${c.name} factors changed`),
    ...k.added.map((c) => `${c.name} added`),
    ...k.removed.map((c) => `${c.name} removed`),
  ];
  const results: string[] = [];
  if (diff.classification) results.push(`stability ${diff.classification.before ?? 'none'} → ${diff.classification.after ?? 'none'}`);
  const compared = diff.results.filter((r) => r.presence === 'both');
  if (compared.length) {
    const members = new Set(compared.flatMap((r) => r.forces.filter((f) => f.difference !== null).map((f) => f.at)));
    const worst = compared.reduce((w, r) => (r.largestForceDifference > w.largestForceDifference ? r : w), compared[0]!);
    const reactionsChanged = compared.some((r) => r.reactions.length > 0);
    results.push(
      `${members.size ? `forces of ${plural(members.size, 'member')} changed, by up to ${quantityFormat(worst.largestForceDifference, 'force', system)} (${worst.kind} ${worst.name})` : 'member forces unchanged'}${reactionsChanged ? '; reactions changed' : ''}`,
    );
  }
  const addedSources = diff.results.filter((r) => r.presence === 'added').map((r) => `${r.kind} ${r.name}`);
  if (addedSources.length) results.push(`results of ${list(addedSources)} new`);
  const removedSources = diff.results.filter((r) => r.presence === 'removed').map((r) => `${r.kind} ${r.name}`);
  if (removedSources.length) results.push(`results of ${list(removedSources)} gone`);
  const line = (kind: DiffLine['kind'], label: string, parts: string[]): DiffLine => ({
    kind,
    label,
    text: parts.length ? parts.join('; ') : 'no change',
    changed: parts.length > 0,
  });
  return [
    line('geometry', 'Geometry', geometry),
    line('supports', 'Supports', supports),
    line('loads', 'Loads', loads),
    line('combinations', 'Combinations', combinations),
    line('results', 'Forces and reactions', results),
  ];
}
