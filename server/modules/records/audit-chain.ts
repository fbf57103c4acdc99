import crypto from 'node:crypto';
import { Op, type Sequelize, type Transaction } from 'sequelize';
import type { AuditChainView } from '@shared/schemas/review.schema';
import { SheetRevisionEvent } from '../../db/models';
import { dbWriteLock } from '../../db/sequelize';
import { canonicalJson } from './canonical-json';

/**
 * The sheet audit log as a hash chain. The database's triggers write each line (so no status
 * change goes unlogged); the service then seals it in the same transaction: `prevHash` is the
 * hash of the line before it (64 zeros for the first), `hash` the SHA-256 (hex) of the
 * canonical JSON of the line's columns with `prevHash`. A changed, removed or reordered line
 * breaks the chain from there on. (An unkeyed chain shows tampering by anyone who does not
 * rewrite every later line too; the triggers refuse updates and deletes besides.)
 */

export const AUDIT_GENESIS = '0'.repeat(64);

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

/** SHA-256 (hex) of the line's canonical JSON, the previous hash included. */
export function auditLineHash(prevHash: string, line: AuditLine): string {
  const text = canonicalJson({
    prevHash,
    id: line.id,
    revisionId: line.revisionId,
    fromStatus: line.fromStatus,
    toStatus: line.toStatus,
    actorId: line.actorId,
    note: line.note,
    at: new Date(line.at).toISOString(),
  });
  return crypto.createHash('sha256').update(text, 'utf8').digest('hex');
}

/**
 * Seals every unsealed line, in id order, onto the chain. Call it inside the transaction that
 * wrote the lines, so a line and its hash commit together. Returns how many lines it sealed.
 */
export async function auditChainSeal(transaction: Transaction): Promise<number> {
  const last = await SheetRevisionEvent.findOne({ where: { hash: { [Op.ne]: null } }, order: [['id', 'DESC']], transaction });
  const open = await SheetRevisionEvent.findAll({ where: { hash: null, ...(last ? { id: { [Op.gt]: last.id } } : {}) }, order: [['id', 'ASC']], transaction });
  let prev = last?.hash ?? AUDIT_GENESIS;
  for (const line of open) {
    const hash = auditLineHash(prev, line);
    await SheetRevisionEvent.update({ prevHash: prev, hash }, { where: { id: line.id, hash: null }, transaction });
    prev = hash;
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

/** Checks the chain from the first line; reports the first line that breaks it. Writes nothing. */
export async function auditChainVerify(): Promise<AuditChainView> {
  const lines = await SheetRevisionEvent.findAll({ order: [['id', 'ASC']] });
  let prev = AUDIT_GENESIS;
  for (const line of lines) {
    let reason: string | null = null;
    if (!line.hash) reason = 'it has no hash: it was written outside Panelpoint, or never sealed';
    else if (line.prevHash !== prev) reason = 'it does not follow the line before it: a line before it was removed, inserted or changed';
    else if (auditLineHash(prev, line) !== line.hash) reason = 'its content no longer matches its hash: it was changed after it was written';
    if (reason) {
      return {
        ok: false,
        lines: lines.length,
        lastHash: lines.at(-1)?.hash ?? AUDIT_GENESIS,
        broken: { eventId: line.id, revisionId: line.revisionId, reason },
        message: `The audit log is broken at line ${line.id} (sheet revision ${line.revisionId}, ${line.fromStatus ?? 'new'} → ${line.toStatus}): ${reason}. Compare the database with your backup.`,
      };
    }
    prev = line.hash!;
  }
  return { ok: true, lines: lines.length, lastHash: prev, broken: null, message: `OK: ${lines.length} audit line(s), each one follows the line before it; last hash ${prev}.` };
}
