/**
 * The job file: the whole model of one truss as one JSON text, read by `npm run -s solve` and
 * `npm run -s sheet` (scripts/job.ts reads the file and its drawing) and exported and imported
 * by the app (job-files.service.ts). No I/O here: a drawing is read through `readDrawing`.
 *
 * Keys (lengths in metres after unit conversion, forces in kN, fy positive up; README "Job
 * files" has an example of each):
 *   drawing        DXF path relative to the job file (command line only); or inline
 *   joints         [[x, y] | { "at": [x, y], "tag"?: "L0", "id"?: "j1" }, …] and
 *   members        [[i, j] | { "joints": [i, j], "tag"?: "L0L1", "id"?: "m1", "group"?: "top-chord" |
 *                  "bottom-chord" | "web" | "other", "material"?: "…", "section"?: "…" }, …]
 *                  (0-based joint indices; material and section here are the Members table's labels)
 *   layers         optional member layers of the drawing
 *   units          "m" | "mm" | "cm" | "in" | "ft" (coordinates; inline default "m")
 *   tolerance      optional, m: joint merging in the import, and how far an "at" or an EA end
 *                  point may be from a joint
 *   supports       [{ "at": [x, y], "type": "pin" | "roller", "angle": deg (roller line from +x, default 90) }]
 *   cases          optional [{ "id": "D", "name": "Roofing", "category": "dead" | "roof-live" | "snow" |
 *                  "wind" | "live" | "other", "source"?: "roof-loading" }]; when given, every load's case must be declared
 *   loads          [{ "at": [x, y], "fx": kN, "fy": kN, "case": "D", "note"?: "…" }]
 *   EA             optional: kN for every member, or [{ "from": [x, y], "to": [x, y], "EA": kN }]
 *   combinationSet optional: "asce7-16-strength" | "asce7-16-asd" | "en1990-6.10" | "en1990-6.10ab"
 *                  (needs "cases"); its combinations come before the hand-written ones
 *   combinations   optional [{ "name": "C1", "factors": { "D": 1.2, "S": 1.6 }, "clause": "…" }]
 *   takeoff        optional: the app's roof loading (shared/schemas/run.schema.ts takeoffInputSchema)
 *                  with joints named by their job ids (a joint's id is its "id", else its tag).
 *                  A case marked "source": "roof-loading" in "cases" holds its loads (filled in
 *                  when the file gives none for it, refused when they differ); every other case
 *                  keeps the loads written, as a run in the app solves the saved loads
 *   design, deflection  optional: the Design tab's member design and deflection request, members
 *                  and joints by end points (job-design.ts)
 *
 * Every bad value is one JobError sentence: exit 2 on the command line, 422 in the API.
 */
import { z } from 'zod';
import type { Combination, LoadCase, TrussModel } from '@shared/model/truss';
import { loadCategorySchema, memberGroupSchema } from '@shared/model/truss';
import { COMBINATION_SETS, CombinationError, combinationsBuild, type CombinationSetId } from '@shared/combinations';
import { dxfImport, dxfParseBytes, tagOfIndex } from '@shared/dxf-import/index';
import { takeoffInputSchema, type TakeoffInput } from '@shared/schemas/run.schema';
import { withDesignStiffness } from '@shared/design/basis';
import { AppError } from '../../errors/app-error';
import { roofLoadsResolve } from '@shared/model/roof-loads';
import type { RoofTakeoffResult } from '@shared/takeoff';
import { assertTakeoffCases, computeTakeoff } from '../takeoff/takeoff-compute';
import { JobError } from './job-error';
import { jobDeflectionSchema, jobDesignInput, jobDesignOf, jobDesignSchema } from './job-design';

export { JobError } from './job-error';

const point = z.tuple([z.number().finite(), z.number().finite()]);
const name = z.string().min(1).max(40);

