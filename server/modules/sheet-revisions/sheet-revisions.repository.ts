import { Op, UniqueConstraintError, type Transaction, type WhereOptions } from 'sequelize';
import type { SheetStatus } from '@shared/schemas/review.schema';
import type { Role } from '@shared/schemas/auth.schema';
import { Drawing, EmailOptOut, SheetComment, SheetRevision, SheetRevisionEvent, Truss, User } from '../../db/models';
import { dbWriteLock } from '../../db/sequelize';
import { auditChainSeal } from '../records/audit-chain';
import { revisionRow, type RevisionRow } from '../records/records.repository';

let sealQueue: Promise<unknown> = Promise.resolve();

/**
 * Runs a write and seals the audit lines its triggers wrote onto the hash chain, in one
 * transaction. Within the process the writes go one at a time (a :memory: database has one
 * connection, on which two transactions cannot be open at once); between processes the
 * IMMEDIATE transaction takes the write lock first, so two sealers never read the same last hash.
 */
function withSealedLog<T>(write: (transaction: Transaction) => Promise<T>): Promise<T> {
  const run = sealQueue.then(() =>
    SheetRevision.sequelize!.transaction(async (transaction) => {
      // PostgreSQL: the chain's lock is taken before the write, so the lines of two sealers
      // are numbered and sealed one transaction after the other (SQLite: BEGIN IMMEDIATE).
      await dbWriteLock(SheetRevision.sequelize!, transaction, 'audit-chain');
      const out = await write(transaction);
      await auditChainSeal(transaction);
      return out;
    }),
  );
  sealQueue = run.catch(() => undefined);
  return run;
}

/**
 * The writes of the check flow and the reads only it needs (comments, people, e-mail
 * addresses). Status changes are conditional updates (WHERE status = expected); the
 * database's triggers write the audit line, supersede earlier issued revisions and refuse any
 * change to an issued one. Revision rows, the audit log and truss contexts are read through
 * records.repository.ts.
 */

export interface CommentRow {
  id: number;
  revisionId: number;
  trussId: number;
  parentId: number | null;
  anchor: string;
  body: string;
  authorId: number;
  resolvedById: number | null;
  resolvedAt: Date | null;
  createdAt: Date;
}

const toDate = (v: unknown): Date | null => (v === null || v === undefined ? null : new Date(v as string));

