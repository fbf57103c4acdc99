import { DataTypes, Model, Op, QueryTypes, type Sequelize } from 'sequelize';
import { printJobFinished, type PrintJobState, type PrintJobView } from '@shared/schemas/print-job.schema';
import { AppError, notFound } from '../../errors/app-error';
import type { FileStore } from '../../storage/file-store';
import { SheetBuildError, SheetBuildPoolClosedError, type SheetBuildPool } from './sheet-build-pool';
import { SheetPrintError, type SheetPrinter } from './sheet-printer';
import { draftInput, draftFileName, loadRunSheet } from './run-sheet.service';
import { runName } from '@shared/text/citations';
import type { JobAttempt, JobQueue } from '../../workers/job-queue';

/**
 * Calc sheet PDFs made in the background. A request stores a job (migration 0011) and is
 * answered at once (202) and the job is handed to the job queue ('print-sheet'): the in-process
 * queue (SQLite) or pg-boss's (PostgreSQL), whose workers take the jobs one at a time each. The
 * process that takes a job builds the sheet's HTML in the sheet-build worker thread (so the main thread keeps
 * answering everyone), prints it in the printer's background lane (so issuing and previews are
 * never held up by it) and stores the PDF in the print-jobs file store. Each step is written to
 * the row as stage and percent, which the app polls. How many unfinished jobs a person holds
 * is counted from the table, so every app process sees the same count. With the in-process
 * queue, jobs left queued, building or printing by a server that stopped are queued again at the
 * next start, up to three tries; pg-boss keeps its jobs and tries again itself (three tries).
 */

/** Unfinished jobs one person may hold at once; one more is refused with 429. */
export const JOBS_PER_PERSON = 2;
/** Tries per job across server restarts; then it fails with a sentence. */
export const JOB_TRIES = 3;

interface JobRow {
  id: number;
  runId: number;
  requestedById: number;
  state: PrintJobState;
  stage: string;
  percent: number;
  pages: number | null;
  htmlBytes: number | null;
  pdfBytes: number | null;
  fileKey: string | null;
  fileName: string | null;
  error: string | null;
  attempts: number;
  startedAt: string | Date | null;
  finishedAt: string | Date | null;
  createdAt: string | Date;
}

/** The print_jobs table (migration 0011), bound to the app's connection in `printJobsCreate`. */
class PrintJobRecord extends Model {}

function bindModel(sequelize: Sequelize): typeof PrintJobRecord {
  const bound = class extends PrintJobRecord {};
  bound.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      runId: { type: DataTypes.INTEGER, allowNull: false },
      requestedById: { type: DataTypes.INTEGER, allowNull: false },
      state: { type: DataTypes.STRING(16), allowNull: false },
      stage: { type: DataTypes.STRING(80), allowNull: false },
      percent: { type: DataTypes.INTEGER, allowNull: false },
      pages: { type: DataTypes.INTEGER, allowNull: true },
      htmlBytes: { type: DataTypes.INTEGER, allowNull: true },
      pdfBytes: { type: DataTypes.INTEGER, allowNull: true },
      fileKey: { type: DataTypes.STRING(120), allowNull: true },
      fileName: { type: DataTypes.STRING(200), allowNull: true },
      error: { type: DataTypes.TEXT, allowNull: true },
      attempts: { type: DataTypes.INTEGER, allowNull: false },
      startedAt: { type: DataTypes.DATE, allowNull: true },
      finishedAt: { type: DataTypes.DATE, allowNull: true },
    },
    { sequelize, tableName: 'print_jobs', modelName: 'PrintJob' },
  );
  return bound;
}

const UNFINISHED = ['queued', 'building', 'printing'];

const iso = (at: string | Date | null | undefined): string | null => (at === null || at === undefined ? null : new Date(at).toISOString());

function viewOf(row: JobRow): PrintJobView {
  return {
    id: Number(row.id),
    runId: Number(row.runId),
    state: row.state,
    stage: row.stage,
    percent: Number(row.percent),
    pages: row.pages === null ? null : Number(row.pages),
    pdfBytes: row.pdfBytes === null ? null : Number(row.pdfBytes),
    error: row.error,
    requestedById: Number(row.requestedById),
    createdAt: iso(row.createdAt)!,
    startedAt: iso(row.startedAt),
    finishedAt: iso(row.finishedAt),
    pdfUrl: row.state === 'done' ? `/api/sheet-jobs/${row.id}/pdf` : null,
  };
}

