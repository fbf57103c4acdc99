import { DEFAULT_IMPORT_LIMITS, type ImportLimits, type ImportLimitsView } from '@shared/schemas/import-limits.schema';
import { ImportLimitsRecord, User } from '../../db/models';

/** The firm's caps on reading a drawing: the saved row, or the defaults when none was saved. */
export async function getImportLimits(): Promise<ImportLimitsView> {
  const row = await ImportLimitsRecord.findByPk(1);
  if (!row) return { ...DEFAULT_IMPORT_LIMITS, updatedBy: '', updatedAt: null };
  const by = row.updatedById === null ? null : await User.findByPk(row.updatedById, { attributes: ['name'] });
  return {
    maxSegments: row.maxSegments,
    maxBlockDepth: row.maxBlockDepth,
    timeLimitSeconds: row.timeLimitSeconds,
    updatedBy: by?.name ?? '',
    updatedAt: new Date(row.updatedAt).toISOString(),
  };
}

/** Saves new caps (already checked against the schema's bounds); they apply to the next import. */
export async function saveImportLimits(input: ImportLimits, userId: number): Promise<ImportLimitsView> {
  await ImportLimitsRecord.upsert({ id: 1, ...input, updatedById: userId });
  return getImportLimits();
}
