import type { WhereOptions } from 'sequelize';
import { readRows } from '../../db/read-rows';
import type { SheetStatus } from '@shared/schemas/review.schema';
import { Project, SheetRevision, SheetRevisionEvent, Truss } from '../../db/models';
import { sqlDate, sqlDateIso } from '../../db/sql-dates';

/**
 * Reads of what is kept: sheet revisions as stored (the issued ones are frozen by the
 * database's triggers), their audit log (written by a trigger, append-only), the truss and
 * project they belong to, and the archive search. Returns plain objects. The writes of the
 * check flow are in sheet-revisions.repository.ts, which builds on these rows.
 */

export interface RevisionRow {
  id: number;
  trussId: number;
  runId: number;
  number: number;
  status: SheetStatus;
  preparedById: number;
  checkedById: number | null;
  /** The checker chosen on submitting (0017); null before submission and on older rows. */
  checkerId: number | null;
  issuedById: number | null;
  preparedByName: string | null;
  checkedByName: string | null;
  issuedByName: string | null;
  submittedAt: Date | null;
  checkedAt: Date | null;
  issuedAt: Date | null;
  supersededAt: Date | null;
  supersededById: number | null;
  pdfStoredName: string | null;
  pdfSize: number | null;
  sha256: string | null;
  signedRecord: string | null;
  signature: string | null;
  keyFingerprint: string | null;
  createdAt: Date;
  updatedAt: Date;
}

export interface EventRow {
  id: number;
  revisionId: number;
  fromStatus: SheetStatus | null;
  toStatus: SheetStatus;
  actorId: number | null;
  note: string;
  at: Date;
}

export interface TrussContext {
  trussId: number;
  trussName: string;
  projectId: number;
  projectName: string;
  jobNumber: string;
}

/** The columns of a revision that one line of the archive shows (its signers included). */
export type ArchiveRevisionRow = Pick<
  RevisionRow,
  'id' | 'trussId' | 'number' | 'status' | 'sha256' | 'pdfSize' | 'supersededById' | 'preparedById' | 'preparedByName' | 'checkedById' | 'checkedByName' | 'issuedById' | 'issuedByName'
> & {
  /** A Date, or (as the archive list reads them) ISO 8601 text in UTC as toISOString writes it; null when unset or unreadable. */
  issuedAt: Date | string | null;
  submittedAt: Date | string | null;
  checkedAt: Date | string | null;
};

/** An archive line as read: the revision, where it belongs, and the number of the revision that superseded it. */
export interface ArchiveLineRow {
  row: ArchiveRevisionRow;
  context: TrussContext;
  supersededByNumber: number | null;
}

const toDate = (v: unknown): Date | null => (v === null || v === undefined ? null : sqlDate(v as string));

/**
 * A row's date straight to ISO text, without a Date in between (the archive list prints only
 * the text: a Date made and written back costs some 1.5 µs a value, four a line; bench:api).
 */
const toIsoText = (v: unknown): string | null => {
  if (v === null || v === undefined) return null;
  try {
    return sqlDateIso(v as string);
  } catch {
    return null; // text that is no date
  }
};

export function revisionRow(r: SheetRevision | RevisionRow): RevisionRow {
  const p = (r instanceof SheetRevision ? r.get({ plain: true }) : r) as unknown as RevisionRow;
  return {
    ...p,
    submittedAt: toDate(p.submittedAt),
    checkedAt: toDate(p.checkedAt),
    issuedAt: toDate(p.issuedAt),
    supersededAt: toDate(p.supersededAt),
    createdAt: sqlDate(p.createdAt),
    updatedAt: sqlDate(p.updatedAt),
  };
}

