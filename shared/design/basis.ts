import type { DesignInput, DesignSelection } from '@shared/model/design-input';
import type { TrussModel } from '@shared/model/truss';
import type { TrussAnalysis } from '@shared/solver/types';
import { deflectionCheck, type DeflectionResult } from './deflection';
import { deflectedShapes, type DeflectedShape } from './deflected-shape';
import { designCheck, type DesignBasis, type DesignGroup, type MemberDesignResult } from './design';
import { DesignError } from './errors';
import { materialValidate, steelGrade, type Material } from './materials';
import { sectionProperties, type Section } from './sections';
import { EN_RECOMMENDED, senseCheck, type BucklingCurve, type DesignStandard, type MemberDesign } from './checks';
import type { DesignUnitSet } from './units';
import { NEAR_FAILING } from './design';

/**
 * From the design the engineer saved with the model (shared/model/design-input.ts) to the
 * basis the checks run on, and the design part of an analysis run.
 */

export const STANDARD_NAMES: Record<DesignStandard, string> = {
  'aisc360-16-lrfd': 'AISC 360-16, LRFD (φ)',
  'aisc360-16-asd': 'AISC 360-16, ASD (Ω)',
  'en1993-1-1': 'EN 1993-1-1 (Eurocode 3)',
  'nds-2018-asd': 'NDS 2018, ASD',
};

const SELECTION_WORDS: Record<Exclude<DesignSelection, string[]>, string> = {
  all: 'every member',
  'top-chord': 'the top chord',
  'bottom-chord': 'the bottom chord',
  web: 'the webs',
};

export function selectionWords(sel: DesignSelection, count: number): string {
  return Array.isArray(sel) ? `${count} chosen member${count === 1 ? '' : 's'}` : SELECTION_WORDS[sel];
}

export interface ResolvedGroup extends DesignGroup {
  /** Member ids in the group after later groups took theirs. */
  memberIds: string[];
  selection: DesignSelection;
}

export interface ResolvedBasis extends DesignBasis {
  groups: ResolvedGroup[];
  /** Group of each member (the last group naming it). */
  groupOf: Map<string, ResolvedGroup>;
}

function materialOf(m: DesignInput['groups'][number]['material'], where: string): Material {
  if (m.kind === 'grade') return steelGrade(m.grade);
  if (m.kind === 'steel') return { kind: 'steel', Fy: m.Fy, Fu: m.Fu, E: m.E };
  return { kind: 'timber', Ft: m.Ft, Fc: m.Fc, Emin: m.Emin, E: m.E, c: m.c, ...(m.name ? { name: m.name } : {}) };
}

/**
 * The design basis of a model's saved design. Throws a DesignError (one sentence) for a bad
 * section or material, a selection that names members the truss does not have or picks none,
 * steel in a timber basis (or the reverse) and members left without a section.
 */
export function designBasisOf(model: TrussModel, input: DesignInput): ResolvedBasis {
  const ids = new Set(model.members.map((m) => m.id));
  const tagOf = new Map(model.members.map((m) => [m.id, m.tag]));
  const groupOf = new Map<string, ResolvedGroup>();
  const names = new Set<string>();
  const groups: ResolvedGroup[] = input.groups.map((g) => {
    const where = `group “${g.name}”`;
    if (names.has(g.name)) throw new DesignError('bad-section', `Two design groups are both called “${g.name}”; give each its own name.`);
    names.add(g.name);
    let list: string[];
    if (Array.isArray(g.members)) {
      const unknown = g.members.find((id) => !ids.has(id));
      if (unknown !== undefined) throw new DesignError('missing-section', `Design ${where} names member “${unknown}”, which this truss does not have; reload the page, the drawing may have been re-imported.`);
      list = [...new Set(g.members)];
    } else if (g.members === 'all') {
      list = [...ids];
    } else {
      const sel = g.members;
      list = model.members.filter((m) => m.group === sel).map((m) => m.id);
      if (!list.length) throw new DesignError('missing-section', `Design ${where} takes ${SELECTION_WORDS[sel]}, but no member is marked ${SELECTION_WORDS[sel].replace(/^the /, '')}; set the members' group in the Members table or pick the members.`);
    }
    const material = materialOf(g.material, where);
    materialValidate(material, where);
    const section: Section = sectionProperties(g.section, where);
    const resolved: ResolvedGroup = {
      name: g.name,
      members: list,
      memberIds: [],
      selection: g.members,
      material,
      section,
      ...(g.Kx !== undefined ? { Kx: g.Kx } : {}),
      ...(g.Ky !== undefined ? { Ky: g.Ky } : {}),
      ...(g.Lx !== undefined ? { Lx: g.Lx } : {}),
      ...(g.Ly !== undefined ? { Ly: g.Ly } : {}),
      ...(g.curve ? { curve: g.curve } : {}),
    };
    for (const id of list) groupOf.set(id, resolved);
    return resolved;
  });
  for (const [id, g] of groupOf) g.memberIds.push(id);
  const steel = input.standard !== 'nds-2018-asd';
  for (const g of groups) {
    if (steel !== (g.material.kind === 'steel')) {
      throw new DesignError('bad-material', `Design group “${g.name}” is ${g.material.kind} but ${STANDARD_NAMES[input.standard]} is for ${steel ? 'steel' : 'timber'}; change the material or the design basis.`);
    }
  }
  const missing = model.members.filter((m) => !groupOf.has(m.id)).map((m) => tagOf.get(m.id)!);
  if (missing.length) {
    throw new DesignError(
      'missing-section',
      `Member${missing.length > 1 ? 's' : ''} ${missing.slice(0, 10).join(', ')}${missing.length > 10 ? ` and ${missing.length - 10} more` : ''} ${missing.length > 1 ? 'are' : 'is'} in no design group; add a group that takes ${missing.length > 1 ? 'them' : 'it'} (or “all”).`,
    );
  }
  const en1993 = {
    ...(input.gammaM0 !== undefined ? { gammaM0: input.gammaM0 } : {}),
    ...(input.gammaM1 !== undefined ? { gammaM1: input.gammaM1 } : {}),
    ...(input.gammaM2 !== undefined ? { gammaM2: input.gammaM2 } : {}),
  };
  // Groups keep only the members they finally hold, so designCheck sees one group per member.
  return { standard: input.standard, en1993, groups: groups.map((g) => Object.assign(g, { members: g.memberIds })), groupOf };
}

