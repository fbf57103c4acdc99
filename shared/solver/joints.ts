import { SolverError } from './errors';
import type { PreparedCase, PreparedModel } from './prepare';
import { sparseEliminate, type SparseRow } from './sparse';
import { stepIdPart } from './step-id';
import type {
  EquilibriumEquation,
  ForceRef,
  ForceSense,
  ForceTerm,
  JointForce,
  JointStep,
  ReactionStep,
  SimultaneousStep,
  SolvedForce,
  ZeroForceFinding,
} from './types';

/** |det| of a joint's 2 × 2 system below which its two unknowns count as collinear. */
const JOINT_DET_TOLERANCE = 1e-9;

/** Forces within this fraction of the largest load (or 1e-12 kN) are reported as zero. */
export function forceSense(value: number, scale: number): ForceSense {
  const tol = Math.max(scale, 1) * 1e-9;
  if (Math.abs(value) <= tol) return '0';
  return value > 0 ? 'T' : 'C';
}

export interface JointSolveResult {
  /** kN per member, tension positive. */
  N: Float64Array;
  /** kN per reaction component, along its direction. */
  R: Float64Array;
  reactionSteps: ReactionStep[];
  reactionNote?: string;
  jointSteps: JointStep[];
  simultaneousSteps: SimultaneousStep[];
}

function memberRef(pm: PreparedModel, e: number): ForceRef {
  return { type: 'member', member: pm.members[e].id };
}

function reactionRef(pm: PreparedModel, k: number): ForceRef {
  const rc = pm.reactions[k];
  return { type: 'reaction', joint: pm.jointIds[rc.joint], component: rc.component };
}

/**
 * Support reactions from the three equations of global equilibrium (possible when there are
 * exactly three reaction components): ΣM about a pin (or the first support), then ΣFx, ΣFy.
 * Each equation is recorded with the loads substituted.
 */
