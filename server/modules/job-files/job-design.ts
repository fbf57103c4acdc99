/**
 * The "design" and "deflection" keys of a job file: the member design the Design tab saves with
 * the model (shared/model/design-input.ts), written with end points instead of ids. One schema
 * for the command line (`npm run -s solve`, `npm run -s sheet`) and the app's export and import.
 *
 *   design      { "standard": "aisc360-16-lrfd" | "aisc360-16-asd" | "en1993-1-1" | "nds-2018-asd",
 *                 "gammaM0"?, "gammaM1"?, "gammaM2"? (EN 1993-1-1; recommended 1.0, 1.0, 1.25),
 *                 "groups": [{ "name"?, "members": "all" | "top-chord" | "bottom-chord" | "web" |
 *                                                   [{ "from": [x, y], "to": [x, y] }, …],
 *                   "material": { "grade": "A992" } | { "Fy", "Fu", "E" } (MPa) |
 *                               timber { "Ft", "Fc", "Emin", "E", "c", "name"? } (MPa, adjusted values),
 *                   "section": { "A", "rx", "ry", "An"?, "U"? } (mm², mm) |
 *                              { "shape": "rectangle" | "round-hollow" | "rect-hollow" | "angle" |
 *                                "double-angle", its dimensions in mm, "An"?, "U"? },
 *                   "K"? (both axes), "Kx"?, "Ky"?, "Lx"?, "Ly"? (m), "curve"? ("a0" … "d") }] }
 *               Later groups take the members they name from earlier ones (as on the Design tab).
 *   deflection  { "joints": [[x, y], …], "combinations": [names of combinations or load cases],
 *                 "limit": 240 (span/deflection) }; needs "design" (the members' A and E).
 *
 * End points and joints are found within the job's tolerance (job-file.ts jointAt). Every bad
 * value is one JobError sentence; the values' bounds and sense are the Design tab's own
 * (designInputSchema, then designBasisOf), so the app and the command line refuse the same things.
 */
import { z } from 'zod';
import type { TrussModel } from '@shared/model/truss';
import {
  deflectionInputSchema,
  designInputSchema,
  designMaterialSchema,
  designSectionSchema,
  type DesignInput,
  type DesignMaterialInput,
  type DesignSectionInput,
} from '@shared/model/design-input';
import { designBasisOf } from '@shared/design/basis';
import { DesignError } from '@shared/design/errors';
import { JobError } from './job-error';

const point = z.tuple([z.number().finite(), z.number().finite()]);
const value = z.unknown();

const SECTION_KEYS: Record<DesignSectionInput['shape'], string[]> = {
  properties: ['A', 'rx', 'ry'],
  rectangle: ['b', 'd'],
  'round-hollow': ['D', 't'],
  'rect-hollow': ['B', 'H', 't'],
  angle: ['b', 'd', 't'],
  'double-angle': ['b', 'd', 't', 's'],
};
const SHAPES = Object.keys(SECTION_KEYS) as DesignSectionInput['shape'][];
const TIMBER_KEYS = ['Ft', 'Fc', 'Emin', 'c'];

const jobGroupSchema = z
  .object({
    name: z.string().trim().min(1).max(80).optional(),
    members: z.union([z.enum(['all', 'top-chord', 'bottom-chord', 'web']), z.array(z.object({ from: point, to: point }).strict()).min(1).max(100_000)]),
    // Values are checked by the Design tab's own schemas (designMaterialSchema, designSectionSchema).
    material: z.object({ grade: value, Fy: value, Fu: value, E: value, Ft: value, Fc: value, Emin: value, c: value, name: value }).partial().strict(),
    section: z.object({ shape: value, A: value, rx: value, ry: value, b: value, d: value, D: value, t: value, B: value, H: value, s: value, An: value, U: value }).partial().strict(),
    K: value.optional(),
    Kx: value.optional(),
    Ky: value.optional(),
    Lx: value.optional(),
    Ly: value.optional(),
    curve: value.optional(),
  })
  .strict();

/** "design" of a job file (structure only; values are checked on conversion). */
export const jobDesignSchema = z
  .object({
    standard: value,
    gammaM0: value.optional(),
    gammaM1: value.optional(),
    gammaM2: value.optional(),
    groups: z.array(jobGroupSchema).min(1).max(100),
  })
  .strict();
export type JobDesign = z.infer<typeof jobDesignSchema>;

/** "deflection" of a job file. */
export const jobDeflectionSchema = z
  .object({
    joints: z.array(point).min(1).max(20),
    combinations: z.array(z.string().min(1)).min(1).max(20),
    limit: value,
  })
  .strict();
