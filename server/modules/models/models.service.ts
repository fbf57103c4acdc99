import type { TrussModel } from '@shared/model/truss';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import type { ModelSaveInput } from '@shared/schemas/model.schema';
import { AppError, conflict, notFound } from '../../errors/app-error';
import { TrussModelRecord, User } from '../../db/models';
import { getTruss } from '../projects/projects.service';
import { assertTakeoffCases, computeTakeoff, takeoffParseStored } from '../takeoff/takeoff-compute';

async function toView(r: TrussModelRecord): Promise<TrussModelView> {
  const by = r.updatedById ? await User.findByPk(r.updatedById, { attributes: ['name'] }) : null;
  return {
    trussId: r.trussId,
    drawingId: r.drawingId,
    model: JSON.parse(r.model),
    takeoff: r.takeoff ? JSON.parse(r.takeoff) : null,
    version: r.version,
    updatedBy: by?.name ?? '',
    updatedAt: new Date(r.updatedAt).toISOString(),
  };
}

export async function getModel(trussId: number): Promise<TrussModelView> {
  await getTruss(trussId);
  const record = await TrussModelRecord.findByPk(trussId);
  if (!record) {
    throw new AppError('no-model-yet', 'This truss has no model yet: upload its DXF drawing first.', 404);
  }
  return toView(record);
}

/** Checks every reference of a save against the model's joints and members, naming what is wrong. */
function assertReferences(model: TrussModel, input: ModelSaveInput): void {
  const joints = new Map(model.joints.map((j) => [j.id, j]));
  const members = new Set(model.members.map((m) => m.id));
  const seenSupport = new Set<string>();
  for (const s of input.supports) {
    if (!joints.has(s.joint)) throw new AppError('unknown-joint', `A support is on joint "${s.joint}", which this truss does not have. Pick a joint from the drawing.`, 400);
    if (seenSupport.has(s.joint)) throw new AppError('two-supports', `Joint ${joints.get(s.joint)!.tag} has two supports. Keep one: a pin, or a roller with its angle.`, 400);
    seenSupport.add(s.joint);
  }
  const caseIds = new Set<string>();
  for (const lc of input.loadCases) {
    if (caseIds.has(lc.id)) throw new AppError('duplicate-load-case', `Two load cases are both called "${lc.id}". Give each a different id.`, 400);
    caseIds.add(lc.id);
    for (const l of lc.loads) {
      if (!joints.has(l.joint)) {
        throw new AppError('unknown-joint', `Load case "${lc.id}" has a load on joint "${l.joint}", which this truss does not have. Pick a joint from the drawing.`, 400);
      }
    }
  }
  for (const c of input.combinations) {
    for (const id of Object.keys(c.factors)) {
      if (!caseIds.has(id)) throw new AppError('unknown-load-case', `Combination "${c.name}" has a factor on load case "${id}", which does not exist. Add the case or remove the factor.`, 400);
    }
  }
  for (const m of input.members) {
    if (!members.has(m.id)) throw new AppError('unknown-member', `Member "${m.id}" is not in this truss. Reload the page: the drawing may have been re-imported.`, 400);
  }
}

/**
 * Saves supports, loads, combinations and member properties. The save names the version it
 * started from; if someone else saved in between, it is refused and nothing is lost.
 */
export async function saveModel(trussId: number, input: ModelSaveInput, userId: number): Promise<TrussModelView> {
  await getTruss(trussId);
  const sequelize = TrussModelRecord.sequelize!;
  const record = await sequelize.transaction(async (transaction) => {
    const record = await TrussModelRecord.findByPk(trussId, { transaction });
    if (!record) throw notFound('The model of that truss');
    if (record.version !== input.version) {
      throw conflict(
        'edit-conflict',
        `Someone else saved this model while you were editing (yours was version ${input.version}, it is now ${record.version}). Reload to see their changes, then make yours again.`,
      );
    }
    const model = JSON.parse(record.model) as TrussModel;
    assertReferences(model, input);
    // The takeoff kept or sent must still fit: its cases exist and its purlins sit on top-chord joints.
    const takeoff = input.takeoff === undefined ? takeoffParseStored(record.takeoff) : input.takeoff;
    if (takeoff) {
      assertTakeoffCases(takeoff, input.loadCases);
      computeTakeoff(model, takeoff);
    }
    const props = new Map(input.members.map((m) => [m.id, m]));
    const next: TrussModel = {
      joints: model.joints,
      members: model.members.map((m) => {
        const p = props.get(m.id);
        return p ? { id: m.id, tag: m.tag, from: m.from, to: m.to, ...stripUndefined(p) } : m;
      }),
      supports: input.supports,
      loadCases: input.loadCases,
      combinations: input.combinations,
    };
    const [updated] = await TrussModelRecord.update(
      {
        model: JSON.stringify(next),
        // null removes the takeoff: stored as SQL NULL, not the text 'null' (which no run could read).
        takeoff: input.takeoff === undefined ? record.takeoff : input.takeoff === null ? null : JSON.stringify(input.takeoff),
        version: record.version + 1,
        updatedById: userId,
      },
      { where: { trussId, version: input.version }, transaction },
    );
    if (updated !== 1) throw conflict('edit-conflict', 'Someone else saved this model at the same moment. Reload and make your change again.');
    return (await TrussModelRecord.findByPk(trussId, { transaction }))!;
  });
  return toView(record);
}

function stripUndefined<T extends object>(o: T): Partial<T> {
  return Object.fromEntries(Object.entries(o).filter(([k, v]) => v !== undefined && k !== 'id')) as Partial<T>;
}
