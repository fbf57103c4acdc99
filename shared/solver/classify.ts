import type { PreparedModel } from './prepare';
import { conditioningOf } from './conditioning';
import { equilibriumRank } from './rank';
import type { SparseRow } from './sparse';
import type { Classification, DeterminacyKind } from './types';

/**
 * Rows of the joint-equilibrium matrix A (2j × (m + r)): row 2i is ΣFx at joint i, row 2i+1 is
 * ΣFy. Column e < m is member e's tension (+u at its `a` joint, −u at its `b` joint); column
 * m + k is reaction component k along its unit direction. Equilibrium: A·[N; R] + F = 0.
 */
export function equilibriumRows(pm: PreparedModel): SparseRow[] {
  const n = pm.jointIds.length;
  const m = pm.members.length;
  const rows: SparseRow[] = [];
  for (let i = 0; i < 2 * n; i++) rows.push({ cols: [], vals: [] });
  const add = (row: number, col: number, v: number) => {
    if (v === 0) return;
    rows[row].cols.push(col);
    rows[row].vals.push(v);
  };
  pm.members.forEach((mb, e) => {
    add(2 * mb.a, e, mb.cx);
    add(2 * mb.a + 1, e, mb.cy);
    add(2 * mb.b, e, -mb.cx);
    add(2 * mb.b + 1, e, -mb.cy);
  });
  pm.reactions.forEach((rc, k) => {
    add(2 * rc.joint, m + k, rc.dx);
    add(2 * rc.joint + 1, m + k, rc.dy);
  });
  return rows;
}

const LIST_LIMIT = 20;

function tagList(tags: string[]): string {
  if (tags.length <= LIST_LIMIT) return tags.join(', ');
  return `${tags.slice(0, LIST_LIMIT).join(', ')} and ${tags.length - LIST_LIMIT} more`;
}

/** Why the reactions alone cannot hold the truss still, when that is the cause. */
function reactionDiagnosis(pm: PreparedModel): string | null {
  const rs = pm.reactions;
  if (rs.length < 3) {
    return `There are only ${rs.length} reaction component${rs.length === 1 ? '' : 's'}; a plane truss needs at least three (for example a pin and a roller).`;
  }
  const parallel = rs.every((r) => Math.abs(r.dx * rs[0].dy - r.dy * rs[0].dx) < 1e-9);
  if (parallel) {
    return 'All reaction lines are parallel, so nothing resists movement across them; turn one roller or make one support a pin.';
  }
  // Concurrent: every reaction line passes through one point.
  const a = rs[0];
  const b = rs.find((r) => Math.abs(r.dx * a.dy - r.dy * a.dx) >= 1e-9);
  if (b) {
    const ax = pm.x[a.joint];
    const ay = pm.y[a.joint];
    const bx = pm.x[b.joint];
    const by = pm.y[b.joint];
    const det = a.dx * -b.dy - a.dy * -b.dx;
    const t = ((bx - ax) * -b.dy - (by - ay) * -b.dx) / det;
    const px = ax + t * a.dx;
    const py = ay + t * a.dy;
    const tol = 1e-9 * Math.max(pm.extent, 1);
    const through = rs.every((r) => Math.abs((pm.x[r.joint] - px) * r.dy - (pm.y[r.joint] - py) * r.dx) < tol);
    if (through) {
      return `All reaction lines pass through one point (${px.toFixed(3)}, ${py.toFixed(3)}) m, so nothing resists rotation about it; move or turn a roller.`;
    }
  }
  return null;
}

/**
 * Whether the members alone make one rigid body: the model with its supports replaced by a pin at
 * the first joint and a roller at the farthest joint (reaction line square to the line between
 * them, so the three reaction lines neither meet at one point nor run parallel) has rank 2j.
 * Then an unstable truss is unstable only because of its supports.
 */
