/**
 * The "design" and "deflection" keys of a job file (issue 14), parsed apart from the model part
 * of the job (scripts/job.ts) and run after the analysis.
 *
 *   design      { "standard": "aisc360-16-lrfd" | "aisc360-16-asd" | "en1993-1-1" | "nds-2018-asd",
 *                 "gammaM0"?, "gammaM1"?, "gammaM2"? (EN 1993-1-1, recommended 1.0, 1.0, 1.25),
 *                 "groups": [{ "name"?, "members": "all" | [{ "from": [x, y], "to": [x, y] }, …],
 *                   "material": { "Fy", "Fu", "E" } (MPa) | { "grade": "A992" } |
 *                               timber { "Ft", "Fc", "Emin", "E", "c" } (MPa, adjusted design values),
 *                   "section": { "A", "rx", "ry", "An"?, "U"? } (mm², mm) |
 *                              { "shape": "rectangle" | "round-hollow" | "rect-hollow" | "angle" |
 *                                "double-angle", dimensions in mm, "An"?, "U"? },
 *                   "K"?, "Kx"?, "Ky"?, "Lx"?, "Ly"? (m), "curve"? ("a0" … "d", EN 1993-1-1) }] }
 *               Later groups override earlier ones for the members they name.
 *   deflection  { "joints": [[x, y], …], "combinations": [names], "limit": 240 (span/deflection) }
 *
 * Every bad value is one JobError sentence (the solve command exits 2 with it).
 */
import { z } from 'zod';
import type { TrussModel } from '@shared/model/truss';
import type { TrussAnalysis } from '@shared/solver/types';
import { DESIGN_STANDARDS, type DesignStandard } from '@shared/design/checks';
import { deflectionCheck } from '@shared/design/deflection';
import { designCheck, type DesignGroup } from '@shared/design/design';
import { DesignError } from '@shared/design/errors';
import { steelGrade, type Material } from '@shared/design/materials';
import { sectionProperties, type SectionInput } from '@shared/design/sections';
import { JobError } from './job';

const point = z.tuple([z.number().finite(), z.number().finite()]);
const num = z.number().finite();

const groupSchema = z
  .object({
    name: z.string().min(1).max(80).optional(),
    members: z.union([z.literal('all'), z.array(z.object({ from: point, to: point }).strict()).min(1)]),
    material: z.record(z.string(), z.union([num, z.string()])).optional(),
    section: z.record(z.string(), z.union([num, z.string()])).optional(),
    K: num.optional(),
    Kx: num.optional(),
    Ky: num.optional(),
    Lx: num.optional(),
    Ly: num.optional(),
    curve: z.enum(['a0', 'a', 'b', 'c', 'd']).optional(),
  })
  .strict();

export const designJobSchema = z
  .object({
    standard: z.enum(DESIGN_STANDARDS as [DesignStandard, ...DesignStandard[]]),
    gammaM0: num.optional(),
    gammaM1: num.optional(),
    gammaM2: num.optional(),
    groups: z.array(groupSchema).min(1),
  })
  .strict();

export const deflectionJobSchema = z
  .object({
    joints: z.array(point).min(1),
    combinations: z.array(z.string().min(1)).min(1),
    limit: num,
  })
  .strict();

function parse<T>(schema: z.ZodType<T>, raw: unknown, key: string): T {
  const r = schema.safeParse(raw);
  if (!r.success) {
    const issue = r.error.issues[0];
    throw new JobError(`In "${[key, ...issue.path].join('.')}": ${issue.message}.`);
  }
  return r.data;
}

function materialOf(raw: Record<string, number | string> | undefined, standard: DesignStandard, where: string): Material {
  if (!raw) throw new JobError(`${where} has no "material"; give {"grade": "A992"}, {"Fy", "Fu", "E"} or timber {"Ft", "Fc", "Emin", "E", "c"}.`);
  if (standard === 'nds-2018-asd') {
    for (const k of ['Ft', 'Fc', 'Emin', 'E', 'c']) {
      if (typeof raw[k] !== 'number') throw new JobError(`The timber of ${where} has no "${k}"; enter the adjusted design values Ft, Fc (all factors except Cp), Emin, E (MPa) and c (NDS 2018 §3.7.1).`);
    }
    return { kind: 'timber', Ft: raw.Ft as number, Fc: raw.Fc as number, Emin: raw.Emin as number, E: raw.E as number, c: raw.c as number };
  }
  if (typeof raw.grade === 'string') return steelGrade(raw.grade);
  for (const k of ['Fy', 'Fu', 'E']) {
    if (typeof raw[k] !== 'number') throw new JobError(`The steel of ${where} has no "${k}"; give Fy, Fu and E in MPa or a preset "grade".`);
  }
  return { kind: 'steel', Fy: raw.Fy as number, Fu: raw.Fu as number, E: raw.E as number };
}

function sectionOf(raw: Record<string, number | string> | undefined, where: string) {
  if (!raw) throw new JobError(`${where} has no "section"; give {"A", "rx", "ry"} (mm², mm) or a shape with its dimensions.`);
  const shape = typeof raw.shape === 'string' ? raw.shape : 'properties';
  const known = ['properties', 'rectangle', 'round-hollow', 'rect-hollow', 'angle', 'double-angle'];
  if (!known.includes(shape)) throw new JobError(`The section shape "${shape}" of ${where} is not one of ${known.join(', ')}.`);
  return sectionProperties({ ...raw, shape } as SectionInput, where);
}