function reactionsGlobal(pm: PreparedModel, lc: PreparedCase, R: Float64Array, knownR: Uint8Array): ReactionStep[] {
  const casePart = `case-${stepIdPart(lc.id)}`;
  const n = pm.jointIds.length;
  const pin = pm.supports.find((s) => s.kind === 'pin');
  const o = pin ? pin.joint : pm.supports[0].joint;
  const ox = pm.x[o];
  const oy = pm.y[o];
  // Coefficient rows for the three equations over the three reactions, plus load constants.
  const coef = [
    pm.reactions.map((rc) => (pm.x[rc.joint] - ox) * rc.dy - (pm.y[rc.joint] - oy) * rc.dx),
    pm.reactions.map((rc) => rc.dx),
    pm.reactions.map((rc) => rc.dy),
  ];
  const loadTerms: ForceTerm[][] = [[], [], []];
  const konst = [0, 0, 0];
  for (let j = 0; j < n; j++) {
    const fx = lc.fx[j];
    const fy = lc.fy[j];
    if (fx !== 0) {
      const arm = -(pm.y[j] - oy);
      if (arm !== 0) loadTerms[0].push(loadTerm(pm, j, 'x', arm, fx));
      loadTerms[1].push(loadTerm(pm, j, 'x', 1, fx));
      konst[0] += arm * fx;
      konst[1] += fx;
    }
    if (fy !== 0) {
      const arm = pm.x[j] - ox;
      if (arm !== 0) loadTerms[0].push(loadTerm(pm, j, 'y', arm, fy));
      loadTerms[2].push(loadTerm(pm, j, 'y', 1, fy));
      konst[0] += arm * fy;
      konst[2] += fy;
    }
  }
  // Solve the 3 × 3 system (Gaussian elimination with partial pivoting).
  const a = coef.map((row, i) => [...row, -konst[i]]);
  for (let c = 0; c < 3; c++) {
    let best = c;
    for (let r = c + 1; r < 3; r++) if (Math.abs(a[r][c]) > Math.abs(a[best][c])) best = r;
    if (Math.abs(a[best][c]) < 1e-12) {
      throw new SolverError('singular-system', 'The three support reactions cannot be found from global equilibrium (their lines are parallel or meet at one point); check the supports.');
    }
    [a[c], a[best]] = [a[best], a[c]];
    for (let r = 0; r < 3; r++) {
      if (r === c) continue;
      const f = a[r][c] / a[c][c];
      for (let k = c; k < 4; k++) a[r][k] -= f * a[c][k];
    }
  }
  const values = [0, 1, 2].map((c) => a[c][3] / a[c][c]);

  // Record in the order an engineer would: each equation solves the reactions that are its
  // only unknowns; whatever is left is solved together with the last equation.
  const kinds: EquilibriumEquation['kind'][] = ['sum-m', 'sum-fx', 'sum-fy'];
  const steps: ReactionStep[] = [];
  const solvedNow = new Uint8Array(3);
  kinds.forEach((kind, i) => {
    const terms: ForceTerm[] = [];
    const unknownHere: number[] = [];
    pm.reactions.forEach((rc, k) => {
      if (Math.abs(coef[i][k]) < 1e-12) return;
      terms.push({ ref: reactionRef(pm, k), symbol: rc.symbol, label: rc.label, coefficient: coef[i][k], value: solvedNow[k] ? R[k] : null });
      if (!solvedNow[k]) unknownHere.push(k);
    });
    terms.push(...loadTerms[i]);
    const toSolve = i === 2 ? [0, 1, 2].filter((k) => !solvedNow[k]) : unknownHere.length === 1 ? unknownHere : [];
    const solves: SolvedForce[] = toSolve.map((k) => {
      R[k] = values[k];
      knownR[k] = 1;
      solvedNow[k] = 1;
      const rc = pm.reactions[k];
      return { ref: reactionRef(pm, k), symbol: rc.symbol, label: rc.label, value: values[k] };
    });
    const about = kind === 'sum-m' ? { joint: pm.jointIds[o], tag: pm.jointTags[o], x: ox, y: oy } : undefined;
    steps.push({
      id: `${casePart}/reaction-${kind}${about ? `-${stepIdPart(about.joint)}` : ''}`,
      caseId: lc.id,
      title: kind === 'sum-m' ? `Moments about joint ${pm.jointTags[o]}` : kind === 'sum-fx' ? 'Horizontal equilibrium' : 'Vertical equilibrium',
      kind: 'reaction',
      equation: { kind, ...(about ? { about } : {}), terms },
      solves,
    });
  });
  return steps;
}

function loadTerm(pm: PreparedModel, j: number, component: 'x' | 'y', coefficient: number, value: number): ForceTerm {
  return {
    ref: { type: 'load', joint: pm.jointIds[j], component },
    symbol: component === 'x' ? pm.loadSymbolX[j] : pm.loadSymbolY[j],
    label: `load at ${pm.jointTags[j]} (${component})`,
    coefficient,
    value,
  };
}

/**
 * Method of joints for one load case of a stable, statically determinate truss. Zero-force
 * members are taken as known. Reactions come first from global equilibrium when there are
 * three of them; otherwise they are unknowns at their joints. Joints are then taken in an order
 * in which each has at most two unknowns; when none is left, the remaining unknowns are solved
 * simultaneously from the equilibrium of the joints that hold them.
 */