function membersRigid(pm: PreparedModel): boolean {
  const n = pm.jointIds.length;
  if (n < 2) return n === 1;
  let far = 1;
  for (let i = 1; i < n; i++) {
    if (Math.hypot(pm.x[i] - pm.x[0], pm.y[i] - pm.y[0]) > Math.hypot(pm.x[far] - pm.x[0], pm.y[far] - pm.y[0])) far = i;
  }
  const L = Math.hypot(pm.x[far] - pm.x[0], pm.y[far] - pm.y[0]);
  if (L === 0) return false;
  const reactions: PreparedModel['reactions'] = [
    { joint: 0, support: 0, component: 'x', dx: 1, dy: 0, symbol: '', label: '' },
    { joint: 0, support: 0, component: 'y', dx: 0, dy: 1, symbol: '', label: '' },
    { joint: far, support: 1, component: 'n', dx: -(pm.y[far] - pm.y[0]) / L, dy: (pm.x[far] - pm.x[0]) / L, symbol: '', label: '' },
  ];
  const supportAt = new Int32Array(n).fill(-1);
  supportAt[0] = 0;
  supportAt[far] = 1;
  const braced: PreparedModel = {
    ...pm,
    reactions,
    supports: [
      { joint: 0, kind: 'pin', reactions: [0, 1] },
      { joint: far, kind: 'roller', reactions: [2] },
    ],
    supportAt,
  };
  return equilibriumRank(braced, equilibriumRows(braced), false).rank === 2 * n;
}

/** The model with one more member from joint a to joint b (incidence rebuilt), for a rank trial. */
function withMember(pm: PreparedModel, a: number, b: number): PreparedModel {
  const dx = pm.x[b] - pm.x[a];
  const dy = pm.y[b] - pm.y[a];
  const length = Math.hypot(dx, dy);
  const members = [...pm.members, { id: '', tag: '', a, b, length, cx: dx / length, cy: dy / length, EA: null, symbol: '' }];
  const n = pm.jointIds.length;
  const start = new Int32Array(n + 1);
  for (const mb of members) {
    start[mb.a + 1]++;
    start[mb.b + 1]++;
  }
  for (let i = 0; i < n; i++) start[i + 1] += start[i];
  const fill = Int32Array.from(start.subarray(0, n));
  const incident = new Int32Array(2 * members.length);
  members.forEach((mb, e) => {
    incident[fill[mb.a]++] = e;
    incident[fill[mb.b]++] = e;
  });
  return { ...pm, members, incidentStart: start, incident };
}

/** Most diagonals tried (each a rank computation, about linear in the truss size). */
const DIAGONAL_TRIALS = 40;

/**
 * An open panel and the diagonal that closes it: among the four-sided panels (four members in a
 * ring, neither diagonal drawn) with a joint that moves in the mechanism, the first whose
 * diagonal raises the rank of the equilibrium matrix. Null when no such panel is found.
 */
export function openPanelFind(pm: PreparedModel, rank: number, moving: Set<number>): { ring: number[]; from: number; to: number; stable: boolean } | null {
  const n = pm.jointIds.length;
  const nbr: Set<number>[] = Array.from({ length: n }, () => new Set<number>());
  for (const mb of pm.members) {
    nbr[mb.a].add(mb.b);
    nbr[mb.b].add(mb.a);
  }
  const tried = new Set<string>();
  let trials = 0;
  const order = [...moving].sort((p, q) => p - q);
  for (const p of order) {
    const ns = [...nbr[p]].sort((u, v) => u - v);
    for (let i = 0; i < ns.length; i++) {
      for (let k = i + 1; k < ns.length; k++) {
        const q = ns[i];
        const r = ns[k];
        if (nbr[q].has(r)) continue; // a triangle, not an open panel
        for (const s of [...nbr[q]].sort((u, v) => u - v)) {
          if (s === p || !nbr[r].has(s) || nbr[p].has(s)) continue;
          // Ring p–q–s–r, neither p–s nor q–r drawn. Try both diagonals, the one at p first.
          for (const [a, b] of [[p, s], [q, r]] as const) {
            const key = a < b ? `${a}-${b}` : `${b}-${a}`;
            if (tried.has(key)) continue;
            tried.add(key);
            const dx = pm.x[b] - pm.x[a];
            const dy = pm.y[b] - pm.y[a];
            if (Math.hypot(dx, dy) <= 1e-9 * Math.max(pm.extent, 1)) continue;
            if (++trials > DIAGONAL_TRIALS) return null;
            const trial = withMember(pm, a, b);
            const next = equilibriumRank(trial, equilibriumRows(trial), false).rank;
            if (next > rank) return { ring: [p, q, s, r], from: a, to: b, stable: next === 2 * n };
          }
        }
      }
    }
  }
  return null;
}

/**
 * Stability and determinacy: the count m + r against 2j and the rank of the joint-equilibrium
 * matrix (structural peel plus sparse elimination of what is left, see rank.ts). A model is stable only with rank 2j; then
 * m + r = 2j is determinate and m + r > 2j indeterminate to degree m + r − 2j. For an unstable
 * model the joints that can move without any member changing length are named.
 */
