import pg from 'pg';
import { AppError } from '../../errors/app-error';

/**
 * How many quick draft PDFs (GET /runs/:id/sheet.pdf, printed while the request waits) one person
 * holds at once, counted where every app process sees it. With the in-process queue (SQLite, one
 * process) the printer's own count is the whole truth, so a hold is free. With PostgreSQL each hold
 * is a session-level advisory lock (person, slot) on a connection kept for the print: the state is
 * PostgreSQL's lock table, shared by every app process, and a process that dies lets its locks go
 * with its connections.
 */
export interface PreviewHolds {
  /** A release for one hold, or null when the person already holds `perPerson`. */
  take(person: number): Promise<(() => Promise<void>) | null>;
  close(): Promise<void>;
}

/** The sentence the printer uses for its own count (sheet-printer.ts), so the app reads the same either way. */
export const previewsFullMessage = (perPerson: number) =>
  `You already have ${perPerson} calc sheet PDFs waiting to print; wait until one of them is done, then ask again.`;

export function previewHoldsInProcess(): PreviewHolds {
  return { take: async () => async () => {}, close: async () => {} };
}

/** First key of every hold's advisory lock (the second is person and slot); an arbitrary constant of ours. */
const HOLD_SPACE = 0x50505648;

export function previewHoldsPostgres(url: string, options: { perPerson?: number; connections?: number } = {}): PreviewHolds {
  const perPerson = options.perPerson ?? 2;
  const pool = new pg.Pool({ connectionString: url, max: options.connections ?? 20, connectionTimeoutMillis: 10_000, application_name: 'panelpoint-preview-holds' });
  pool.on('error', () => {});
  const held = new Set<pg.PoolClient>();
  let closed = false;
  return {
    async take(person) {
      let client: pg.PoolClient;
      try {
        client = await pool.connect();
      } catch {
        throw new AppError('print-busy', 'The server is printing as many calc sheets as it can just now; ask for the PDF again in a minute.', 503);
      }
      for (let slot = 0; slot < perPerson; slot++) {
        const key = person * 8 + slot;
        const { rows } = await client.query<{ ok: boolean }>('SELECT pg_try_advisory_lock($1::int, $2::int) AS ok', [HOLD_SPACE, key]);
        if (rows[0]?.ok) {
          let released = false;
          held.add(client);
          return async () => {
            if (released || !held.delete(client)) return;
            released = true;
            try {
              await client.query('SELECT pg_advisory_unlock($1::int, $2::int)', [HOLD_SPACE, key]);
              client.release();
            } catch (err) {
              // A connection that cannot unlock is dropped, which lets its lock go.
              client.release(err instanceof Error ? err : true);
            }
          };
        }
      }
      client.release();
      return null;
    },
    async close() {
      if (closed) return;
      closed = true;
      // Connections still holding a hold are dropped, which lets their locks go.
      for (const client of held) client.release(true);
      held.clear();
      await pool.end();
    },
  };
}
