import crypto from 'node:crypto';
import {
  dxfImport,
  dxfLayers,
  dxfParseBytes,
  isDxfImportError,
  type DxfImportOptions,
  type DxfImportResult,
  type DxfParsed,
} from '@shared/dxf-import';
import { drawingImportOptionsSchema, type DrawingSummaryView, type DrawingView } from '@shared/schemas/drawing.schema';
import { modelRebase } from '@shared/model/rebase';
import type { TrussModel } from '@shared/model/truss';
import { AppError, notFound } from '../../errors/app-error';
import { validationError } from '../../middleware/error-handler';
import { Drawing, TrussModelRecord, User } from '../../db/models';
import type { FileStore } from '../../storage/file-store';
import { getTruss } from '../projects/projects.service';

export interface UploadedFile {
  storedName: string;
  originalName: string;
  size: number;
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

type ImportOutcome = { status: 'imported'; result: DxfImportResult } | { status: 'failed'; error: { code: string; message: string } };

/**
 * Import failures that other import options can fix (units, layers, tolerance) keep the upload
 * as a failed version to re-import; a fault in the drawing itself (a block inside itself, too
 * many segments, a line without an end) refuses the upload with its sentence, storing nothing.
 */
const FIXED_BY_OPTIONS = new Set<string>(['units-required', 'unknown-layer', 'no-lines', 'tolerance-too-large', 'bad-option']);

function runImport(parsed: DxfParsed, options: DxfImportOptions): ImportOutcome {
  try {
    return { status: 'imported', result: dxfImport(parsed, options) };
  } catch (err) {
    if (isDxfImportError(err)) {
      if (!FIXED_BY_OPTIONS.has(err.code)) throw new AppError(err.code, err.message, 422);
      return { status: 'failed', error: { code: err.code, message: err.message } };
    }
    throw err;
  }
}

/** Parses the bytes or refuses the file outright (not a DXF at all: nothing is stored). */
function parseOrRefuse(bytes: Buffer): DxfParsed {
  try {
    return dxfParseBytes(new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength));
  } catch (err) {
    if (isDxfImportError(err)) throw new AppError(err.code, err.message, 422);
    throw err;
  }
}

/**
 * Lists the drawing's layers for the layer picker. Listing explodes the blocks, so a drawing
 * whose blocks cannot be exploded (a block inside itself, nesting too deep, too many segments)
 * is refused here with the import's own sentence, and nothing is stored.
 */
function listLayersOrRefuse(parsed: DxfParsed) {
  try {
    return dxfLayers(parsed);
  } catch (err) {
    if (isDxfImportError(err)) throw new AppError(err.code, err.message, 422);
    throw err;
  }
}

/**
 * Stores an uploaded DXF as the truss's next drawing version and imports it. A file that is
 * not an ASCII DXF is refused and removed; a DXF whose import fails (units not given, no
 * lines on the layers) is kept as a failed version the user can re-import with other options.
 */
export async function uploadDrawing(
  input: { trussId: number; file: UploadedFile; fields: Record<string, unknown>; userId: number },
  store: FileStore,
): Promise<DrawingView> {
  try {
    await getTruss(input.trussId);
    const options = parseUploadOptions(input.fields);
    const bytes = await store.read(input.file.storedName);
    const sha256 = crypto.createHash('sha256').update(bytes).digest('hex');
    const parsed = parseOrRefuse(bytes);
    const layers = listLayersOrRefuse(parsed);
    const outcome = runImport(parsed, options);

    const sequelize = Drawing.sequelize!;
    const drawing = await sequelize.transaction(async (transaction) => {
      const latest = (await Drawing.max('version', { where: { trussId: input.trussId }, transaction })) as number | null;
      const created = await Drawing.create(
        {
          trussId: input.trussId,
          version: (latest ?? 0) + 1,
          originalName: input.file.originalName.slice(0, 255),
          storedName: input.file.storedName,
          size: input.file.size,
          sha256,
          status: outcome.status,
          options: JSON.stringify(options),
          layers: JSON.stringify(layers),
          result: outcome.status === 'imported' ? JSON.stringify(outcome.result) : null,
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
    await store.remove(input.file.storedName);
    throw err;
  }
}

/** Imports a stored drawing again with other options; the original bytes are untouched. */
export async function reimportDrawing(id: number, options: DxfImportOptions, userId: number, store: FileStore): Promise<DrawingView> {
  const drawing = await Drawing.findByPk(id);
  if (!drawing) throw notFound('That drawing');
  const parsed = parseOrRefuse(await store.read(drawing.storedName));
  const outcome = runImport(parsed, options);
  if (outcome.status === 'failed') {
    // Nothing is written: the last good import stays as it was.
    throw new AppError(outcome.error.code, outcome.error.message, 422);
  }
  await Drawing.sequelize!.transaction(async (transaction) => {
    await drawing.update(
      { status: 'imported', options: JSON.stringify(options), result: JSON.stringify(outcome.result), error: null, importedAt: new Date() },
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

export async function getDrawingFile(id: number, store: FileStore): Promise<{ bytes: Buffer; name: string }> {
  const drawing = await Drawing.findByPk(id);
  if (!drawing) throw notFound('That drawing');
  return { bytes: await store.read(drawing.storedName), name: drawing.originalName };
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
