/**
 * The job file of `npm run -s solve` and `npm run -s sheet` (format: the solve command, issue 4
 * item 10), read into a truss model. Pure apart from reading the job file and its drawing.
 *
 * JOB.json (lengths in metres after unit conversion, forces in kN, fy positive up):
 *   drawing      DXF path relative to the job file, read through the drawing import; or
 *   joints       [[x, y], …] and members [[i, j], …] (0-based joint indices) inline
 *   layers       optional member layers of the drawing
 *   units        "m" | "mm" | "cm" | "in" | "ft" (drawing or inline coordinates; required for a
 *                drawing without $INSUNITS; inline default "m")
 *   tolerance    optional, m: joint merging in the import, and how far an "at" may be from a joint
 *   supports     [{ "at": [x, y], "type": "pin" | "roller", "angle": deg (roller line from +x, default 90) }]
 *   loads        [{ "at": [x, y], "fx": kN, "fy": kN, "case": "D" }]
 *   EA           optional kN for every member (needed when the truss is indeterminate)
 *   combinations optional [{ "name": "C1", "factors": { "D": 1.2, "S": 1.6 }, "clause": "…" }]
 *
 * The loading code is the solve command's (scripts/solve.ts), moved here so the sheet command
 * reads jobs the same way; solve.ts can import it from here.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import type { TrussModel } from '@shared/model/truss';
import { dxfImport, dxfParseBytes, tagOfIndex } from '@shared/dxf-import/index';

/** Bad input in a job file: the message names the field or the item and what to do. */
export class JobError extends Error {
  readonly code = 'bad-job';
}

const point = z.tuple([z.number().finite(), z.number().finite()]);
/** The job file (see the header of this file). */
export const jobSchema = z
  .object({
    drawing: z.string().min(1).optional(),
    joints: z.array(point).optional(),
    members: z.array(z.tuple([z.number().int().nonnegative(), z.number().int().nonnegative()])).optional(),
    layers: z.array(z.string().min(1)).optional(),
    units: z.enum(['m', 'mm', 'cm', 'in', 'ft']).optional(),
    tolerance: z.number().positive().finite().optional(),
    supports: z.array(
      z.object({
        at: point,
        type: z.enum(['pin', 'roller']),
        angle: z.number().finite().optional(),
      }),
    ),
    loads: z
      .array(
        z.object({
          at: point,
          fx: z.number().finite().default(0),
          fy: z.number().finite().default(0),
          case: z.string().min(1).max(40).default('D'),
        }),
      )
      .default([]),
    EA: z.number().positive().finite().optional(),
    combinations: z
      .array(z.object({ name: z.string().min(1).max(80), factors: z.record(z.string(), z.number().finite()), clause: z.string().max(200).optional() }))
      .default([]),
    /** Parsed and run by scripts/job-design.ts after the analysis. */
    design: z.unknown().optional(),
    deflection: z.unknown().optional(),
  })
  .strict();
export type Job = z.infer<typeof jobSchema>;

const METRES_PER_UNIT = { m: 1, mm: 0.001, cm: 0.01, in: 0.0254, ft: 0.3048 } as const;
const DEFAULT_TOLERANCE = 0.001;

function geometryOf(job: Job, jobDir: string): { joints: TrussModel['joints']; members: TrussModel['members']; tolerance: number } {
  if (job.drawing) {
    if (job.joints || job.members) throw new JobError('Give either "drawing" or inline "joints" and "members", not both.');
    const file = path.resolve(jobDir, job.drawing);
    let bytes: Buffer;
    try {
      bytes = readFileSync(file);
    } catch {
      throw new JobError(`Cannot read the drawing ${job.drawing} (looked for ${file}).`);
    }
    const parsed = dxfParseBytes(new Uint8Array(bytes));
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
  const tags = job.joints.map((_, i) => tagOfIndex(i));
  const joints = job.joints.map(([x, y], i) => ({ id: tags[i], tag: tags[i], x: x * f, y: y * f }));
  const members = job.members.map(([a, b], k) => {
    for (const i of [a, b]) {
      if (i >= joints.length) throw new JobError(`Member ${k} refers to joint index ${i}, but there are only ${joints.length} joints (indices start at 0).`);
    }
    return { from: tags[a], to: tags[b], tag: `${tags[a]}${tags[b]}` };
  });
  return { joints, members: uniqueTags(members), tolerance: job.tolerance ?? DEFAULT_TOLERANCE };
}

function uniqueTags(list: { from: string; to: string; tag: string }[]): TrussModel['members'] {
  const seen = new Map<string, number>();
  return list.map((m) => {
    const n = (seen.get(m.tag) ?? 0) + 1;
    seen.set(m.tag, n);
    const tag = n === 1 ? m.tag : `${m.tag}-${n}`;
    return { id: tag, tag, from: m.from, to: m.to };
  });
}

function jointAt(joints: TrussModel['joints'], at: [number, number], tolerance: number, what: string): string {
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

/** The truss model of a parsed job; `jobDir` resolves a relative drawing path. */
export function jobModel(job: Job, jobDir: string): TrussModel {
  const { joints, members, tolerance } = geometryOf(job, jobDir);
  if (job.EA) for (const m of members) m.EA = job.EA;
  const supports: TrussModel['supports'] = job.supports.map((s) => {
    const joint = jointAt(joints, s.at, tolerance, `${s.type} support`);
    if (s.type === 'pin') {
      if (s.angle !== undefined) throw new JobError(`The pin at [${s.at.join(', ')}] has an "angle"; only a roller takes one.`);
      return { joint, kind: 'pin' as const };
    }
    return { joint, kind: 'roller' as const, angleDeg: s.angle ?? 90 };
  });
  const cases = new Map<string, TrussModel['loadCases'][number]>();
  for (const ld of job.loads) {
    const joint = jointAt(joints, ld.at, tolerance, `load of case ${ld.case}`);
    if (!cases.has(ld.case)) cases.set(ld.case, { id: ld.case, name: ld.case, category: 'other', loads: [] });
    cases.get(ld.case)!.loads.push({ joint, fx: ld.fx, fy: ld.fy });
  }
  return { joints, members, supports, loadCases: [...cases.values()], combinations: job.combinations };
}

/**
 * Reads, validates and converts a job file into a truss model.
 * @throws JobError for a missing or unreadable file, bad JSON or a bad field; the drawing import
 * and the solver throw their own typed errors (DxfImportError, SolverError).
 */
export function jobLoad(jobPath: string): { job: Job; model: TrussModel } {
  let text: string;
  try {
    text = readFileSync(jobPath, 'utf8');
  } catch {
    throw new JobError(`Cannot read the job file ${jobPath}.`);
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    throw new JobError(`The job file ${jobPath} is not valid JSON (${(e as Error).message}).`);
  }
  const parsed = jobSchema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const where = issue.path.length ? issue.path.join('.') : 'the job';
    throw new JobError(`In ${jobPath}, ${where}: ${issue.message}.`);
  }
  return { job: parsed.data, model: jobModel(parsed.data, path.dirname(path.resolve(jobPath))) };
}
