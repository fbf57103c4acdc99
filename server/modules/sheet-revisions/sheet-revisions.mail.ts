import type { Mailer } from '../../mail/mailer';
import type { TrussContext } from '../records/records.repository';

/** The e-mails of the review: who is told, and what the message says. */

export type ReviewMailKind = 'submitted' | 'returned' | 'checked' | 'issued';

export interface ReviewMailInput {
  kind: ReviewMailKind;
  to: string[];
  context: TrussContext;
  label: string;
  actorName: string;
  note: string;
  pageUrl: string;
  openComments?: number;
  sha256?: string;
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
      lines.push(`${m.actorName} submitted the calc sheet ${sheet} for check.`, 'Please read it step by step, comment where needed, then return it or mark it checked.');
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
