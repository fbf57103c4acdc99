import crypto from 'node:crypto';
import net from 'node:net';
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import type { AddressInfo } from 'node:net';
import { OutboxMessage } from '../db/models';

export interface SmtpSink {
  port: number;
  /** The address it listens on (always a loopback address). */
  address: string;
  /** The per-start credentials Panelpoint's mailer signs in with (AUTH PLAIN over loopback). */
  auth: { user: string; pass: string };
  close(): Promise<void>;
}

export interface SmtpSinkOptions {
  port?: number;
  /** A loopback address only: 127.0.0.1 (default), another 127.x address, ::1 or localhost. */
  host?: string;
  /** The one envelope sender accepted (Panelpoint's MAIL_FROM address); unset accepts any after AUTH. */
  sender?: string;
}

/** The bare address of a From line such as `Panelpoint <no-reply@panelpoint.local>`. */
export function senderAddress(from: string): string {
  const angled = /<([^<>\s]+)>\s*$/.exec(from);
  return (angled ? angled[1] : from).trim().toLowerCase();
}

export function isLoopback(host: string): boolean {
  if (host === 'localhost') return true;
  const ip = host.replace(/^::ffff:/i, '');
  if (net.isIPv4(ip)) return ip.startsWith('127.');
  return net.isIPv6(host) && /^(0{0,4}:){7}0{0,3}1$|^::1$/.test(host);
}

function smtpError(message: string, responseCode: number): Error {
  return Object.assign(new Error(message), { responseCode });
}

/**
 * A local SMTP server standing in for the firm's mail service in development and tests: it
 * files every message it accepts in the outbox table, which the admin's outbox page lists.
 *
 * It takes mail from Panelpoint alone: it listens on loopback only (a non-loopback host is
 * refused before anything listens, and a connection from elsewhere is dropped), it requires
 * AUTH with credentials made afresh at every start and known only to this process's mailer,
 * and with `sender` set it refuses any other envelope sender.
 */
export async function startSmtpSink(options: SmtpSinkOptions = {}): Promise<SmtpSink> {
  const host = options.host ?? '127.0.0.1';
  if (!isLoopback(host)) {
    throw new Error(
      `The local mail sink listens on loopback only (127.0.0.1 or ::1), not on "${host}"; to take mail from other machines, set SMTP_URL to a real mail server instead.`,
    );
  }
  const auth = { user: 'panelpoint', pass: crypto.randomBytes(24).toString('base64url') };
  const expectedPass = Buffer.from(auth.pass);
  const sender = options.sender ? senderAddress(options.sender) : undefined;
  const server = new SMTPServer({
    authOptional: false,
    authMethods: ['PLAIN', 'LOGIN'],
    // No TLS on a loopback socket; the credentials never leave the machine.
    allowInsecureAuth: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    banner: 'Panelpoint local mail sink',
    size: 5 * 1024 * 1024,
    onConnect(session, callback) {
      if (!isLoopback(session.remoteAddress)) return callback(smtpError('This mail sink takes mail from this machine only.', 554));
      callback();
    },
    onAuth(login, _session, callback) {
      const given = Buffer.from(login.password ?? '');
      const ok = login.username === auth.user && given.length === expectedPass.length && crypto.timingSafeEqual(given, expectedPass);
      if (!ok) return callback(smtpError('These credentials are not Panelpoint\'s.', 535));
      callback(null, { user: auth.user });
    },
    onMailFrom(address, _session, callback) {
      if (sender && address.address.toLowerCase() !== sender) {
        return callback(smtpError(`This mail sink takes mail from ${sender} only.`, 553));
      }
      callback();
    },
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
    server.listen(options.port ?? 0, host, () => resolve());
  });
  const address = server.server.address() as AddressInfo;
  return {
    port: address.port,
    address: address.address,
    auth,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