export const recordsRepository = {
  async findRevision(id: number): Promise<RevisionRow | null> {
    const r = await SheetRevision.findByPk(id);
    return r ? revisionRow(r) : null;
  },

  async listRevisions(where: { trussId?: number; trussIds?: number[]; statuses?: SheetStatus[]; sha256?: string }): Promise<RevisionRow[]> {
    const w: WhereOptions = {};
    if (where.trussId !== undefined) Object.assign(w, { trussId: where.trussId });
    if (where.trussIds !== undefined) Object.assign(w, { trussId: where.trussIds });
    if (where.statuses !== undefined) Object.assign(w, { status: where.statuses });
    if (where.sha256 !== undefined) Object.assign(w, { sha256: where.sha256 });
    const rows = (await SheetRevision.findAll({ where: w, order: [['trussId', 'ASC'], ['number', 'DESC']], raw: true })) as unknown as RevisionRow[];
    return rows.map(revisionRow);
  },

  async events(revisionId: number): Promise<EventRow[]> {
    const rows = await SheetRevisionEvent.findAll({ where: { revisionId }, order: [['id', 'ASC']] });
    return rows.map((e) => ({ ...(e.get({ plain: true }) as unknown as EventRow), at: new Date(e.at) }));
  },

  async trussContext(trussId: number): Promise<TrussContext | null> {
    const truss = await Truss.findByPk(trussId);
    if (!truss) return null;
    const project = await Project.findByPk(truss.projectId);
    if (!project) return null;
    return { trussId, trussName: truss.name, projectId: project.id, projectName: project.name, jobNumber: project.jobNumber };
  },

  async trussContexts(trussIds: number[]): Promise<Map<number, TrussContext>> {
    const out = new Map<number, TrussContext>();
    if (trussIds.length === 0) return out;
    const trusses = (await Truss.findAll({ attributes: ['id', 'name', 'projectId'], where: { id: trussIds }, raw: true })) as unknown as Pick<Truss, 'id' | 'name' | 'projectId'>[];
    const projectIds = [...new Set(trusses.map((t) => t.projectId))];
    const projects = new Map(
      ((await Project.findAll({ attributes: ['id', 'name', 'jobNumber'], where: { id: projectIds }, raw: true })) as unknown as Pick<Project, 'id' | 'name' | 'jobNumber'>[]).map((p) => [p.id, p]),
    );
    for (const t of trusses) {
      const p = projects.get(t.projectId);
      if (p) out.set(t.id, { trussId: t.id, trussName: t.name, projectId: p.id, projectName: p.name, jobNumber: p.jobNumber });
    }
    return out;
  },

  /**
   * The archive's lines: revisions of the given statuses (of the given trusses), each with its
   * truss and project and the number of the revision that superseded it, in one hand-written
   * query of plain rows and only the columns shown (not the signed record), instead of a
   * revision read, two context reads and a read per superseding revision (bench:api).
   */
  async archiveLines(where: { trussIds?: number[]; statuses: SheetStatus[] }): Promise<ArchiveLineRow[]> {
    if (where.statuses.length === 0 || (where.trussIds && where.trussIds.length === 0)) return [];
    type Raw = Omit<ArchiveRevisionRow, 'issuedAt' | 'submittedAt' | 'checkedAt'> & {
      issuedAt: string | Date | null;
      submittedAt: string | Date | null;
      checkedAt: string | Date | null;
      trussName: string;
      projectId: number;
      projectName: string;
      jobNumber: string;
      supersededByNumber: number | null;
    };
    const rows = await readRows<Raw>(
      SheetRevision.sequelize!,
      `SELECT r."id", r."trussId", r."number", r."status", r."issuedAt", r."sha256", r."pdfSize", r."supersededById",
              r."preparedById", r."preparedByName", r."submittedAt", r."checkedById", r."checkedByName", r."checkedAt",
              r."issuedById", r."issuedByName",
              t."name" AS "trussName", p."id" AS "projectId", p."name" AS "projectName", p."jobNumber",
              s."number" AS "supersededByNumber"
         FROM "sheet_revisions" r
         JOIN "trusses" t ON t."id" = r."trussId"
         JOIN "projects" p ON p."id" = t."projectId"
         LEFT JOIN "sheet_revisions" s ON s."id" = r."supersededById"
        WHERE r."status" IN (:statuses)${where.trussIds ? ' AND r."trussId" IN (:trussIds)' : ''}`,
      where.trussIds ? { statuses: where.statuses, trussIds: where.trussIds } : { statuses: where.statuses },
    );
    return rows.map((r) => ({
      row: {
        id: r.id,
        trussId: r.trussId,
        number: r.number,
        status: r.status,
        issuedAt: toIsoText(r.issuedAt),
        sha256: r.sha256,
        pdfSize: r.pdfSize,
        supersededById: r.supersededById,
        preparedById: r.preparedById,
        preparedByName: r.preparedByName,
        submittedAt: toIsoText(r.submittedAt),
        checkedById: r.checkedById,
        checkedByName: r.checkedByName,
        checkedAt: toIsoText(r.checkedAt),
        issuedById: r.issuedById,
        issuedByName: r.issuedByName,
      },
      context: { trussId: r.trussId, trussName: r.trussName, projectId: r.projectId, projectName: r.projectName, jobNumber: r.jobNumber },
      supersededByNumber: r.supersededByNumber,
    }));
  },

  /** Trusses whose job number, project or truss name contain the given texts (case-insensitive). */
  async trussIdsMatching(filter: { text?: string; jobNumber?: string; project?: string; truss?: string }): Promise<number[] | 'all'> {
    // No filter (the archive page as it opens): every truss, without listing them in the query.
    if (!filter.text && !filter.jobNumber && !filter.project && !filter.truss) return 'all';
    // Filtered here rather than with LIKE, whose escaping differs between SQLite and PostgreSQL.
    const projects = new Map((await Project.findAll({ attributes: ['id', 'name', 'jobNumber'], raw: true })).map((p) => [p.id, p]));
    const trusses = await Truss.findAll({ attributes: ['id', 'name', 'projectId'], raw: true });
    const has = (value: string, part?: string) => !part || value.toLowerCase().includes(part.toLowerCase());
    return trusses
      .filter((t) => {
        const p = projects.get(t.projectId);
        if (!p) return false;
        return (
          has(p.jobNumber, filter.jobNumber) &&
          has(p.name, filter.project) &&
          has(t.name, filter.truss) &&
          (!filter.text || [t.name, p.name, p.jobNumber].some((s) => has(s, filter.text)))
        );
      })
      .map((t) => t.id);
  },
};
