import { promises as fs } from 'node:fs';
import path from 'node:path';
import { simpleParser, type ParsedMail } from 'mailparser';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { afterResponseSettled } from '../../api/http/after-response.ts';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { type RunningIdp, startIdp } from '../../fake-idp/server.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { expectWordedMail } from '../support/mail-wording.ts';
import { signInAtIdp } from '../support/oidc-flow.ts';
import { drawnSignature } from '../support/signature.ts';
import { snapshotData } from '../fixtures/snapshot.ts';

// A performer's identity (linked sign-in and contact address) is the performer's, not the staff's.
const ORIGIN = 'http://127.0.0.1:3999';
let idp: RunningIdp;
let t: TestApp;
let restore: () => Promise<void>;
let head: string;
let lantern: string;

beforeAll(async () => {
  idp = await startIdp({ port: 0, quiet: true, clients: [{ clientId: 'plinth', clientSecret: 'plinth-dev-secret', redirectUris: [`${ORIGIN}/api/auth/callback`], postLogoutRedirectUris: [`${ORIGIN}/`] }] });
  t = await createTestApp({ OIDC_ISSUER: idp.issuer, APP_ORIGIN: ORIGIN });
  restore = await snapshotData(t);
});
beforeEach(async () => {
  await restore();
  await fs.rm(t.mail.dir, { recursive: true, force: true });
  await fs.mkdir(t.mail.dir, { recursive: true });
  head = await t.sessionFor('head@plinth.test');
  lantern = (await t.db.db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow()).id;
});
afterAll(async () => {
  await t?.close();
  await idp?.close();
});

const api = () => request(t.app);
const performer = (legal: string) => t.db.db.selectFrom('performers').select(['id', 'version', 'email', 'email_confirmed_at', 'user_id']).where('legal_name', '=', legal).executeTakeFirstOrThrow();
const templateId = async (kind: string) => (await t.db.db.selectFrom('consent_templates').select('id').where('kind', '=', kind as never).orderBy('created_at').executeTakeFirstOrThrow()).id;
function sessionCookie(res: request.Response): string {
  return ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((l) => l.startsWith('plinth.sid='))!.split(';')[0]!;
}

async function mails(): Promise<ParsedMail[]> {
  const files = (await fs.readdir(t.mail.dir)).filter((f) => f.endsWith('.eml')).sort();
  return Promise.all(files.map(async (f) => simpleParser(await fs.readFile(path.join(t.mail.dir, f)))));
}
const to = (m: ParsedMail) => (m.to && 'text' in m.to ? m.to.text : '');
async function mailsTo(address: string) {
  return (await mails()).filter((m) => to(m).includes(address));
}

/** Signs in at the real identity provider as this demo account and returns the app session cookie. */
async function signInAs(email: string): Promise<string> {
  const login = await api().get('/api/auth/login');
  const { callbackUrl } = await signInAtIdp(login.headers.location as string, idp.issuer, email, DEMO_PASSWORD);
  const cb = await api().get(callbackUrl.slice(ORIGIN.length)).set('Cookie', sessionCookie(login));
  expect(cb.status).toBe(302);
  return sessionCookie(cb);
}

/** The editable fields of a performer as the head sees them, ready to send back changed. */
async function editBody(id: string, over: Record<string, unknown>) {
  const d = (await api().get(`/api/performers/${id}`).set('Cookie', head)).body;
  return {
    legalName: d.legalName,
    preferredName: d.preferredName,
    pronouns: d.pronouns,
    ...d.contact,
    engagements: d.engagements.map((e: Record<string, unknown>) => ({ productionId: e.productionId, characterName: e.characterName, startsOn: e.startsOn, endsOn: e.endsOn })),
    version: d.version,
    ...over,
  };
}

async function medicalConsentOf(performerId: string): Promise<string> {
  // Every seeded performer has a patch-testing consent; its questionnaire carries health answers.
  return (await t.db.db.selectFrom('consents').select('id').where('performer_id', '=', performerId).where('kind', '=', 'patch_testing').executeTakeFirstOrThrow()).id;
}

