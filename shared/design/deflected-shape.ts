import type { JointLoad, TrussModel } from '@shared/model/truss';
import { modelPrepare } from '@shared/solver/prepare';
import { stiffnessSolve } from '@shared/solver/stiffness';
import type { StiffnessDisplacementsStep, TrussAnalysis } from '@shared/solver/types';

/** Above this many joints the shape is not worked out (a dense stiffness solve grows as the cube). */
export const SHAPE_JOINT_LIMIT = 400;

export interface DeflectedShape {
  /** The service combination (or load case) whose loads deflect the truss. */
  combination: string;
  /** mm, +x right, +y up, every joint. */
  joints: { joint: string; tag: string; ux: number; uy: number }[];
  /** The largest movement of any joint, mm, and where. */
  maxMm: number;
  maxTag: string;
  /** Drawing exaggeration: displacements are drawn this many times their size. */
  scale: number;
}

/**
 * A round exaggeration (1, 2 or 5 × a power of ten) that draws the largest movement at about
 * `share` of the span, never more; 1 when nothing moves. Common practice, no source.
 */
export function shapeScale(spanMm: number, maxMm: number, share = 0.06): number {
  if (!(maxMm > 0) || !(spanMm > 0)) return 1;
  const raw = (share * spanMm) / maxMm;
  if (raw <= 1) return 1;
  const p = 10 ** Math.floor(Math.log10(raw));
  for (const m of [5, 2, 1]) if (m * p <= raw) return m * p;
  return p;
}

/**
 * The displacement of every joint under each service combination, by the direct stiffness
 * method with EA = A·E of each member's design section (so the shape agrees with the
 * unit-load deflections at the chosen joints). Null when the truss is over
 * {@link SHAPE_JOINT_LIMIT} joints or unstable.
 */
export function deflectedShapes(
  model: TrussModel,
  analysis: TrussAnalysis,
  combinations: string[],
  props: (memberId: string) => { A: number; E: number } | null,
): DeflectedShape[] | null {
  if (model.joints.length > SHAPE_JOINT_LIMIT || analysis.classification.kind === 'unstable') return null;
  const members = model.members.map((m) => {
    const p = props(m.id);
    // mm² × MPa = N; /1000 → kN.
    return p ? { ...m, EA: (p.A * p.E) / 1000 } : m;
  });
  if (members.some((m) => !(typeof m.EA === 'number' && m.EA > 0))) return null;
  const caseById = new Map(model.loadCases.map((c) => [c.id, c]));
  const factorsOf = (name: string): Record<string, number> | null => {
    const combo = analysis.combinations.find((c) => c.name === name);
    if (combo) return combo.factors;
    return caseById.has(name) ? { [name]: 1 } : null;
  };
  const xs = model.supports.map((s) => model.joints.find((j) => j.id === s.joint)?.x ?? 0);
  const spanMm = (Math.max(...xs) - Math.min(...xs)) * 1000;
  const out: DeflectedShape[] = [];
  for (const name of combinations) {
    const factors = factorsOf(name);
    if (!factors) continue;
    const loads: JointLoad[] = [];
    for (const [caseId, factor] of Object.entries(factors)) {
      for (const l of caseById.get(caseId)?.loads ?? []) loads.push({ joint: l.joint, fx: factor * l.fx, fy: factor * l.fy });
    }
    const pm = modelPrepare({ ...model, members, loadCases: [{ id: 'service', name, category: 'other', loads }], combinations: [] });
    const st = stiffnessSolve(pm, pm.cases[0], 1);
    const step = st.steps.find((s): s is StiffnessDisplacementsStep => s.kind === 'stiffness-displacements');
    if (!step) continue;
    const joints = step.displacements.map((d) => ({ joint: d.joint, tag: d.tag, ux: d.ux * 1000, uy: d.uy * 1000 }));
    let maxMm = 0;
    let maxTag = joints[0]?.tag ?? '';
    for (const j of joints) {
      const m = Math.hypot(j.ux, j.uy);
      if (m > maxMm) {
        maxMm = m;
        maxTag = j.tag;
      }
    }
    out.push({ combination: name, joints, maxMm, maxTag, scale: shapeScale(spanMm, maxMm) });
  }
  return out;
}