export const sheetRevisionsRepository = {
  /**
   * A new draft numbered one past the truss's highest. Two engineers starting a revision at
   * once both read the same highest number; the unique (trussId, number) index refuses the
   * second insert, which then tries the next number.
   */
  async createDraft(input: { trussId: number; runId: number; preparedById: number; note: string }): Promise<RevisionRow> {
    for (let attempt = 0; ; attempt++) {
      const highest = (await SheetRevision.max('number', { where: { trussId: input.trussId } })) as number | null;
      try {
        const created = await withSealedLog((transaction) =>
          SheetRevision.create(
            {
              trussId: input.trussId,
              runId: input.runId,
              number: (highest ?? 0) + 1,
              status: 'draft',
              preparedById: input.preparedById,
              lastActorId: input.preparedById,
              lastNote: input.note,
            },
            { transaction },
          ),
        );
        return revisionRow(created);
      } catch (err) {
        if (err instanceof UniqueConstraintError && attempt < 5) continue;
        throw err;
      }
    }
  },

  /**
   * Moves a revision from `from` to `to` with the given columns, only if it is still at
   * `from`. Returns false when someone else moved it first (nothing written).
   */
  async transition(
    id: number,
    from: SheetStatus,
    to: SheetStatus,
    actorId: number,
    note: string,
    fields: Partial<Omit<RevisionRow, 'id' | 'status' | 'trussId' | 'number' | 'runId' | 'createdAt' | 'updatedAt'>> = {},
  ): Promise<boolean> {
    const [count] = await withSealedLog((transaction) =>
      SheetRevision.update({ ...fields, status: to, lastActorId: actorId, lastNote: note }, { where: { id, status: from }, transaction }),
    );
    return count === 1;
  },

  /**
   * Hands a revision in check from one checker to another, only if it is still in check with
   * the same checker; the audit log gets a line (in check → in check) with the note, sealed
   * onto the chain in the same transaction. False when someone moved it first (nothing written).
   */
  async checkerChange(id: number, fromCheckerId: number | null, toCheckerId: number, actorId: number, note: string): Promise<boolean> {
    return withSealedLog(async (transaction) => {
      const [count] = await SheetRevision.update(
        { checkerId: toCheckerId, lastActorId: actorId, lastNote: note },
        { where: { id, status: 'in-check', checkerId: fromCheckerId }, transaction },
      );
      if (count !== 1) return false;
      await SheetRevisionEvent.create({ revisionId: id, fromStatus: 'in-check', toStatus: 'in-check', actorId, note, at: new Date() }, { transaction });
      return true;
    });
  },

  /** One person as the checker rules need them; null when there is nobody with that id. */
  async userById(id: number): Promise<{ id: number; name: string; role: Role; disabled: boolean; active: boolean } | null> {
    const u = await User.findByPk(id, { attributes: ['id', 'name', 'role', 'disabled', 'passwordHash'] });
    return u ? { id: u.id, name: u.name, role: u.role, disabled: Boolean(u.disabled), active: u.passwordHash !== null } : null;
  },

  /** Reviewers who can sign in (invitation accepted, not disabled), by name. */
  async activeReviewers(): Promise<{ id: number; name: string; email: string }[]> {
    const rows = await User.findAll({
      attributes: ['id', 'name', 'email'],
      where: { role: 'reviewer', disabled: false, passwordHash: { [Op.ne]: null } },
      order: [['name', 'ASC'], ['id', 'ASC']],
      raw: true,
    });
    return rows.map((u) => ({ id: u.id, name: u.name, email: u.email }));
  },

  async hasIssuedAfter(trussId: number, number: number): Promise<RevisionRow | null> {
    const r = await SheetRevision.findOne({
      where: { trussId, number: { [Op.gt]: number }, status: ['issued', 'superseded'] },
      order: [['number', 'DESC']],
    });
    return r ? revisionRow(r) : null;
  },

  /** Comments of a truss made on revisions numbered up to `upToNumber`, oldest first. */
  async commentsUpTo(trussId: number, upToNumber: number): Promise<CommentRow[]> {
    const revisionIds = (
      await SheetRevision.findAll({ attributes: ['id'], where: { trussId, number: { [Op.lte]: upToNumber } }, raw: true })
    ).map((r) => r.id);
    if (revisionIds.length === 0) return [];
    const rows = await SheetComment.findAll({ where: { revisionId: revisionIds }, order: [['id', 'ASC']] });
    return rows.map(commentRow);
  },

  async openThreadCounts(revisionIds: number[]): Promise<Map<number, number>> {
    if (revisionIds.length === 0) return new Map();
    const rows = await SheetComment.findAll({ attributes: ['revisionId'], where: { revisionId: revisionIds, parentId: null, resolvedAt: null }, raw: true });
    const counts = new Map<number, number>();
    for (const r of rows) counts.set(r.revisionId, (counts.get(r.revisionId) ?? 0) + 1);
    return counts;
  },

  async findComment(id: number): Promise<CommentRow | null> {
    const c = await SheetComment.findByPk(id);
    return c ? commentRow(c) : null;
  },

  async createComment(input: Omit<CommentRow, 'id' | 'resolvedById' | 'resolvedAt' | 'createdAt'>): Promise<CommentRow> {
    return commentRow(await SheetComment.create(input));
  },

  async setResolved(id: number, by: { userId: number; at: Date } | null): Promise<void> {
    await SheetComment.update({ resolvedById: by?.userId ?? null, resolvedAt: by?.at ?? null }, { where: { id } });
  },

  async userNames(ids: (number | null)[]): Promise<Map<number, string>> {
    const wanted = [...new Set(ids.filter((i): i is number => i !== null))];
    if (wanted.length === 0) return new Map();
    const rows = await User.findAll({ attributes: ['id', 'name'], where: { id: wanted }, raw: true });
    return new Map(rows.map((u) => [u.id, u.name]));
  },

  /**
   * Addresses of active accounts (invitation accepted, not disabled) with a role, or with the
   * given ids; with `kind`, less those who turned
   * that e-mail off on their account page (email_opt_outs, migration 0015).
   */
  async activeEmails(where: { role?: 'reviewer'; ids?: number[]; kind?: string }): Promise<string[]> {
    const w: WhereOptions = { disabled: false, passwordHash: { [Op.ne]: null } };
    if (where.role) Object.assign(w, { role: where.role });
    if (where.ids) Object.assign(w, { id: where.ids });
    const rows = await User.findAll({ attributes: ['id', 'email'], where: w, order: [['id', 'ASC']], raw: true });
    if (!where.kind || rows.length === 0) return rows.map((u) => u.email);
    const off = new Set(
      (await EmailOptOut.findAll({ attributes: ['userId'], where: { kind: where.kind, userId: rows.map((u) => u.id) }, raw: true })).map((r) => r.userId),
    );
    return rows.filter((u) => !off.has(u.id)).map((u) => u.email);
  },

  /** Everyone who prepared, checked or issued a revision, or uploaded a drawing, on the project. */
  async projectPeople(projectId: number): Promise<number[]> {
    const trussIds = (await Truss.findAll({ attributes: ['id'], where: { projectId }, raw: true })).map((t) => t.id);
    if (trussIds.length === 0) return [];
    const revisions = await SheetRevision.findAll({ attributes: ['preparedById', 'checkedById', 'issuedById'], where: { trussId: trussIds }, raw: true });
    const drawings = await Drawing.findAll({ attributes: ['uploadedById'], where: { trussId: trussIds }, raw: true });
    const ids = new Set<number>();
    for (const r of revisions) for (const id of [r.preparedById, r.checkedById, r.issuedById]) if (id) ids.add(id);
    for (const d of drawings) if (d.uploadedById) ids.add(d.uploadedById);
    return [...ids];
  },
};

function commentRow(c: SheetComment): CommentRow {
  return {
    id: c.id,
    revisionId: c.revisionId,
    trussId: c.trussId,
    parentId: c.parentId,
    anchor: c.anchor,
    body: c.body,
    authorId: c.authorId,
    resolvedById: c.resolvedById ?? null,
    resolvedAt: toDate(c.resolvedAt),
    createdAt: new Date(c.createdAt),
  };
}
