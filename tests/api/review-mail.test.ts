import bcrypt from 'bcryptjs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { EmailOptOut, OutboxMessage, User } from '../../server/db/models';
import { DEMO_PASSWORD } from '../../server/seed/demo';
import { demoEmail, demoUserId, signIn, startTestServices, type Tab } from '../support/test-services';
import { solvedDemoRun } from '../support/fixtures';

/**
 * The review e-mails on a real server: a real solved run of the demo truss, its real calc
 * sheet, the real SMTP sink (each message filed in the outbox table), real sessions. The
 * step numbers expected in the mail are read from the sheet HTML the reviewer sees, not
 * worked out by the code under test.
 */

const PUBLIC_URL = 'http://sheets.office-east.example:8080';
let services: Services;
let engineer: Tab;
let reviewer: Tab;
let reviewer2: Tab;
let runId: number;
/** The worked steps of the run's sheet in document order: anchor, printed number, title. */
let steps: { id: string; number: string; title: string }[];

const put = (t: Tab, url: string, body: unknown) => t.agent.put(url).set('X-CSRF-Token', t.csrf).send(body as object);
const post = (t: Tab, url: string, body: object = {}) => t.agent.post(url).set('X-CSRF-Token', t.csrf).send(body);
const lastMailId = async () => ((await OutboxMessage.max('id')) as number | null) ?? 0;
async function mailsSince(id: number) {
  const rows = await OutboxMessage.findAll({ order: [['id', 'ASC']] });
  return rows.filter((m) => m.id > id).map((m) => ({ to: (JSON.parse(m.to) as string[]).sort(), subject: m.subject, text: m.text }));
}
async function waitForMailTo(address: string, since: number) {
  const until = Date.now() + 10_000;
  for (;;) {
    const mail = (await mailsSince(since)).find((m) => m.to.includes(address));
    if (mail) return mail;
    if (Date.now() > until) throw new Error(`no mail to ${address} within 10 s`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

beforeAll(async () => {
  services = await startTestServices({ publicUrl: PUBLIC_URL });
  await User.create({ email: 'second.reviewer@demo.panelpoint.test', name: 'Priya Okafor', role: 'reviewer', passwordHash: await bcrypt.hash(DEMO_PASSWORD, 4) });
  engineer = await signIn(services.app, demoEmail('engineer'));
  reviewer = await signIn(services.app, demoEmail('reviewer'));
  reviewer2 = await signIn(services.app, 'second.reviewer@demo.panelpoint.test');
  runId = (await solvedDemoRun(engineer)).id;
  const html = (await reviewer.agent.get(`/api/runs/${runId}/sheet`).expect(200)).text;
  steps = [...html.matchAll(/<article class="step[^"]*" id="([^"]+)">\s*<h4><a class="anchor" href="#[^"]+"><span class="step-no">([\d.]+)<\/span>\s*([^<]*)<\/a>/g)].map((m) => ({
    id: m[1],
    number: m[2],
    title: m[3].trim().replace(/&#x27;|&#39;/g, "'").replace(/&quot;/g, '"').replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&amp;/g, '&'),
  }));
}, 90_000);

afterAll(async () => {
  await services?.shutdown();
});

describe('e-mail settings', () => {
  it('when a person opens their settings, then every review e-mail is on', async () => {
    const res = await reviewer.agent.get('/api/me/email-settings').expect(200);
    expect(res.body).toEqual({ submitted: true, returned: true, checked: true, issued: true });
  });

  it('when a setting name is unknown, a value is not a boolean or the body is not an object, then 422 with one sentence and nothing is written', async () => {
    const cases: [unknown, RegExp][] = [
      [{ sent: false }, /"sent" is not an e-mail setting; use submitted, returned, checked, issued\./],
      [{ returned: 'no' }, /Set "returned" to true or false\./],
      [{ returned: 0 }, /Set "returned" to true or false\./],
      [{ submitted: false, digest: true }, /"digest" is not an e-mail setting/],
      [[{ returned: false }], /Send the e-mail settings as an object/],
    ];
    for (const [body, message] of cases) {
      const res = await put(reviewer2, '/api/me/email-settings', body);
      expect(res.status, JSON.stringify(body)).toBe(422);
      expect(res.body.error.code).toBe('email-settings-invalid');
      expect(res.body.error.message).toMatch(message);
      expect(res.body.error.message.split(/\.\s/)).toHaveLength(1);
    }
    expect(await EmailOptOut.count()).toBe(0);
  });

  it('when a person turns one off and on again, then only their own setting changes', async () => {
    expect((await put(reviewer2, '/api/me/email-settings', { checked: false, issued: false })).body).toEqual({ submitted: true, returned: true, checked: false, issued: false });
    expect((await put(reviewer2, '/api/me/email-settings', { issued: true })).body).toEqual({ submitted: true, returned: true, checked: false, issued: true });
    expect((await reviewer.agent.get('/api/me/email-settings')).body.checked).toBe(true);
    expect((await put(reviewer2, '/api/me/email-settings', { checked: true })).body.checked).toBe(true);
    expect(await EmailOptOut.count()).toBe(0);
  });
});

describe('review e-mails people act on', () => {
  let sheetId: number;

  it('when the sheet has worked steps, then the test has read their printed numbers', () => {
    // The demo truss under one case has stability, reaction and joint steps (at least 8).
    expect(steps.length).toBeGreaterThanOrEqual(8);
    expect(steps.every((s) => /^\d+\.\d+$/.test(s.number))).toBe(true);
  });

  it('when the engineer chooses the demo reviewer as checker, then the submit mail goes to that checker only, with a link on PUBLIC_URL', async () => {
    await put(reviewer2, '/api/me/email-settings', { submitted: false }).expect(200);
    sheetId = (await post(engineer, '/api/trusses/1/sheets', { runId }).expect(201)).body.id;
    const before = await lastMailId();
    await post(engineer, `/api/sheets/${sheetId}/submit`, { checkerId: await demoUserId() }).expect(200);
    const mails = await mailsSince(before);
    expect(mails).toHaveLength(1);
    expect(mails[0].to).toEqual(['reviewer@demo.panelpoint.test']);
    const link = /Open the sheet: (\S+)/.exec(mails[0].text)![1];
    expect(new URL(link).host).toBe(new URL(PUBLIC_URL).host);
    expect(link).toBe(`${PUBLIC_URL}/sheets/${sheetId}`);
    expect(mails[0].text).not.toContain('localhost');
    // The run is cited by its number within the truss and the model save it solved, as the app and the sheet cite it.
    const truss = (await engineer.agent.get('/api/trusses/1').expect(200)).body as { name: string };
    const run = (await engineer.agent.get(`/api/runs/${runId}`).expect(200)).body as { number: number; modelVersion: number };
    expect(mails[0].text).toContain(`The sheet is made from Run ${run.number} of ${truss.name} (model save ${run.modelVersion}).`);
  });

  it('when seven comments are open and the sheet is returned, then the mail quotes the first five in sheet order with their step numbers and counts the other two', async () => {
    // Seven steps spread over the sheet, commented on last-first so the mail's order is the sheet's, not the comments'.
    const picked = [0, 1, 2, 3, 4, 5, 6].map((i) => steps[Math.floor((i * (steps.length - 1)) / 6)]);
    expect(new Set(picked.map((s) => s.id)).size).toBe(7);
    const bodies = picked.map((s, i) => `Comment ${i + 1} on ${s.id}: check the arithmetic\nand the sign.`);
    for (let i = 6; i >= 0; i--) await post(reviewer, `/api/sheets/${sheetId}/comments`, { anchor: picked[i].id, body: bodies[i] }).expect(201);

    const before = await lastMailId();
    await post(reviewer, `/api/sheets/${sheetId}/return`, { note: 'See the comments' }).expect(200);
    const mails = await mailsSince(before);
    expect(mails).toHaveLength(1);
    expect(mails[0].to).toEqual(['engineer@demo.panelpoint.test']);
    const text = mails[0].text;
    expect(text).toContain('The open comments (7):');
    let last = -1;
    for (let i = 0; i < 5; i++) {
      const heading = `- Step ${picked[i].number} ${picked[i].title} — Rosa Quint:`;
      const at = text.indexOf(heading);
      expect(at, heading).toBeGreaterThan(last);
      last = at;
      expect(text).toContain(`  Comment ${i + 1} on ${picked[i].id}: check the arithmetic\n  and the sign.`);
    }
    for (const i of [5, 6]) expect(text).not.toContain(`Comment ${i + 1} on`);
    expect(text).toContain('…and 2 more open comments on the sheet page.');
    expect(new URL(/Open the sheet: (\S+)/.exec(text)![1]).host).toBe('sheets.office-east.example:8080');
  });

  it('when everyone has turned every review e-mail off, then a password-reset e-mail is still sent', async () => {
    for (const t of [engineer, reviewer, reviewer2]) await put(t, '/api/me/email-settings', { submitted: false, returned: false, checked: false, issued: false }).expect(200);
    const before = await lastMailId();
    await post(reviewer2, '/api/password-resets', { email: 'second.reviewer@demo.panelpoint.test' });
    const mail = await waitForMailTo('second.reviewer@demo.panelpoint.test', before);
    expect(mail.text).toContain(`${PUBLIC_URL}/reset-password/`);
  });
});
