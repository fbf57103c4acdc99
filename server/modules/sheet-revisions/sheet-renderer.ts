import type { Sequelize } from 'sequelize';
import { AppError } from '../../errors/app-error';

/**
 * What the sheet-revisions module needs from the rest of the server, as two small interfaces passed in
 * from app.ts: something that prints a run's calc sheet to PDF, and something that finds a run.
 */

/** A signature as the sheet's signature block prints it. */
export interface SheetSignature {
  name: string;
  /** 'Prepared by', 'Checked by', 'Issued by'. */
  role: string;
  /** ISO 8601. */
  date: string;
}

export interface SheetRenderInput {
  runId: number;
  /** Revision letter as printed, e.g. "B". */
  revisionLabel: string;
  /** Filled when issuing; null for an unsigned print. */
  signatures: { preparedBy: SheetSignature; checkedBy: SheetSignature; issuedBy: SheetSignature } | null;
  /** Filled when issuing: what every page prints to identify the copy, and where to verify it. */
  issue?: SheetIssueStamp | null;
}

/** The issued copy's own identity, printed on every page (see records/issued-record.ts). */
export interface SheetIssueStamp {
  /** The issued revision's id (the sheet revision row), as the verify address names it. */
  sheetId: number;
  /** Short fingerprint (issueFingerprint): hex digits. */
  fingerprint: string;
  /** What the fingerprint is of, in words. */
  fingerprintOf: string;
  /** PUBLIC_URL/verify/<sheetId>. */
  verifyUrl: string;
}

export interface SheetRenderer {
  /** The calc sheet of a run as PDF bytes. The issuing path stores and hashes exactly these. */
  renderPdf(input: SheetRenderInput): Promise<Buffer>;
}

export type RunStatus = 'queued' | 'running' | 'solved' | 'unstable' | 'failed';

export interface RunRef {
  id: number;
  trussId: number;
  status: RunStatus;
  /** 1, 2, … within the truss (migration 0014), and the truss's name: "Run 2 of T7". */
  number?: number;
  trussName?: string;
  /** The model save the run solved. */
  modelVersion?: number;
}

export interface RunSource {
  findRun(runId: number): Promise<RunRef | null>;
}

/**
 * Reads the columns it needs (id, trussId, status, number, modelVersion, and the truss's name) from the runs module's analysis_runs
 * table (migration 0003), rather than importing that module, so the two stay independent.
 */
export function analysisRunsTable(sequelize: Sequelize): RunSource {
  return {
    async findRun(runId) {
      try {
        const [rows] = await sequelize.query(
          'SELECT r.id, r."trussId", r.status, r.number, r."modelVersion", t.name AS "trussName" FROM analysis_runs r LEFT JOIN trusses t ON t.id = r."trussId" WHERE r.id = ?',
          { replacements: [runId] },
        );
        const row = (rows as { id: number; trussId: number; status: RunStatus; number: number | null; modelVersion: number; trussName: string | null }[])[0];
        return row
          ? {
              id: Number(row.id),
              trussId: Number(row.trussId),
              status: row.status,
              ...(row.number !== null ? { number: Number(row.number) } : {}),
              ...(row.trussName !== null ? { trussName: row.trussName } : {}),
              modelVersion: Number(row.modelVersion),
            }
          : null;
      } catch (err) {
        // SQLite says "no such table", PostgreSQL 'relation "…" does not exist'.
        if (/no such table|relation .* does not exist/i.test(String((err as Error).message))) {
          throw new AppError('runs-unavailable', 'Analysis runs are not available on this server yet, so no sheet revision can be made. Tell your admin.', 503);
        }
        throw err;
      }
    },
  };
}
