import { promises as fs } from 'node:fs';
import path from 'node:path';
import { simpleParser } from 'mailparser';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { ProductionDetailSchema, UserPageSchema } from '#shared/schemas/admin.ts';
import { SessionSchema } from '#shared/schemas/session.ts';
import { seedDemo } from '../../api/db/seed.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { truncateAll } from '../support/db.ts';

let t: TestApp;
let admin: string;

beforeAll(async () => {
  t = await createTestApp({}, { seed: false });
});
beforeEach(async () => {
  await truncateAll(t.db);
  await seedDemo(t.db.db);
  await fs.rm(t.mail.dir, { recursive: true, force: true });
  await fs.mkdir(t.mail.dir, { recursive: true });
  admin = await t.sessionFor('admin@plinth.test');
});
afterAll(async () => {
  await t?.close();
});

async function waitForMail(count: number): Promise<string[]> {
  // The catcher writes each message once SMTP has finished; the send already awaited that.
  const files = (await fs.readdir(t.mail.dir)).filter((f) => f.endsWith('.eml'));
  expect(files.length).toBe(count);
  return files.map((f) => path.join(t.mail.dir, f));
}

async function lantern() {
  return t.db.db.selectFrom('productions').select(['id', 'version']).where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow();
}

describe('users', () => {
  it('lists, searches, sorts and pages on the server', async () => {
    const all = UserPageSchema.parse((await request(t.app).get('/api/users').set('Cookie', admin)).body);
    expect(all.total).toBe(7);
    const page = UserPageSchema.parse((await request(t.app).get('/api/users?pageSize=2&page=2&sort=email&dir=asc').set('Cookie', admin)).body);
    const sorted = all.items.map((u) => u.email).sort();
    expect(page.items.map((u) => u.email)).toEqual(sorted.slice(2, 4));
    const found = UserPageSchema.parse((await request(t.app).get('/api/users?q=varga').set('Cookie', admin)).body);
    expect(found.items.map((u) => u.email)).toEqual(['artist2@plinth.test']);
    const literal = UserPageSchema.parse((await request(t.app).get('/api/users?q=%25').set('Cookie', admin)).body);
    expect(literal.total).toBe(0);
  });

  it('registers a user by e-mail and refuses a duplicate with a field message', async () => {
    const created = await request(t.app).post('/api/users').set('Cookie', admin).send({ email: 'New.Person@Plinth.test', displayName: 'New Person' });
    expect(created.status).toBe(201);
    expect(created.body.email).toBe('new.person@plinth.test');
    expect(created.body.linked).toBe(false);
    const dup = await request(t.app).post('/api/users').set('Cookie', admin).send({ email: 'new.person@plinth.test', displayName: 'Again' });
    expect(dup.status).toBe(400);
    expect(dup.body.error.details.fields.email[0]).toMatch(/already exists/);
    const waiting = UserPageSchema.parse((await request(t.app).get('/api/users?access=none').set('Cookie', admin)).body);
    expect(waiting.items.map((u) => u.email)).toEqual(['new.person@plinth.test']);
  });

  it('answers a stale edit with 409 and keeps the first edit', async () => {
    const id = await t.userId('artist@plinth.test');
    const first = await request(t.app).patch(`/api/users/${id}`).set('Cookie', admin).send({ displayName: 'Rafe L.', isAdmin: false, version: 1 });
    expect(first.status).toBe(200);
    expect(first.body.version).toBe(2);
    const stale = await request(t.app).patch(`/api/users/${id}`).set('Cookie', admin).send({ displayName: 'Overwrite', isAdmin: false, version: 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('conflict');
    const row = await t.db.db.selectFrom('users').select('display_name').where('id', '=', id).executeTakeFirstOrThrow();
    expect(row.display_name).toBe('Rafe L.');
  });

  it('will not remove the last studio administrator', async () => {
    const id = await t.userId('admin@plinth.test');
    const res = await request(t.app).patch(`/api/users/${id}`).set('Cookie', admin).send({ displayName: 'Ines', isAdmin: false, version: 1 });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.isAdmin).toBeDefined();
  });
});

describe('productions, memberships and the designated lead', () => {
  it('creates a production and validates its dates', async () => {
    const bad = await request(t.app).post('/api/productions').set('Cookie', admin).send({ name: 'Ashfall', kind: 'film', startsOn: '2027-05-01', endsOn: '2027-04-01' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fields.endsOn).toBeDefined();
    const ok = await request(t.app).post('/api/productions').set('Cookie', admin).send({ name: 'Ashfall', kind: 'film', startsOn: '2027-05-01' });
    expect(ok.status).toBe(201);
    expect(ProductionDetailSchema.parse(ok.body).lead).toBeNull();
    const dup = await request(t.app).post('/api/productions').set('Cookie', admin).send({ name: 'ashfall', kind: 'stage' });
    expect(dup.status).toBe(400);
  });

  it('gives a role, e-mails a notice through SMTP, and the new role appears in the person\'s seats', async () => {
    const p = await lantern();
    const newcomer = await request(t.app).post('/api/users').set('Cookie', admin).send({ email: 'pip@plinth.test', displayName: 'Pip Okonkwo-Hale' });
    const res = await request(t.app).post(`/api/productions/${p.id}/memberships`).set('Cookie', admin).send({ userId: newcomer.body.id, role: 'archivist' });
    expect(res.status).toBe(201);
    const detail = ProductionDetailSchema.parse(res.body);
    expect(detail.memberships.some((m) => m.email === 'pip@plinth.test' && m.role === 'archivist')).toBe(true);

    const [file] = await waitForMail(1);
    const mail = await simpleParser(await fs.readFile(file!));
    expect(mail.to && 'text' in mail.to ? mail.to.text : '').toContain('pip@plinth.test');
    expect(mail.subject).toBe('Plinth: you are now Archivist on The Lantern Keeper');
    expect(mail.text).toContain('http://127.0.0.1:3999/');

    const outbox = await request(t.app).get('/api/outbox').set('Cookie', admin);
    expect(outbox.body.total).toBe(1);
    expect(outbox.body.items[0].subject).toBe(mail.subject);
    expect(outbox.body.items[0].to[0]).toContain('pip@plinth.test');
    const one = await request(t.app).get(`/api/outbox/${outbox.body.items[0].id}`).set('Cookie', admin);
    expect(one.status).toBe(200);
    expect(one.body.text).toContain('You now have the role "Archivist" on The Lantern Keeper');

    const pipSession = SessionSchema.parse((await request(t.app).get('/api/session').set('Cookie', await t.sessionFor('pip@plinth.test'))).body);
    expect(pipSession.seats).toEqual([{ productionId: p.id, productionName: 'The Lantern Keeper', role: 'archivist' }]);

    const again = await request(t.app).post(`/api/productions/${p.id}/memberships`).set('Cookie', admin).send({ userId: newcomer.body.id, role: 'archivist' });
    expect(again.status).toBe(400);
  });

  it('removes a membership, and the role stops working at once', async () => {
    const p = await lantern();
    const artistCookie = await t.sessionFor('artist@plinth.test');
    const before = SessionSchema.parse((await request(t.app).get('/api/session').set('Cookie', artistCookie)).body);
    expect(before.seats.length).toBe(1);
    const detail = ProductionDetailSchema.parse((await request(t.app).get(`/api/productions/${p.id}`).set('Cookie', admin)).body);
    const m = detail.memberships.find((x) => x.email === 'artist@plinth.test')!;
    const res = await request(t.app).delete(`/api/productions/${p.id}/memberships/${m.id}`).set('Cookie', admin);
    expect(res.status).toBe(200);
    const after = SessionSchema.parse((await request(t.app).get('/api/session').set('Cookie', artistCookie)).body);
    expect(after.seats).toEqual([]);
  });

  it('appoints a new lead, ends the old appointment and keeps the history', async () => {
    const p = await lantern();
    const headId = await t.userId('head@plinth.test');
    const res = await request(t.app).post(`/api/productions/${p.id}/lead`).set('Cookie', admin).send({ userId: headId, version: p.version });
    expect(res.status).toBe(201);
    const detail = ProductionDetailSchema.parse(res.body);
    expect(detail.lead?.userId).toBe(headId);
    expect(detail.leadHistory).toHaveLength(2);
    const [current, previous] = detail.leadHistory;
    expect(current!.endsAt).toBeNull();
    expect(current!.appointedBy).toBe('Ines Calloway');
    expect(previous!.displayName).toBe('Dr. Tomasz Brill');
    expect(previous!.endsAt).not.toBeNull();
    expect(previous!.endedBy).toBe('Ines Calloway');

    const leadSession = SessionSchema.parse((await request(t.app).get('/api/session').set('Cookie', await t.sessionFor('lead@plinth.test'))).body);
    expect(leadSession.leadOf).toEqual([]);
    const headSession = SessionSchema.parse((await request(t.app).get('/api/session').set('Cookie', await t.sessionFor('head@plinth.test'))).body);
    expect(headSession.leadOf).toEqual([p.id]);
    expect(headSession.current?.role).toBe('lead');

    const audit = await t.db.db.selectFrom('audit_log').selectAll().where('action', '=', 'lead.appoint').execute();
    expect(audit).toHaveLength(1);
    // The new lead is told, and so are the production's heads.
    const subjects = await Promise.all((await waitForMail(2)).map(async (f) => (await simpleParser(await fs.readFile(f))).subject));
    expect(subjects.sort()).toEqual(['Plinth: the designated lead on The Lantern Keeper changed', 'Plinth: you are now Designated lead on The Lantern Keeper']);
  });

  it('refuses a lead appointment made on a stale view, and one for someone not on the team', async () => {
    const p = await lantern();
    const headId = await t.userId('head@plinth.test');
    const stale = await request(t.app).post(`/api/productions/${p.id}/lead`).set('Cookie', admin).send({ userId: headId, version: p.version + 5 });
    expect(stale.status).toBe(409);
    const outsider = await request(t.app).post('/api/users').set('Cookie', admin).send({ email: 'outsider@plinth.test', displayName: 'Outsider' });
    const notMember = await request(t.app).post(`/api/productions/${p.id}/lead`).set('Cookie', admin).send({ userId: outsider.body.id, version: p.version });
    expect(notMember.status).toBe(400);
    const open = await t.db.db.selectFrom('lead_appointments').select('user_id').where('production_id', '=', p.id).where('ends_at', 'is', null).execute();
    expect(open).toHaveLength(1);
  });

  it('two appointments racing on the same version: one wins, one gets 409', async () => {
    const p = await lantern();
    const headId = await t.userId('head@plinth.test');
    const artistId = await t.userId('artist@plinth.test');
    const [a, b] = await Promise.all([
      request(t.app).post(`/api/productions/${p.id}/lead`).set('Cookie', admin).send({ userId: headId, version: p.version }),
      request(t.app).post(`/api/productions/${p.id}/lead`).set('Cookie', admin).send({ userId: artistId, version: p.version }),
    ]);
    expect([a.status, b.status].sort()).toEqual([201, 409]);
    const open = await t.db.db.selectFrom('lead_appointments').select('user_id').where('production_id', '=', p.id).where('ends_at', 'is', null).execute();
    expect(open).toHaveLength(1);
  });

  it('ends an appointment without a successor', async () => {
    const p = await lantern();
    const res = await request(t.app).delete(`/api/productions/${p.id}/lead?version=${p.version}`).set('Cookie', admin);
    expect(res.status).toBe(200);
    expect(res.body.lead).toBeNull();
    const home = await request(t.app).get('/api/home').set('Cookie', admin);
    const task = home.body.tasks.find((x: { id: string }) => x.id === 'productions-without-lead');
    // Saltglass Mile, The Glass Orchard (the earlier production the archive keeps casts of) and now this one.
    expect(task.count).toBe(3);
  });
});

describe('seat switching', () => {
  it('switches to another production and role the person holds, and refuses one they do not', async () => {
    const head = await t.sessionFor('head@plinth.test');
    const s = SessionSchema.parse((await request(t.app).get('/api/session').set('Cookie', head)).body);
    expect(s.seats.map((x) => `${x.productionName}/${x.role}`)).toEqual(['Saltglass Mile/artist', 'The Lantern Keeper/head']);
    expect(s.current?.role).toBe('head');
    const salt = s.seats.find((x) => x.productionName === 'Saltglass Mile')!;
    const switched = await request(t.app).put('/api/session/current').set('Cookie', head).send({ productionId: salt.productionId, role: 'artist' });
    expect(switched.status).toBe(200);
    expect((await request(t.app).get('/api/home').set('Cookie', head)).body.role).toBe('artist');
    const refused = await request(t.app).put('/api/session/current').set('Cookie', head).send({ productionId: salt.productionId, role: 'head' });
    expect(refused.status).toBe(400);
  });
});

describe('audit log', () => {
  it('records admin changes with who did them', async () => {
    await request(t.app).post('/api/users').set('Cookie', admin).send({ email: 'audited@plinth.test', displayName: 'Audited' });
    const res = await request(t.app).get('/api/audit?action=user.').set('Cookie', admin);
    expect(res.status).toBe(200);
    expect(res.body.items[0]).toMatchObject({ action: 'user.create', actor: 'Ines Calloway', entityType: 'user' });
  });

  it('names the production and the performer an entry is about, so the page reads in words', async () => {
    const performer = await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow();
    const p = await lantern();
    await t.db.db
      .insertInto('audit_log')
      .values({ actor_user_id: await t.userId('head@plinth.test'), action: 'performer.update', entity_type: 'performer', entity_id: performer.id, production_id: p.id, subject_performer_id: performer.id, details: '{}' })
      .execute();
    const res = await request(t.app).get('/api/audit?action=performer.update').set('Cookie', admin);
    expect(res.status).toBe(200);
    expect(res.body.items[0]).toMatchObject({ action: 'performer.update', productionName: 'The Lantern Keeper', subjectName: 'Juno Castellane' });
  });
});

describe('mail that could not be sent', () => {
  it('does not undo the change, is listed without its text, and goes out on retry', async () => {
    const p = await lantern();
    const real = t.ctx.mailer;
    t.ctx.mailer = { send: async () => Promise.reject(new Error('relay refused the connection')), close: () => {} };
    let res: request.Response;
    try {
      res = await request(t.app).post(`/api/productions/${p.id}/memberships`).set('Cookie', admin).send({ userId: await t.userId('archivist@plinth.test'), role: 'artist' });
    } finally {
      t.ctx.mailer = real;
    }
    // The role stands although its notice could not go.
    expect(res.status).toBe(201);
    const failures = await request(t.app).get('/api/outbox/failures').set('Cookie', admin);
    expect(failures.status).toBe(200);
    expect(failures.body.items).toHaveLength(1);
    const [f] = failures.body.items;
    expect(f).toMatchObject({ recipients: 'archivist@plinth.test', subject: 'Plinth: you are now Artist on The Lantern Keeper', error: 'relay refused the connection', attempts: 1 });
    expect(JSON.stringify(failures.body)).not.toContain('Sign in at');
    expect((await request(t.app).get('/api/outbox/failures').set('Cookie', await t.sessionFor('head@plinth.test'))).status).toBe(403);

    const before = (await fs.readdir(t.mail.dir)).filter((n) => n.endsWith('.eml')).length;
    const retry = await request(t.app).post(`/api/outbox/failures/${f.id}/retry`).set('Cookie', admin);
    expect(retry.body).toEqual({ sent: true, error: null });
    expect((await fs.readdir(t.mail.dir)).filter((n) => n.endsWith('.eml')).length).toBe(before + 1);
    expect((await request(t.app).get('/api/outbox/failures').set('Cookie', admin)).body.items).toEqual([]);
    expect((await request(t.app).post(`/api/outbox/failures/${f.id}/retry`).set('Cookie', admin)).status).toBe(404);
  });
});