describe('re-pointing the sign-in', () => {
  it('a head cannot attach a sign-in they control to a performer and read health answers as "the performer"', async () => {
    const juno = await performer('Juno Castellane');
    // Juno's own sign-in is unlinked first, so the record is free to be re-pointed.
    await api().put(`/api/performers/${juno.id}/account`).set('Cookie', head).send({ userId: null, version: juno.version }).expect(200);
    const after = await performer('Juno Castellane');
    // The account the head controls: known to the identity provider, holding no staff role.
    const newcomer = await signInAs('newcomer@plinth.test');
    const res = await api().put(`/api/performers/${juno.id}/account`).set('Cookie', head).send({ userId: await t.userId('newcomer@plinth.test'), version: after.version });
    expect(res.status).toBe(400);
    expect((await performer('Juno Castellane')).user_id).toBeNull();

    expect((await api().get('/api/session').set('Cookie', newcomer)).body.performerIds).toEqual([]);
    const consent = await api().get(`/api/consents/${await medicalConsentOf(juno.id)}`).set('Cookie', newcomer);
    expect(consent.status).toBe(403);
    expect(JSON.stringify(consent.body)).not.toContain('known_allergies');
  });

  it('a head who changes the address to an account they own gains nothing at that account’s sign-in', async () => {
    const oz = await performer('Oswin Parfitt-Reyes');
    const edit = await api().patch(`/api/performers/${oz.id}`).set('Cookie', head).send(await editBody(oz.id, { email: 'newcomer@plinth.test' }));
    expect(edit.status).toBe(200);
    expect(edit.body.contact).toMatchObject({ email: 'newcomer@plinth.test', emailConfirmed: false });

    const newcomer = await signInAs('newcomer@plinth.test');
    expect((await api().get('/api/session').set('Cookie', newcomer)).body.performerIds).toEqual([]);
    expect((await performer('Oswin Parfitt-Reyes')).user_id).toBeNull();
    const consent = await api().get(`/api/consents/${await medicalConsentOf(oz.id)}`).set('Cookie', newcomer);
    expect(consent.status).toBe(403);
  });

  it('the change is audited with before and after, the old address and the lead are told, the new one gets only a confirmation request', async () => {
    const hal = await performer('Halvard Imre Solberg');
    await api().patch(`/api/performers/${hal.id}`).set('Cookie', head).send(await editBody(hal.id, { email: 'marta.private@example.test' })).expect(200);
    const audit = await t.db.db.selectFrom('audit_log').select(['details', 'actor_user_id']).where('action', '=', 'performer.email_change').where('entity_id', '=', hal.id).executeTakeFirstOrThrow();
    expect(audit.details).toMatchObject({ before: 'h.solberg@example.test', beforeConfirmed: true, after: 'marta.private@example.test' });
    expect(audit.actor_user_id).toBe(await t.userId('head@plinth.test'));

    const toNew = await mailsTo('marta.private@example.test');
    expect(toNew).toHaveLength(1);
    expect(toNew[0]!.subject).toMatch(/confirm your e-mail address/i);
    expect(toNew[0]!.attachments).toHaveLength(0);
    // The Outbox shows that a confirmation link went out, never the link itself.
    const admin = await t.sessionFor('admin@plinth.test');
    const listed = (await api().get('/api/outbox').set('Cookie', admin)).body.items.find((m: { to: string[] }) => m.to.some((a) => a.includes('marta.private@example.test')));
    const shown = await api().get(`/api/outbox/${encodeURIComponent(listed.id)}`).set('Cookie', admin);
    const token = /\/confirm-email\/([A-Za-z0-9_-]{40,60})/.exec(toNew[0]!.text ?? '')![1]!;
    expect(shown.body.text).toContain('/confirm-email/[link withheld]');
    expect(shown.body.text).not.toContain(token);
    const toOld = await mailsTo('h.solberg@example.test');
    expect(toOld).toHaveLength(1);
    expect(toOld[0]!.text).toMatch(/changed the e-mail address/);
    const toLead = await mailsTo('lead@plinth.test');
    expect(toLead.some((m) => /contact address was changed/.test(m.subject ?? ''))).toBe(true);
    // Each of the three names the production and its department head, with moments in words.
    for (const m of [toNew[0]!, toOld[0]!, ...toLead]) expectWordedMail(m.text);
  });

  it("refuses a staff member's own sign-in address as a performer's contact address", async () => {
    const hal = await performer('Halvard Imre Solberg');
    const res = await api().patch(`/api/performers/${hal.id}`).set('Cookie', head).send(await editBody(hal.id, { email: 'head@plinth.test' }));
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.email).toBeDefined();
    expect((await performer('Halvard Imre Solberg')).email).toBe('h.solberg@example.test');
  });

  it('once the performer confirms the address, their own sign-in with it is linked (the path the attack imitated)', async () => {
    const hal = await performer('Halvard Imre Solberg');
    await api().patch(`/api/performers/${hal.id}`).set('Cookie', head).send(await editBody(hal.id, { email: 'newcomer@plinth.test' })).expect(200);
    const mail = (await mailsTo('newcomer@plinth.test'))[0]!;
    const token = /\/confirm-email\/([A-Za-z0-9_-]{40,60})/.exec(mail.text ?? '')![1]!;
    const view = await api().get(`/api/email-confirmations/${token}`);
    expect(view.body).toEqual({ performerName: 'Halvard Imre Solberg', email: 'newcomer@plinth.test' });
    expect((await api().post(`/api/email-confirmations/${token}`)).status).toBe(200);
    expect((await api().post(`/api/email-confirmations/${token}`)).status).toBe(409);
    const confirmed = await t.db.db.selectFrom('audit_log').select(['actor_performer_id']).where('action', '=', 'performer.email_confirm').executeTakeFirstOrThrow();
    expect(confirmed.actor_performer_id).toBe(hal.id);

    const newcomer = await signInAs('newcomer@plinth.test');
    expect((await api().get('/api/session').set('Cookie', newcomer)).body.performerIds).toEqual([hal.id]);
  });

  it('a confirmation link for an address that has since changed again no longer confirms anything', async () => {
    const hal = await performer('Halvard Imre Solberg');
    await api().patch(`/api/performers/${hal.id}`).set('Cookie', head).send(await editBody(hal.id, { email: 'first@example.test' })).expect(200);
    const token = /\/confirm-email\/([A-Za-z0-9_-]{40,60})/.exec((await mailsTo('first@example.test'))[0]!.text ?? '')![1]!;
    await api().patch(`/api/performers/${hal.id}`).set('Cookie', head).send(await editBody(hal.id, { email: 'second@example.test' })).expect(200);
    const res = await api().post(`/api/email-confirmations/${token}`);
    expect(res.status).toBe(409);
    expect(res.body.error.details.reason).toBe('superseded');
    expect((await performer('Halvard Imre Solberg')).email_confirmed_at).toBeNull();
  });
});