function memberBetween(model: TrussModel, from: [number, number], to: [number, number], tol: number, where: string): string {
  const near = (j: TrussModel['joints'][number], p: [number, number]) => Math.hypot(j.x - p[0], j.y - p[1]) <= tol;
  const byId = new Map(model.joints.map((j) => [j.id, j]));
  const m = model.members.find((mb) => {
    const a = byId.get(mb.from)!;
    const b = byId.get(mb.to)!;
    return (near(a, from) && near(b, to)) || (near(a, to) && near(b, from));
  });
  if (!m) throw new JobError(`${where} names a member from [${from.join(', ')}] to [${to.join(', ')}] m, but no member joins joints there (within ${tol} m).`);
  return m.id;
}

function jointNear(model: TrussModel, p: [number, number], tol: number): string {
  const j = model.joints.find((jt) => Math.hypot(jt.x - p[0], jt.y - p[1]) <= tol);
  if (!j) throw new JobError(`The deflection joint [${p.join(', ')}] m is not at a joint within ${tol} m.`);
  return j.id;
}

/**
 * The "design" and "deflection" outputs of a solved job (empty object when the job has neither).
 * Lengths in the output: mm; forces kN.
 */
export function jobDesignOutputs(job: { design?: unknown; deflection?: unknown; tolerance?: number }, model: TrussModel, analysis: TrussAnalysis): Record<string, unknown> {
  if (job.design === undefined && job.deflection === undefined) return {};
  if (analysis.classification.kind === 'unstable') throw new JobError('The truss is unstable, so it has no member forces to design for or deflect; fix its supports or members first.');
  const tol = job.tolerance ?? 0.001;
  const out: Record<string, unknown> = {};
  try {
    let groups: DesignGroup[] = [];
    if (job.design !== undefined) {
      const d = parse(designJobSchema, job.design, 'design');
      groups = d.groups.map((g, i) => {
        const name = g.name ?? `group ${i + 1}`;
        const members = g.members === 'all' ? ('all' as const) : g.members.map((m) => memberBetween(model, m.from, m.to, tol, name));
        return {
          name,
          members,
          material: materialOf(g.material, d.standard, name),
          section: sectionOf(g.section, name),
          ...(g.Kx ?? g.K ? { Kx: (g.Kx ?? g.K) as number } : {}),
          ...(g.Ky ?? g.K ? { Ky: (g.Ky ?? g.K) as number } : {}),
          ...(g.Lx !== undefined ? { Lx: g.Lx } : {}),
          ...(g.Ly !== undefined ? { Ly: g.Ly } : {}),
          ...(g.curve ? { curve: g.curve } : {}),
        };
      });
      const en1993 = { ...(d.gammaM0 !== undefined ? { gammaM0: d.gammaM0 } : {}), ...(d.gammaM1 !== undefined ? { gammaM1: d.gammaM1 } : {}), ...(d.gammaM2 !== undefined ? { gammaM2: d.gammaM2 } : {}) };
      const results = designCheck(model, analysis, { standard: d.standard, groups, en1993 });
      out.design = results.map((r) => ({
        member: r.tag,
        group: r.group,
        utilisation: r.utilisation,
        governing: r.governing,
        pass: r.pass,
        reversal: r.reversal,
        checks: r.checks.map((c) => ({ clause: c.clause, sense: c.sense, combination: c.combination, ratio: c.ratio, ...(c.capacity !== undefined ? { capacity: c.capacity } : {}), ...(c.slenderness ? { slenderness: c.slenderness.value, limit: c.slenderness.limit } : {}) })),
        steps: { tension: r.tension?.steps ?? [], compression: r.compression?.steps ?? [] },
        notes: r.notes,
      }));
    }
    if (job.deflection !== undefined) {
      const f = parse(deflectionJobSchema, job.deflection, 'deflection');
      if (!groups.length) throw new JobError('"deflection" needs the members\' sections and materials: give "design" with its groups.');
      const last = new Map<string, DesignGroup>();
      for (const g of groups) for (const id of g.members === 'all' ? model.members.map((m) => m.id) : g.members) last.set(id, g);
      const tagOf = new Map(model.members.map((m) => [m.id, m.tag]));
      const res = deflectionCheck(model, analysis, { joints: f.joints.map((p) => jointNear(model, p, tol)), combinations: f.combinations, limit: f.limit }, (id) => {
        const g = last.get(id);
        return g ? { A: g.section.A, E: g.material.E } : null;
      });
      out.deflection = res.map((r) => ({
        at: r.at,
        joint: r.tag,
        combination: r.combination,
        dx: r.dx,
        dy: r.dy,
        span: r.span,
        limit: r.limit,
        allowed: r.allowed,
        ratio: r.ratio,
        pass: r.pass,
        table: r.tableY.map((t) => ({ member: tagOf.get(t.member), n: t.n, N: t.N, L: t.L, A: t.A, E: t.E, nNL_AE: t.term })),
      }));
    }
  } catch (e) {
    if (e instanceof DesignError) throw new JobError(e.message);
    throw e;
  }
  return out;
}
