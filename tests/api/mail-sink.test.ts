import net from 'node:net';
import os from 'node:os';
import nodemailer from 'nodemailer';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { OutboxMessage } from '../../server/db/models';
import { isLoopback, senderAddress, startSmtpSink } from '../../server/mail/smtp-sink';
import { startTestServices } from '../support/test-services';

// The real local SMTP sink of a started server, spoken to over real SMTP by nodemailer clients.
let services: Services;
beforeAll(async () => {
  services = await startTestServices();
});
afterAll(async () => {
  await services.shutdown();
});

const port = () => services.sink!.port;
const client = (auth?: { user: string; pass: string }) =>
  nodemailer.createTransport({ host: '127.0.0.1', port: port(), secure: false, ignoreTLS: true, auth });
const message = (from: string) => ({ from, to: 'someone@firm.test', subject: `probe ${Math.random()}`, text: 'hello' });
const stored = (subject: string) => OutboxMessage.count({ where: { subject } });

describe('the local mail sink takes mail from Panelpoint alone', () => {
  it("Panelpoint's own mailer gets through (AUTH with the per-start secret, its own MAIL_FROM)", async () => {
    await services.mailer.send({ to: 'engineer@firm.test', subject: 'sink-ok', text: 'hi' });
    expect(await stored('sink-ok')).toBe(1);
  });

  it('a client without AUTH is refused (530) and nothing is filed', async () => {
    const m = message(services.config.mailFrom);
    await expect(client().sendMail(m)).rejects.toMatchObject({ responseCode: 530 });
    expect(await stored(m.subject)).toBe(0);
  });

  it('a client with the wrong password is refused (535)', async () => {
    const m = message(services.config.mailFrom);
    await expect(client({ user: 'panelpoint', pass: 'guessed-password' }).sendMail(m)).rejects.toMatchObject({ responseCode: 535 });
    expect(await stored(m.subject)).toBe(0);
  });

  it("even with the credentials, a foreign envelope sender is refused (553)", async () => {
    const m = message('Someone Else <mallory@elsewhere.test>');
    await expect(client(services.sink!.auth).sendMail(m)).rejects.toMatchObject({ responseCode: 553 });
    expect(await stored(m.subject)).toBe(0);
  });

  it('listens on loopback only: the socket is bound to 127.0.0.1', () => {
    expect(services.sink!.address).toBe('127.0.0.1');
  });

  const outside = Object.values(os.networkInterfaces())
    .flat()
    .find((i) => i && i.family === 'IPv4' && !i.internal)?.address;
  it.skipIf(!outside)('is not reachable on the machine\'s network address', async () => {
    const refused = await new Promise<string>((resolve) => {
      const socket = net.connect(port(), outside!);
      socket.once('connect', () => {
        socket.destroy();
        resolve('connected');
      });
      socket.once('error', (err: NodeJS.ErrnoException) => resolve(err.code ?? 'error'));
    });
    expect(refused).toBe('ECONNREFUSED');
  });

  it('refuses to listen on a non-loopback address, with a sentence saying what to do', async () => {
    await expect(startSmtpSink({ host: '0.0.0.0' })).rejects.toThrow(/loopback only .* set SMTP_URL/);
    await expect(startSmtpSink({ host: '::' })).rejects.toThrow(/loopback only/);
    if (outside) await expect(startSmtpSink({ host: outside })).rejects.toThrow(/loopback only/);
  });
});

describe('loopback and sender helpers', () => {
  it('knows loopback addresses (RFC 1122 3.2.1.3: 127/8; RFC 4291 2.5.3: ::1)', () => {
    for (const h of ['127.0.0.1', '127.1.2.3', '::1', '0:0:0:0:0:0:0:1', '::ffff:127.0.0.1', 'localhost']) expect(isLoopback(h), h).toBe(true);
    for (const h of ['0.0.0.0', '::', '10.0.0.1', '128.0.0.1', '::2', '192.168.1.5', 'panelpoint.lan']) expect(isLoopback(h), h).toBe(false);
  });

  it('reads the bare address of a From line', () => {
    expect(senderAddress('Panelpoint <No-Reply@Panelpoint.local>')).toBe('no-reply@panelpoint.local');
    expect(senderAddress('mail@firm.test')).toBe('mail@firm.test');
  });
});
