import multer from 'multer';
import { reimportSchema } from '@shared/schemas/drawing.schema';
import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { idParam, validateBody } from '../../middleware/validate';
import { AppError } from '../../errors/app-error';
import type { FileStore } from '../../storage/file-store';
import { privateDiskStorage } from '../../storage/private-disk-storage';
import * as drawings from './drawings.service';
import type { ImportPool } from './import-pool';

const UPLOADERS = ['drafter', 'engineer'] as const;

export function drawingsRoutes(registry: RouteSpec[], deps: { store: FileStore; pool: ImportPool; uploadsDir: string; maxUploadBytes: number }) {
  const routes = new ApiRoutes('/api', registry);
  const upload = multer({
    // Generated names only (the user's file name is kept in the database, never on disk),
    // created with mode 0600.
    storage: privateDiskStorage(deps.uploadsDir, '.dxf'),
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
        file: { storedName: req.file.filename, originalName: req.file.originalname, size: req.file.size },
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
    const { bytes, name } = await drawings.getDrawingFile(idParam(req.params.id, 'That drawing'), deps.store);
    res.attachment(name).type('application/dxf').send(bytes);
  });
  return routes.router;
}
