import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import bcrypt from 'bcryptjs';
import { ZxcvbnFactory } from '@zxcvbn-ts/core';
import * as zxcvbnCommon from '@zxcvbn-ts/language-common';
import * as zxcvbnEn from '@zxcvbn-ts/language-en';
import { QueryTypes } from 'sequelize';
import type { Services } from '../../server/bootstrap';
import { OutboxMessage, PasswordReset, User } from '../../server/db/models';
import { hashToken } from '../../server/modules/auth/auth.service';
import { DEMO_PASSWORD } from '../../server/seed/demo';
import { demoEmail, openTab, signIn, startTestServices, type Tab } from '../support/test-services';

// Password change and reset on a real SQLite file, with e-mail over a real SMTP exchange to the
// local sink (which files each message in the outbox table).

let services: Services;
beforeAll(async () => {
  services = await startTestServices({}, { realFile: true });
});
afterAll(async () => {
  await services.shutdown();
});

/**
 * An independent zxcvbn estimator built here from the same published dictionaries, so the
 * expected score of a test password comes from the library, not from our rule's code.
 */
const reference = new ZxcvbnFactory({
  dictionary: { ...zxcvbnCommon.dictionary, ...zxcvbnEn.dictionary },
  graphs: zxcvbnCommon.adjacencyGraphs,
  translations: zxcvbnEn.translations,
});

/** A strong password (zxcvbn score 4) of invented unrelated words; checked below, not assumed. */
const STRONG = 'kiln mortise ladder fern 71';
const STRONG_2 = 'gusset heron quarry velvet 38';

async function mailsTo(address: string): Promise<OutboxMessage[]> {
  const rows = await OutboxMessage.findAll({ order: [['id', 'ASC']] });
  return rows.filter((m) => (JSON.parse(m.to) as string[]).includes(address));
}

