import { Op, UniqueConstraintError, literal } from 'sequelize';
import { AnalysisRun, TrussModelRecord, User } from '../../db/models';

/** A run row as plain data; the JSON columns stay text so big results are never parsed needlessly. */
export interface RunRow {
  id: number;
  trussId: number;
  /** 1, 2, … within the truss. */
  number: number;
  modelVersion: number;
  status: AnalysisRun['status'];
  progress: string;
  model: string;
  takeoff: string | null;
  analysis: string | null;
  summary: string | null;
  error: string | null;
  ranById: number | null;
  ranBy: string;
  startedAt: Date | null;
  finishedAt: Date | null;
  createdAt: Date;
}

type RunUpdate = Partial<Pick<AnalysisRun, 'status' | 'progress' | 'analysis' | 'summary' | 'error' | 'startedAt' | 'finishedAt'>>;

const LIST_ATTRIBUTES = ['id', 'trussId', 'number', 'modelVersion', 'status', 'progress', 'takeoff', 'summary', 'error', 'ranById', 'startedAt', 'finishedAt', 'createdAt'] as const;

async function namesOf(ids: (number | null)[]): Promise<Map<number, string>> {
  const wanted = [...new Set(ids.filter((id): id is number => id !== null))];
  if (!wanted.length) return new Map();
  const users = await User.findAll({ where: { id: wanted }, attributes: ['id', 'name'] });
  return new Map(users.map((u) => [u.id, u.name]));
}

function toRow(r: AnalysisRun, names: Map<number, string>): RunRow {
  return {
    id: r.id,
    trussId: r.trussId,
    number: r.number,
    modelVersion: r.modelVersion,
    status: r.status,
    progress: r.progress,
    model: r.model ?? '',
    takeoff: r.takeoff ?? null,
    analysis: r.analysis ?? null,
    summary: r.summary ?? null,
    error: r.error ?? null,
    ranById: r.ranById,
    ranBy: r.ranById !== null ? (names.get(r.ranById) ?? '') : '',
    startedAt: r.startedAt ?? null,
    finishedAt: r.finishedAt ?? null,
    createdAt: new Date(r.createdAt),
  };
}

/**
 * Inserts a run as the truss's next number (the largest so far + 1). Two runs started at once may
 * both read the same largest number; the unique index on (trussId, number) refuses the second
 * insert, which then reads again and takes the next one.
 */
export async function insertRun(values: Omit<RunRow, 'id' | 'number' | 'ranBy' | 'createdAt'>): Promise<RunRow> {
  for (let attempt = 1; ; attempt++) {
    const last = (await AnalysisRun.max('number', { where: { trussId: values.trussId } })) as number | null;
    try {
      const created = await AnalysisRun.create({ ...values, number: (last ?? 0) + 1 });
      return toRow(created, await namesOf([created.ranById]));
    } catch (err) {
      if (!(err instanceof UniqueConstraintError) || attempt >= 20) throw err;
    }
  }
}

export async function updateRun(id: number, values: RunUpdate): Promise<void> {
  await AnalysisRun.update(values, { where: { id } });
}

/** A run with its snapshot and results, or null. */
export async function findRun(id: number): Promise<RunRow | null> {
  const r = await AnalysisRun.findByPk(id);
  return r ? toRow(r, await namesOf([r.ranById])) : null;
}

/** A truss's runs without snapshots or results, newest first. */
export async function listRuns(trussId: number): Promise<RunRow[]> {
  const rows = await AnalysisRun.findAll({ where: { trussId }, attributes: [...LIST_ATTRIBUTES], order: [['id', 'DESC']] });
  const names = await namesOf(rows.map((r) => r.ranById));
  return rows.map((r) => toRow(r, names));
}

/** The working model's current version, or null when the truss has no model. */
export async function currentModelVersion(trussId: number): Promise<number | null> {
  const record = await TrussModelRecord.findByPk(trussId, { attributes: ['version'] });
  return record ? record.version : null;
}

/** Marks every queued or running run failed; returns how many there were. */
export async function failUnfinishedRuns(values: { error: string; finishedAt: Date; progress: string }): Promise<number> {
  const [count] = await AnalysisRun.update({ status: 'failed', ...values }, { where: { status: ['queued', 'running'] } });
  return count;
}

/** The sheet revisions made from a run (another module's table, read by its columns), newest first. */
export async function revisionsOfRun(runId: number): Promise<{ number: number; status: string }[]> {
  const [rows] = await AnalysisRun.sequelize!.query('SELECT number, status FROM sheet_revisions WHERE "runId" = ? ORDER BY number DESC', { replacements: [runId] });
  return rows as { number: number; status: string }[];
}

/**
 * Writes a run's re-checked design in one statement that also makes sure no sheet revision was
 * started from the run meanwhile; false when one was (nothing written).
 */
export async function updateRunDesign(id: number, values: { model: string; analysis: string; summary: string; modelVersion: number }): Promise<boolean> {
  if (!Number.isSafeInteger(id)) return false;
  const [count] = await AnalysisRun.update(values, {
    where: { [Op.and]: [{ id }, literal(`NOT EXISTS (SELECT 1 FROM sheet_revisions WHERE sheet_revisions."runId" = ${id})`)] },
  });
  return count === 1;
}