/**
 * The model the analysis runs on: members without E, A or EA of their own take A and E from
 * their design section and material (mm² → m², MPa → kN/m²), so an indeterminate truss is
 * analysed with the stiffness of the members it is designed with.
 */
export function withDesignStiffness(model: TrussModel): TrussModel {
  if (!model.design) return model;
  let basis: ResolvedBasis;
  try {
    basis = designBasisOf(model, model.design);
  } catch {
    return model; // the run reports the design error; the analysis goes on with the model's own properties
  }
  return {
    ...model,
    members: model.members.map((m) => {
      if (m.E !== undefined || m.A !== undefined || m.EA !== undefined) return m;
      const g = basis.groupOf.get(m.id);
      if (!g) return m;
      return { ...m, A: g.section.A * 1e-6, E: g.material.E * 1000 };
    }),
  };
}

/** A member's checks; `refused` says why a check Panelpoint does not make leaves it failing. */
export type RunMemberDesign = MemberDesignResult & { refused?: string };

/**
 * AISC 360-16 §E6 and EN 1993-1-1 §6.4 (built-up members: the modified slenderness for the
 * connector spacing) are not applied, so a pair of angles in compression is refused — reported
 * as failing with this sentence — rather than checked on the unsafe side (the conservative
 * reading). A pair of angles only ever in tension is checked.
 */
export const BUILT_UP_REFUSED =
  'A pair of angles in compression is not checked: the built-up member rules (AISC 360-16 §E6, EN 1993-1-1 §6.4) are not applied here; check it by hand or enter its properties with the modified slenderness.';

function refuseBuiltUp(r: MemberDesignResult): RunMemberDesign {
  return r.compression ? { ...r, pass: false, refused: BUILT_UP_REFUSED } : r;
}

export interface RunDesignGroup {
  name: string;
  selection: string;
  memberCount: number;
  material: Material;
  section: Section;
  Kx: number;
  Ky: number;
  Lx: number | null;
  Ly: number | null;
  curve: string | null;
}

/** The design part of a run: what was checked against what, or why it could not be. */
export interface RunDesign {
  standard: DesignStandard;
  standardName: string;
  en1993: { gammaM0: number; gammaM1: number; gammaM2: number } | null;
  groups: RunDesignGroup[];
  members: RunMemberDesign[];
  deflection: DeflectionResult[];
  /**
   * Every joint's movement under each service combination, for the deflected-shape drawing;
   * null past the joint limit; absent in runs made before it existed.
   */
  shapes?: DeflectedShape[] | null;
  /** Set when the checks could not be made (a bad section, an uncovered member, …). */
  error: { code: string; message: string } | null;
  /** The model version whose design this is (a re-check without re-analysis moves it on). */
  modelVersion?: number;
  /** Set when the checks were redone on stored forces without a new analysis. */
  recheckedAt?: string;
}