describe('invitations: the performer links a sign-in of their own', () => {
  it('goes only to a confirmed address, and links only when the performer accepts with a non-staff sign-in', async () => {
    const hal = await performer('Halvard Imre Solberg');
    const sent = await api().post(`/api/performers/${hal.id}/account-invitation`).set('Cookie', head);
    expect(sent.status).toBe(200);
    expect(sent.body).toEqual({ sentTo: 'h.solberg@example.test', mailed: true });
    const token = /\/join\/([A-Za-z0-9_-]{40,60})/.exec((await mailsTo('h.solberg@example.test'))[0]!.text ?? '')![1]!;
    expect((await api().get(`/api/account-invitations/${token}`)).body).toEqual({ performerName: 'Halvard Imre Solberg' });

    // A staff sign-in cannot take the performer's place.
    const artist = await t.sessionFor('artist@plinth.test');
    expect((await api().post(`/api/account-invitations/${token}/accept`).set('Cookie', artist)).status).toBe(403);
    expect((await performer('Halvard Imre Solberg')).user_id).toBeNull();

    const newcomer = await signInAs('newcomer@plinth.test');
    const accepted = await api().post(`/api/account-invitations/${token}/accept`).set('Cookie', newcomer);
    expect(accepted.status).toBe(200);
    expect((await api().get('/api/session').set('Cookie', newcomer)).body.performerIds).toEqual([hal.id]);
    const audit = await t.db.db.selectFrom('audit_log').select(['actor_user_id', 'details']).where('action', '=', 'performer.account_link').where('entity_id', '=', hal.id).executeTakeFirstOrThrow();
    expect(audit.actor_user_id).toBe(await t.userId('newcomer@plinth.test'));
    expect((await mailsTo('lead@plinth.test')).some((m) => /linked a sign-in/.test(m.subject ?? ''))).toBe(true);
    for (const m of [...(await mailsTo('h.solberg@example.test')), ...(await mailsTo('lead@plinth.test'))]) expectWordedMail(m.text);
    expect((await api().post(`/api/account-invitations/${token}/accept`).set('Cookie', newcomer)).status).toBe(409);
  });

  it('is refused while the address is unconfirmed, and to staff who do not manage the performer', async () => {
    const hal = await performer('Halvard Imre Solberg');
    await api().patch(`/api/performers/${hal.id}`).set('Cookie', head).send(await editBody(hal.id, { email: 'unconfirmed@example.test' })).expect(200);
    const res = await api().post(`/api/performers/${hal.id}/account-invitation`).set('Cookie', head);
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.email).toBeDefined();
    const oz = await performer('Oswin Parfitt-Reyes');
    expect((await api().post(`/api/performers/${oz.id}/account-invitation`).set('Cookie', await t.sessionFor('artist@plinth.test'))).status).toBe(403);
  });
});

