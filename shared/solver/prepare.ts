import type { TrussModel } from '@shared/model/truss';
import { SolverError } from './errors';
import { loadLetterFor, symbolLoad, symbolMember, symbolReaction } from './katex';

/**
 * Internal, index-based view of a validated model. Member direction (cx, cy) runs from joint
 * `a` to joint `b`; a tension T pulls joint a along +(cx, cy) and joint b along −(cx, cy).
 */
export interface PreparedMember {
  id: string;
  tag: string;
  a: number;
  b: number;
  /** m */
  length: number;
  cx: number;
  cy: number;
  /** kN, when known (EA, or E·A). */
  EA: number | null;
  symbol: string;
}

/** One reaction component: a unit direction at a supported joint. */
export interface PreparedReaction {
  joint: number;
  support: number;
  component: 'x' | 'y' | 'n';
  dx: number;
  dy: number;
  symbol: string;
  label: string;
}

export interface PreparedSupport {
  joint: number;
  kind: 'pin' | 'roller';
  angleDeg?: number;
  /** Indices into `reactions`. */
  reactions: number[];
}

export interface PreparedCase {
  id: string;
  name: string;
  /** kN per joint, summed over the case's loads. */
  fx: Float64Array;
  fy: Float64Array;
}

export interface PreparedModel {
  model: TrussModel;
  jointIds: string[];
  jointTags: string[];
  x: Float64Array;
  y: Float64Array;
  jointIndex: Map<string, number>;
  members: PreparedMember[];
  supports: PreparedSupport[];
  reactions: PreparedReaction[];
  /** Support index per joint, −1 when none. */
  supportAt: Int32Array;
  /** Incident member indices per joint (CSR: memberStart[j]..memberStart[j+1]). */
  incidentStart: Int32Array;
  incident: Int32Array;
  cases: PreparedCase[];
  /** Largest coordinate extent, m (for tolerances). */
  extent: number;
  loadSymbolX: string[];
  loadSymbolY: string[];
}

/** Relative tolerance on lengths for "zero length" and "collinear" tests. */
export const LENGTH_TOLERANCE = 1e-9;

function assertFinite(value: unknown, what: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new SolverError(
      'non-finite-value',
      `${what} is ${String(value)}; give a finite number.`,
    );
  }
}

/**
 * Checks a model and builds the index-based view the solver works on. Throws `SolverError`
 * naming the joint, member, support, load or combination at fault.
 */