/** The job file (see the top of this file). */
export const jobSchema = z
  .object({
    drawing: z.string().min(1).optional(),
    joints: z.array(z.union([point, z.object({ at: point, tag: name.optional(), id: name.optional() }).strict()])).optional(),
    members: z
      .array(
        z.union([
          z.tuple([z.number().int().nonnegative(), z.number().int().nonnegative()]),
          z
            .object({
              joints: z.tuple([z.number().int().nonnegative(), z.number().int().nonnegative()]),
              tag: name.optional(),
              id: name.optional(),
              group: memberGroupSchema.optional(),
              material: z.string().max(120).optional(),
              section: z.string().max(120).optional(),
            })
            .strict(),
        ]),
      )
      .optional(),
    layers: z.array(z.string().min(1)).optional(),
    units: z.enum(['m', 'mm', 'cm', 'in', 'ft']).optional(),
    tolerance: z.number().positive().finite().optional(),
    supports: z.array(
      z
        .object({
          at: point,
          type: z.enum(['pin', 'roller']),
          angle: z.number().finite().optional(),
        })
        .strict(),
    ),
    // Category and set id are strings here and checked by hand, so a bad one gets a sentence naming the choices.
    cases: z.array(z.object({ id: name, name: z.string().min(1).max(120).optional(), category: z.string(), source: z.string().optional() }).strict()).optional(),
    loads: z
      .array(
        z
          .object({
            at: point,
            fx: z.number().finite().default(0),
            fy: z.number().finite().default(0),
            case: name.default('D'),
            note: z.string().max(200).optional(),
          })
          .strict(),
      )
      .default([]),
    EA: z.union([z.number().positive().finite(), z.array(z.object({ from: point, to: point, EA: z.number().positive().finite() }).strict())]).optional(),
    combinationSet: z.string().optional(),
    combinations: z
      .array(z.object({ name: z.string().min(1).max(80), factors: z.record(z.string(), z.number().finite()), clause: z.string().max(200).optional() }).strict())
      .default([]),
    /** The app's roof loading, checked by its own schema in jobModel. */
    takeoff: z.unknown().optional(),
    /** The member design and deflection request (job-design.ts), checked as the Design tab checks them. */
    design: jobDesignSchema.optional(),
    deflection: jobDeflectionSchema.optional(),
  })
  .strict();
export type Job = z.infer<typeof jobSchema>;

const METRES_PER_UNIT = { m: 1, mm: 0.001, cm: 0.01, in: 0.0254, ft: 0.3048 } as const;
/** m: how far an "at" may be from its joint when the job gives no tolerance. */
export const JOB_DEFAULT_TOLERANCE = 0.001;

/** A parsed job's first problem as one sentence: the field and what is wrong. */
export function jobParse(raw: unknown, where: string): Job {
  const parsed = jobSchema.safeParse(raw);
  if (!parsed.success) {
    let issue = parsed.error.issues[0];
    // A joint or member entry may be a list or an object: report the branch of the shape given.
    while (issue.code === 'invalid_union' && issue.errors.length) {
      const value = issue.path.reduce<unknown>((v, k) => (v as Record<PropertyKey, unknown> | undefined)?.[k as PropertyKey], raw);
      const branch = issue.errors[Array.isArray(value) ? 0 : Math.min(1, issue.errors.length - 1)];
      if (!branch?.length) break;
      issue = { ...branch[0], path: [...issue.path, ...branch[0].path] } as typeof issue;
    }
    const at = issue.path.length ? issue.path.join('.') : 'the job';
    throw new JobError(`In ${where}, ${at}: ${issue.message}.`);
  }
  return parsed.data;
}

type Geometry = { joints: TrussModel['joints']; members: TrussModel['members']; tolerance: number };

