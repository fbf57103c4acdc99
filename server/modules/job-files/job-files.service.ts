import type { TrussModel } from '@shared/model/truss';
import { trussModelSchema } from '@shared/model/truss';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import { DxfImportError } from '@shared/dxf-import/index';
import { SolverError } from '@shared/solver/errors';
import { modelPrepare } from '@shared/solver/prepare';
import { AppError, conflict } from '../../errors/app-error';
import { TrussModelRecord } from '../../db/models';
import { getTruss } from '../projects/projects.service';
import { getModel, modelWithDesign } from '../models/models.service';
import { takeoffParseStored } from '../takeoff/takeoff-compute';
import { JobError, jobFileOf, jobModel, jobParse, memberEA } from './job-file';

/** Where the import says the problem is. */
const WHERE = 'the job file';

async function recordOf(trussId: number): Promise<TrussModelRecord> {
  await getTruss(trussId);
  const record = await TrussModelRecord.findByPk(trussId);
  if (!record) throw new AppError('no-model-yet', 'This truss has no model yet: upload its DXF drawing first.', 404);
  return record;
}

/** A file name of plain letters, digits and dashes from the truss name. */
function fileNameOf(name: string, trussId: number): string {
  const safe = name.normalize('NFKD').replace(/[^A-Za-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60);
  return `${safe || `truss-${trussId}`}.job.json`;
}

/**
 * The saved model of a truss as a job file (server/modules/job-files/job-file.ts): what
 * `npm run -s solve` reads to give the forces a run of this model gives.
 */
export async function exportJobFile(trussId: number): Promise<{ json: string; fileName: string }> {
  const truss = await getTruss(trussId);
  const record = await recordOf(trussId);
  const model = JSON.parse(record.model) as TrussModel;
  const takeoff = takeoffParseStored(record.takeoff);
  const job = jobFileOf(model, takeoff);
  return { json: `${JSON.stringify(job, null, 1)}\n`, fileName: fileNameOf(truss.name, trussId) };
}

/** Joint and member ids of the job matched to the truss's own, by position; a sentence when the geometry differs. */
function geometryMatch(truss: TrussModel, job: TrussModel, tolerance: number): { joint: Map<string, string>; member: Map<string, string> } {
  if (job.joints.length !== truss.joints.length || job.members.length !== truss.members.length) {
    throw new JobError(
      `The job file has ${job.joints.length} joints and ${job.members.length} members, but this truss has ${truss.joints.length} and ${truss.members.length}; a job file can bring supports, loads, combinations, stiffness and roof loading onto the truss's own geometry only (change the geometry by uploading a drawing).`,
    );
  }
  const joint = new Map<string, string>();
  const taken = new Set<string>();
  for (const j of job.joints) {
    let best: TrussModel['joints'][number] | null = null;
    let bestD = Infinity;
    for (const t of truss.joints) {
      const d = Math.hypot(t.x - j.x, t.y - j.y);
      if (d < bestD) {
        bestD = d;
        best = t;
      }
    }
    if (!best || bestD > tolerance || taken.has(best.id)) {
      throw new JobError(`Joint ${j.tag} of the job file at [${j.x}, ${j.y}] m is not a joint of this truss within ${tolerance} m; import a job file of this truss's geometry (change the geometry by uploading a drawing).`);
    }
    taken.add(best.id);
    joint.set(j.id, best.id);
  }
  const byEnds = new Map(truss.members.map((m) => [[m.from, m.to].sort().join('\u0000'), m.id]));
  const member = new Map<string, string>();
  for (const m of job.members) {
    const id = byEnds.get([joint.get(m.from)!, joint.get(m.to)!].sort().join('\u0000'));
    if (!id) throw new JobError(`Member ${m.tag} of the job file joins two joints that no member of this truss joins; import a job file of this truss's geometry.`);
    member.set(m.id, id);
  }
  return { joint, member };
}

const STIFFNESS_MATCH = 1e-12;

/**
 * Imports a job file as the next version of a truss's model: supports, load cases and loads,
 * combinations (hand-written and from "combinationSet"), member stiffness and labels (group,
 * material, section), the roof loading and the member design with its deflection request replace
 * the saved ones — a file without "design" leaves the truss without one, as a file without loads
 * leaves it without loads. Joints and members stay the truss's own (the job's must be at the same
 * places). The design goes through the Design tab's own check (modelWithDesign), in the same
 * transaction as the rest: one sentence (422) for the first problem, and nothing is written then.
 */
export async function importJobFile(trussId: number, raw: unknown, userId: number): Promise<TrussModelView> {
  await getTruss(trussId);
  const sequelize = TrussModelRecord.sequelize!;
  try {
    const job = jobParse(raw, WHERE);
    const jm = jobModel(job, null);
    await sequelize.transaction(async (transaction) => {
      const record = await TrussModelRecord.findByPk(trussId, { transaction });
      if (!record) throw new AppError('no-model-yet', 'This truss has no model yet: upload its DXF drawing first.', 404);
      const saved = JSON.parse(record.model) as TrussModel;
      const { joint, member } = geometryMatch(saved, jm.model, jm.tolerance);
      const jobMember = new Map(jm.model.members.map((m) => [member.get(m.id)!, m]));
      const members = saved.members.map((m) => {
        const from = jobMember.get(m.id)!;
        const { E: _e, A: _a, EA: _ea, group: _g, material: _m, section: _s, ...bare } = m;
        void [_e, _a, _ea, _g, _m, _s];
        const labels = { ...(from.group ? { group: from.group } : {}), ...(from.material ? { material: from.material } : {}), ...(from.section ? { section: from.section } : {}) };
        // The member's own stiffness: kept as E and A when the job's EA is their product, else the job's EA.
        const given = from.EA ?? null;
        const now = memberEA(m);
        const own = given !== null && now !== null && Math.abs(given - now) <= STIFFNESS_MATCH * Math.abs(now) ? { ...(m.E !== undefined ? { E: m.E } : {}), ...(m.A !== undefined ? { A: m.A } : {}), ...(m.EA !== undefined ? { EA: m.EA } : {}) } : given === null ? {} : { EA: given };
        return { ...bare, ...labels, ...own };
      });
      const j = (id: string) => joint.get(id)!;
      const plain: TrussModel = {
        joints: saved.joints,
        members,
        supports: jm.model.supports.map((s) => ({ ...s, joint: j(s.joint) })),
        loadCases: jm.model.loadCases.map((c) => ({ ...c, loads: c.loads.map((l) => ({ ...l, joint: j(l.joint) })) })),
        combinations: jm.model.combinations,
      };
      const d = jm.model.design;
      const design = d
        ? {
            ...d,
            groups: d.groups.map((g) => ({ ...g, members: typeof g.members === 'string' ? g.members : g.members.map((id) => member.get(id)!) })),
            ...(d.deflection ? { deflection: { ...d.deflection, joints: d.deflection.joints.map(j) } } : {}),
          }
        : null;
      const takeoff = jm.takeoff
        ? {
            ...jm.takeoff,
            topChordJoints: jm.takeoff.topChordJoints.map(j),
            ...(jm.takeoff.purlinJoints ? { purlinJoints: jm.takeoff.purlinJoints.map(j) } : {}),
          }
        : null;
      // The app's own checks of a model: its schema (bounds) and the solver's (supports, loads, ids).
      const checked = trussModelSchema.safeParse(plain);
      if (!checked.success) throw new JobError(`In ${WHERE}: ${checked.error.issues[0].message.replace(/\.$/, '')}.`);
      modelPrepare(plain);
      // The Design tab's own rule (PUT /api/trusses/:id/design): an AppError 422 that writes nothing.
      const next = modelWithDesign(plain, design);
      const [updated] = await TrussModelRecord.update(
        { model: JSON.stringify(next), takeoff: takeoff ? JSON.stringify(takeoff) : null, version: record.version + 1, updatedById: userId },
        { where: { trussId, version: record.version }, transaction },
      );
      if (updated !== 1) throw conflict('edit-conflict', 'Someone else saved this model at the same moment. Import the job file again.');
    });
  } catch (e) {
    if (e instanceof JobError || e instanceof SolverError || e instanceof DxfImportError) throw new AppError(e instanceof JobError ? 'bad-job-file' : e.code, e.message, 422);
    throw e;
  }
  return getModel(trussId);
}
