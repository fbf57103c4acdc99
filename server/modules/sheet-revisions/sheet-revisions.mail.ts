import type { Mailer } from '../../mail/mailer';
import type { TrussContext } from '../records/records.repository';

/** The e-mails of the review: who is told, and what the message says. */

export type ReviewMailKind = 'submitted' | 'returned' | 'checked' | 'issued';

export interface ReviewMailInput {
  kind: ReviewMailKind;
  to: string[];
  context: TrussContext;
  label: string;
  /** The run the sheet was made from, as cited: "Run 2 of T7 (model save 5)". */
  run?: string;
  actorName: string;
  note: string;
  pageUrl: string;
  openComments?: number;
  /** The open comment threads, in the sheet's order; the mail quotes the first MAIL_COMMENTS. */
  comments?: MailComment[];
  sha256?: string;
  /** Submitted: the mail goes to the chosen checker only, and says so. */
  toChecker?: boolean;
}

/** A comment thread as a mail quotes it: where it is on the sheet, who wrote it, what it says. */
export interface MailComment {
  /** The step's printed number ("6.4"), or the section's ("6"); null where the sheet has none. */
  number: string | null;
  /** The step's or section's title, or the anchor when the sheet has no title for it. */
  place: string;
  author: string;
  body: string;
}

/** How many comments a mail quotes in full; the rest are counted. */
export const MAIL_COMMENTS = 5;
/** A longer comment is cut at this many characters in the mail (the sheet page has it whole). */
export const MAIL_COMMENT_CHARS = 600;

function commentLines(comments: MailComment[]): string[] {
  const lines = ['', comments.length === 1 ? 'The open comment:' : `The open comments (${comments.length}):`];
  for (const c of comments.slice(0, MAIL_COMMENTS)) {
    const where = c.number ? `Step ${c.number} ${c.place}` : c.place;
    const text = c.body.length > MAIL_COMMENT_CHARS ? `${c.body.slice(0, MAIL_COMMENT_CHARS).trimEnd()}…` : c.body;
    lines.push('', `- ${where} — ${c.author}:`, ...text.split(/\r?\n/).map((l) => `  ${l}`));
  }
  const rest = comments.length - MAIL_COMMENTS;
  if (rest > 0) lines.push('', `…and ${rest} more open comment${rest === 1 ? '' : 's'} on the sheet page.`);
  return lines;
}

const WHAT: Record<ReviewMailKind, string> = {
  submitted: 'submitted for check',
  returned: 'returned with comments',
  checked: 'checked',
  issued: 'issued',
};

export function reviewMailMessage(m: ReviewMailInput): { subject: string; text: string } {
  const { context: c } = m;
  const sheet = `${c.jobNumber} ${c.projectName} — ${c.trussName}, revision ${m.label}`;
  const subject = `[${c.jobNumber}] ${c.projectName} · ${c.trussName} · revision ${m.label} ${WHAT[m.kind]}`;
  const lines: string[] = [];
  switch (m.kind) {
    case 'submitted':
      lines.push(`${m.actorName} submitted the calc sheet ${sheet} for check.`);
      if (m.toChecker) lines.push('You are its checker: only you can return it or mark it checked.');
      lines.push('Please read it step by step, comment where needed, then return it or mark it checked.');
      break;
    case 'returned':
      lines.push(`${m.actorName} returned the calc sheet ${sheet}.`, `Open comments: ${m.openComments ?? 0}. Address them in a new revision and submit it again.`);
      break;
    case 'checked':
      lines.push(`${m.actorName} checked the calc sheet ${sheet}.`, 'It can now be issued.');
      break;
    case 'issued':
      lines.push(`${m.actorName} issued the calc sheet ${sheet}.`, `The signed PDF is in the archive. SHA-256: ${m.sha256 ?? ''}`);
      break;
  }
  if (m.run) lines.push(`The sheet is made from ${m.run}.`);
  if (m.comments?.length && (m.kind === 'returned' || m.kind === 'submitted')) lines.push(...commentLines(m.comments));
  if (m.note) lines.push('', `Note: ${m.note}`);
  lines.push('', `Open the sheet: ${m.pageUrl}`);
  return { subject, text: lines.join('\n') };
}

/** Sends one message to every recipient; nothing is sent when there is nobody to tell. */
export async function reviewMailSend(mailer: Mailer, m: ReviewMailInput): Promise<void> {
  const to = [...new Set(m.to.map((a) => a.toLowerCase()))];
  if (to.length === 0) return;
  await mailer.send({ to, ...reviewMailMessage(m) });
}