function geometryOf(job: Job, readDrawing: ((relativePath: string) => Uint8Array) | null): Geometry {
  if (job.drawing) {
    if (job.joints || job.members) throw new JobError('Give either "drawing" or inline "joints" and "members", not both.');
    if (!readDrawing) {
      throw new JobError(`This job file names the drawing ${job.drawing}; a job file imported into the app must give its "joints" and "members" inline (export one from the app to see how).`);
    }
    const parsed = dxfParseBytes(readDrawing(job.drawing));
    const result = dxfImport(parsed, {
      ...(job.layers ? { layers: job.layers } : {}),
      ...(job.units ? { units: job.units } : {}),
      ...(job.tolerance ? { tolerance: job.tolerance } : {}),
    });
    // Joint and member ids become their tags so every output names them the same way.
    const idToTag = new Map(result.joints.map((j) => [j.id, j.tag]));
    return {
      joints: result.joints.map((j) => ({ id: j.tag, tag: j.tag, x: j.x, y: j.y })),
      members: uniqueTags(result.members.map((m) => ({ from: idToTag.get(m.from) as string, to: idToTag.get(m.to) as string, tag: m.tag }))),
      tolerance: job.tolerance ?? result.tolerance.value,
    };
  }
  if (!job.joints || !job.members) throw new JobError('The job needs "drawing" (a DXF path) or inline "joints" [[x, y], …] and "members" [[i, j], …].');
  if (job.layers) throw new JobError('"layers" applies to a drawing only; remove it or give "drawing".');
  const f = METRES_PER_UNIT[job.units ?? 'm'];
  const joints = job.joints.map((j, i) => {
    const at = Array.isArray(j) ? j : j.at;
    const tag = (!Array.isArray(j) && j.tag) || tagOfIndex(i);
    const id = (!Array.isArray(j) && j.id) || tag;
    return { id, tag, x: at[0] * f, y: at[1] * f };
  });
  const seenId = new Map<string, number>();
  const seenTag = new Map<string, number>();
  joints.forEach((j, i) => {
    if (seenId.has(j.id)) throw new JobError(`Joints ${seenId.get(j.id)} and ${i} both have the id "${j.id}"; give each joint its own id (or leave ids out).`);
    if (seenTag.has(j.tag)) throw new JobError(`Joints ${seenTag.get(j.tag)} and ${i} both have the tag "${j.tag}"; give each joint its own tag (or leave tags out).`);
    seenId.set(j.id, i);
    seenTag.set(j.tag, i);
  });
  const explicit = job.members.some((m) => !Array.isArray(m) && (m.id || m.tag));
  const list = job.members.map((m, k) => {
    const [a, b] = Array.isArray(m) ? m : m.joints;
    for (const i of [a, b]) {
      if (i >= joints.length) throw new JobError(`Member ${k} refers to joint index ${i}, but there are only ${joints.length} joints (indices start at 0).`);
    }
    const tag = (!Array.isArray(m) && m.tag) || `${joints[a].tag}${joints[b].tag}`;
    const labels = Array.isArray(m) ? {} : { ...(m.group ? { group: m.group } : {}), ...(m.material ? { material: m.material } : {}), ...(m.section ? { section: m.section } : {}) };
    return { from: joints[a].id, to: joints[b].id, tag, id: (!Array.isArray(m) && m.id) || undefined, labels };
  });
  let members: TrussModel['members'];
  if (explicit) {
    const ids = new Set<string>();
    members = list.map((m, k) => {
      const id = m.id ?? m.tag;
      if (ids.has(id)) throw new JobError(`Two members have the id "${id}" (the second is member ${k}); give each member its own id or tag.`);
      ids.add(id);
      return { id, tag: m.tag, from: m.from, to: m.to, ...m.labels };
    });
  } else members = uniqueTags(list);
  return { joints, members, tolerance: job.tolerance ?? JOB_DEFAULT_TOLERANCE };
}

function uniqueTags(list: { from: string; to: string; tag: string; labels?: Pick<TrussModel['members'][number], 'group' | 'material' | 'section'> }[]): TrussModel['members'] {
  const seen = new Map<string, number>();
  return list.map((m) => {
    const n = (seen.get(m.tag) ?? 0) + 1;
    seen.set(m.tag, n);
    const tag = n === 1 ? m.tag : `${m.tag}-${n}`;
    return { id: tag, tag, from: m.from, to: m.to, ...m.labels };
  });
}

/** The joint nearest `at`, within the tolerance, or a sentence naming the nearest one. */
export function jointAt(joints: TrussModel['joints'], at: [number, number], tolerance: number, what: string): string {
  let best = -1;
  let bestD = Infinity;
  joints.forEach((j, i) => {
    const d = Math.hypot(j.x - at[0], j.y - at[1]);
    if (d < bestD) {
      bestD = d;
      best = i;
    }
  });
  if (best < 0 || bestD > tolerance) {
    const near = best >= 0 ? ` (nearest is joint ${joints[best].tag} at [${joints[best].x}, ${joints[best].y}], ${bestD.toPrecision(3)} m away)` : '';
    throw new JobError(`The ${what} at [${at[0]}, ${at[1]}] m is not at a joint within ${tolerance} m${near}; move it onto a joint or raise "tolerance".`);
  }
  return joints[best].id;
}

