import { pipeline } from 'node:stream/promises';
import multer from 'multer';
import { reimportSchema } from '@shared/schemas/drawing.schema';
import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { idParam, validateBody } from '../../middleware/validate';
import { AppError } from '../../errors/app-error';
import type { FileStore } from '../../storage/file-store';
import * as drawings from './drawings.service';
import type { ImportPool } from './import-pool';

const UPLOADERS = ['drafter', 'engineer'] as const;

export function drawingsRoutes(registry: RouteSpec[], deps: { store: FileStore; pool: ImportPool; maxUploadBytes: number }) {
  const routes = new ApiRoutes('/api', registry);
  const upload = multer({
    // Held in memory (at most MAX_UPLOAD_MB) while the drawing is read; only a drawing that is
    // kept goes to the store, under a generated key (the user's file name stays in the database).
    storage: multer.memoryStorage(),
    limits: { fileSize: deps.maxUploadBytes, files: 1, fields: 10 },
  });

  routes.add('get', '/trusses/:id/drawings', ANY_ROLE, async (req, res) => {
    res.json(await drawings.listDrawings(idParam(req.params.id, 'That truss')));
  });
  routes.add('post', '/trusses/:id/drawings', UPLOADERS, upload.single('file'), async (req, res) => {
    if (!req.file) {
      throw new AppError('file-missing', 'No file came with the upload. Choose a DXF file and send it in the field named "file".', 400);
    }
    const view = await drawings.uploadDrawing(
      {
        trussId: idParam(req.params.id, 'That truss'),
        file: { bytes: req.file.buffer, originalName: req.file.originalname },
        fields: req.body ?? {},
        userId: req.user!.id,
      },
      deps,
    );
    res.status(201).json(view);
  });
  routes.add('get', '/drawings/:id', ANY_ROLE, async (req, res) => {
    res.json(await drawings.getDrawing(idParam(req.params.id, 'That drawing')));
  });
  routes.add('post', '/drawings/:id/reimport', UPLOADERS, validateBody(reimportSchema), async (req, res) => {
    res.json(await drawings.reimportDrawing(idParam(req.params.id, 'That drawing'), req.body, req.user!.id, deps));
  });
  routes.add('get', '/drawings/:id/file', ANY_ROLE, async (req, res) => {
    const { stream, name } = await drawings.getDrawingFile(idParam(req.params.id, 'That drawing'), deps.store);
    res.attachment(name).type('application/dxf');
    // A store that fails mid-file ends the response; the client sees a cut-off download.
    await pipeline(stream, res).catch(() => res.destroy());
  });
  return routes.router;
}