export type JobDeflection = z.infer<typeof jobDeflectionSchema>;

function firstIssue(error: z.ZodError, where: string): never {
  const issue = error.issues[0];
  const at = [where, ...issue.path].join('.');
  throw new JobError(`In "${at}": ${issue.message.replace(/\.$/, '')}.`);
}

function materialOf(raw: JobDesign['groups'][number]['material'], standard: unknown, where: string): DesignMaterialInput {
  const has = (k: string) => (raw as Record<string, unknown>)[k] !== undefined;
  // The kind is read from the keys given; with none of them, from the design basis.
  const kind = has('grade') ? 'grade' : TIMBER_KEYS.some(has) ? 'timber' : has('Fy') || has('Fu') ? 'steel' : standard === 'nds-2018-asd' ? 'timber' : 'steel';
  const allowed: Record<typeof kind, string[]> = { grade: ['grade'], steel: ['Fy', 'Fu', 'E'], timber: ['Ft', 'Fc', 'Emin', 'E', 'c', 'name'] };
  const extra = Object.keys(raw).find((k) => !allowed[kind].includes(k));
  if (extra !== undefined) {
    const words = { grade: 'a preset grade', steel: 'steel values', timber: 'timber design values' }[kind];
    throw new JobError(`The material of ${where} mixes ${words} (${allowed[kind].join(', ')}) with "${extra}"; give a "grade", or Fy, Fu and E, or timber Ft, Fc, Emin, E and c.`);
  }
  const parsed = designMaterialSchema.safeParse({ kind, ...raw });
  if (!parsed.success) throw new JobError(`The material of ${where}: ${lower(parsed.error.issues[0].message.replace(/\.$/, ''))}.`);
  return parsed.data;
}

function sectionOf(raw: JobDesign['groups'][number]['section'], where: string): DesignSectionInput {
  const shape = raw.shape === undefined ? 'properties' : raw.shape;
  if (typeof shape !== 'string' || !(SHAPES as string[]).includes(shape)) {
    throw new JobError(`The section shape ${JSON.stringify(shape)} of ${where} is not one of ${SHAPES.join(', ')} (leave "shape" out to give A, rx and ry).`);
  }
  const allowed = ['shape', ...SECTION_KEYS[shape as DesignSectionInput['shape']], 'An', 'U'];
  const extra = Object.keys(raw).find((k) => !allowed.includes(k));
  if (extra !== undefined) {
    throw new JobError(`The ${shape === 'properties' ? 'section properties' : `${shape} section`} of ${where} take ${SECTION_KEYS[shape as DesignSectionInput['shape']].join(', ')} (and An, U for tension), not "${extra}"; remove it.`);
  }
  const parsed = designSectionSchema.safeParse({ ...raw, shape });
  if (!parsed.success) throw new JobError(`The section of ${where}: ${lower(parsed.error.issues[0].message.replace(/\.$/, ''))}.`);
  return parsed.data;
}

type Locate = (at: [number, number], what: string) => string;

/** The member joining two end points (each found by `joint`), or a sentence naming them. */
function memberBetween(model: TrussModel, from: [number, number], to: [number, number], joint: Locate, where: string): string {
  const a = joint(from, `start of a member of ${where}`);
  const b = joint(to, `end of a member of ${where}`);
  const m = model.members.find((mb) => (mb.from === a && mb.to === b) || (mb.from === b && mb.to === a));
  if (!m) throw new JobError(`${cap(where)} names a member from [${from.join(', ')}] to [${to.join(', ')}] m, but no member joins those joints; give the end points of a member.`);
  return m.id;
}

