import crypto from 'node:crypto';
import type { DxfImportOptions, DxfImportResult, DxfLayerInfo } from '@shared/dxf-import';
import { drawingImportOptionsSchema, type DrawingSummaryView, type DrawingView } from '@shared/schemas/drawing.schema';
import { modelRebase } from '@shared/model/rebase';
import type { TrussModel } from '@shared/model/truss';
import { AppError, notFound } from '../../errors/app-error';
import { validationError } from '../../middleware/error-handler';
import { Drawing, TrussModelRecord, User } from '../../db/models';
import { StoredFileMissingError, type FileStore } from '../../storage/file-store';
import { getTruss } from '../projects/projects.service';
import { getImportLimits } from '../firm/import-limits.service';
import { ImportPoolClosedError, type ImportOutcome, type ImportPool } from './import-pool';

export interface UploadedFile {
  bytes: Buffer;
  originalName: string;
}

/** Multipart fields arrive as strings; layers as a JSON array or repeated fields. */
export function parseUploadOptions(fields: Record<string, unknown>): DxfImportOptions {
  const raw: Record<string, unknown> = {};
  if (fields.layers !== undefined && fields.layers !== '') {
    const l = fields.layers;
    if (Array.isArray(l)) raw.layers = l;
    else {
      try {
        raw.layers = JSON.parse(String(l));
      } catch {
        raw.layers = String(l).split(',').map((s) => s.trim()).filter(Boolean);
      }
    }
  }
  if (fields.units !== undefined && fields.units !== '') raw.units = fields.units;
  if (fields.tolerance !== undefined && fields.tolerance !== '') raw.tolerance = Number(fields.tolerance);
  const parsed = drawingImportOptionsSchema.safeParse(raw);
  if (!parsed.success) throw validationError(parsed.error);
  return parsed.data;
}

/**
 * Import failures that other import options can fix (units, layers, tolerance) keep the upload
 * as a failed version to re-import; a fault in the drawing itself (a block inside itself, too
 * many segments, a line without an end) refuses the upload with its sentence, storing nothing.
 */
const FIXED_BY_OPTIONS = new Set<string>(['units-required', 'unknown-layer', 'no-lines', 'tolerance-too-large', 'bad-option']);

/** Where the refusals of a capped drawing tell people to go (the firm settings page). */
export const RAISE_LIMIT_HINT = 'ask an admin to raise the limit in Firm settings';

export interface DrawingDeps {
  store: FileStore;
  pool: ImportPool;
}

type ImportRead =
  | { status: 'imported'; layers: DxfLayerInfo[] | null; result: DxfImportResult; resultJson: string }
  | { status: 'failed'; layers: DxfLayerInfo[] | null; error: { code: string; message: string } };

/**
 * Parses and imports the bytes in an import worker, under the firm's caps and time limit, and
 * turns every way that can end into a stored outcome or one 422 sentence. The main thread only
 * waits, so other people's requests keep being answered while a large drawing is read.
 */
