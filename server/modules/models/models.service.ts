import { QueryTypes, type Transaction } from 'sequelize';
import { readRows } from '../../db/read-rows';
import { capitalised, modelSaveName } from '@shared/text/citations';
import type { JointLoad, TrussModel } from '@shared/model/truss';
import { roofLoadsProblem } from '@shared/model/roof-loads';
import { sheetRevisionLabel } from '@shared/schemas/review.schema';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import type { DesignSaveInput, ModelSaveInput } from '@shared/schemas/model.schema';
import { designBasisOf } from '@shared/design/basis';
import { DesignError } from '@shared/design/errors';
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
  // Read on every visit to a truss: the truss, its model and the name of who saved it last in
  // one hand-written query of plain rows, not three model reads (bench:api).
  const rows = await readRows<{
    truss: number;
    trussId: number | null;
    drawingId: number | null;
    model: string | null;
    takeoff: string | null;
    version: number;
    updatedAt: string | Date;
    updatedBy: string | null;
  }>(
    TrussModelRecord.sequelize!,
    `SELECT t."id" AS "truss", m."trussId", m."drawingId", m."model", m."takeoff", m."version", m."updatedAt", u."name" AS "updatedBy"
       FROM "trusses" t
       LEFT JOIN "truss_models" m ON m."trussId" = t."id"
       LEFT JOIN "users" u ON u."id" = m."updatedById"
      WHERE t."id" = :trussId`,
    { trussId },
  );
  const r = rows[0];
  if (!r) throw notFound('That truss');
  if (r.trussId === null || r.model === null) {
    throw new AppError('no-model-yet', 'This truss has no model yet: upload its DXF drawing first.', 404);
  }
  return {
    trussId: r.trussId,
    drawingId: r.drawingId,
    model: JSON.parse(r.model),
    takeoff: r.takeoff ? JSON.parse(r.takeoff) : null,
    version: r.version,
    updatedBy: r.updatedBy ?? '',
    updatedAt: new Date(r.updatedAt).toISOString(),
  };
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
        `Someone else saved this model while you were editing (you opened ${modelSaveName(input.version)}, it is now ${modelSaveName(record.version)}). Reload to see their changes, then make yours again.`,
      );
    }
    const model = JSON.parse(record.model) as TrussModel;
    assertReferences(model, input);
    // The takeoff kept or sent must still fit: its cases exist and its purlins sit on top-chord joints.
    const takeoff = input.takeoff === undefined ? takeoffParseStored(record.takeoff) : input.takeoff;
    let caseLoads: Record<string, JointLoad[]> | null = null;
    if (takeoff) {
      assertTakeoffCases(takeoff, input.loadCases);
      caseLoads = computeTakeoff(model, takeoff, input.loadCases).caseLoads;
    }
    // What the loads table shows is what a run solves: a case from the roof loading holds exactly its loads.
    const problem = roofLoadsProblem(model.loadCases, input.loadCases, caseLoads, input.takeoff === null);
    if (problem) throw new AppError(problem.code, problem.message, 422);
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
      // The member design is saved by its own route and kept by this one.
      ...(model.design ? { design: model.design } : {}),
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

/**
 * Checks a member design against the saved model: every member in a group, sections and
 * materials that make sense, deflection joints and combinations that exist. One sentence (422)
 * for the first thing wrong.
 */
export function assertDesign(model: TrussModel, design: NonNullable<DesignSaveInput['design']>): void {
  try {
    designBasisOf(model, design);
  } catch (e) {
    if (e instanceof DesignError) throw new AppError(e.code, e.message, 422);
    throw e;
  }
  if (design.deflection) {
    const joints = new Set(model.joints.map((j) => j.id));
    const bad = design.deflection.joints.find((j) => !joints.has(j));
    if (bad !== undefined) throw new AppError('unknown-joint', `The deflection joint “${bad}” is not in this truss; pick a joint on the drawing.`, 422);
    const names = [...model.combinations.map((c) => c.name), ...model.loadCases.map((c) => c.id)];
    const badCombo = design.deflection.combinations.find((c) => !names.includes(c));
    if (badCombo !== undefined) {
      throw new AppError('unknown-combination', `The service combination “${badCombo}” is neither a combination nor a load case of this truss; pick one of ${names.slice(0, 12).join(', ') || '(none yet: add load cases first)'}.`, 422);
    }
  }
}

/**
 * The model with its member design replaced (null removes it), checked by assertDesign: the one
 * rule of the Design tab's save and of a job file's import.
 */
export function modelWithDesign(model: TrussModel, design: DesignSaveInput['design']): TrussModel {
  if (design) assertDesign(model, design);
  const { design: _old, ...rest } = model;
  void _old;
  return design ? { ...rest, design } : rest;
}