function cap(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

/** A sentence of the Design tab's schema made the second half of ours ("The area A …" → "the area A …"). */
function lower(s: string): string {
  return /^[A-Z][a-z]/.test(s) ? s.charAt(0).toLowerCase() + s.slice(1) : s;
}

/**
 * The Design tab's design (member and joint ids of `model`) of a job's "design" and
 * "deflection", or undefined when the job has neither. `joint` finds a joint within the job's
 * tolerance (a JobError sentence when none is). Checked as the Design tab checks a save.
 * @throws JobError for the first bad value.
 */
export function jobDesignInput(design: JobDesign | undefined, deflection: JobDeflection | undefined, model: TrussModel, joint: Locate): DesignInput | undefined {
  if (design === undefined) {
    if (deflection !== undefined) throw new JobError('"deflection" needs the members\' sections and materials: give "design" with its groups, or remove "deflection".');
    return undefined;
  }
  const names = new Set<string>();
  const groups = design.groups.map((g, i) => {
    const name = g.name ?? `group ${i + 1}`;
    const where = `design group “${name}” (design.groups.${i})`;
    if (names.has(name)) throw new JobError(`Two design groups are both called “${name}”; give each its own "name".`);
    names.add(name);
    const members = typeof g.members === 'string' ? g.members : [...new Set(g.members.map((m) => memberBetween(model, m.from, m.to, joint, where)))];
    return {
      name,
      members,
      material: materialOf(g.material, design.standard, where),
      section: sectionOf(g.section, where),
      ...((g.Kx ?? g.K) !== undefined ? { Kx: g.Kx ?? g.K } : {}),
      ...((g.Ky ?? g.K) !== undefined ? { Ky: g.Ky ?? g.K } : {}),
      ...(g.Lx !== undefined ? { Lx: g.Lx } : {}),
      ...(g.Ly !== undefined ? { Ly: g.Ly } : {}),
      ...(g.curve !== undefined ? { curve: g.curve } : {}),
    };
  });
  let defl: unknown;
  if (deflection) {
    const jointIds = deflection.joints.map((p, i) => joint(p, `deflection joint ${i}`));
    const known = [...model.combinations.map((c) => c.name), ...model.loadCases.map((c) => c.id)];
    const bad = deflection.combinations.find((c) => !known.includes(c));
    if (bad !== undefined) {
      throw new JobError(`"deflection" names the service combination "${bad}", which is neither a combination nor a load case of the job; use one of ${known.slice(0, 12).join(', ') || '(none: add load cases first)'}.`);
    }
    defl = { joints: [...new Set(jointIds)], combinations: deflection.combinations, limit: deflection.limit };
    const d = deflectionInputSchema.safeParse(defl);
    if (!d.success) firstIssue(d.error, 'deflection');
  }
  const raw = {
    standard: design.standard,
    ...(design.gammaM0 !== undefined ? { gammaM0: design.gammaM0 } : {}),
    ...(design.gammaM1 !== undefined ? { gammaM1: design.gammaM1 } : {}),
    ...(design.gammaM2 !== undefined ? { gammaM2: design.gammaM2 } : {}),
    groups,
    ...(defl ? { deflection: defl } : {}),
  };
  const parsed = designInputSchema.safeParse(raw);
  if (!parsed.success) firstIssue(parsed.error, 'design');
  try {
    designBasisOf(model, parsed.data);
  } catch (e) {
    if (e instanceof DesignError) throw new JobError(e.message);
    throw e;
  }
  return parsed.data;
}

/** The job file's "design" and "deflection" of a saved design (the app's export). */
export function jobDesignOf(model: TrussModel): { design?: JobDesign; deflection?: JobDeflection } {
  const d = model.design;
  if (!d) return {};
  const at = new Map(model.joints.map((j) => [j.id, [j.x, j.y] as [number, number]]));
  const byId = new Map(model.members.map((m) => [m.id, m]));
  const groups = d.groups.map((g) => {
    // A member id the model no longer has (a re-imported drawing) is left out: the run reports it too.
    const members = typeof g.members === 'string' ? g.members : g.members.flatMap((id) => (byId.has(id) ? [{ from: at.get(byId.get(id)!.from)!, to: at.get(byId.get(id)!.to)! }] : []));
    const { kind: _kind, ...material } = g.material;
    void _kind;
    const { shape, ...dims } = g.section;
    const same = g.Kx !== undefined && g.Ky !== undefined && g.Kx === g.Ky;
    return {
      name: g.name,
      members,
      material,
      section: shape === 'properties' ? dims : { shape, ...dims },
      ...(same ? { K: g.Kx } : { ...(g.Kx !== undefined ? { Kx: g.Kx } : {}), ...(g.Ky !== undefined ? { Ky: g.Ky } : {}) }),
      ...(g.Lx !== undefined ? { Lx: g.Lx } : {}),
      ...(g.Ly !== undefined ? { Ly: g.Ly } : {}),
      ...(g.curve !== undefined ? { curve: g.curve } : {}),
    };
  });
  return {
    design: {
      standard: d.standard,
      ...(d.gammaM0 !== undefined ? { gammaM0: d.gammaM0 } : {}),
      ...(d.gammaM1 !== undefined ? { gammaM1: d.gammaM1 } : {}),
      ...(d.gammaM2 !== undefined ? { gammaM2: d.gammaM2 } : {}),
      groups,
    } as JobDesign,
    ...(d.deflection
      ? { deflection: { joints: d.deflection.joints.flatMap((id) => (at.has(id) ? [at.get(id)!] : [])), combinations: d.deflection.combinations, limit: d.deflection.limit } }
      : {}),
  };
}