async function readInWorker(bytes: Buffer, options: DxfImportOptions, listLayers: boolean, pool: ImportPool): Promise<ImportRead> {
  const limits = await getImportLimits();
  // A copy of its own: the buffer is handed over to the worker, never shared.
  const own = new Uint8Array(bytes);
  let outcome: ImportOutcome;
  try {
    outcome = await pool.read(
      { bytes: own, options, listLayers, limits: { maxSegments: limits.maxSegments, maxBlockDepth: limits.maxBlockDepth, howToRaise: RAISE_LIMIT_HINT } },
      limits.timeLimitSeconds * 1000,
    );
  } catch (err) {
    if (err instanceof ImportPoolClosedError) {
      throw new AppError('server-stopping', 'The server is shutting down, so the drawing was not read and nothing was stored; upload it again in a minute.', 503);
    }
    throw err;
  }
  switch (outcome.type) {
    case 'read':
      if ('resultJson' in outcome.imported) {
        const { resultJson } = outcome.imported;
        return { status: 'imported', layers: outcome.layers, result: JSON.parse(resultJson) as DxfImportResult, resultJson };
      }
      if (!FIXED_BY_OPTIONS.has(outcome.imported.error.code)) throw new AppError(outcome.imported.error.code, outcome.imported.error.message, 422);
      // No layer holds a line: no choice of layers or units can fix that, so the upload is
      // refused with that sentence (never first asked for its units, never kept).
      if (outcome.imported.error.code === 'no-lines' && outcome.layers && !outcome.layers.some((l) => l.holdsLines)) {
        throw new AppError('no-lines', outcome.imported.error.message, 422);
      }
      return { status: 'failed', layers: outcome.layers, error: outcome.imported.error };
    case 'refused':
      throw new AppError(outcome.error.code, outcome.error.message, 422);
    case 'timed-out':
      throw new AppError(
        'drawing-too-slow',
        `The drawing took longer than ${outcome.seconds} s to read, so it was stopped and nothing was stored; upload a drawing of the one truss with its blocks exploded, or ${RAISE_LIMIT_HINT} (the time limit).`,
        422,
      );
    case 'out-of-memory':
      throw new AppError(
        'drawing-too-large',
        `Reading the drawing needed more than ${outcome.megabytes} MB of memory, so it was stopped and nothing was stored; upload a drawing of the one truss with its blocks exploded, or lower the segment limit in Firm settings.`,
        422,
      );
    case 'crashed':
      // A defect in the import, not in the drawing: said plainly, and the file is not kept.
      throw new AppError(
        'import-crashed',
        `Panelpoint could not read this drawing because of an error of its own (${outcome.message.slice(0, 200)}), and nothing was stored; send the file to your admin so it can be reported.`,
        422,
      );
    case 'stopped':
      throw new AppError(
        'import-stopped',
        `The drawing import stopped before finishing (${outcome.why.slice(0, 200)}) and nothing was stored; upload it again, and tell your admin if it keeps happening.`,
        503,
      );
  }
}

/**
 * Reads an uploaded DXF and stores it as the truss's next drawing version. A file that is not
 * an ASCII DXF, or a drawing with a fault of its own, is refused before anything is stored; a
 * DXF whose import fails for options (units not given, no lines on the layers) is kept as a
 * failed version the user can re-import with other options. The bytes go to the store under a
 * generated key only once they are to be kept; if the row then cannot be written the object is
 * removed again (a crash in between leaves an object the start-up sweep removes).
 */
export async function uploadDrawing(
  input: { trussId: number; file: UploadedFile; fields: Record<string, unknown>; userId: number },
  { store, pool }: DrawingDeps,
): Promise<DrawingView> {
  await getTruss(input.trussId);
  const options = parseUploadOptions(input.fields);
  const bytes = input.file.bytes;
  const sha256 = crypto.createHash('sha256').update(bytes).digest('hex');
  const outcome = await readInWorker(bytes, options, true, pool);
  const layers = outcome.layers ?? [];
  const storedName = `${crypto.randomBytes(16).toString('hex')}.dxf`;
  await store.put(storedName, bytes);
  try {
    const sequelize = Drawing.sequelize!;
    const drawing = await sequelize.transaction(async (transaction) => {
      const latest = (await Drawing.max('version', { where: { trussId: input.trussId }, transaction })) as number | null;
      const created = await Drawing.create(
        {
          trussId: input.trussId,
          version: (latest ?? 0) + 1,
          originalName: input.file.originalName.slice(0, 255),
          storedName,
          size: bytes.length,
          sha256,
          status: outcome.status,
          options: JSON.stringify(options),
          layers: JSON.stringify(layers),
          result: outcome.status === 'imported' ? outcome.resultJson : null,
          error: outcome.status === 'failed' ? JSON.stringify(outcome.error) : null,
          uploadedById: input.userId,
          importedAt: new Date(),
        },
        { transaction },
      );
      if (outcome.status === 'imported') await applyToModel(created, outcome.result, input.userId, transaction);
      return created;
    });
    return toDrawingView(drawing);
  } catch (err) {
    await store.delete(storedName).catch(() => {});
    throw err;
  }
}

/** The stored bytes of a drawing version; a missing object is one sentence, not a 500. */
async function storedDrawing(drawing: Drawing, store: FileStore): Promise<Buffer> {
  try {
    return await store.get(drawing.storedName);
  } catch (err) {
    if (err instanceof StoredFileMissingError) throw drawingFileMissing(drawing, store);
    throw err;
  }
}

