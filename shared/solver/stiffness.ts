import { SolverError } from './errors';
import type { PreparedCase, PreparedModel } from './prepare';
import { stepIdPart } from './step-id';
import type { StiffnessStep } from './types';
import { forceSense } from './joints';

/** Largest number of free degrees of freedom whose stiffness matrix is printed in the steps. */
export const STIFFNESS_PRINT_LIMIT = 12;

/** Members without EA (nor E and A): the direct stiffness method cannot run without them. */
export function stiffnessMissing(pm: PreparedModel): string[] {
  return pm.members.filter((mb) => mb.EA === null).map((mb) => mb.id);
}

interface Dof {
  joint: number;
  dx: number;
  dy: number;
  label: string;
}

/** The free degrees of freedom: two per free joint, one along the rolling line at a roller. */
function dofsBuild(pm: PreparedModel): { dofs: Dof[]; first: Int32Array; count: Int32Array } {
  const n = pm.jointIds.length;
  const dofs: Dof[] = [];
  const first = new Int32Array(n);
  const count = new Int32Array(n);
  for (let j = 0; j < n; j++) {
    first[j] = dofs.length;
    const s = pm.supportAt[j];
    const tag = pm.jointTags[j];
    if (s < 0) {
      dofs.push({ joint: j, dx: 1, dy: 0, label: `u_${tag}` }, { joint: j, dx: 0, dy: 1, label: `v_${tag}` });
    } else if (pm.supports[s].kind === 'roller') {
      const rc = pm.reactions[pm.supports[s].reactions[0]];
      dofs.push({ joint: j, dx: -rc.dy, dy: rc.dx, label: `t_${tag}` });
    }
    count[j] = dofs.length - first[j];
  }
  return { dofs, first, count };
}

/** Solves K·u = P for symmetric positive definite K (dense Cholesky, in place). */
function choleskySolve(K: Float64Array, n: number, P: Float64Array): Float64Array {
  for (let j = 0; j < n; j++) {
    let d = K[j * n + j];
    for (let k = 0; k < j; k++) d -= K[j * n + k] * K[j * n + k];
    if (!(d > 0)) throw new SolverError('singular-system', 'The stiffness matrix is not positive definite; the truss is unstable or a member has no stiffness.');
    const ljj = Math.sqrt(d);
    K[j * n + j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = K[i * n + j];
      for (let k = 0; k < j; k++) s -= K[i * n + k] * K[j * n + k];
      K[i * n + j] = s / ljj;
    }
  }
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = P[i];
    for (let k = 0; k < i; k++) s -= K[i * n + k] * y[k];
    y[i] = s / K[i * n + i];
  }
  const u = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = y[i];
    for (let k = i + 1; k < n; k++) s -= K[k * n + i] * u[k];
    u[i] = s / K[i * n + i];
  }
  return u;
}

export interface StiffnessSolveResult {
  N: Float64Array;
  R: Float64Array;
  steps: StiffnessStep[];
}

/**
 * Direct stiffness method for one load case: member stiffness k = EA/L, assembly over the free
 * degrees of freedom, K·u = P, member forces N = k·(elongation) with elongation = û·(u_b − u_a),
 * and reactions from the equilibrium of each supported joint. Small displacements, linear
 * elastic members. Throws `missing-stiffness` naming members without EA.
 */
