import multer from 'multer';
import type { Request } from 'express';
import {
  archiveQuerySchema,
  newSheetCommentSchema,
  newSheetRevisionSchema,
  sheetCommentResolveSchema,
  sheetTransitionSchema,
  type FirmSigningKeyView,
  type SheetAction,
} from '@shared/schemas/review.schema';
import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { idParam, validateBody } from '../../middleware/validate';
import { validationError } from '../../middleware/error-handler';
import { AppError } from '../../errors/app-error';
import * as review from './sheet-revisions.service';
import * as archive from '../records/archive.service';

export type ReviewRouteDeps = review.ReviewServiceDeps & { maxVerifyBytes: number };

const actorOf = (req: Request): review.Actor => ({ id: req.user!.id, name: req.user!.name, role: req.user!.role });

/** Sheet revisions, their review and comments, the archive and the verify route. */
export function reviewRoutes(registry: RouteSpec[], deps: ReviewRouteDeps) {
  const routes = new ApiRoutes('/api', registry);
  // Held in memory only: a verify upload is hashed and dropped, never written anywhere.
  const verifyUpload = multer({ storage: multer.memoryStorage(), limits: { fileSize: deps.maxVerifyBytes, files: 1, fields: 5 } });

  routes.add('get', '/trusses/:id/sheets', ANY_ROLE, async (req, res) => {
    res.json(await review.listTrussRevisions(idParam(req.params.id, 'That truss')));
  });
  routes.add('post', '/trusses/:id/sheets', ['engineer'], validateBody(newSheetRevisionSchema), async (req, res) => {
    const trussId = idParam(req.params.id, 'That truss');
    res.status(201).json(await review.createRevision({ trussId, runId: req.body.runId, note: req.body.note }, actorOf(req), deps));
  });
  routes.add('get', '/sheets/:id', ANY_ROLE, async (req, res) => {
    res.json(await review.getRevision(idParam(req.params.id, 'That sheet revision'), deps));
  });

  const transition = (action: SheetAction, who: readonly ('engineer' | 'reviewer')[]) =>
    routes.add('post', `/sheets/:id/${action}`, who, validateBody(sheetTransitionSchema), async (req, res) => {
      res.json(await review.transitionRevision(idParam(req.params.id, 'That sheet revision'), action, req.body.note, actorOf(req), deps));
    });
  transition('submit', ['engineer']);
  transition('return', ['reviewer']);
  transition('check', ['reviewer']);
  transition('issue', ['engineer']);

  routes.add('get', '/sheets/:id/pdf', ANY_ROLE, async (req, res) => {
    const { bytes, name } = await archive.getIssuedPdf(idParam(req.params.id, 'That sheet revision'), deps.sheets);
    res.attachment(name).type('application/pdf').send(bytes);
  });
  routes.add('post', '/sheets/:id/comments', ['engineer', 'reviewer'], validateBody(newSheetCommentSchema), async (req, res) => {
    res.status(201).json(await review.addComment(idParam(req.params.id, 'That sheet revision'), req.body, actorOf(req), deps));
  });
  routes.add('patch', '/sheet-comments/:id', ['engineer', 'reviewer'], validateBody(sheetCommentResolveSchema), async (req, res) => {
    res.json(await review.resolveComment(idParam(req.params.id, 'That comment'), req.body.resolved, actorOf(req), deps));
  });

  routes.add('get', '/archive', ANY_ROLE, async (req, res) => {
    const parsed = archiveQuerySchema.safeParse(req.query);
    if (!parsed.success) throw validationError(parsed.error);
    res.json(await archive.searchArchive(parsed.data));
  });
  routes.add('post', '/archive/verify', ANY_ROLE, verifyUpload.single('file'), async (req, res) => {
    if (!req.file) {
      throw new AppError('file-missing', 'No file came with the upload. Drop a PDF and send it in the field named "file".', 400);
    }
    res.json(await archive.verifyPdf(req.file.buffer, deps));
  });
  routes.add('get', '/firm/signing-key', ['admin'], (_req, res) => {
    const view: FirmSigningKeyView = { algorithm: 'Ed25519', publicKeyPem: deps.key.publicKeyPem, fingerprint: deps.key.fingerprint };
    res.json(view);
  });
  return routes.router;
}