function drawingFileMissing(drawing: Drawing, store: FileStore): AppError {
  return new AppError(
    'drawing-file-missing',
    `The file of drawing version ${drawing.version} is missing from ${store.label}; ask your admin to restore it from backup, or upload the drawing again.`,
    409,
  );
}

/** Imports a stored drawing again with other options; the original bytes are untouched. */
export async function reimportDrawing(id: number, options: DxfImportOptions, userId: number, { store, pool }: DrawingDeps): Promise<DrawingView> {
  const drawing = await Drawing.findByPk(id);
  if (!drawing) throw notFound('That drawing');
  const outcome = await readInWorker(await storedDrawing(drawing, store), options, false, pool);
  if (outcome.status === 'failed') {
    // Nothing is written: the last good import stays as it was.
    throw new AppError(outcome.error.code, outcome.error.message, 422);
  }
  await Drawing.sequelize!.transaction(async (transaction) => {
    await drawing.update(
      { status: 'imported', options: JSON.stringify(options), result: outcome.resultJson, error: null, importedAt: new Date() },
      { transaction },
    );
    await applyToModel(drawing, outcome.result, userId, transaction);
  });
  return toDrawingView(drawing);
}

/**
 * The newest drawing version sets the working model's geometry; supports, loads and member
 * properties already placed are carried over by position.
 */
async function applyToModel(drawing: Drawing, result: DxfImportResult, userId: number, transaction: import('sequelize').Transaction) {
  const newest = (await Drawing.max('version', { where: { trussId: drawing.trussId }, transaction })) as number;
  if (drawing.version !== newest) return;
  const record = await TrussModelRecord.findByPk(drawing.trussId, { transaction });
  const previous = record ? (JSON.parse(record.model) as TrussModel) : null;
  const { model } = modelRebase(previous, result, result.tolerance.value);
  if (record) {
    await record.update(
      { model: JSON.stringify(model), drawingId: drawing.id, version: record.version + 1, updatedById: userId },
      { transaction },
    );
  } else {
    await TrussModelRecord.create(
      { trussId: drawing.trussId, drawingId: drawing.id, model: JSON.stringify(model), takeoff: null, updatedById: userId },
      { transaction },
    );
  }
}

export async function listDrawings(trussId: number): Promise<DrawingSummaryView[]> {
  await getTruss(trussId);
  const rows = await Drawing.findAll({ where: { trussId }, order: [['version', 'DESC']] });
  return Promise.all(rows.map(toSummaryView));
}

export async function getDrawing(id: number): Promise<DrawingView> {
  const drawing = await Drawing.findByPk(id);
  if (!drawing) throw notFound('That drawing');
  return toDrawingView(drawing);
}

export async function getDrawingFile(id: number, store: FileStore): Promise<{ stream: import('node:stream').Readable; name: string }> {
  const drawing = await Drawing.findByPk(id);
  if (!drawing) throw notFound('That drawing');
  try {
    return { stream: await store.getStream(drawing.storedName), name: drawing.originalName };
  } catch (err) {
    if (err instanceof StoredFileMissingError) throw drawingFileMissing(drawing, store);
    throw err;
  }
}

async function userName(id: number | null): Promise<string> {
  if (id === null) return '';
  return (await User.findByPk(id, { attributes: ['name'] }))?.name ?? '';
}

async function toSummaryView(d: Drawing): Promise<DrawingSummaryView> {
  const result = d.result ? (JSON.parse(d.result) as DxfImportResult) : null;
  return {
    id: d.id,
    trussId: d.trussId,
    version: d.version,
    originalName: d.originalName,
    size: d.size,
    sha256: d.sha256,
    status: d.status,
    uploadedBy: await userName(d.uploadedById),
    createdAt: new Date(d.createdAt).toISOString(),
    importedAt: new Date(d.importedAt).toISOString(),
    jointCount: result?.joints.length ?? 0,
    memberCount: result?.members.length ?? 0,
  };
}

async function toDrawingView(d: Drawing): Promise<DrawingView> {
  return {
    ...(await toSummaryView(d)),
    options: JSON.parse(d.options),
    layers: JSON.parse(d.layers),
    result: d.result ? JSON.parse(d.result) : null,
    error: d.error ? JSON.parse(d.error) : null,
  };
}