describe('re-pointing the mail', () => {
  async function repointTo(legal: string, email: string) {
    const p = await performer(legal);
    await api().patch(`/api/performers/${p.id}`).set('Cookie', head).send(await editBody(p.id, { email })).expect(200);
    return p.id;
  }

  it('no signing link goes to an unconfirmed address', async () => {
    const id = await repointTo('Oswin Parfitt-Reyes', 'marta.private@example.test');
    const res = await api().post('/api/signing-requests').set('Cookie', head).send({ performerId: id, templateId: await templateId('application'), productionId: lantern, mode: 'link' });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.mode.join(' ')).toMatch(/not yet confirmed/);
    expect((await mailsTo('marta.private@example.test')).every((m) => !/\/sign\//.test(m.text ?? ''))).toBe(true);
  });

  it('the signed copy with health answers is not mailed to an unconfirmed address', async () => {
    const id = await repointTo('Tamsin Achebe-Lowry', 'marta.private@example.test');
    const cookie = await t.sessionFor('head@plinth.test');
    const created = await api().post('/api/signing-requests').set('Cookie', cookie).send({ performerId: id, templateId: await templateId('health_data'), productionId: lantern, mode: 'tablet' });
    expect(created.status).toBe(201);
    await api().post(`/api/signing-requests/${created.body.id}/hand-over`).set('Cookie', cookie).expect(200);
    const tablet = await api().get('/api/tablet').set('Cookie', cookie);
    const submit = await api()
      .post('/api/tablet/submit')
      .set('Cookie', cookie)
      .send({ templateVersionId: tablet.body.form.template.versionId, idempotencyKey: tablet.body.idempotencyKey, signerName: 'Tamsin Achebe-Lowry', agreed: true, answers: { share_with_medic: true }, signaturePng: await drawnSignature() });
    expect(submit.status).toBe(201);
    expect(submit.body.emailedTo).toBeNull();
    expect((await mailsTo('marta.private@example.test')).every((m) => m.attachments.length === 0)).toBe(true);
  });

  it('no withdrawal link goes to an unconfirmed address, and a link withdrawal names the performer as the actor', async () => {
    await repointTo('Beatrix Nwachukwu', 'marta.private@example.test');
    const res = await api().post('/api/withdrawal-links').send({ email: 'marta.private@example.test' });
    expect(res.status).toBe(202);
    await afterResponseSettled();
    expect((await mailsTo('marta.private@example.test')).every((m) => !/\/withdraw\//.test(m.text ?? ''))).toBe(true);
    expect(await t.db.db.selectFrom('withdrawal_links').select('id').execute()).toHaveLength(0);
  });
});

describe('unlinking a sign-in', () => {
  it('tells the performer at their confirmed address and the lead, naming the production, its head and the moment', async () => {
    const juno = await performer('Juno Castellane');
    await api().put(`/api/performers/${juno.id}/account`).set('Cookie', head).send({ userId: null, version: juno.version }).expect(200);
    const own = (await mailsTo('performer@plinth.test')).filter((m) => m.subject === 'Your sign-in was unlinked from your record');
    expect(own).toHaveLength(1);
    expect(own[0]!.text).toContain('unlinked your sign-in from your record');
    expectWordedMail(own[0]!.text);
    const lead = (await mailsTo('lead@plinth.test')).filter((m) => m.subject === "Plinth: Juno Castellane's sign-in was unlinked");
    expect(lead).toHaveLength(1);
    expect(lead[0]!.text).toContain("Marta Oyelaran unlinked the sign-in from Juno Castellane's record.");
    expectWordedMail(lead[0]!.text);
    // Nothing about the performer's health travels with it.
    for (const m of [...own, ...lead]) expect(m.text).not.toMatch(/allerg|consent answer|reaction/i);
  });
});