export function stiffnessSolve(pm: PreparedModel, lc: PreparedCase, scale: number): StiffnessSolveResult {
  const missing = stiffnessMissing(pm);
  if (missing.length) {
    const tags = missing.map((id) => pm.members.find((mb) => mb.id === id)?.tag ?? id);
    throw new SolverError(
      'missing-stiffness',
      `The truss is statically indeterminate, so its member forces depend on member stiffness; member${tags.length > 1 ? 's' : ''} ${tags.slice(0, 20).join(', ')}${tags.length > 20 ? ` and ${tags.length - 20} more` : ''} ${tags.length > 1 ? 'have' : 'has'} no E and A (or EA). Give E and A for every member.`,
      missing,
    );
  }
  const casePart = `case-${stepIdPart(lc.id)}`;
  const { dofs, first, count } = dofsBuild(pm);
  const nd = dofs.length;
  const K = new Float64Array(nd * nd);
  const P = new Float64Array(nd);
  dofs.forEach((f, q) => {
    P[q] = f.dx * lc.fx[f.joint] + f.dy * lc.fy[f.joint];
  });
  const kOf = pm.members.map((mb) => (mb.EA as number) / mb.length);
  // B row of a member: elongation = Σ B_q u_q.
  const bRow = (e: number): [number[], number[]] => {
    const mb = pm.members[e];
    const idx: number[] = [];
    const val: number[] = [];
    for (const [j, sgn] of [[mb.a, -1], [mb.b, 1]] as const) {
      for (let q = first[j]; q < first[j] + count[j]; q++) {
        idx.push(q);
        val.push(sgn * (mb.cx * dofs[q].dx + mb.cy * dofs[q].dy));
      }
    }
    return [idx, val];
  };
  const bRows = pm.members.map((_, e) => bRow(e));
  bRows.forEach(([idx, val], e) => {
    const k = kOf[e];
    for (let s = 0; s < idx.length; s++) for (let t = 0; t < idx.length; t++) K[idx[s] * nd + idx[t]] += k * val[s] * val[t];
  });
  const matrix = nd <= STIFFNESS_PRINT_LIMIT ? Array.from({ length: nd }, (_, i) => Array.from(K.subarray(i * nd, (i + 1) * nd))) : null;
  const u = choleskySolve(K, nd, P);
  const N = new Float64Array(pm.members.length);
  const elong = new Float64Array(pm.members.length);
  bRows.forEach(([idx, val], e) => {
    let d = 0;
    for (let s = 0; s < idx.length; s++) d += val[s] * u[idx[s]];
    elong[e] = d;
    N[e] = kOf[e] * d;
  });
  // Reactions: minus the resultant of loads and member forces at each supported joint.
  const R = new Float64Array(pm.reactions.length);
  for (const sp of pm.supports) {
    const j = sp.joint;
    let sx = lc.fx[j];
    let sy = lc.fy[j];
    for (let k = pm.incidentStart[j]; k < pm.incidentStart[j + 1]; k++) {
      const e = pm.incident[k];
      const mb = pm.members[e];
      const sgn = mb.a === j ? 1 : -1;
      sx += sgn * N[e] * mb.cx;
      sy += sgn * N[e] * mb.cy;
    }
    for (const k of sp.reactions) {
      const rc = pm.reactions[k];
      R[k] = -(sx * rc.dx + sy * rc.dy);
    }
  }
  const ux = new Float64Array(pm.jointIds.length);
  const uy = new Float64Array(pm.jointIds.length);
  dofs.forEach((f, q) => {
    ux[f.joint] += f.dx * u[q];
    uy[f.joint] += f.dy * u[q];
  });
  const steps: StiffnessStep[] = [
    {
      id: `${casePart}/stiffness-members`,
      caseId: lc.id,
      title: 'Member stiffness',
      kind: 'stiffness-members',
      rows: pm.members.map((mb, e) => ({ member: mb.id, tag: mb.tag, length: mb.length, EA: mb.EA as number, c: mb.cx, s: mb.cy, k: kOf[e] })),
    },
    {
      id: `${casePart}/stiffness-assembly`,
      caseId: lc.id,
      title: 'Assembled stiffness matrix',
      kind: 'stiffness-assembly',
      dofs: dofs.map((f) => ({ joint: pm.jointIds[f.joint], tag: pm.jointTags[f.joint], dx: f.dx, dy: f.dy, label: f.label })),
      matrix,
      loads: Array.from(P),
      ...(matrix ? {} : { note: `${nd} free degrees of freedom: the matrix is assembled and solved but not printed.` }),
    },
    {
      id: `${casePart}/stiffness-displacements`,
      caseId: lc.id,
      title: 'Joint displacements',
      kind: 'stiffness-displacements',
      displacements: pm.jointIds.map((id, j) => ({ joint: id, tag: pm.jointTags[j], ux: ux[j], uy: uy[j] })),
    },
    {
      id: `${casePart}/stiffness-forces`,
      caseId: lc.id,
      title: 'Member forces',
      kind: 'stiffness-forces',
      rows: pm.members.map((mb, e) => ({ member: mb.id, tag: mb.tag, k: kOf[e], elongation: elong[e], force: N[e], sense: forceSense(N[e], scale) })),
    },
  ];
  return { N, R, steps };
}
