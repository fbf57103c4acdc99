import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { AuditChainView } from '@shared/schemas/review.schema';
import { SheetRevisionEvent } from '../../db/models';
import { dbWriteLock } from '../../db/sequelize';
import { canonicalJson } from './canonical-json';

/**
 * The sheet audit log as a keyed hash chain. The database's triggers write each line (so no
 * status change goes unlogged); the service then seals it in the same transaction: `prevHash` is
 * the hash of the line before it (64 zeros for the first), `hash` the HMAC-SHA-256 (hex, RFC 2104)
 * under the audit key of the canonical JSON of the line's columns with `prevHash`.
 *
 * The audit key is a file in the data folder beside the signing key (`AUDIT_KEY_FILE`, 0600),
 * never in the database: someone who can write the database but not read that file can change a
 * line, but cannot give it a hash that checks, nor re-hash the lines after it. Removing lines from
 * the end is caught by the chain head (table audit_chain_heads, migration 0016): the count, last id
 * and last hash, with an HMAC of its own, moved on in the transaction that seals the lines.
 *
 * Lines sealed before the key existed (versions before 0016) keep their plain SHA-256 hashes and
 * still check as before; they are reported as "before keying". Where keying began is written in the
 * key file (`firstKeyedId`), so no database change can move it; and the first keyed line's hash
 * covers the last unkeyed one's, so a changed line before keying breaks the chain there too.
 */

export const AUDIT_GENESIS = '0'.repeat(64);
/** The audit key's file name in DATA_DIR. */
export const AUDIT_KEY_FILE = 'audit-chain-key.json';

interface AuditLine {
  id: number;
  revisionId: number;
  fromStatus: string | null;
  toStatus: string;
  actorId: number | null;
  note: string;
  at: Date;
  prevHash?: string | null;
  hash?: string | null;
}

/** The audit key and the first line id it seals (every line before it was sealed without a key). */
export interface AuditKey {
  secret: Buffer;
  firstKeyedId: number;
  /** First 16 hex digits of the SHA-256 of the secret: names the key in messages, reveals nothing. */
  keyId: string;
}

interface HeadRow {
  lines: number;
  lastId: number | null;
  lastHash: string;
  mac: string;
}

/** Thrown at start when the audit key cannot be used; the message is the one sentence printed. */
export class AuditKeyStartError extends Error {
  override name = 'AuditKeyStartError';
}

function lineText(prevHash: string, line: AuditLine): string {
  return canonicalJson({
    prevHash,
    id: line.id,
    revisionId: line.revisionId,
    fromStatus: line.fromStatus,
    toStatus: line.toStatus,
    actorId: line.actorId,
    note: line.note,
    at: new Date(line.at).toISOString(),
  });
}

/** SHA-256 (hex) of the line's canonical JSON, the previous hash included: the hash of a line sealed before keying. */
export function auditLineHash(prevHash: string, line: AuditLine): string {
  return crypto.createHash('sha256').update(lineText(prevHash, line), 'utf8').digest('hex');
}

/** HMAC-SHA-256 (hex) of the same text under the audit key: the hash of a keyed line. */
export function auditLineMac(secret: Buffer, prevHash: string, line: AuditLine): string {
  return crypto.createHmac('sha256', secret).update(lineText(prevHash, line), 'utf8').digest('hex');
}

function lineHashFor(key: AuditKey, prevHash: string, line: AuditLine): string {
  return line.id >= key.firstKeyedId ? auditLineMac(key.secret, prevHash, line) : auditLineHash(prevHash, line);
}

function headMac(secret: Buffer, head: Omit<HeadRow, 'mac'>): string {
  const text = canonicalJson({ kind: 'panelpoint-audit-head', lines: head.lines, lastId: head.lastId, lastHash: head.lastHash });
  return crypto.createHmac('sha256', secret).update(text, 'utf8').digest('hex');
}

const macEqual = (a: string, b: string) => a.length === b.length && crypto.timingSafeEqual(Buffer.from(a), Buffer.from(b));

const keyIdOf = (secret: Buffer) => crypto.createHash('sha256').update(secret).digest('hex').slice(0, 16);