/** Pages of a PDF as Chromium writes it: one `/Type /Page` object per page. */
export function pdfPageCount(pdf: Buffer): number {
  return (pdf.toString('latin1').match(/\/Type\s*\/Page(?!s)/g) ?? []).length;
}

export interface PrintJobsDeps {
  sequelize: Sequelize;
  /** Where a new job is sent; the process that works the queue calls `work`. */
  queue: Pick<JobQueue, 'send' | 'durable' | 'idle'>;
  /** Where finished PDFs are kept (the print-jobs store: the data folder, or the object store). */
  files: FileStore;
  log: (msg: string, err?: unknown) => void;
  now?: () => Date;
}

/** What the process that prints needs besides the table and the store. */
export interface PrintJobsWorkDeps {
  printer: SheetPrinter;
  builder: SheetBuildPool;
}

export interface PrintJobs {
  /** Stores a job for a run's draft PDF and starts it when its turn comes. */
  request(runId: number, personId: number): Promise<PrintJobView>;
  /** One job, for the person who asked for it only. */
  get(jobId: number, personId: number): Promise<PrintJobView>;
  /** The caller's jobs for a run, newest first (at most 5). */
  listForRun(runId: number, personId: number): Promise<PrintJobView[]>;
  /** The finished PDF, for the person who asked for it only. */
  pdf(jobId: number, personId: number): Promise<{ bytes: Buffer; fileName: string }>;
  /** In-process queue only: queues again what a stopped server left unfinished (nothing to do on a durable queue). */
  resume(): Promise<{ requeued: number; failed: number }>;
  /** The queue's handler for 'print-sheet': makes the job's PDF in this process. */
  work(jobId: number, attempt: JobAttempt, deps: PrintJobsWorkDeps): Promise<void>;
  /** The queue gave up on a job (every try ran out of time): it fails with a sentence. */
  givenUp(jobId: number): Promise<void>;
  /** Resolves when no job is waiting or running in this process (tests). */
  idle(): Promise<void>;
  /** Stops taking jobs; the one running is left to the next start or another process. */
  close(): Promise<void>;
}

/**
 * ms of page.pdf per byte of sheet HTML, for the estimate while Chromium writes the pages (it
 * tells nothing until it is done). Starts from bench:sheet (200 joints, 5 cases: 19.1 MiB of
 * HTML, page.pdf 100 s on 2 quiet cores) and follows each job this server prints.
 */
const START_MS_PER_BYTE = 100_224 / (19.1 * 1024 * 1024);