/** Waits for the n-th message to an address (self-service mail is sent after the answer). */
async function waitForMail(address: string, n: number): Promise<OutboxMessage> {
  const until = Date.now() + 10_000;
  for (;;) {
    const mails = await mailsTo(address);
    if (mails.length >= n) return mails[n - 1];
    if (Date.now() > until) throw new Error(`no mail #${n} to ${address} within 10 s`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

const resetTokenIn = (mail: OutboxMessage) => {
  const m = /http:\/\/panelpoint\.test\/reset-password\/([A-Za-z0-9_-]+)/.exec(mail.text);
  if (!m) throw new Error(`no reset link in: ${mail.text}`);
  return m[1];
};

async function makeUser(email: string, name: string, password: string): Promise<User> {
  return User.create({ email, name, role: 'engineer', passwordHash: await bcrypt.hash(password, 4) });
}

const forgot = async (tab: Tab, email: string) => tab.agent.post('/api/password-resets').set('X-CSRF-Token', tab.csrf).send({ email });
const complete = async (tab: Tab, token: string, password: string) =>
  tab.agent.post('/api/password-resets/complete').set('X-CSRF-Token', tab.csrf).send({ token, password });
type SessionRow = { sid: string; expires: string; data: string; createdAt: string; updatedAt: string };
/** The user's session rows, read with plain SQL and picked by the JSON in JavaScript (same on SQLite and PostgreSQL). */
const sessionsOf = async (userId: number) =>
  (await services.sequelize.query<SessionRow>(`SELECT * FROM "Sessions"`, { type: QueryTypes.SELECT })).filter(
    (r) => (JSON.parse(r.data) as { passport?: { user?: { id?: number } } }).passport?.user?.id === userId,
  );
const sessionRowsOf = async (userId: number) => (await sessionsOf(userId)).length;

describe('the test passwords themselves', () => {
  it('when zxcvbn scores the passwords these tests use, then the strong ones score 4 and the weak ones below 3', () => {
    // Expected scores from zxcvbn itself (a general-purpose library, not our code).
    expect(reference.check(STRONG).score).toBe(4);
    expect(reference.check(STRONG_2).score).toBe(4);
    expect(reference.check('password1234').score).toBeLessThan(3);
    expect(reference.check('qwertyuiop123').score).toBeLessThan(3);
  });
});

describe('changing one’s own password', () => {
  it('when the current password is wrong, then 400 with one sentence on that field and nothing changes', async () => {
    const user = await makeUser('change.wrong@example.com', 'Ines Varga', STRONG);
    const tab = await signIn(services.app, user.email, STRONG);
    const before = (await User.findByPk(user.id))!;
    const res = await tab.agent.post('/api/account/password').set('X-CSRF-Token', tab.csrf).send({ currentPassword: 'not my password', newPassword: STRONG_2 });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('wrong-current-password');
    expect(res.body.error.fields.currentPassword).toBe(res.body.error.message);
    expect(res.body.error.message.split(/\.\s/).length).toBe(1);
    const after = (await User.findByPk(user.id))!;
    expect(after.passwordHash).toBe(before.passwordHash);
    expect(after.sessionEpoch).toBe(before.sessionEpoch);
    await tab.agent.get('/api/projects').expect(200);
  });

  it('when the new password is common, then 400 naming zxcvbn’s reason and what to do, and nothing changes', async () => {
    const user = await makeUser('change.weak@example.com', 'Oskar Lindqvist', STRONG);
    const tab = await signIn(services.app, user.email, STRONG);
    const weak = 'qwertyuiop123';
    const expectedWarning = reference.check(weak).feedback.warning!;
    expect(expectedWarning).toBeTruthy();
    const res = await tab.agent.post('/api/account/password').set('X-CSRF-Token', tab.csrf).send({ currentPassword: STRONG, newPassword: weak });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('weak-password');
    // zxcvbn's own warning, as the reason, in the one sentence; then what to do.
    expect(res.body.error.message.toLowerCase()).toContain(expectedWarning.replace(/\.$/, '').toLowerCase());
    expect(res.body.error.message).toMatch(/unrelated words\.$/);
    expect(res.body.error.fields.newPassword).toBe(res.body.error.message);
    expect(await bcrypt.compare(STRONG, (await User.findByPk(user.id))!.passwordHash!)).toBe(true);
  });

  it('when the new password is the person’s own e-mail address with a suffix, then it is refused as personal data', async () => {
    const user = await makeUser('martha.quill@example.com', 'Martha Quill', STRONG);
    const tab = await signIn(services.app, user.email, STRONG);
    const res = await tab.agent.post('/api/account/password').set('X-CSRF-Token', tab.csrf).send({ currentPassword: STRONG, newPassword: 'martha.quill@example.com' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('weak-password');
    // The same password scores 0 in zxcvbn when the address is given as a user input.
    expect(reference.check('martha.quill@example.com', ['martha.quill@example.com']).score).toBeLessThan(3);
  });

  it('when the new password is shorter than 12 characters, then 400 on that field and nothing changes', async () => {
    const user = await makeUser('change.short@example.com', 'Ravi Menon', STRONG);
    const tab = await signIn(services.app, user.email, STRONG);
    const res = await tab.agent.post('/api/account/password').set('X-CSRF-Token', tab.csrf).send({ currentPassword: STRONG, newPassword: 'Xq7#kz!p2' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.newPassword).toMatch(/at least 12 characters/);
    await signIn(services.app, user.email, STRONG);
  });

  it('when the change is accepted, then this tab stays signed in, every other session is signed out, and only the new password works', async () => {
    const user = await makeUser('change.ok@example.com', 'Hana Sato', STRONG);
    const here = await signIn(services.app, user.email, STRONG);
    const laptop = await signIn(services.app, user.email, STRONG);
    const phone = await signIn(services.app, user.email, STRONG);
    expect(await sessionRowsOf(user.id)).toBe(3);
    await laptop.agent.get('/api/projects').expect(200);

    const res = await here.agent.post('/api/account/password').set('X-CSRF-Token', here.csrf).send({ currentPassword: STRONG, newPassword: STRONG_2 });
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe(user.email);
    expect(res.body.csrfToken).not.toBe(here.csrf);

    await here.agent.get('/api/projects').expect(200);
    for (const other of [laptop, phone]) {
      const r = await other.agent.get('/api/projects');
      expect(r.status).toBe(401);
    }
    expect(await sessionRowsOf(user.id)).toBe(1);
    const old = await openTab(services.app);
    expect((await old.agent.post('/api/session').set('X-CSRF-Token', old.csrf).send({ email: user.email, password: STRONG })).status).toBe(401);
    await signIn(services.app, user.email, STRONG_2);
  });

  it('when another session is saved again after the change (a request of it still in flight), then it is still signed out', async () => {
    const user = await makeUser('change.race@example.com', 'Dmitri Volkov', STRONG);
    const here = await signIn(services.app, user.email, STRONG);
    const laptop = await signIn(services.app, user.email, STRONG);
    const rowsBefore = await sessionsOf(user.id);
    expect(rowsBefore).toHaveLength(2);
    await here.agent.post('/api/account/password').set('X-CSRF-Token', here.csrf).send({ currentPassword: STRONG, newPassword: STRONG_2 }).expect(200);
    // Put the old rows back, as a request that was running during the change would on saving.
    for (const r of rowsBefore) {
      await services.sequelize.query(`INSERT INTO "Sessions" (sid, expires, data, "createdAt", "updatedAt") VALUES (:sid, :expires, :data, :createdAt, :updatedAt)`, {
        replacements: r,
      });
    }
    expect((await laptop.agent.get('/api/projects')).status).toBe(401);
    await here.agent.get('/api/projects').expect(200);
  });

  it('when signed out, then 401 and nothing changes', async () => {
    const tab = await openTab(services.app);
    const res = await tab.agent.post('/api/account/password').set('X-CSRF-Token', tab.csrf).send({ currentPassword: DEMO_PASSWORD, newPassword: STRONG });
    expect(res.status).toBe(401);
  });
});

describe('resetting a password by an e-mailed link', () => {
  it('when someone asks for a reset, then the e-mailed link sets a new password once, signs them in and signs out their other sessions', async () => {
    const user = await makeUser('reset.flow@example.com', 'Tariq Haddad', STRONG);
    const elsewhere = await signIn(services.app, user.email, STRONG);
    const guest = await openTab(services.app);
    const asked = await forgot(guest, 'Reset.Flow@Example.com');
    expect(asked.status).toBe(202);
    const mail = await waitForMail(user.email, 1);
    expect(mail.subject).toBe('Choose a new Panelpoint password');
    expect(mail.text).toMatch(/expires in 60 minutes/);
    const token = resetTokenIn(mail);

    // Stored hashed: the token itself is nowhere in the table.
    const row = await PasswordReset.findOne({ where: { userId: user.id } });
    expect(row!.tokenHash).toBe(hashToken(token));
    expect(row!.tokenHash).not.toContain(token);
    // One hour, from the moment it was made (±5 s for the test's own run time).
    expect(Math.abs(row!.expiresAt.getTime() - row!.createdAt.getTime() - 3600_000)).toBeLessThan(5000);

    // Asking for the link does not change the password.
    await signIn(services.app, user.email, STRONG);

    const shown = await guest.agent.get(`/api/password-resets/${token}`).expect(200);
    expect(shown.body).toMatchObject({ email: user.email, name: 'Tariq Haddad' });

    const done = await complete(guest, token, STRONG_2);
    expect(done.status).toBe(200);
    expect(done.body.user.email).toBe(user.email);
    await guest.agent.get('/api/projects').expect(200);
    expect((await elsewhere.agent.get('/api/projects')).status).toBe(401);
    await signIn(services.app, user.email, STRONG_2);

    // The same link again: refused, and the password stays.
    const other = await openTab(services.app);
    const again = await complete(other, token, 'an entirely new phrase of words');
    expect(again.status).toBe(410);
    expect(again.body.error.code).toBe('reset-used');
    expect((await other.agent.get(`/api/password-resets/${token}`)).status).toBe(410);
    await signIn(services.app, user.email, STRONG_2);
  });

  it('when the link is older than an hour, then it is refused and the password stays', async () => {
    const user = await makeUser('reset.expired@example.com', 'Lena Brandt', STRONG);
    const guest = await openTab(services.app);
    await forgot(guest, user.email);
    const token = resetTokenIn(await waitForMail(user.email, 1));
    // The link's clock moved on past its hour (one second late).
    await PasswordReset.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { tokenHash: hashToken(token) } });
    const res = await complete(guest, token, STRONG_2);
    expect(res.status).toBe(410);
    expect(res.body.error.code).toBe('reset-expired');
    expect(res.body.error.message).toMatch(/ask for a new one/);
    await signIn(services.app, user.email, STRONG);
  });

  it('when a newer link is sent, then the older one no longer works', async () => {
    const user = await makeUser('reset.newer@example.com', 'Carmen Ortiz', STRONG);
    const admin = await signIn(services.app, demoEmail('admin'));
    const guest = await openTab(services.app);
    await forgot(guest, user.email);
    const first = resetTokenIn(await waitForMail(user.email, 1));
    const sent = await admin.agent.post(`/api/users/${user.id}/password-reset`).set('X-CSRF-Token', admin.csrf).send({});
    expect(sent.status).toBe(202);
    const second = resetTokenIn(await waitForMail(user.email, 2));
    expect(second).not.toBe(first);
    const old = await complete(guest, first, STRONG_2);
    expect(old.status).toBe(404);
    expect(old.body.error.code).toBe('reset-not-found');
    await signIn(services.app, user.email, STRONG);
    expect((await complete(guest, second, STRONG_2)).status).toBe(200);
  });

  it('when an admin sends a reset link, then the e-mail names the admin and the link works', async () => {
    const user = await makeUser('reset.admin@example.com', 'Yusuf Demir', STRONG);
    const admin = await signIn(services.app, demoEmail('admin'));
    const adminName = (await User.findOne({ where: { email: demoEmail('admin') } }))!.name;
    const sent = await admin.agent.post(`/api/users/${user.id}/password-reset`).set('X-CSRF-Token', admin.csrf).send({});
    expect(sent.status).toBe(202);
    expect(sent.body.email).toBe(user.email);
    expect(sent.body.link).toBeUndefined();
    const mail = await mailsTo(user.email);
    expect(mail).toHaveLength(1);
    expect(mail[0].text).toContain(adminName);
    const guest = await openTab(services.app);
    expect((await complete(guest, resetTokenIn(mail[0]), STRONG_2)).status).toBe(200);
    await signIn(services.app, user.email, STRONG_2);
  });

  it('when an admin sends a link to an unknown, pending or disabled account, then one sentence and no mail', async () => {
    const admin = await signIn(services.app, demoEmail('admin'));
    const pending = await User.create({ email: 'reset.pending@example.com', name: 'P', role: 'drafter', passwordHash: null });
    const disabled = await makeUser('reset.disabled@example.com', 'D', STRONG);
    await disabled.update({ disabled: true });
    const before = await OutboxMessage.count();
    const cases: [number, number, string][] = [
      [999999, 404, 'not-found'],
      [pending.id, 409, 'user-pending'],
      [disabled.id, 409, 'user-disabled'],
    ];
    for (const [id, status, code] of cases) {
      const res = await admin.agent.post(`/api/users/${id}/password-reset`).set('X-CSRF-Token', admin.csrf).send({});
      expect(res.status).toBe(status);
      expect(res.body.error.code).toBe(code);
    }
    expect(await OutboxMessage.count()).toBe(before);
    expect(await PasswordReset.count({ where: { userId: [pending.id, disabled.id] } })).toBe(0);
  });

  it('when the address is unknown, then the same answer as a known one and no mail', async () => {
    const known = await makeUser('reset.known@example.com', 'Aiko Mori', STRONG);
    const guest = await openTab(services.app);
    const unknown = await forgot(guest, 'nobody.here@example.com');
    // Then a known address; its mail is sent after the unknown one would have been.
    const knownRes = await forgot(guest, known.email);
    expect(unknown.status).toBe(202);
    expect(unknown.body).toEqual(knownRes.body);
    expect(knownRes.status).toBe(202);
    await waitForMail(known.email, 1);
    expect(await mailsTo('nobody.here@example.com')).toHaveLength(0);
  });

  it('when someone asks again within a minute, then the same answer and no second mail (no mail-bombing an address)', async () => {
    const user = await makeUser('reset.twice@example.com', 'Nadia Rahman', STRONG);
    const guest = await openTab(services.app);
    const first = await forgot(guest, user.email);
    const token = resetTokenIn(await waitForMail(user.email, 1));
    const second = await forgot(guest, user.email);
    expect(second.status).toBe(202);
    expect(second.body).toEqual(first.body);
    // A later request for another address is mailed; by then the second one would have been too.
    const marker = await makeUser('reset.marker@example.com', 'Marker', STRONG);
    await forgot(guest, marker.email);
    await waitForMail(marker.email, 1);
    expect(await mailsTo(user.email)).toHaveLength(1);
    expect((await complete(guest, token, STRONG_2)).status).toBe(200);
  });

  it('when the new password is weak or short, then 400 and the link still works', async () => {
    const user = await makeUser('reset.weak@example.com', 'Bruno Costa', STRONG);
    const guest = await openTab(services.app);
    await forgot(guest, user.email);
    const token = resetTokenIn(await waitForMail(user.email, 1));
    const weak = await complete(guest, token, 'password1234');
    expect(weak.status).toBe(400);
    expect(weak.body.error.code).toBe('weak-password');
    expect(weak.body.error.message).toContain(reference.check('password1234').feedback.warning!.replace(/\.$/, '').toLowerCase());
    // zxcvbn's slowest kind of input, at the 200-character maximum: refused (weak, or past the
    // check's time limit), never a 500, and the link still works.
    const repeated = await complete(guest, token, 'ab1!'.repeat(50));
    expect(repeated.status).toBe(400);
    expect(repeated.body.error.code).toBe('weak-password');
    const short = await complete(guest, token, 'short');
    expect(short.status).toBe(400);
    expect(short.body.error.fields.password).toMatch(/at least 12/);
    await guest.agent.get(`/api/password-resets/${token}`).expect(200);
    await signIn(services.app, user.email, STRONG);
  });

  it('when the body is not what the route takes, then 400 with one sentence and nothing written', async () => {
    const guest = await openTab(services.app);
    const resetsBefore = await PasswordReset.count();
    for (const body of [{}, { email: 'not an address' }, { email: 42 }, { email: ['a@b.c'] }]) {
      const res = await guest.agent.post('/api/password-resets').set('X-CSRF-Token', guest.csrf).send(body);
      expect(res.status).toBe(400);
      expect(res.body.error.fields.email).toMatch(/Enter an e-mail address/);
    }
    for (const body of [{}, { token: 'x', password: STRONG }, { token: 'a'.repeat(40) }, { token: 'a'.repeat(40), password: 12345678901234 }]) {
      const res = await complete(guest, (body as { token?: string }).token as string, (body as { password?: string }).password as string);
      expect(res.status).toBe(400);
    }
    const unknownToken = await complete(guest, 'a'.repeat(43), STRONG);
    expect(unknownToken.status).toBe(404);
    expect(await PasswordReset.count()).toBe(resetsBefore);
  });
});

describe('the rule on invitations', () => {
  it('when an invited person picks a common password, then 400 with the reason and the invitation stays usable', async () => {
    const admin = await signIn(services.app, demoEmail('admin'));
    const invited = await admin.agent.post('/api/users/invitations').set('X-CSRF-Token', admin.csrf).send({ email: 'invited.weak@example.com', name: 'Elif Kaya', role: 'drafter' });
    const token = invited.body.link.split('/').pop();
    const guest = await openTab(services.app);
    const res = await guest.agent.post('/api/invitations/accept').set('X-CSRF-Token', guest.csrf).send({ token, name: 'Elif Kaya', password: 'password1234' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('weak-password');
    expect(res.body.error.fields.password).toBe(res.body.error.message);
    await guest.agent.get(`/api/invitations/${token}`).expect(200);
    expect((await guest.agent.post('/api/invitations/accept').set('X-CSRF-Token', guest.csrf).send({ token, name: 'Elif Kaya', password: STRONG })).status).toBe(200);
  });
});
