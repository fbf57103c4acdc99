import type { TrussModel } from '@shared/model/truss';
import type { TrussAnalysis } from '@shared/solver/types';
import { DesignError } from './errors';
import { materialValidate, type Material } from './materials';
import { senseCheck, type BucklingCurve, type DesignLimit, type DesignStandard, type EnFactors, EN_RECOMMENDED, type SenseCheck } from './checks';
import type { Section } from './sections';

/** A group of members designed alike. Lengths in m (as the truss model), section in mm. */
export interface DesignGroup {
  name: string;
  /** "all", or member ids. Later groups override earlier ones for the members they name. */
  members: 'all' | string[];
  material: Material;
  section: Section;
  Kx?: number;
  Ky?: number;
  /** Unbraced length in plane, m (default: the member length). */
  Lx?: number;
  /** Unbraced length out of plane, m (default: the member length; purlin or brace spacing where given). */
  Ly?: number;
  curve?: BucklingCurve;
}

export interface DesignBasis {
  standard: DesignStandard;
  groups: DesignGroup[];
  /** EN 1993-1-1 partial factors (recommended values unless a National Annex says otherwise). */
  en1993?: Partial<EnFactors>;
}

export interface LimitRatio extends DesignLimit {
  sense: 'tension' | 'compression';
  ratio: number;
  /** The combination the ratio is for (the one with the largest force of that sense). */
  combination: string;
}

export interface MemberDesignResult {
  member: string;
  tag: string;
  group: string;
  /** Largest ratio over every limit and combination. */
  utilisation: number;
  /** Combination giving the utilisation; null when the member carries no force. */
  governing: string | null;
  pass: boolean;
  /** In tension under one combination and compression under another. */
  reversal: boolean;
  /** Force per combination, kN (tension +), and its ratio. */
  combinations: { name: string; force: number; ratio: number }[];
  tension: (SenseCheck & { combination: string; force: number }) | null;
  compression: (SenseCheck & { combination: string; force: number }) | null;
  /** Every limit's ratio for its governing combination. */
  checks: LimitRatio[];
  notes: string[];
}

/** Near-failing: utilisation from this ratio up to 1.0 (common practice, no source). */
export const NEAR_FAILING = 0.9;

function forcesSources(analysis: TrussAnalysis): { name: string; forces: Record<string, number> }[] {
  return analysis.combinations.length
    ? analysis.combinations.map((c) => ({ name: c.name, forces: c.forces }))
    : analysis.cases.map((c) => ({ name: c.caseId, forces: c.forces }));
}

function positiveOr(v: number | undefined, fallback: number, what: string): number {
  if (v === undefined) return fallback;
  if (!(Number.isFinite(v) && v > 0)) throw new DesignError('bad-section', `${what} must be a positive number.`);
  return v;
}

/**
 * Axial checks of every member for every combination (or every load case when there are no
 * combinations) by the design basis. Both senses are checked for a member that reverses.
 * Throws `missing-section` naming members no group covers.
 */