/**
 * The key each open database seals with (a test process may hold several servers at once).
 * Per process, but not state of its own: every process reads the same key file in the shared
 * DATA_DIR at start, and auditKeyOpen refuses a start whose key did not seal the chain head.
 */
const keys = new WeakMap<Sequelize, AuditKey>();

function keyOf(sequelize: Sequelize): AuditKey {
  const key = keys.get(sequelize);
  if (!key) throw new Error('The audit key was not opened for this database; startServices opens it (auditKeyOpen) before any sheet is written.');
  return key;
}

/** Reads the key file; null when there is none. Throws one sentence when it cannot be read. */
export function auditKeyLoad(file: string): AuditKey | null {
  if (!fs.existsSync(file)) return null;
  try {
    const parsed = JSON.parse(fs.readFileSync(file, 'utf8')) as { version?: number; secret?: string; firstKeyedId?: number };
    if (parsed.version !== 1 || typeof parsed.secret !== 'string' || !/^[0-9a-f]{64}$/.test(parsed.secret) || !Number.isInteger(parsed.firstKeyedId) || parsed.firstKeyedId! < 1) {
      throw new Error('bad shape');
    }
    const secret = Buffer.from(parsed.secret, 'hex');
    return { secret, firstKeyedId: parsed.firstKeyedId!, keyId: keyIdOf(secret) };
  } catch {
    throw new AuditKeyStartError(`The audit key file ${file} cannot be read (it is not the JSON Panelpoint wrote): restore it from your backup of the data folder and start again.`);
  }
}

async function headRead(sequelize: Sequelize, transaction?: Transaction): Promise<HeadRow | null> {
  const rows = await sequelize.query<HeadRow>('SELECT lines, "lastId", "lastHash", mac FROM audit_chain_heads WHERE id = 1', { type: QueryTypes.SELECT, transaction });
  return rows[0] ?? null;
}

async function headWrite(sequelize: Sequelize, key: AuditKey, head: Omit<HeadRow, 'mac'>, exists: boolean, transaction: Transaction): Promise<void> {
  const replacements = { ...head, mac: headMac(key.secret, head), at: new Date() };
  await sequelize.query(
    exists
      ? 'UPDATE audit_chain_heads SET lines = :lines, "lastId" = :lastId, "lastHash" = :lastHash, mac = :mac, "updatedAt" = :at WHERE id = 1'
      : 'INSERT INTO audit_chain_heads (id, lines, "lastId", "lastHash", mac, "updatedAt") VALUES (1, :lines, :lastId, :lastHash, :mac, :at)',
    { replacements, transaction },
  );
}

/** The chain's sealed lines as they stand: count, last id and hash. */
async function sealedTail(transaction: Transaction): Promise<Omit<HeadRow, 'mac'>> {
  const lines = await SheetRevisionEvent.count({ where: { hash: { [Op.ne]: null } }, transaction });
  const last = await SheetRevisionEvent.findOne({ where: { hash: { [Op.ne]: null } }, order: [['id', 'DESC']], transaction });
  return { lines, lastId: last?.id ?? null, lastHash: last?.hash ?? AUDIT_GENESIS };
}

/**
 * Opens the audit key at start, before anything is sealed. With `dataDir` null (a :memory:
 * database) the key lives in memory. Otherwise the key file is made once, at the first start of a
 * version with keying, naming the first line it seals; the lines already there stay as they were.
 * When the chain is keyed (its head exists) and the file is missing or holds another key, the
 * start is refused with one sentence saying where the key was expected and how to restore it.
 */
