import type { TrussModel } from '@shared/model/truss';
import { trussSolve } from '@shared/solver/solve';
import type { TrussAnalysis } from '@shared/solver/types';
import { DesignError } from './errors';
import { num } from './steps';

/** Span/deflection limits offered in the app: common practice, no source (the engineer sets the one that applies). */
export const COMMON_DEFLECTION_LIMITS = [
  { limit: 180, note: 'common practice, no source: roof members without a ceiling' },
  { limit: 240, note: 'common practice, no source: roof members with a flexible ceiling, total load' },
  { limit: 360, note: 'common practice, no source: floors, or ceilings that crack, live load' },
];

export interface DeflectionRow {
  member: string;
  tag: string;
  /** Member force from a unit load (kN/kN). */
  n: number;
  /** Member force from the service combination, kN. */
  N: number;
  /** mm */
  L: number;
  /** mm² */
  A: number;
  /** MPa */
  E: number;
  /** n·N·L/(A·E), mm. */
  term: number;
}

export interface DeflectionResult {
  joint: string;
  tag: string;
  at: [number, number];
  combination: string;
  /** mm, +x right, +y up (unit-load method). */
  dx: number;
  dy: number;
  /** Span between the outermost supports, mm, and the span/deflection limit. */
  span: number;
  limit: number;
  /** Allowed deflection span/limit, mm. */
  allowed: number;
  /** |dy| / allowed. */
  ratio: number;
  pass: boolean;
  /** Tables for the unit load along x and along y. */
  tableX: DeflectionRow[];
  tableY: DeflectionRow[];
  formula: string;
}

export interface DeflectionRequest {
  joints: string[];
  combinations: string[];
  /** Span/deflection, e.g. 240. */
  limit: number;
}

/**
 * Joint deflections by the unit-load (virtual work) method, δ = Σ n·N·L/(A·E): N from the
 * service combination, n from a unit load at the joint along x and along y (solved by the same
 * solver, so a determinate truss gets them by the method of joints). A (mm²) and E (MPa) per
 * member come from `props`. Temperature and lack-of-fit terms are not included.
 */
export function deflectionCheck(
  model: TrussModel,
  analysis: TrussAnalysis,
  req: DeflectionRequest,
  props: (memberId: string) => { A: number; E: number } | null,
): DeflectionResult[] {
  if (!(Number.isFinite(req.limit) && req.limit > 0)) throw new DesignError('bad-deflection', `The span/deflection limit must be a positive number such as 240 (it is ${req.limit}).`);
  const jointById = new Map(model.joints.map((j) => [j.id, j]));
  for (const id of req.joints) if (!jointById.has(id)) throw new DesignError('unknown-joint', `The deflection joint ${id} is not in the truss.`);
  const sources = new Map<string, Record<string, number>>();
  for (const c of analysis.cases) sources.set(c.caseId, c.forces);
  for (const c of analysis.combinations) sources.set(c.name, c.forces);
  for (const name of req.combinations) {
    if (!sources.has(name)) throw new DesignError('unknown-combination', `The service combination "${name}" is neither a combination nor a load case of the job; use one of ${[...sources.keys()].join(', ')}.`);
  }
  const pa = model.members.map((m) => {
    const p = props(m.id);
    if (!p || !(p.A > 0) || !(p.E > 0)) throw new DesignError('bad-deflection', `Member ${m.tag} has no area and modulus for the deflection; give its section and material (or A and E).`);
    const a = jointById.get(m.from)!;
    const b = jointById.get(m.to)!;
    return { ...p, L: Math.hypot(b.x - a.x, b.y - a.y) * 1000 };
  });
  const unit = trussSolve({
    ...model,
    loadCases: req.joints.flatMap((j) => [
      { id: `unit-x-${j}`, name: `unit x at ${j}`, category: 'other' as const, loads: [{ joint: j, fx: 1, fy: 0 }] },
      { id: `unit-y-${j}`, name: `unit y at ${j}`, category: 'other' as const, loads: [{ joint: j, fx: 0, fy: 1 }] },
    ]),
    combinations: [],
  });
  const unitForces = new Map(unit.cases.map((c) => [c.caseId, c.forces]));
  const supportX = model.supports.map((s) => jointById.get(s.joint)!.x);
  const span = (Math.max(...supportX) - Math.min(...supportX)) * 1000;
  const table = (n: Record<string, number>, N: Record<string, number>): DeflectionRow[] =>
    model.members.map((m, e) => {
      const { A, E, L } = pa[e];
      const nn = n[m.id] ?? 0;
      const NN = N[m.id] ?? 0;
      return { member: m.id, tag: m.tag, n: nn, N: NN, L, A, E, term: (nn * NN * 1000 * L) / (A * E) };
    });
  const out: DeflectionResult[] = [];
  for (const jid of req.joints) {
    const j = jointById.get(jid)!;
    for (const name of req.combinations) {
      const N = sources.get(name)!;
      const tableX = table(unitForces.get(`unit-x-${jid}`)!, N);
      const tableY = table(unitForces.get(`unit-y-${jid}`)!, N);
      const dx = tableX.reduce((s, r) => s + r.term, 0);
      const dy = tableY.reduce((s, r) => s + r.term, 0);
      const allowed = span / req.limit;
      const ratio = allowed > 0 ? Math.abs(dy) / allowed : Infinity;
      out.push({
        joint: jid,
        tag: j.tag,
        at: [j.x, j.y],
        combination: name,
        dx,
        dy,
        span,
        limit: req.limit,
        allowed,
        ratio,
        pass: ratio <= 1,
        tableX,
        tableY,
        formula: `δ = Σ n·N·L/(A·E) (unit-load method); limit span/${num(req.limit)} = ${num(span)}/${num(req.limit)} = ${num(allowed)} mm`,
      });
    }
  }
  return out;
}
