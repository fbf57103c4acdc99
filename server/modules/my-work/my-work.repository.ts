import { Op, QueryTypes } from 'sequelize';
import { SheetComment, SheetRevision } from '../../db/models';
import { revisionRow, type RevisionRow } from '../records/records.repository';

/** The reads of "My work": revisions waiting for one person, and drawings whose import needs a look. */

export interface DrawingProblemRow {
  id: number;
  trussId: number;
  version: number;
  originalName: string;
  status: 'imported' | 'failed';
  result: string | null;
  error: string | null;
  importedAt: string | Date;
}

export const myWorkRepository = {
  /**
   * In check, waiting for this reviewer: the chosen checker is them, or (revisions submitted
   * before checkers were chosen, migration 0017) no checker was chosen and they did not prepare it.
   */
  async toCheck(userId: number): Promise<RevisionRow[]> {
    const rows = await SheetRevision.findAll({
      where: {
        status: 'in-check',
        [Op.or]: [{ checkerId: userId }, { checkerId: null, preparedById: { [Op.ne]: userId } }],
      },
      order: [['submittedAt', 'ASC'], ['id', 'ASC']],
      raw: true,
    });
    return (rows as unknown as RevisionRow[]).map(revisionRow);
  },

  /** Revisions this person prepared, in the given status, oldest change first. */
  async preparedBy(userId: number, status: 'returned' | 'checked'): Promise<RevisionRow[]> {
    const rows = await SheetRevision.findAll({ where: { status, preparedById: userId }, order: [['updatedAt', 'ASC'], ['id', 'ASC']], raw: true });
    return (rows as unknown as RevisionRow[]).map(revisionRow);
  },

  /** Every revision of the given trusses (number, status): to tell which returned ones were revised. */
  async revisionsOf(trussIds: number[]): Promise<Pick<RevisionRow, 'id' | 'trussId' | 'number' | 'status'>[]> {
    if (trussIds.length === 0) return [];
    return (await SheetRevision.findAll({ attributes: ['id', 'trussId', 'number', 'status'], where: { trussId: trussIds }, raw: true })) as unknown as Pick<
      RevisionRow,
      'id' | 'trussId' | 'number' | 'status'
    >[];
  },

  async openThreadCounts(revisionIds: number[]): Promise<Map<number, number>> {
    const counts = new Map<number, number>();
    if (revisionIds.length === 0) return counts;
    const rows = await SheetComment.findAll({ attributes: ['revisionId'], where: { revisionId: revisionIds, parentId: null, resolvedAt: null }, raw: true });
    for (const r of rows) counts.set(r.revisionId, (counts.get(r.revisionId) ?? 0) + 1);
    return counts;
  },

  /**
   * The newest drawing version of each truss in a project not archived, where that version
   * failed to import or its report holds a warning. The warning test is a text match on the
   * stored report (JSON written by JSON.stringify, so without spaces), so only those rows'
   * reports are read and parsed.
   */
  async drawingsWithProblems(): Promise<DrawingProblemRow[]> {
    return SheetRevision.sequelize!.query<DrawingProblemRow>(
      `SELECT d."id", d."trussId", d."version", d."originalName", d."status", d."result", d."error", d."importedAt"
         FROM "drawings" d
         JOIN "trusses" t ON t."id" = d."trussId"
         JOIN "projects" p ON p."id" = t."projectId"
        WHERE p."archived" = :no
          AND d."version" = (SELECT MAX(d2."version") FROM "drawings" d2 WHERE d2."trussId" = d."trussId")
          AND (d."status" = 'failed' OR d."result" LIKE :warning)
        ORDER BY d."importedAt" ASC, d."id" ASC`,
      { type: QueryTypes.SELECT, replacements: { no: false, warning: '%"severity":"warning"%' }, raw: true },
    );
  },
};
