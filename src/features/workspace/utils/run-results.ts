import type { MemberGroup, TrussModel } from '@shared/model/truss';
import type { EnvelopeRow, SolverStep, SupportReaction, TrussAnalysis } from '@shared/solver';

/** What the results view shows: one load case, one combination, or the envelope. */
export type ResultSource = { kind: 'case'; caseId: string } | { kind: 'combination'; name: string } | { kind: 'envelope' };

export function resultSourceKey(s: ResultSource): string {
  return s.kind === 'case' ? `case:${s.caseId}` : s.kind === 'combination' ? `combination:${s.name}` : 'envelope';
}

export function resultSourceParse(key: string): ResultSource {
  if (key.startsWith('case:')) return { kind: 'case', caseId: key.slice(5) };
  if (key.startsWith('combination:')) return { kind: 'combination', name: key.slice(12) };
  return { kind: 'envelope' };
}

/** Member forces (kN, tension positive) and reactions of a source; the envelope gives each member's governing force and no reactions. */
export function resultForces(analysis: TrussAnalysis, source: ResultSource): { forces: Record<string, number>; reactions: SupportReaction[] | null } | null {
  if (source.kind === 'case') {
    const c = analysis.cases.find((x) => x.caseId === source.caseId);
    return c ? { forces: c.forces, reactions: c.reactions } : null;
  }
  if (source.kind === 'combination') {
    const c = analysis.combinations.find((x) => x.name === source.name);
    return c ? { forces: c.forces, reactions: c.reactions } : null;
  }
  if (analysis.envelope.length === 0) return null;
  return { forces: Object.fromEntries(analysis.envelope.map((r) => [r.member, r.governingForce])), reactions: null };
}

/** One row of the member force table. */
export interface ForceRow {
  id: string;
  tag: string;
  group: MemberGroup | null;
  from: string;
  to: string;
  /** m */
  length: number;
  /** kN, tension positive (the envelope: the governing force). */
  force: number;
  envelope: EnvelopeRow | null;
}

export function forceRows(model: TrussModel, analysis: TrussAnalysis, source: ResultSource): ForceRow[] {
  const result = resultForces(analysis, source);
  if (!result) return [];
  const joints = new Map(model.joints.map((j) => [j.id, j]));
  const envelope = new Map(analysis.envelope.map((r) => [r.member, r]));
  return model.members.map((m) => {
    const a = joints.get(m.from)!;
    const b = joints.get(m.to)!;
    return {
      id: m.id,
      tag: m.tag,
      group: m.group ?? null,
      from: a.tag,
      to: b.tag,
      length: Math.hypot(b.x - a.x, b.y - a.y),
      force: result.forces[m.id] ?? 0,
      envelope: source.kind === 'envelope' ? (envelope.get(m.id) ?? null) : null,
    };
  });
}

export type GroupFilter = 'all' | 'chords' | MemberGroup;

export function forceRowsFilter(rows: ForceRow[], filter: GroupFilter): ForceRow[] {
  if (filter === 'all') return rows;
  if (filter === 'chords') return rows.filter((r) => r.group === 'top-chord' || r.group === 'bottom-chord');
  return rows.filter((r) => r.group === filter);
}

/** The joints a step is about, for linking it to the diagram. */
export function stepJoints(step: SolverStep): string[] {
  switch (step.kind) {
    case 'joint':
    case 'zero-force':
      return [step.joint];
    case 'simultaneous':
      return step.joints.map((j) => j.joint);
    case 'reaction':
      return step.equation.about ? [step.equation.about.joint] : [];
    case 'check':
      return step.residualJoint ? [step.residualJoint] : [];
    default:
      return [];
  }
}