const CATEGORIES = loadCategorySchema.options;
const SET_IDS = COMBINATION_SETS.map((s) => s.id);

function casesOf(job: Job, joints: TrussModel['joints'], tolerance: number, f: number): LoadCase[] {
  const cases = new Map<string, LoadCase>();
  if (job.cases) {
    job.cases.forEach((c, i) => {
      if (cases.has(c.id)) throw new JobError(`"cases" declares load case "${c.id}" twice; give each case its own id.`);
      if (!(CATEGORIES as readonly string[]).includes(c.category)) {
        throw new JobError(`Load case "${c.id}" (cases.${i}) has category "${c.category}"; use one of ${CATEGORIES.join(', ')}.`);
      }
      if (c.source !== undefined && c.source !== 'roof-loading') {
        throw new JobError(`Load case "${c.id}" (cases.${i}) has source "${c.source}"; the one source is "roof-loading" (its loads are the roof loading's), or leave "source" out for loads entered by hand.`);
      }
      cases.set(c.id, { id: c.id, name: c.name ?? c.id, category: c.category as LoadCase['category'], loads: [], ...(c.source ? { source: 'roof-loading' as const } : {}) });
    });
  }
  for (const ld of job.loads) {
    const at: [number, number] = [ld.at[0] * f, ld.at[1] * f];
    if (!cases.has(ld.case)) {
      if (job.cases) {
        throw new JobError(`The load at [${ld.at.join(', ')}] is in load case "${ld.case}", which "cases" does not declare; add it to "cases" (with its name and category) or correct the load's "case".`);
      }
      cases.set(ld.case, { id: ld.case, name: ld.case, category: 'other', loads: [] });
    }
    const joint = jointAt(joints, at, tolerance, `load of case ${ld.case}`);
    cases.get(ld.case)!.loads.push({ joint, fx: ld.fx, fy: ld.fy, ...(ld.note ? { note: ld.note } : {}) });
  }
  return [...cases.values()];
}

function combinationsOf(job: Job, loadCases: LoadCase[]): Combination[] {
  const built: Combination[] = [];
  if (job.combinationSet !== undefined) {
    if (!(SET_IDS as string[]).includes(job.combinationSet)) {
      throw new JobError(`"combinationSet" is "${job.combinationSet}", which is not a combination set; use one of ${SET_IDS.join(', ')}.`);
    }
    if (!job.cases) throw new JobError(`"combinationSet" needs "cases" with each case's category, so the set knows which loads are dead, snow, wind …; add "cases".`);
    try {
      for (const c of combinationsBuild(job.combinationSet as CombinationSetId, loadCases)) built.push({ name: c.name, factors: c.factors, clause: c.clause });
    } catch (e) {
      if (e instanceof CombinationError) throw new JobError(e.message);
      throw e;
    }
  }
  const ids = new Set(loadCases.map((c) => c.id));
  const names = new Set(built.map((c) => c.name));
  for (const c of job.combinations) {
    for (const id of Object.keys(c.factors)) {
      if (!ids.has(id)) {
        throw new JobError(`Combination "${c.name}" has a factor on load case "${id}", which the job does not have; ${job.cases ? 'declare it in "cases"' : 'give it a load'} or remove the factor.`);
      }
    }
    if (names.has(c.name)) {
      throw new JobError(`Combination "${c.name}" is named twice${built.some((b) => b.name === c.name) ? ' (once by "combinationSet")' : ''}; give each combination its own name.`);
    }
    names.add(c.name);
    built.push({ name: c.name, factors: { ...c.factors }, ...(c.clause ? { clause: c.clause } : {}) });
  }
  return built;
}