export function designCheck(model: TrussModel, analysis: TrussAnalysis, basis: DesignBasis): MemberDesignResult[] {
  const en = { ...EN_RECOMMENDED, ...(basis.en1993 ?? {}) };
  for (const k of ['gammaM0', 'gammaM1', 'gammaM2'] as const) {
    if (!(Number.isFinite(en[k]) && en[k] > 0)) throw new DesignError('bad-material', `${k} must be a positive number (EN 1993-1-1 §6.1 recommends ${EN_RECOMMENDED[k]}).`);
  }
  const steel = basis.standard !== 'nds-2018-asd';
  const groupOf = new Map<string, DesignGroup>();
  const ids = new Set(model.members.map((m) => m.id));
  basis.groups.forEach((g) => {
    materialValidate(g.material, `group ${g.name}`);
    if (steel !== (g.material.kind === 'steel')) {
      throw new DesignError('bad-material', `Group ${g.name} is ${g.material.kind} but the design basis ${basis.standard} is for ${steel ? 'steel' : 'timber'}; change the material or the basis.`);
    }
    const list = g.members === 'all' ? [...ids] : g.members;
    for (const id of list) {
      if (!ids.has(id)) throw new DesignError('missing-section', `Group ${g.name} names member ${id}, which is not in the truss.`);
      groupOf.set(id, g);
    }
  });
  const missing = model.members.filter((m) => !groupOf.has(m.id));
  if (missing.length) {
    const tags = missing.map((m) => m.tag);
    throw new DesignError('missing-section', `Member${tags.length > 1 ? 's' : ''} ${tags.slice(0, 10).join(', ')}${tags.length > 10 ? ` and ${tags.length - 10} more` : ''} ${tags.length > 1 ? 'have' : 'has'} no section and material; put ${tags.length > 1 ? 'them' : 'it'} in a design group.`);
  }
  const joint = new Map(model.joints.map((j) => [j.id, j]));
  const sources = forcesSources(analysis);
  // A capacity and its steps depend on the group, the sense and the buckling lengths only, not
  // on the force: members of one group and one length (a chord's panels, a web's repeats)
  // share one check. The results are not mutated afterwards, so sharing them is safe.
  const senseMemo = new Map<string, SenseCheck>();
  const senseOf = (sense: 'tension' | 'compression', g: DesignGroup, design: Parameters<typeof senseCheck>[2]): SenseCheck => {
    const key = `${basis.groups.indexOf(g)}|${sense}|${design.Lx}|${design.Ly}`;
    let sc = senseMemo.get(key);
    if (!sc) senseMemo.set(key, (sc = senseCheck(basis.standard, sense, design, en)));
    return sc;
  };
  return model.members.map((mb) => {
    const g = groupOf.get(mb.id)!;
    const a = joint.get(mb.from)!;
    const b = joint.get(mb.to)!;
    const L = Math.hypot(b.x - a.x, b.y - a.y);
    const K = positiveOr(g.Kx, 1, `K of group ${g.name}`);
    const design = {
      material: g.material,
      section: g.section,
      Kx: K,
      Ky: positiveOr(g.Ky, K, `Ky of group ${g.name}`),
      Lx: positiveOr(g.Lx, L, `Lx of group ${g.name}`) * 1000,
      Ly: positiveOr(g.Ly, L, `Ly of group ${g.name}`) * 1000,
      ...(g.curve ? { curve: g.curve } : {}),
    };
    let maxT = 0;
    let maxTName = '';
    let maxC = 0;
    let maxCName = '';
    for (const s of sources) {
      const v = s.forces[mb.id] ?? 0;
      if (v > maxT) {
        maxT = v;
        maxTName = s.name;
      } else if (v < maxC) {
        maxC = v;
        maxCName = s.name;
      }
    }
    const tension = maxT > 0 ? { ...senseOf('tension', g, design), combination: maxTName, force: maxT } : null;
    const compression = maxC < 0 ? { ...senseOf('compression', g, design), combination: maxCName, force: maxC } : null;
    const checks: LimitRatio[] = [];
    for (const sc of [tension, compression]) {
      if (!sc) continue;
      for (const l of sc.limits) {
        const ratio = l.capacity !== undefined ? Math.abs(sc.force) / l.capacity : l.slenderness!.value / l.slenderness!.limit;
        checks.push({ ...l, sense: sc.sense, ratio, combination: sc.combination });
      }
    }
    // Per combination: the force over the least capacity of its sense, and the slenderness limit of that sense.
    const slenderRatio = (sc: SenseCheck | null) => Math.max(0, ...(sc?.limits.filter((l) => l.slenderness).map((l) => l.slenderness!.value / l.slenderness!.limit) ?? []));
    const slenderT = slenderRatio(tension);
    const slenderC = slenderRatio(compression);
    const combinations = sources.map((s) => {
      const force = s.forces[mb.id] ?? 0;
      const sc = force > 0 ? tension : force < 0 ? compression : null;
      const ratio = sc ? Math.max(Math.abs(force) / sc.capacity, force > 0 ? slenderT : slenderC) : 0;
      return { name: s.name, force, ratio };
    });
    let utilisation = 0;
    let governing: string | null = null;
    for (const c of checks) {
      if (c.ratio > utilisation) {
        utilisation = c.ratio;
        governing = c.combination;
      }
    }
    return {
      member: mb.id,
      tag: mb.tag,
      group: g.name,
      utilisation,
      governing,
      pass: utilisation <= 1,
      reversal: tension !== null && compression !== null,
      combinations,
      tension,
      compression,
      checks,
      notes: g.section.notes,
    };
  });
}
