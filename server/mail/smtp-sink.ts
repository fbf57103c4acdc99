import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import type { AddressInfo } from 'node:net';
import { OutboxMessage } from '../db/models';

export interface SmtpSink {
  port: number;
  close(): Promise<void>;
}

/**
 * A local SMTP server standing in for the firm's mail service in development and tests:
 * it accepts every message over a real SMTP exchange and files it in the outbox table,
 * which the admin's outbox page lists.
 */
export async function startSmtpSink(port = 0, host = '127.0.0.1'): Promise<SmtpSink> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    banner: 'Panelpoint local mail sink',
    size: 5 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', async () => {
        try {
          const raw = Buffer.concat(chunks).toString('utf8');
          const parsed = await simpleParser(raw);
          await OutboxMessage.create({
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            to: JSON.stringify(session.envelope.rcptTo.map((r) => r.address)),
            subject: parsed.subject ?? '(no subject)',
            text: parsed.text ?? '',
            raw,
            receivedAt: new Date(),
          });
          callback();
        } catch (err) {
          callback(err as Error);
        }
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => resolve());
  });
  const address = server.server.address() as AddressInfo;
  return {
    port: address.port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