export function modelPrepare(model: TrussModel): PreparedModel {
  if (!model.joints.length || !model.members.length) {
    throw new SolverError('empty-model', 'The model has no joints or no members; add the truss geometry first.');
  }
  const jointIndex = new Map<string, number>();
  const n = model.joints.length;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  const jointIds: string[] = [];
  const jointTags: string[] = [];
  model.joints.forEach((jt, i) => {
    assertFinite(jt.x, `Joint ${jt.tag} x`);
    assertFinite(jt.y, `Joint ${jt.tag} y`);
    if (jointIndex.has(jt.id)) {
      throw new SolverError('duplicate-id', `Two joints have the id "${jt.id}"; give each joint its own id.`, [jt.id]);
    }
    jointIndex.set(jt.id, i);
    x[i] = jt.x;
    y[i] = jt.y;
    jointIds.push(jt.id);
    jointTags.push(jt.tag);
  });
  let minX = Infinity;
  let maxX = -Infinity;
  let minY = Infinity;
  let maxY = -Infinity;
  for (let i = 0; i < n; i++) {
    minX = Math.min(minX, x[i]);
    maxX = Math.max(maxX, x[i]);
    minY = Math.min(minY, y[i]);
    maxY = Math.max(maxY, y[i]);
  }
  const extent = Math.max(maxX - minX, maxY - minY, 1e-9);

  const jointOf = (id: string, what: string): number => {
    const i = jointIndex.get(id);
    if (i === undefined) {
      throw new SolverError('unknown-joint', `${what} refers to joint "${id}", which is not in the model.`, [id]);
    }
    return i;
  };

  const memberIds = new Set<string>();
  const members: PreparedMember[] = model.members.map((mb) => {
    if (memberIds.has(mb.id)) {
      throw new SolverError('duplicate-id', `Two members have the id "${mb.id}"; give each member its own id.`, [mb.id]);
    }
    memberIds.add(mb.id);
    const a = jointOf(mb.from, `Member ${mb.tag}`);
    const b = jointOf(mb.to, `Member ${mb.tag}`);
    for (const [key, v] of [['E', mb.E], ['A', mb.A], ['EA', mb.EA]] as const) {
      if (v !== undefined) {
        assertFinite(v, `Member ${mb.tag} ${key}`);
        if (v <= 0) {
          throw new SolverError('non-finite-value', `Member ${mb.tag} ${key} is ${v}; it must be positive.`, [mb.id]);
        }
      }
    }
    const dx = x[b] - x[a];
    const dy = y[b] - y[a];
    const length = Math.hypot(dx, dy);
    if (a === b || length <= LENGTH_TOLERANCE * Math.max(extent, 1)) {
      throw new SolverError(
        'zero-length-member',
        `Member ${mb.tag} joins joint ${jointTags[a]} to ${a === b ? 'itself' : `joint ${jointTags[b]} at the same point`}; remove it or merge the joints.`,
        [mb.id],
      );
    }
    const EA = mb.EA ?? (mb.E !== undefined && mb.A !== undefined ? mb.E * mb.A : null);
    return { id: mb.id, tag: mb.tag, a, b, length, cx: dx / length, cy: dy / length, EA, symbol: symbolMember(mb.tag) };
  });

  if (!model.supports.length) {
    throw new SolverError('no-supports', 'The model has no supports; add a pin and a roller (or two pins) so the truss can carry load.');
  }
  const supportAt = new Int32Array(n).fill(-1);
  const supports: PreparedSupport[] = [];
  const reactions: PreparedReaction[] = [];
  model.supports.forEach((sp, si) => {
    const j = jointOf(sp.joint, `A ${sp.kind} support`);
    if (supportAt[j] !== -1) {
      throw new SolverError(
        'duplicate-support',
        `Joint ${jointTags[j]} has two supports; keep one (a pin already restrains both directions).`,
        [sp.joint],
      );
    }
    supportAt[j] = si;
    const tag = jointTags[j];
    if (sp.kind === 'pin') {
      reactions.push({ joint: j, support: si, component: 'x', dx: 1, dy: 0, symbol: symbolReaction(tag, 'x'), label: `R_${tag},x` });
      reactions.push({ joint: j, support: si, component: 'y', dx: 0, dy: 1, symbol: symbolReaction(tag, 'y'), label: `R_${tag},y` });
      supports.push({ joint: j, kind: 'pin', reactions: [reactions.length - 2, reactions.length - 1] });
    } else {
      const angleDeg = sp.angleDeg ?? 90;
      assertFinite(angleDeg, `Roller at joint ${tag} angle`);
      const rad = (angleDeg * Math.PI) / 180;
      let dx = Math.cos(rad);
      let dy = Math.sin(rad);
      if (Math.abs(dx) < 1e-15) dx = 0;
      if (Math.abs(dy) < 1e-15) dy = 0;
      const norm = ((angleDeg % 180) + 180) % 180;
      const shown = norm === 90 ? 'y' : norm === 0 ? 'x' : 'n';
      reactions.push({
        joint: j,
        support: si,
        component: 'n',
        dx,
        dy,
        symbol: symbolReaction(tag, shown),
        label: shown === 'n' ? `R_${tag}` : `R_${tag},${shown}`,
      });
      supports.push({ joint: j, kind: 'roller', angleDeg, reactions: [reactions.length - 1] });
    }
  });

  // Incidence lists (CSR), in member order.
  const degree = new Int32Array(n + 1);
  for (const mb of members) {
    degree[mb.a + 1]++;
    degree[mb.b + 1]++;
  }
  for (let i = 0; i < n; i++) degree[i + 1] += degree[i];
  const incidentStart = Int32Array.from(degree);
  const fill = Int32Array.from(degree.subarray(0, n));
  const incident = new Int32Array(2 * members.length);
  members.forEach((mb, e) => {
    incident[fill[mb.a]++] = e;
    incident[fill[mb.b]++] = e;
  });

  const caseIds = new Set<string>();
  const cases: PreparedCase[] = model.loadCases.map((lc) => {
    if (caseIds.has(lc.id)) {
      throw new SolverError('duplicate-id', `Two load cases have the id "${lc.id}"; give each its own id.`, [lc.id]);
    }
    caseIds.add(lc.id);
    const fx = new Float64Array(n);
    const fy = new Float64Array(n);
    for (const ld of lc.loads) {
      const j = jointOf(ld.joint, `A load of case ${lc.id}`);
      assertFinite(ld.fx, `Load case ${lc.id}, load at joint ${jointTags[j]}, fx`);
      assertFinite(ld.fy, `Load case ${lc.id}, load at joint ${jointTags[j]}, fy`);
      fx[j] += ld.fx;
      fy[j] += ld.fy;
    }
    return { id: lc.id, name: lc.name, fx, fy };
  });

  for (const combo of model.combinations ?? []) {
    for (const [caseId, factor] of Object.entries(combo.factors)) {
      if (!caseIds.has(caseId)) {
        throw new SolverError(
          'unknown-load-case',
          `Combination ${combo.name} has a factor for load case "${caseId}", which is not in the model; add the case or remove the factor.`,
          [caseId],
        );
      }
      assertFinite(factor, `Combination ${combo.name}, factor on ${caseId}`);
    }
  }

  const loadLetter = loadLetterFor(jointTags, model.members.map((m) => m.tag));
  return {
    model,
    jointIds,
    jointTags,
    x,
    y,
    jointIndex,
    members,
    supports,
    reactions,
    supportAt,
    incidentStart,
    incident,
    cases,
    extent,
    loadSymbolX: jointTags.map((t) => symbolLoad(t, 'x', loadLetter)),
    loadSymbolY: jointTags.map((t) => symbolLoad(t, 'y', loadLetter)),
  };
}
