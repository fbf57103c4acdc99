import type { RequestHandler } from 'express';
import multer from 'multer';
import { archiveQuerySchema, type FirmSigningKeyView } from '@shared/schemas/review.schema';
import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { idParam } from '../../middleware/validate';
import { validationError } from '../../middleware/error-handler';
import { AppError } from '../../errors/app-error';
import type { FileStore } from '../../storage/file-store';
import * as archive from './archive.service';
import { auditChainVerify } from './audit-chain';
import type { SigningKeys } from './signing-keys';
import { verifyPdf } from './verify.service';
import { publicSheet, publicVerifyPdf } from './public-verify.service';

export interface RecordsRouteDeps {
  /** The firm's Ed25519 keys: the current one and every retired public key. */
  keys: SigningKeys;
  /** Where issued PDFs are kept. */
  sheets: FileStore;
  maxVerifyBytes: number;
  /** Counts each public verify request per network address; refuses over the limit (429). */
  publicLimit: RequestHandler;
}

/** What is issued and kept: the archived PDFs, the archive search, verification, the firm's keys, the audit chain. */
export function recordsRoutes(registry: RouteSpec[], deps: RecordsRouteDeps) {
  const routes = new ApiRoutes('/api', registry);
  // Held in memory only: a verify upload is hashed and dropped, never written anywhere.
  const verifyUpload = multer({ storage: multer.memoryStorage(), limits: { fileSize: deps.maxVerifyBytes, files: 1, fields: 5 } });

  routes.add('get', '/sheets/:id/pdf', ANY_ROLE, async (req, res) => {
    const { bytes, name } = await archive.getIssuedPdf(idParam(req.params.id, 'That sheet revision'), deps.sheets);
    res.attachment(name).type('application/pdf').send(bytes);
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
    res.json(await verifyPdf(req.file.buffer, deps));
  });
  // The public verify page: no sign-in, limited per address, only what the sheet itself prints.
  routes.add('get', '/public/verify/:id', 'public', deps.publicLimit, async (req, res) => {
    res.json(await publicSheet(idParam(req.params.id, 'That issued sheet')));
  });
  routes.add('post', '/public/verify', 'public', deps.publicLimit, verifyUpload.single('file'), async (req, res) => {
    if (!req.file) {
      throw new AppError('file-missing', 'No file came with the upload. Choose the calc sheet PDF and send it in the field named "file".', 400);
    }
    res.json(await publicVerifyPdf(req.file.buffer, deps));
  });
  routes.add('get', '/firm/signing-key', ['admin'], async (_req, res) => {
    const key = await deps.keys.current();
    const view: FirmSigningKeyView = { algorithm: 'Ed25519', publicKeyPem: key.publicKeyPem, fingerprint: key.fingerprint, keyId: key.keyId };
    res.json(view);
  });
  routes.add('get', '/firm/signing-keys', ['admin'], async (_req, res) => {
    res.json(await deps.keys.list());
  });
  routes.add('post', '/firm/signing-keys/rotate', ['admin'], async (_req, res) => {
    res.status(201).json(await deps.keys.rotate());
  });
  routes.add('get', '/admin/audit-chain', ['admin'], async (_req, res) => {
    res.json(await auditChainVerify());
  });
  return routes.router;
}