export async function auditKeyOpen(sequelize: Sequelize, opts: { dataDir: string | null }): Promise<AuditKey> {
  const file = opts.dataDir === null ? null : path.join(opts.dataDir, AUDIT_KEY_FILE);
  const key = await sequelize.transaction(async (t) => {
    await dbWriteLock(sequelize, t, 'audit-chain');
    const head = await headRead(sequelize, t);
    let found = file ? auditKeyLoad(file) : null;
    if (!found) {
      if (head) {
        throw new AuditKeyStartError(
          `The audit key ${file ?? '(in memory)'} is missing, but the sheet audit log has ${head.lines} line(s) sealed with it: restore that file from your backup of the data folder (mode 0600, owned by the server's user) and start again — Panelpoint will not make a new audit key while keyed lines exist.`,
        );
      }
      const last = await SheetRevisionEvent.findOne({ order: [['id', 'DESC']], transaction: t });
      const secret = crypto.randomBytes(32);
      const firstKeyedId = (last?.id ?? 0) + 1;
      found = { secret, firstKeyedId, keyId: keyIdOf(secret) };
      if (file) {
        fs.mkdirSync(opts.dataDir!, { recursive: true, mode: 0o700 });
        try {
          fs.writeFileSync(file, `${JSON.stringify({ version: 1, secret: secret.toString('hex'), firstKeyedId, createdAt: new Date().toISOString() })}\n`, { mode: 0o600, flag: 'wx' });
        } catch (err) {
          // Another process starting at the same moment wrote it first; use that one.
          if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
          found = auditKeyLoad(file)!;
        }
      }
    }
    if (head) {
      if (!macEqual(head.mac, headMac(found.secret, head))) {
        throw new AuditKeyStartError(
          `The audit key file ${file} holds key ${found.keyId}, which did not seal this database's audit log: restore the audit key file from your backup of the data folder and start again.`,
        );
      }
    } else {
      // No head yet: the first keyed start (or a start that stopped between writing the key
      // file and this row). Made only while no keyed line exists; otherwise it stays missing
      // and the check reports it.
      const keyed = await SheetRevisionEvent.count({ where: { id: { [Op.gte]: found.firstKeyedId } }, transaction: t });
      if (keyed === 0) await headWrite(sequelize, found, await sealedTail(t), false, t);
    }
    return found;
  });
  keys.set(sequelize, key);
  return key;
}

/** For the verify command: uses a key read from its file (or none) without making anything. */
export function auditKeyUse(sequelize: Sequelize, key: AuditKey): void {
  keys.set(sequelize, key);
}

/**
 * Seals every unsealed line, in id order, onto the chain, and moves the head on. Call it inside
 * the transaction that wrote the lines, so a line and its hash commit together. The head is moved
 * only when it checks and names the line the new ones follow: a head that was tampered with, or
 * one left behind by lines removed from the end, is never re-sealed over (the check keeps
 * reporting it). Returns how many lines it sealed.
 */
export async function auditChainSeal(transaction: Transaction): Promise<number> {
  const sequelize = SheetRevisionEvent.sequelize!;
  const key = keyOf(sequelize);
  const last = await SheetRevisionEvent.findOne({ where: { hash: { [Op.ne]: null } }, order: [['id', 'DESC']], transaction });
  const open = await SheetRevisionEvent.findAll({ where: { hash: null, ...(last ? { id: { [Op.gt]: last.id } } : {}) }, order: [['id', 'ASC']], transaction });
  if (open.length === 0) return 0;
  let prev = last?.hash ?? AUDIT_GENESIS;
  for (const line of open) {
    const hash = lineHashFor(key, prev, line);
    await SheetRevisionEvent.update({ prevHash: prev, hash }, { where: { id: line.id, hash: null }, transaction });
    prev = hash;
  }
  const head = await headRead(sequelize, transaction);
  if (head && macEqual(head.mac, headMac(key.secret, head)) && head.lastId === (last?.id ?? null) && head.lastHash === (last?.hash ?? AUDIT_GENESIS)) {
    await headWrite(sequelize, key, { lines: head.lines + open.length, lastId: open.at(-1)!.id, lastHash: prev }, true, transaction);
  }
  return open.length;
}

/** At the first start after the chain was added: seals the lines written before it, once. */
export async function auditChainSealExisting(sequelize: Sequelize): Promise<number> {
  return sequelize.transaction(async (t) => {
    await dbWriteLock(sequelize, t, 'audit-chain');
    if ((await SheetRevisionEvent.count({ where: { hash: { [Op.ne]: null } }, transaction: t })) > 0) return 0;
    return auditChainSeal(t);
  });
}