function stiffnessApply(job: Job, members: TrussModel['members'], joints: TrussModel['joints'], tolerance: number, f: number): void {
  if (job.EA === undefined) return;
  if (typeof job.EA === 'number') {
    for (const m of members) m.EA = job.EA;
    return;
  }
  const byEnds = new Map<string, TrussModel['members'][number]>();
  for (const m of members) byEnds.set([m.from, m.to].sort().join('\u0000'), m);
  const given = new Set<string>();
  job.EA.forEach((e, i) => {
    const what = `"EA" entry ${i}`;
    const a = jointAt(joints, [e.from[0] * f, e.from[1] * f], tolerance, `start of ${what}`);
    const b = jointAt(joints, [e.to[0] * f, e.to[1] * f], tolerance, `end of ${what}`);
    const m = byEnds.get([a, b].sort().join('\u0000'));
    if (!m) {
      throw new JobError(`${what} runs from [${e.from.join(', ')}] to [${e.to.join(', ')}], but no member joins those joints; give the end points of a member.`);
    }
    if (given.has(m.id)) throw new JobError(`${what} gives member ${m.tag} a second EA; give each member one.`);
    given.add(m.id);
    m.EA = e.EA;
  });
}

/**
 * The roof loading of a job, checked by the app's own schema (joint references are job ids), and
 * the cases marked as from it given its loads by the one rule of shared/model/roof-loads.ts
 * (roofLoadsResolve): a marked case holds the roof loading's loads (filled in when the file
 * leaves them out, refused when they differ); every other case keeps the loads the file gives.
 */
function takeoffOf(job: Job, model: TrussModel): TakeoffInput | null {
  let input: TakeoffInput | null = null;
  let caseLoads: RoofTakeoffResult['caseLoads'] | null = null;
  if (job.takeoff !== undefined) {
    const parsed = takeoffInputSchema.safeParse(job.takeoff);
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      throw new JobError(`In "takeoff"${issue.path.length ? `.${issue.path.join('.')}` : ''}: ${issue.message.replace(/\.$/, '')}.`);
    }
    try {
      assertTakeoffCases(parsed.data, model.loadCases);
      caseLoads = computeTakeoff(model, parsed.data).caseLoads;
    } catch (e) {
      if (e instanceof AppError) throw new JobError(`In "takeoff": ${e.message}`);
      throw e;
    }
    input = parsed.data;
  }
  const resolved = roofLoadsResolve(model.loadCases, caseLoads);
  if (resolved.problem) {
    const id = resolved.problem.caseId;
    const said = `Load case "${id}" is marked as from the roof loading ("source": "roof-loading")`;
    throw new JobError(
      resolved.problem.code === 'roof-loads-without-takeoff'
        ? `${said}, but the job file has no "takeoff"; add the roof loading, or remove the case's "source" to keep its loads as hand loads.`
        : resolved.problem.code === 'roof-loads-not-written'
          ? `${said}, but the roof loading writes no loads into it; add it to the roof loading's "areaLoads" or "wind", or remove its "source".`
          : `${said}, but its loads differ from what the roof loading computes; leave its loads out (the roof loading fills them in), or remove its "source" to keep them as hand loads.`,
    );
  }
  model.loadCases = resolved.cases;
  return input;
}

/**
 * A job as the app's model (cases, combinations, stiffness) with the marked cases holding the
 * roof loading's loads, and the roof loading itself (kept apart, as the app keeps it).
 */
export interface JobModel {
  model: TrussModel;
  takeoff: TakeoffInput | null;
  tolerance: number;
}

/**
 * The truss model of a parsed job. `readDrawing` reads a drawing path relative to the job
 * (null where drawings cannot be read: an upload to the app).
 * @throws JobError for any bad field; the drawing import throws DxfImportError.
 */
export function jobModel(job: Job, readDrawing: ((relativePath: string) => Uint8Array) | null): JobModel {
  const { joints, members, tolerance } = geometryOf(job, readDrawing);
  // "units" converts the drawing or inline coordinates; every "at" and EA end point is in metres.
  const f = 1;
  stiffnessApply(job, members, joints, tolerance, f);
  const supports: TrussModel['supports'] = job.supports.map((s) => {
    const joint = jointAt(joints, [s.at[0] * f, s.at[1] * f], tolerance, `${s.type} support`);
    if (s.type === 'pin') {
      if (s.angle !== undefined) throw new JobError(`The pin at [${s.at.join(', ')}] has an "angle"; only a roller takes one.`);
      return { joint, kind: 'pin' as const };
    }
    return { joint, kind: 'roller' as const, angleDeg: s.angle ?? 90 };
  });
  const loadCases = casesOf(job, joints, tolerance, f);
  const model: TrussModel = { joints, members, supports, loadCases, combinations: combinationsOf(job, loadCases) };
  const design = jobDesignInput(job.design, job.deflection, model, (p, what) => jointAt(joints, p, tolerance, what));
  if (design) model.design = design;
  return { model, takeoff: takeoffOf(job, model), tolerance };
}

