import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type { Sequelize } from 'sequelize';
import type { SigningKeyView } from '@shared/schemas/review.schema';
import { AppError } from '../../errors/app-error';
import { SheetRevision, SigningKey } from '../../db/models';
import { FIRM_KEY_FILE, firmKeyFrom, firmKeyInMemory, firmKeyLoad, keyIdOf, verifyWithPublicKey, type FirmKey } from './firm-key';

/**
 * The firm's signing keys: the current private key (in DATA_DIR, or in memory for a :memory:
 * database) and every public key it has ever had, in the signing_keys table, so a sheet issued
 * before a rotation still verifies under the key id its record names.
 */
export interface SigningKeys {
  /** The key that signs now. Re-reads the key file when another process has rotated it. */
  current(): Promise<FirmKey>;
  /** The public key with this whole fingerprint (as issued rows store it), or null if unknown. */
  publicKeyFor(fingerprint: string): Promise<PublicKeyCheck | null>;
  /** Every key, current first, then by date, newest first. */
  list(): Promise<SigningKeyView[]>;
  /** Makes a new key current and retires the old one; its public key stays in the table. */
  rotate(now?: Date): Promise<SigningKeyView>;
}

export interface PublicKeyCheck {
  keyId: string;
  fingerprint: string;
  verify(text: string, signatureBase64: string): boolean;
}

/** Thrown at start when the key cannot be used; the message is the one sentence printed. */
export class SigningKeyStartError extends Error {
  override name = 'SigningKeyStartError';
}

const countIssued = () => SheetRevision.count({ where: { status: ['issued', 'superseded'] } });

async function latestIssuedKeyId(): Promise<string | null> {
  const row = await SheetRevision.findOne({ where: { status: ['issued', 'superseded'] }, order: [['issuedAt', 'DESC'], ['id', 'DESC']] });
  return row?.keyFingerprint ? keyIdOf(row.keyFingerprint) : null;
}

const currentRow = () => SigningKey.findOne({ where: { retiredAt: null }, order: [['createdAt', 'DESC']] });

async function register(sequelize: Sequelize, key: FirmKey, now: Date): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    await SigningKey.update({ retiredAt: now }, { where: { retiredAt: null }, transaction });
    const known = await SigningKey.findByPk(key.keyId, { transaction });
    // A key that was retired never becomes current again (its row keeps its dates).
    if (!known) await SigningKey.create({ keyId: key.keyId, fingerprint: key.fingerprint, algorithm: 'Ed25519', publicKeyPem: key.publicKeyPem, createdAt: now }, { transaction });
  });
}

function newPrivateKeyPem(): string {
  return crypto.generateKeyPairSync('ed25519').privateKey.export({ type: 'pkcs8', format: 'pem' }).toString();
}

/**
 * Opens the key ring at start. With `dataDir` null (a :memory: database) the key lives in
 * memory. Otherwise the key file in `dataDir` is made on first start only: when issued sheets
 * exist and the file is missing, or holds another key than the one the database names as
 * current, the start is refused with one sentence saying where the key was expected and how to
 * restore it, rather than silently making a key under which every issued sheet would fail.
 */