export function trussClassify(pm: PreparedModel): Classification {
  const m = pm.members.length;
  const r = pm.reactions.length;
  const j = pm.jointIds.length;
  const degree = m + r - 2 * j;
  const rows = equilibriumRows(pm);
  const first = equilibriumRank(pm, rows, false);
  const rank = first.rank;
  let kind: DeterminacyKind;
  let mechanismJoints: string[] = [];
  let message: string;
  let cause: Classification['cause'] = null;
  if (rank < 2 * j) {
    kind = 'unstable';
    const order = equilibriumRank(pm, rows, true).mechanismJoints;
    mechanismJoints = order.map((i) => pm.jointIds[i]);
    const tags = order.map((i) => pm.jointTags[i]);
    const parts: string[] = [];
    if (degree < 0) {
      parts.push(
        `m + r = ${m} + ${r} = ${m + r} is less than 2j = ${2 * j}: the truss is short of ${-degree} member${degree === -1 ? '' : 's'} or reaction${degree === -1 ? '' : 's'} and is a mechanism.`,
      );
    } else {
      parts.push(
        `m + r = ${m + r} ≥ 2j = ${2 * j}, but the joint equilibrium equations are dependent (rank ${rank} < ${2 * j}): the truss is geometrically unstable.`,
      );
    }
    const diag = reactionDiagnosis(pm);
    if (diag) parts.push(diag);
    const loose = order.filter((i) => pm.incidentStart[i + 1] - pm.incidentStart[i] < 2 && pm.supportAt[i] < 0);
    if (loose.length) {
      parts.push(`Joint${loose.length > 1 ? 's' : ''} ${tagList(loose.map((i) => pm.jointTags[i]))} ${loose.length > 1 ? 'have' : 'has'} fewer than two members and no support.`);
    }
    if (diag && membersRigid(pm)) {
      cause = { kind: 'supports', reason: diag };
      // The members make one rigid body: only the supports let it move (a rigid plane body needs
      // three reaction lines, neither all parallel nor all through one point; any statics text, from memory).
      parts.push(
        `The members themselves form one rigid truss: the supports are the cause. Change a support (make a roller a pin, or turn a roller so that the reaction lines neither run parallel nor meet at one point); adding members will not help. Joints that move with the truss: ${tagList(tags)}. No member forces are given for an unstable truss.`,
      );
    } else {
      const panel = openPanelFind(pm, rank, new Set(order));
      cause = {
        kind: diag ? 'supports-and-members' : 'members',
        reason: diag ?? (degree < 0 ? `m + r < 2j: short of ${-degree}` : 'a mechanism within the members'),
        ...(panel
          ? { diagonal: { from: pm.jointIds[panel.from], to: pm.jointIds[panel.to], fromTag: pm.jointTags[panel.from], toTag: pm.jointTags[panel.to], panel: panel.ring.map((i) => pm.jointTags[i]), makesStable: panel.stable } }
          : {}),
      };
      const panelText = panel
        ? ` The open panel ${panel.ring.map((i) => pm.jointTags[i]).join('–')} has no diagonal: a member from ${pm.jointTags[panel.from]} to ${pm.jointTags[panel.to]} ${panel.stable ? 'makes the truss stable' : 'takes away one way it can move (more are needed)'}.`
        : '';
      parts.push(
        `Joints that can move without any member changing length: ${tagList(tags)}. ${diag ? 'Besides changing the supports, add' : 'Add'} a member (such as the missing diagonal of an open panel) or a support restraint there; no member forces are given for an unstable truss.${panelText}`,
      );
    }
    message = parts.join(' ');
  } else if (degree === 0) {
    kind = 'determinate';
    message = `m + r = ${m} + ${r} = ${2 * j} = 2j and the equilibrium matrix has full rank: the truss is stable and statically determinate.`;
  } else {
    kind = 'indeterminate';
    message = `m + r = ${m} + ${r} = ${m + r} > 2j = ${2 * j} and the equilibrium matrix has full rank: the truss is stable and statically indeterminate to degree ${degree}; member forces depend on member stiffness EA.`;
  }
  const conditioning = kind === 'unstable' ? null : conditioningOf(pm);
  return {
    kind,
    m,
    r,
    j,
    degree,
    rank,
    mechanismJoints,
    message,
    cause,
    conditioning,
    step: { id: 'model/determinacy', caseId: '', title: 'Stability and determinacy', kind: 'determinacy', m, r, j, degree, rank, verdict: kind },
  };
}