/**
 * Saves the member design (design basis, groups with material and section, deflection request)
 * as a new model version, with the same edit-conflict rule as the model save.
 */
export async function saveDesign(trussId: number, input: DesignSaveInput, userId: number): Promise<TrussModelView> {
  await getTruss(trussId);
  const sequelize = TrussModelRecord.sequelize!;
  const record = await sequelize.transaction(async (transaction) => {
    const record = await TrussModelRecord.findByPk(trussId, { transaction });
    if (!record) throw new AppError('no-model-yet', 'This truss has no model yet: upload its DXF drawing first.', 404);
    if (record.version !== input.version) {
      throw conflict(
        'edit-conflict',
        `Someone else saved this model while you were editing (you opened ${modelSaveName(input.version)}, it is now ${modelSaveName(record.version)}). Reload to see their changes, then make yours again.`,
      );
    }
    const next = modelWithDesign(JSON.parse(record.model) as TrussModel, input.design);
    const [updated] = await TrussModelRecord.update(
      { model: JSON.stringify(next), version: record.version + 1, updatedById: userId },
      { where: { trussId, version: input.version }, transaction },
    );
    if (updated !== 1) throw conflict('edit-conflict', 'Someone else saved this model at the same moment. Reload and make your change again.');
    return (await TrussModelRecord.findByPk(trussId, { transaction }))!;
  });
  return toView(record);
}

/**
 * "Detach and edit by hand": the case keeps its loads as they are, no longer marked as from the
 * roof loading, so the takeoff stops updating them and the loads table lets them be edited. A new
 * model save. Refused (409, nothing written) when the current model save is the one an issued
 * sheet revision was made from: that sheet says these loads come from the roof loading.
 */
export async function detachRoofLoads(trussId: number, input: { version: number; caseId: string }, userId: number): Promise<TrussModelView> {
  await getTruss(trussId);
  const sequelize = TrussModelRecord.sequelize!;
  const record = await sequelize.transaction(async (transaction) => {
    const record = await TrussModelRecord.findByPk(trussId, { transaction });
    if (!record) throw new AppError('no-model-yet', 'This truss has no model yet: upload its DXF drawing first.', 404);
    if (record.version !== input.version) {
      throw conflict(
        'edit-conflict',
        `Someone else saved this model while you were editing (you opened ${modelSaveName(input.version)}, it is now ${modelSaveName(record.version)}). Reload to see their changes, then detach again.`,
      );
    }
    const model = JSON.parse(record.model) as TrussModel;
    const target = model.loadCases.find((c) => c.id === input.caseId);
    if (!target) throw new AppError('unknown-load-case', `Load case "${input.caseId}" is not in this model; reload the page and pick a case from the loads table.`, 422);
    if (target.source !== 'roof-loading') {
      throw new AppError('not-from-roof-loading', `The loads of load case "${input.caseId}" are already entered by hand, so there is nothing to detach.`, 422);
    }
    const issued = await issuedRevisionOfSave(trussId, record.version, transaction);
    if (issued !== null) {
      throw conflict(
        'model-issued',
        `${capitalised(modelSaveName(record.version))} is the one issued sheet revision ${sheetRevisionLabel(issued)} was made from, so its loads from the roof loading are not detached; change the roof loading and use its loads again instead.`,
      );
    }
    const next: TrussModel = {
      ...model,
      loadCases: model.loadCases.map((c) => {
        if (c.id !== input.caseId) return c;
        const { source: _s, ...rest } = c;
        void _s;
        return rest;
      }),
    };
    const [updated] = await TrussModelRecord.update(
      { model: JSON.stringify(next), version: record.version + 1, updatedById: userId },
      { where: { trussId, version: input.version }, transaction },
    );
    if (updated !== 1) throw conflict('edit-conflict', 'Someone else saved this model at the same moment. Reload and detach again.');
    return (await TrussModelRecord.findByPk(trussId, { transaction }))!;
  });
  return toView(record);
}

/**
 * The number of the newest issued (or since superseded) sheet revision of the truss whose run
 * solved this model save, or null. Reads the sheet and run tables of other modules by their columns.
 */
async function issuedRevisionOfSave(trussId: number, modelVersion: number, transaction: Transaction): Promise<number | null> {
  const rows = await TrussModelRecord.sequelize!.query<{ number: number }>(
    `SELECT s.number FROM sheet_revisions s JOIN analysis_runs r ON r.id = s."runId"
      WHERE s."trussId" = :trussId AND s.status IN ('issued', 'superseded') AND r."modelVersion" = :modelVersion
      ORDER BY s.number DESC LIMIT 1`,
    { replacements: { trussId, modelVersion }, type: QueryTypes.SELECT, transaction },
  );
  return rows.length ? Number(rows[0]!.number) : null;
}