export function jointsSolve(pm: PreparedModel, lc: PreparedCase, zeroForce: ZeroForceFinding[], scale: number): JointSolveResult {
  const n = pm.jointIds.length;
  const m = pm.members.length;
  const r = pm.reactions.length;
  const casePart = `case-${stepIdPart(lc.id)}`;
  const N = new Float64Array(m);
  const R = new Float64Array(r);
  const knownM = new Uint8Array(m);
  const knownR = new Uint8Array(r);
  const fromM: string[] = new Array(m);
  const fromR: string[] = new Array(r);

  const memberIndex = new Map(pm.members.map((mb, e) => [mb.id, e]));
  for (const z of zeroForce) {
    const e = memberIndex.get(z.member) as number;
    knownM[e] = 1;
    N[e] = 0;
    fromM[e] = z.id;
  }

  let reactionSteps: ReactionStep[] = [];
  let reactionNote: string | undefined;
  if (r === 3) {
    reactionSteps = reactionsGlobal(pm, lc, R, knownR);
    for (const st of reactionSteps) for (const s of st.solves) {
      const k = pm.reactions.findIndex((rc) => rc.symbol === s.symbol);
      fromR[k] = st.id;
    }
  } else {
    reactionNote = `With ${r} reaction components the three equations of global equilibrium cannot give them all; the reactions are found with the member forces at the joints.`;
  }

  const reactionsAt = (j: number): number[] => (pm.supportAt[j] >= 0 ? pm.supports[pm.supportAt[j]].reactions : []);
  const count = new Int32Array(n);
  for (let j = 0; j < n; j++) {
    let c = 0;
    for (let k = pm.incidentStart[j]; k < pm.incidentStart[j + 1]; k++) if (!knownM[pm.incident[k]]) c++;
    for (const k of reactionsAt(j)) if (!knownR[k]) c++;
    count[j] = c;
  }

  const queue: number[] = [];
  const inQueue = new Uint8Array(n);
  for (let j = 0; j < n; j++) if (count[j] > 0 && count[j] <= 2) {
    queue.push(j);
    inQueue[j] = 1;
  }
  const jointSteps: JointStep[] = [];
  const memberForceOn = (e: number, j: number, value: number | null): JointForce => {
    const mb = pm.members[e];
    const sgn = mb.a === j ? 1 : -1;
    const f: JointForce = { ref: memberRef(pm, e), symbol: mb.symbol, label: mb.tag, cx: sgn * mb.cx, cy: sgn * mb.cy, value };
    if (value !== null && fromM[e]) f.from = fromM[e];
    return f;
  };
  const reactionForce = (k: number, value: number | null): JointForce => {
    const rc = pm.reactions[k];
    const f: JointForce = { ref: reactionRef(pm, k), symbol: rc.symbol, label: rc.label, cx: rc.dx, cy: rc.dy, value };
    if (value !== null && fromR[k]) f.from = fromR[k];
    return f;
  };
  const loadForces = (j: number): JointForce[] => {
    const out: JointForce[] = [];
    if (lc.fx[j] !== 0) out.push({ ref: { type: 'load', joint: pm.jointIds[j], component: 'x' }, symbol: pm.loadSymbolX[j], label: `load at ${pm.jointTags[j]} (x)`, cx: 1, cy: 0, value: lc.fx[j] });
    if (lc.fy[j] !== 0) out.push({ ref: { type: 'load', joint: pm.jointIds[j], component: 'y' }, symbol: pm.loadSymbolY[j], label: `load at ${pm.jointTags[j]} (y)`, cx: 0, cy: 1, value: lc.fy[j] });
    return out;
  };
  const equationsOf = (known: JointForce[], unknowns: JointForce[]): [EquilibriumEquation, EquilibriumEquation] => {
    const fx: ForceTerm[] = [];
    const fy: ForceTerm[] = [];
    for (const list of [unknowns, known]) {
      for (const f of list) {
        if (f.cx !== 0) fx.push({ ref: f.ref, symbol: f.symbol, label: f.label, coefficient: f.cx, value: f.value });
        if (f.cy !== 0) fy.push({ ref: f.ref, symbol: f.symbol, label: f.label, coefficient: f.cy, value: f.value });
      }
    }
    return [
      { kind: 'sum-fx', terms: fx },
      { kind: 'sum-fy', terms: fy },
    ];
  };
  const settle = (j: number) => {
    count[j]--;
    if (count[j] > 0 && count[j] <= 2 && !inQueue[j]) {
      queue.push(j);
      inQueue[j] = 1;
    }
  };

  for (let qi = 0; qi < queue.length; qi++) {
    const j = queue[qi];
    inQueue[j] = 0;
    if (count[j] === 0 || count[j] > 2) continue;
    const known: JointForce[] = loadForces(j);
    const unknownM: number[] = [];
    const unknownR: number[] = [];
    for (let k = pm.incidentStart[j]; k < pm.incidentStart[j + 1]; k++) {
      const e = pm.incident[k];
      if (knownM[e]) known.push(memberForceOn(e, j, N[e]));
      else unknownM.push(e);
    }
    for (const k of reactionsAt(j)) {
      if (knownR[k]) known.push(reactionForce(k, R[k]));
      else unknownR.push(k);
    }
    const unknowns = [...unknownM.map((e) => memberForceOn(e, j, null)), ...unknownR.map((k) => reactionForce(k, null))];
    let kx = 0;
    let ky = 0;
    for (const f of known) {
      kx += f.cx * (f.value as number);
      ky += f.cy * (f.value as number);
    }
    let vals: number[];
    let solvedFrom: JointStep['solvedFrom'] = 'both';
    if (unknowns.length === 2) {
      const [u, v] = unknowns;
      const det = u.cx * v.cy - v.cx * u.cy;
      if (Math.abs(det) < JOINT_DET_TOLERANCE) continue; // collinear unknowns: wait for more
      vals = [(-kx * v.cy + ky * v.cx) / det, (-ky * u.cx + kx * u.cy) / det];
    } else {
      const [u] = unknowns;
      if (Math.abs(u.cx) >= Math.abs(u.cy)) {
        vals = [-kx / u.cx];
        solvedFrom = 'sum-fx';
      } else {
        vals = [-ky / u.cy];
        solvedFrom = 'sum-fy';
      }
    }
    const id = `${casePart}/joint-${stepIdPart(pm.jointIds[j])}`;
    const solution: SolvedForce[] = [];
    unknowns.forEach((u, i) => {
      const v = vals[i];
      if (i < unknownM.length) {
        const e = unknownM[i];
        N[e] = v;
        knownM[e] = 1;
        fromM[e] = id;
        solution.push({ ref: u.ref, symbol: u.symbol, label: u.label, value: v, sense: forceSense(v, scale) });
        const mb = pm.members[e];
        settle(mb.a === j ? mb.b : mb.a);
        count[j]--;
      } else {
        const k = unknownR[i - unknownM.length];
        R[k] = v;
        knownR[k] = 1;
        fromR[k] = id;
        solution.push({ ref: u.ref, symbol: u.symbol, label: u.label, value: v });
        count[j]--;
      }
    });
    jointSteps.push({
      id,
      caseId: lc.id,
      title: `Joint ${pm.jointTags[j]}`,
      kind: 'joint',
      joint: pm.jointIds[j],
      jointTag: pm.jointTags[j],
      x: pm.x[j],
      y: pm.y[j],
      known,
      unknowns,
      equations: equationsOf(known, unknowns),
      solvedFrom,
      solution,
    });
  }

  const simultaneousSteps: SimultaneousStep[] = [];
  const restM: number[] = [];
  const restR: number[] = [];
  for (let e = 0; e < m; e++) if (!knownM[e]) restM.push(e);
  for (let k = 0; k < r; k++) if (!knownR[k]) restR.push(k);
  if (restM.length || restR.length) {
    const col = new Map<string, number>();
    restM.forEach((e, i) => col.set(`m${e}`, i));
    restR.forEach((k, i) => col.set(`r${k}`, restM.length + i));
    const joints: number[] = [];
    for (let j = 0; j < n; j++) if (count[j] > 0) joints.push(j);
    const rows: SparseRow[] = [];
    const rhs: number[] = [];
    const equations: EquilibriumEquation[] = [];
    for (const j of joints) {
      const known: JointForce[] = loadForces(j);
      const unknowns: JointForce[] = [];
      const rx: SparseRow = { cols: [], vals: [] };
      const ry: SparseRow = { cols: [], vals: [] };
      for (let k = pm.incidentStart[j]; k < pm.incidentStart[j + 1]; k++) {
        const e = pm.incident[k];
        if (knownM[e]) known.push(memberForceOn(e, j, N[e]));
        else {
          const f = memberForceOn(e, j, null);
          unknowns.push(f);
          const c = col.get(`m${e}`) as number;
          rx.cols.push(c);
          rx.vals.push(f.cx);
          ry.cols.push(c);
          ry.vals.push(f.cy);
        }
      }
      for (const k of reactionsAt(j)) {
        if (knownR[k]) known.push(reactionForce(k, R[k]));
        else {
          const f = reactionForce(k, null);
          unknowns.push(f);
          const c = col.get(`r${k}`) as number;
          rx.cols.push(c);
          rx.vals.push(f.cx);
          ry.cols.push(c);
          ry.vals.push(f.cy);
        }
      }
      let kx = 0;
      let ky = 0;
      for (const f of known) {
        kx += f.cx * (f.value as number);
        ky += f.cy * (f.value as number);
      }
      rows.push(rx, ry);
      rhs.push(-kx, -ky);
      const [ex, ey] = equationsOf(known, unknowns);
      equations.push(
        { ...ex, about: { joint: pm.jointIds[j], tag: pm.jointTags[j], x: pm.x[j], y: pm.y[j] } },
        { ...ey, about: { joint: pm.jointIds[j], tag: pm.jointTags[j], x: pm.x[j], y: pm.y[j] } },
      );
    }
    const nu = restM.length + restR.length;
    const elim = sparseEliminate(nu, rows, { rhs: Float64Array.from(rhs) });
    if (elim.rank < nu) {
      throw new SolverError('singular-system', `The remaining ${nu} unknown forces at joints ${joints.map((j) => pm.jointTags[j]).join(', ')} cannot be found from joint equilibrium; the truss may be unstable there.`, joints.map((j) => pm.jointIds[j]));
    }
    const x = elim.solution as Float64Array;
    const id = `${casePart}/simultaneous-${simultaneousSteps.length + 1}`;
    const solution: SolvedForce[] = [];
    restM.forEach((e, i) => {
      N[e] = x[i];
      knownM[e] = 1;
      fromM[e] = id;
      const mb = pm.members[e];
      solution.push({ ref: memberRef(pm, e), symbol: mb.symbol, label: mb.tag, value: x[i], sense: forceSense(x[i], scale) });
    });
    restR.forEach((k, i) => {
      const v = x[restM.length + i];
      R[k] = v;
      knownR[k] = 1;
      fromR[k] = id;
      const rc = pm.reactions[k];
      solution.push({ ref: reactionRef(pm, k), symbol: rc.symbol, label: rc.label, value: v });
    });
    const tags = joints.map((j) => pm.jointTags[j]);
    simultaneousSteps.push({
      id,
      caseId: lc.id,
      title: `Simultaneous solution at joints ${tags.length > 12 ? `${tags.slice(0, 12).join(', ')}, …` : tags.join(', ')}`,
      kind: 'simultaneous',
      reason: `No joint is left with two or fewer unknown forces (joints ${tags.length > 12 ? `${tags.slice(0, 12).join(', ')} and ${tags.length - 12} more` : tags.join(', ')} each have three or more), so the remaining ${nu} unknowns are solved together from the equilibrium of those joints.`,
      joints: joints.map((j) => ({ joint: pm.jointIds[j], tag: pm.jointTags[j] })),
      unknowns: [
        ...restM.map((e) => ({ ref: memberRef(pm, e), symbol: pm.members[e].symbol, label: pm.members[e].tag })),
        ...restR.map((k) => ({ ref: reactionRef(pm, k), symbol: pm.reactions[k].symbol, label: pm.reactions[k].label })),
      ],
      equations,
      solution,
    });
  }

  return { N, R, reactionSteps, ...(reactionNote ? { reactionNote } : {}), jointSteps, simultaneousSteps };
}