export function printJobsCreate(deps: PrintJobsDeps): PrintJobs {
  const { sequelize } = deps;
  const Jobs = bindModel(sequelize);
  const now = deps.now ?? (() => new Date());
  let closed = false;
  let msPerByte = START_MS_PER_BYTE;

  async function update(id: number, values: Partial<Omit<JobRow, 'id'>>): Promise<void> {
    await Jobs.update(values, { where: { id } });
  }

  async function rowOr404(jobId: number): Promise<JobRow> {
    const row = (await Jobs.findByPk(jobId, { raw: true })) as unknown as JobRow | null;
    if (!row) throw notFound('That print job');
    return row;
  }

  async function ownRow(jobId: number, personId: number): Promise<JobRow> {
    const row = await rowOr404(jobId);
    if (Number(row.requestedById) !== personId) {
      throw new AppError('not-your-print-job', 'That print job was asked for by someone else, so only they can see it; ask for the PDF yourself on the run page.', 403);
    }
    return row;
  }

  async function runOr409(runId: number): Promise<void> {
    const [run] = await sequelize.query<{ id: number; status: string; number: number; trussName: string }>(
      'SELECT r.id, r.status, r.number, t.name AS "trussName" FROM analysis_runs r JOIN trusses t ON t.id = r."trussId" WHERE r.id = ?', {
      replacements: [runId],
      type: QueryTypes.SELECT,
    });
    if (!run) throw notFound('That analysis run');
    if (run.status !== 'solved' && run.status !== 'unstable') {
      const why: Record<string, string> = { queued: 'it is still waiting to be solved', running: 'it is still being solved', failed: 'it failed' };
      throw new AppError('run-not-finished', `${runName(Number(run.number), run.trussName)} has no calc sheet because ${why[run.status] ?? `it is ${run.status}`}. Open the run to see its status.`, 409);
    }
  }

  async function fail(id: number, message: string): Promise<void> {
    await update(id, { state: 'failed', stage: 'failed', error: message, finishedAt: now() });
  }

  /**
   * Takes the job for this try: a queued job, or one a stopped process left building or printing
   * (the queue tries it again). Null when it is finished already or gone.
   */
  async function claim(jobId: number): Promise<JobRow | null> {
    const row = (await Jobs.findByPk(jobId, { raw: true })) as unknown as JobRow | null;
    if (!row || !UNFINISHED.includes(row.state)) return null;
    const [taken] = await Jobs.update(
      { state: 'building', stage: 'reading the run', percent: 5, attempts: Number(row.attempts) + 1, startedAt: now() },
      { where: { id: jobId, state: row.state, attempts: row.attempts } },
    );
    return taken === 1 ? { ...row, attempts: Number(row.attempts) + 1 } : null;
  }

  async function runJob(job: JobRow, attempt: JobAttempt, workDeps: PrintJobsWorkDeps): Promise<void> {
    const id = Number(job.id);
    const [person] = await sequelize.query<{ disabled: number | boolean }>('SELECT disabled FROM users WHERE id = ?', {
      replacements: [job.requestedById],
      type: QueryTypes.SELECT,
    });
    if (!person || person.disabled === true || Number(person.disabled) === 1) {
      await fail(id, 'This PDF was not made because the account that asked for it has been disabled or removed; whoever needs it can ask for it again.');
      return;
    }
    let ticker: NodeJS.Timeout | undefined;
    try {
      const base = await loadRunSheet(Number(job.runId));
      await update(id, { stage: 'typesetting the equations', percent: 10 });
      const built = await workDeps.builder.build(draftInput(base, now()), () => {
        void update(id, { stage: 'filling in the sheet templates', percent: 25 }).catch(() => {});
      });
      const htmlBytes = Buffer.byteLength(built.html);
      await update(id, { state: 'printing', stage: 'loading the sheet into the printer', percent: 30, htmlBytes });
      let pdfStarted = 0;
      const expectedMs = htmlBytes * msPerByte;
      const pdf = await workDeps.printer.print(built.html, built.paper, {
        priority: 'background',
        person: `job-${job.requestedById}`,
        label: `print-job-${id}`,
        onPhase: (phase) => {
          if (phase === 'fonts') void update(id, { stage: 'loading fonts', percent: 38 }).catch(() => {});
          if (phase === 'pdf') {
            pdfStarted = performance.now();
            let last = 40;
            void update(id, { stage: 'laying out and printing the pages', percent: last }).catch(() => {});
            // Chromium says nothing until the PDF is written: the percent is an estimate from the size.
            ticker = setInterval(() => {
              const percent = 40 + Math.floor(55 * Math.min(1, (performance.now() - pdfStarted) / expectedMs));
              if (percent === last) return;
              last = percent;
              void update(id, { percent }).catch(() => {});
            }, 1_500);
            ticker.unref();
          }
        },
      });
      clearInterval(ticker);
      if (pdfStarted) msPerByte = 0.5 * msPerByte + 0.5 * ((performance.now() - pdfStarted) / htmlBytes);
      await update(id, { stage: 'storing the PDF', percent: 97 });
      const fileKey = `print-job-${id}.pdf`;
      await deps.files.put(fileKey, pdf);
      const pages = pdfPageCount(pdf);
      await update(id, {
        state: 'done',
        stage: `done: ${pages} page${pages === 1 ? '' : 's'}`,
        percent: 100,
        pages,
        pdfBytes: pdf.length,
        fileKey,
        fileName: draftFileName(base),
        finishedAt: now(),
      });
    } catch (err) {
      clearInterval(ticker);
      // Shutting down: the row stays as it is; the next start (in-process) or another process
      // (the durable queue, which is told so by the throw) takes it again.
      if (err instanceof SheetBuildPoolClosedError || (err instanceof SheetPrintError && err.code === 'printer-closed')) {
        if (attempt.last && closed) return;
        if (!attempt.last) throw err;
      }
      if (err instanceof AppError || err instanceof SheetPrintError) {
        await fail(id, err.message);
        return;
      }
      deps.log(`Print job ${id} failed`, err);
      const why = err instanceof SheetBuildError ? 'the sheet could not be built' : 'the server could not finish it';
      await fail(id, `The calc sheet PDF could not be made (${why}). Ask for it again; if it keeps happening, tell your admin.`);
    }
  }

  return {
    async request(runId, personId) {
      await runOr409(runId);
      const same = (await Jobs.findOne({ where: { runId, requestedById: personId, state: UNFINISHED }, order: [['id', 'DESC']], raw: true })) as unknown as JobRow | null;
      if (same) return viewOf(same);
      const n = await Jobs.count({ where: { requestedById: personId, state: UNFINISHED } });
      if (n >= JOBS_PER_PERSON) {
        throw new AppError(
          'print-queue-full',
          `You already have ${JOBS_PER_PERSON} calc sheet PDFs being made; wait until one of them is done, then ask again.`,
          429,
        );
      }
      const created = await Jobs.create({ runId, requestedById: personId, state: 'queued', stage: 'waiting for its turn', percent: 0, attempts: 0 });
      const row = created.get({ plain: true }) as JobRow;
      try {
        await deps.queue.send('print-sheet', { id: Number(row.id) }, { priority: 'background' });
      } catch (err) {
        deps.log(`Print job ${row.id} could not be queued`, err);
        await fail(Number(row.id), 'This PDF could not be handed to the print queue; ask for it again, and if it keeps happening tell your admin.').catch(() => {});
        throw new AppError('print-job-not-queued', 'The calc sheet PDF could not be handed to the print queue; ask for it again, and if it keeps happening tell your admin.', 503);
      }
      return viewOf(row);
    },
    async get(jobId, personId) {
      return viewOf(await ownRow(jobId, personId));
    },
    async listForRun(runId, personId) {
      const rows = (await Jobs.findAll({ where: { runId, requestedById: personId }, order: [['id', 'DESC']], limit: 5, raw: true })) as unknown as JobRow[];
      return rows.map(viewOf);
    },
    async pdf(jobId, personId) {
      const row = await ownRow(jobId, personId);
      if (row.state !== 'done' || !row.fileKey) {
        const what = printJobFinished(row.state) ? `it failed: ${row.error ?? 'no reason was recorded.'}` : `it is still ${row.stage} (${row.percent} %); wait until it is done.`;
        throw new AppError('print-job-not-done', `Print job ${jobId} has no PDF because ${what}`, 409);
      }
      try {
        return { bytes: await deps.files.get(row.fileKey), fileName: row.fileName ?? `print-job-${jobId}.pdf` };
      } catch {
        throw new AppError('print-job-file-gone', `The PDF of print job ${jobId} is no longer stored on the server; ask for the calc sheet PDF again.`, 410);
      }
    },
    async resume() {
      // pg-boss keeps its jobs across restarts and tries them again itself.
      if (deps.queue.durable) return { requeued: 0, failed: 0 };
      const tired = (await Jobs.findAll({ where: { state: ['building', 'printing'], attempts: { [Op.gte]: JOB_TRIES } }, attributes: ['id'], raw: true })) as unknown as { id: number }[];
      for (const row of tired) {
        await fail(
          Number(row.id),
          `The server stopped ${JOB_TRIES} times while making this PDF, so it was not tried again; ask for it again, and if it keeps happening tell your admin.`,
        );
      }
      const [requeued] = await Jobs.update(
        { state: 'queued', stage: 'waiting for its turn (queued again after a server restart)', percent: 0 },
        { where: { state: ['building', 'printing'] } },
      );
      const waiting = (await Jobs.findAll({ where: { state: 'queued' }, attributes: ['id'], order: [['id', 'ASC']], raw: true })) as unknown as { id: number }[];
      for (const row of waiting) await deps.queue.send('print-sheet', { id: Number(row.id) }, { priority: 'background' });
      return { requeued, failed: tired.length };
    },
    async work(jobId, attempt, workDeps) {
      if (closed) throw new Error('This process is stopping; the print job is left to another.');
      const job = await claim(jobId);
      if (!job) return;
      await runJob(job, attempt, workDeps);
    },
    async givenUp(jobId) {
      await Jobs.update(
        { state: 'failed', stage: 'failed', error: `The calc sheet PDF was not made in its time limit after ${JOB_TRIES} tries; ask for it again, and if it keeps happening tell your admin.`, finishedAt: now() },
        { where: { id: jobId, state: UNFINISHED } },
      );
    },
    async idle() {
      await deps.queue.idle();
    },
    async close() {
      closed = true;
      // The running job ends when the builder and printer close (app.ts closes them after this).
    },
  };
}