/** Design checks and deflections of a solved model; a design error is recorded, not thrown. */
export function runDesign(model: TrussModel, analysis: TrussAnalysis): RunDesign | null {
  const input = model.design;
  if (!input) return null;
  const empty: RunDesign = { standard: input.standard, standardName: STANDARD_NAMES[input.standard], en1993: null, groups: [], members: [], deflection: [], error: null };
  if (analysis.classification.kind === 'unstable') {
    return { ...empty, error: { code: 'unstable', message: 'The truss is unstable, so it has no member forces to design for; fix its supports or members first.' } };
  }
  try {
    const basis = designBasisOf(model, input);
    const members = designCheck(model, analysis, basis).map((r) => (basis.groupOf.get(r.member)!.section.shape === 'double-angle' ? refuseBuiltUp(r) : r));
    const props = (id: string) => {
      const g = basis.groupOf.get(id);
      return g ? { A: g.section.A, E: g.material.E } : null;
    };
    const deflection = input.deflection ? deflectionCheck(model, analysis, input.deflection, props) : [];
    const shapes = input.deflection ? deflectedShapes(model, analysis, input.deflection.combinations, props) : [];
    return {
      ...empty,
      en1993: input.standard === 'en1993-1-1' ? { gammaM0: 1.0, gammaM1: 1.0, gammaM2: 1.25, ...basis.en1993 } : null,
      groups: basis.groups.map((g) => ({
        name: g.name,
        selection: selectionWords(g.selection, g.memberIds.length),
        memberCount: g.memberIds.length,
        material: g.material,
        section: g.section,
        Kx: g.Kx ?? 1,
        Ky: g.Ky ?? g.Kx ?? 1,
        Lx: g.Lx ?? null,
        Ly: g.Ly ?? null,
        curve: g.curve ?? null,
      })),
      members,
      deflection,
      shapes,
    };
  } catch (e) {
    if (e instanceof DesignError) return { ...empty, error: { code: e.code, message: e.message } };
    throw e;
  }
}

/** A run's design in a line (the run list and the results header). */
export function designSummaryOf(d: RunDesign): {
  standard: string;
  members: number;
  failing: number;
  nearFailing: number;
  maxUtilisation: number;
  governingMember: string | null;
  error: string | null;
  recheckedAt: string | null;
} {
  let max = 0;
  let gov: string | null = null;
  let failing = 0;
  let near = 0;
  for (const m of d.members) {
    if (!m.pass) failing++;
    else if (m.utilisation >= NEAR_FAILING) near++;
    if (m.utilisation > max) {
      max = m.utilisation;
      gov = m.tag;
    }
  }
  return { standard: d.standardName, members: d.members.length, failing, nearFailing: near, maxUtilisation: max, governingMember: gov, error: d.error?.message ?? null, recheckedAt: d.recheckedAt ?? null };
}

/** JSON of a run's design; a value that is not a finite number (a zero span) is written as null. */
export function designJson(d: RunDesign | null): string {
  return JSON.stringify(d, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v));
}

/**
 * A member's tension and compression steps printed in `units`: the run keeps them in SI (MPa,
 * mm, mm², kN); a US customary project shows them in ksi, in, in², kip, each step computed again
 * from the converted values so that its printed numbers multiply out. Capacities (kN) are the
 * run's own up to rounding of the last binary digit.
 */
export function memberStepsIn(model: TrussModel, d: RunDesign, r: RunMemberDesign, units: DesignUnitSet): Pick<RunMemberDesign, 'tension' | 'compression'> {
  if (units.system === 'si') return { tension: r.tension, compression: r.compression };
  const g = d.groups.find((x) => x.name === r.group);
  const mb = model.members.find((m) => m.id === r.member);
  if (!g || !mb) return { tension: r.tension, compression: r.compression };
  const a = model.joints.find((j) => j.id === mb.from)!;
  const b = model.joints.find((j) => j.id === mb.to)!;
  const L = Math.hypot(b.x - a.x, b.y - a.y);
  const design: MemberDesign = {
    material: g.material,
    section: g.section,
    Kx: g.Kx,
    Ky: g.Ky,
    Lx: (g.Lx ?? L) * 1000,
    Ly: (g.Ly ?? L) * 1000,
    ...(g.curve ? { curve: g.curve as BucklingCurve } : {}),
  };
  const en = d.en1993 ?? EN_RECOMMENDED;
  const again = (sc: RunMemberDesign['tension']) => (sc ? { ...senseCheck(d.standard, sc.sense, design, en, units), combination: sc.combination, force: sc.force } : null);
  return { tension: again(r.tension), compression: again(r.compression) };
}