export async function signingKeysOpen(sequelize: Sequelize, opts: { dataDir: string | null; now?: () => Date }): Promise<SigningKeys> {
  const now = opts.now ?? (() => new Date());
  const file = opts.dataDir === null ? null : path.join(opts.dataDir, FIRM_KEY_FILE);
  let key: FirmKey;

  if (file === null) {
    key = firmKeyInMemory();
    await register(sequelize, key, now());
  } else {
    const issued = await countIssued();
    const recorded = await currentRow();
    if (!fs.existsSync(file)) {
      if (issued > 0) {
        const keyId = recorded?.keyId ?? (await latestIssuedKeyId()) ?? 'unknown';
        throw new SigningKeyStartError(
          `The firm signing key ${file} is missing, but ${issued} issued sheet(s) are signed with key ${keyId}: restore that file from your backup of the data folder (mode 0600, owned by the server's user) and start again — Panelpoint will not make a new key while issued sheets exist.`,
        );
      }
      fs.mkdirSync(opts.dataDir!, { recursive: true, mode: 0o700 });
      try {
        fs.writeFileSync(file, newPrivateKeyPem(), { mode: 0o600, flag: 'wx' });
      } catch (err) {
        // Another process starting at the same moment wrote it first; use that one.
        if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
      }
    }
    key = firmKeyLoad(file);
    if (recorded && recorded.fingerprint !== key.fingerprint) {
      if (issued > 0) {
        const known = await SigningKey.findByPk(key.keyId);
        throw new SigningKeyStartError(
          `The firm signing key ${file} holds key ${key.keyId}${known ? ', which was retired' : ', which this database has never used'}, but the current key is ${recorded.keyId}: restore the key file of key ${recorded.keyId} from your backup of the data folder and start again.`,
        );
      }
      await register(sequelize, key, now());
    } else if (!recorded) {
      await register(sequelize, key, now());
    }
  }

  let held = key;
  const ring: SigningKeys = {
    async current() {
      const row = await currentRow();
      if (row && row.fingerprint !== held.fingerprint && file !== null) {
        const fromFile = firmKeyLoad(file);
        if (fromFile.fingerprint !== row.fingerprint) {
          throw new AppError('signing-key-mismatch', `The signing key file does not hold the current key ${row.keyId}, so nothing can be signed; tell your admin to restore the key file from backup.`, 503);
        }
        held = fromFile;
      }
      return held;
    },
    async publicKeyFor(fingerprint) {
      const row = await SigningKey.findOne({ where: { fingerprint } });
      if (!row) return null;
      const pem = row.publicKeyPem;
      return { keyId: row.keyId, fingerprint: row.fingerprint, verify: (text, sig) => verifyWithPublicKey(pem, text, sig) };
    },
    async list() {
      const rows = await SigningKey.findAll({ order: [['createdAt', 'DESC'], ['keyId', 'ASC']] });
      const counts = new Map<string, number>();
      const signed = await SheetRevision.findAll({ attributes: ['keyFingerprint'], where: { status: ['issued', 'superseded'] }, raw: true });
      for (const r of signed) if (r.keyFingerprint) counts.set(r.keyFingerprint, (counts.get(r.keyFingerprint) ?? 0) + 1);
      return rows.map((r) => keyView(r, counts.get(r.fingerprint) ?? 0));
    },
    async rotate(at = now()) {
      const pem = newPrivateKeyPem();
      const next = firmKeyFrom(crypto.createPrivateKey(pem));
      const tmp = file === null ? null : `${file}.next-${crypto.randomBytes(4).toString('hex')}`;
      if (tmp) fs.writeFileSync(tmp, pem, { mode: 0o600, flag: 'wx' });
      try {
        await sequelize.transaction(async (transaction) => {
          await SigningKey.update({ retiredAt: at }, { where: { retiredAt: null }, transaction });
          await SigningKey.create({ keyId: next.keyId, fingerprint: next.fingerprint, algorithm: 'Ed25519', publicKeyPem: next.publicKeyPem, createdAt: at }, { transaction });
          // Last step before the commit: if the file cannot be put in place, the table is rolled back.
          if (tmp && file) fs.renameSync(tmp, file);
        });
      } finally {
        if (tmp && fs.existsSync(tmp)) fs.rmSync(tmp, { force: true });
      }
      held = next;
      const row = (await SigningKey.findByPk(next.keyId))!;
      return keyView(row, 0);
    },
  };
  return ring;
}

function keyView(r: SigningKey, sheetsSigned: number): SigningKeyView {
  return {
    keyId: r.keyId,
    fingerprint: r.fingerprint,
    algorithm: 'Ed25519',
    publicKeyPem: r.publicKeyPem,
    createdAt: new Date(r.createdAt).toISOString(),
    retiredAt: r.retiredAt ? new Date(r.retiredAt).toISOString() : null,
    current: r.retiredAt === null || r.retiredAt === undefined,
    sheetsSigned,
  };
}