/**
 * Checks the chain from the first line and then its head; reports the first break. Writes
 * nothing. Without a key (the verify command run where the key file is not) only a chain that
 * was never keyed can be checked.
 */
export async function auditChainVerify(): Promise<AuditChainView> {
  const sequelize = SheetRevisionEvent.sequelize!;
  const key = keys.get(sequelize) ?? null;
  const lines = await SheetRevisionEvent.findAll({ order: [['id', 'ASC']] });
  const head = await headRead(sequelize);
  const lastHash = lines.at(-1)?.hash ?? AUDIT_GENESIS;
  const firstKeyedId = key?.firstKeyedId ?? Number.POSITIVE_INFINITY;
  const beforeKeying = lines.filter((l) => l.id < firstKeyedId).length;
  const counts = { lines: lines.length, beforeKeying, keyed: lines.length - beforeKeying };
  const brokenAt = (line: AuditLine, reason: string): AuditChainView => ({
    ok: false,
    ...counts,
    lastHash,
    broken: { eventId: line.id, revisionId: line.revisionId, reason },
    message: `The audit log is broken at line ${line.id} (sheet revision ${line.revisionId}, ${line.fromStatus ?? 'new'} → ${line.toStatus}): ${reason}. Compare the database with your backup.`,
  });
  const brokenHead = (reason: string): AuditChainView => ({
    ok: false,
    ...counts,
    lastHash,
    broken: { eventId: lines.at(-1)?.id ?? 0, revisionId: lines.at(-1)?.revisionId ?? 0, reason },
    message: `The audit log is broken at its end: ${reason}. Compare the database with your backup.`,
  });

  if (!key && head) {
    return {
      ok: false,
      ...counts,
      keyed: 0,
      beforeKeying: 0,
      lastHash,
      broken: null,
      message: `The audit log is keyed, but the audit key file (${AUDIT_KEY_FILE} in the data folder) is not here, so its lines cannot be checked: run the check where the data folder is, or restore the key from your backup.`,
    };
  }

  let prev = AUDIT_GENESIS;
  for (const line of lines) {
    const keyedLine = line.id >= firstKeyedId;
    let reason: string | null = null;
    if (!line.hash) reason = 'it has no hash: it was written outside Panelpoint, or never sealed';
    else if (line.prevHash !== prev) reason = 'it does not follow the line before it: a line before it was removed, inserted or changed';
    else if (!macEqual(keyedLine ? auditLineMac(key!.secret, prev, line) : auditLineHash(prev, line), line.hash)) {
      reason = keyedLine
        ? 'its content no longer matches its keyed hash: it was changed after it was written'
        : 'its content no longer matches its hash (a line from before keying): it was changed after it was written';
    }
    if (reason) return brokenAt(line, reason);
    prev = line.hash!;
  }

  if (key) {
    if (!head) return brokenHead('the chain head (table audit_chain_heads) is missing');
    if (!macEqual(head.mac, headMac(key.secret, head))) return brokenHead('the chain head no longer matches its keyed hash: it was changed');
    const lastId = lines.at(-1)?.id ?? null;
    if (head.lines !== lines.length || head.lastId !== lastId || head.lastHash !== prev) {
      const removed = head.lines > lines.length || (head.lastId !== null && (lastId === null || head.lastId > lastId));
      return brokenHead(
        removed
          ? `the chain head records ${head.lines} line(s) ending at line ${head.lastId}, but the log has ${lines.length} ending at line ${lastId ?? 'none'}: lines were removed from the end`
          : `the chain head records ${head.lines} line(s) ending at line ${head.lastId}, but the log has ${lines.length} ending at line ${lastId ?? 'none'}`,
      );
    }
  }

  const parts = key
    ? `${counts.beforeKeying} from before keying (plain SHA-256), ${counts.keyed} keyed with audit key ${key.keyId}`
    : 'the chain is not keyed yet (Panelpoint keys it at its next start)';
  return {
    ok: true,
    ...counts,
    lastHash: prev,
    broken: null,
    message: `OK: ${lines.length} audit line(s), each one follows the line before it; ${parts}; last hash ${prev}.`,
  };
}