/**
 * The model a run solves, as the app's run snapshot makes it (runs.service.ts snapshotOf): the
 * loads exactly as the job's cases hold them (the roof loading never replaces a case at solve
 * time; its marked cases already hold its loads, jobModel), and members without a stiffness of
 * their own given the E·A of their design section (withDesignStiffness).
 */
export function jobModelSolved(jm: JobModel): TrussModel {
  return withDesignStiffness(jm.model);
}

/** Effective axial stiffness of a member, kN (EA, else E·A), or null. */
export function memberEA(m: TrussModel['members'][number]): number | null {
  return m.EA ?? (m.E !== undefined && m.A !== undefined ? m.E * m.A : null);
}

/**
 * The job file of a saved model (the app's export): everything the model and its roof loading
 * hold. "EA" is each member's own stiffness; a member without one takes its design section's,
 * on the command line as in the app (jobModelSolved), so both solve the same model.
 */
export function jobFileOf(model: TrussModel, takeoff: TakeoffInput | null): Record<string, unknown> {
  const index = new Map(model.joints.map((j, i) => [j.id, i]));
  const at = new Map(model.joints.map((j) => [j.id, [j.x, j.y] as [number, number]]));
  // A tolerance below half the closest joint spacing, so no "at" can find the wrong joint.
  let closest = Infinity;
  const sorted = [...model.joints].sort((a, b) => a.x - b.x);
  for (let i = 0; i < sorted.length; i++) {
    for (let k = i + 1; k < sorted.length && sorted[k].x - sorted[i].x < closest; k++) {
      closest = Math.min(closest, Math.hypot(sorted[k].x - sorted[i].x, sorted[k].y - sorted[i].y));
    }
  }
  const tolerance = Math.min(JOB_DEFAULT_TOLERANCE, Number.isFinite(closest) ? closest / 4 : JOB_DEFAULT_TOLERANCE);
  const eas = model.members.map((m) => memberEA(m));
  const allSame = eas.length > 0 && eas.every((v) => v !== null && v === eas[0]);
  const EA = allSame
    ? eas[0]
    : model.members.flatMap((m, k) => (eas[k] === null ? [] : [{ from: at.get(m.from), to: at.get(m.to), EA: eas[k] }]));
  return {
    units: 'm',
    tolerance,
    joints: model.joints.map((j) => ({ id: j.id, tag: j.tag, at: [j.x, j.y] })),
    members: model.members.map((m) => ({
      id: m.id,
      tag: m.tag,
      joints: [index.get(m.from), index.get(m.to)],
      ...(m.group ? { group: m.group } : {}),
      ...(m.material ? { material: m.material } : {}),
      ...(m.section ? { section: m.section } : {}),
    })),
    supports: model.supports.map((s) => (s.kind === 'pin' ? { at: at.get(s.joint), type: 'pin' } : { at: at.get(s.joint), type: 'roller', angle: s.angleDeg })),
    cases: model.loadCases.map((c) => ({ id: c.id, name: c.name, category: c.category, ...(c.source ? { source: c.source } : {}) })),
    loads: model.loadCases.flatMap((c) => c.loads.map((l) => ({ at: at.get(l.joint), fx: l.fx, fy: l.fy, case: c.id, ...(l.note ? { note: l.note } : {}) }))),
    ...(Array.isArray(EA) ? (EA.length ? { EA } : {}) : { EA }),
    combinations: model.combinations.map((c) => ({ name: c.name, factors: c.factors, ...(c.clause ? { clause: c.clause } : {}) })),
    ...(takeoff ? { takeoff } : {}),
    ...jobDesignOf(model),
  };
}
