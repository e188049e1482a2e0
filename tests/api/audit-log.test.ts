import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from '../support/app.ts';

// The audit log for the administrator and the designated lead. The entries these tests read are
// written here, in 2024 (long before the demo's own), so each filter's answer is known exactly.
let t: TestApp;
const id: Record<string, string> = {};
const WINDOW = { from: '2024-01-01', to: '2024-12-31' };

type Entry = { id: string; action: string; productionName: string | null; subjectName: string | null; subjectPerformerId: string | null; actor: string | null; at: string };

async function entry(values: { at: string; actor: string | null; action: string; entityType: string; entityId?: string | null; production?: string | null; subject?: string | null; details?: Record<string, unknown> }) {
  await t.db.db
    .insertInto('audit_log')
    .values({
      at: new Date(values.at),
      actor_user_id: values.actor,
      action: values.action,
      entity_type: values.entityType,
      entity_id: values.entityId ?? null,
      production_id: values.production ?? null,
      subject_performer_id: values.subject ?? null,
      details: JSON.stringify(values.details ?? {}),
    })
    .execute();
}

async function list(email: string, query: Record<string, string | number | undefined> = {}) {
  return request(t.app)
    .get('/api/audit')
    .query({ ...WINDOW, ...query })
    .set('Cookie', await t.sessionFor(email));
}
const actions = (res: request.Response) => (res.body.items as Entry[]).map((e) => e.action).sort();

beforeAll(async () => {
  // The studio's clock, named so the day boundaries below are known.
  t = await createTestApp({ TIME_ZONE: 'Europe/London' });
  const db = t.db.db;
  id.lantern = (await db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow()).id;
  id.saltglass = (await db.selectFrom('productions').select('id').where('name', '=', 'Saltglass Mile').executeTakeFirstOrThrow()).id;
  id.juno = (await db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow()).id;
  id.head = await t.userId('head@plinth.test');
  id.lead = await t.userId('lead@plinth.test');
  id.admin = await t.userId('admin@plinth.test');
  // A performer engaged on the second production only, and that production's own lead.
  id.wren = (await db.insertInto('performers').values({ legal_name: 'Wren Halloway-Fisk', preferred_name: null }).returning('id').executeTakeFirstOrThrow()).id;
  await db.insertInto('engagements').values({ performer_id: id.wren, production_id: id.saltglass }).execute();
  id.otherLead = (await db.insertInto('users').values({ email: 'lead.saltglass@plinth.test', display_name: 'Ilse Marrow' }).returning('id').executeTakeFirstOrThrow()).id;
  await db.insertInto('lead_appointments').values({ production_id: id.saltglass, user_id: id.otherLead, appointed_by: id.admin, starts_at: new Date(Date.now() - 86_400_000) }).execute();

  // On the first production.
  await entry({ at: '2024-03-10T10:00:00Z', actor: id.head, action: 'consent.sign', entityType: 'consent', production: id.lantern, subject: id.juno });
  await entry({ at: '2024-03-11T10:00:00Z', actor: id.lead, action: 'medical.read', entityType: 'consent', production: id.lantern, subject: id.juno, details: { fields: ['q1'] } });
  await entry({ at: '2024-03-12T10:00:00Z', actor: id.head, action: 'booking.create', entityType: 'booking', production: id.lantern, subject: id.juno });
  // 00:30 on 1 July on the studio's clock (Europe/London, summer time), still 30 June in UTC.
  await entry({ at: '2024-06-30T23:30:00Z', actor: id.head, action: 'consent.withdraw', entityType: 'consent', production: id.lantern, subject: id.juno });
  // No production, about the first production's performer: her own record (named only as the record changed).
  await entry({ at: '2024-04-01T09:00:00Z', actor: id.head, action: 'performer.email_change', entityType: 'performer', entityId: id.juno });
  // On the second production, and about its performer with no production.
  await entry({ at: '2024-03-10T11:00:00Z', actor: id.otherLead, action: 'consent.sign', entityType: 'consent', production: id.saltglass, subject: id.wren });
  await entry({ at: '2024-04-02T09:00:00Z', actor: id.head, action: 'performer.email_change', entityType: 'performer', entityId: id.wren });
  // Studio-wide, about no performer.
  await entry({ at: '2024-05-01T09:00:00Z', actor: id.admin, action: 'user.create', entityType: 'user', entityId: id.head });
});
afterAll(async () => {
  await t?.close();
});

describe('who reads which part of the log', () => {
  it("the lead reads their production's entries and their performers' own records, not the other production's", async () => {
    const res = await list('lead@plinth.test');
    expect(res.status).toBe(200);
    expect(actions(res)).toEqual(['booking.create', 'consent.sign', 'consent.withdraw', 'medical.read', 'performer.email_change']);
    const items = res.body.items as Entry[];
    expect(items.every((e) => e.productionName === 'The Lantern Keeper' || e.subjectName === 'Juno Castellane')).toBe(true);
    expect(items.find((e) => e.action === 'performer.email_change')).toMatchObject({ subjectName: 'Juno Castellane', subjectPerformerId: id.juno, productionName: null });
    expect(res.body.total).toBe(5);
  });

  it('the lead of the other production reads only theirs', async () => {
    const res = await list('lead.saltglass@plinth.test');
    expect(res.status).toBe(200);
    expect(actions(res)).toEqual(['consent.sign', 'performer.email_change']);
    expect((res.body.items as Entry[]).map((e) => e.subjectName)).toEqual(['Wren Halloway-Fisk', 'Wren Halloway-Fisk']);
  });

  it('a lead naming a production they do not lead is refused', async () => {
    expect((await list('lead@plinth.test', { production: id.saltglass })).status).toBe(403);
    expect((await list('lead.saltglass@plinth.test', { production: id.lantern })).status).toBe(403);
    expect((await list('lead@plinth.test', { production: id.lantern })).status).toBe(200);
  });

  it('the administrator reads every entry, and may narrow to one production', async () => {
    const all = await list('admin@plinth.test');
    expect(all.status).toBe(200);
    expect(all.body.total).toBe(8);
    const salt = await list('admin@plinth.test', { production: id.saltglass });
    expect(actions(salt)).toEqual(['consent.sign']);
  });

  it('the head, an artist, the archivist and the performer are refused', async () => {
    for (const email of ['head@plinth.test', 'artist@plinth.test', 'archivist@plinth.test', 'performer@plinth.test']) {
      const res = await list(email);
      expect(res.status, email).toBe(403);
      expect(res.body.error.message, email).toMatch(/audit log/);
    }
    expect((await request(t.app).get('/api/audit')).status).toBe(401);
  });
});

describe('filters', () => {
  it('free text finds the actor by name or e-mail address, and the performer by name', async () => {
    expect(actions(await list('lead@plinth.test', { q: 'Brill' }))).toEqual(['medical.read']);
    expect(actions(await list('lead@plinth.test', { q: 'lead@plinth' }))).toEqual(['medical.read']);
    expect((await list('admin@plinth.test', { q: 'halloway' })).body.total).toBe(2);
    // A wildcard character is text, not a pattern.
    expect((await list('admin@plinth.test', { q: '%' })).body.total).toBe(0);
  });

  it('a performer: the entries about them, including those about their own record', async () => {
    const res = await list('admin@plinth.test', { performer: id.juno });
    expect(actions(res)).toEqual(['booking.create', 'consent.sign', 'consent.withdraw', 'medical.read', 'performer.email_change']);
    // The lead asking about another production's performer gets nothing of theirs.
    expect((await list('lead@plinth.test', { performer: id.wren })).body.total).toBe(0);
  });

  it('an event exactly, or a group of events ending with a dot', async () => {
    expect(actions(await list('lead@plinth.test', { action: 'consent.sign' }))).toEqual(['consent.sign']);
    expect(actions(await list('lead@plinth.test', { action: 'consent.' }))).toEqual(['consent.sign', 'consent.withdraw']);
    // Without its dot a group's name is no event at all.
    expect((await list('lead@plinth.test', { action: 'consent' })).status).toBe(400);
    expect((await list('lead@plinth.test', { action: 'consent.si' })).body.total).toBe(0);
  });

  it("days are read on the studio's clock, both ends included", async () => {
    // 23:30 UTC on 30 June is 1 July in London.
    expect(actions(await list('lead@plinth.test', { from: '2024-07-01', to: '2024-07-01' }))).toEqual(['consent.withdraw']);
    expect((await list('lead@plinth.test', { from: '2024-06-30', to: '2024-06-30' })).body.total).toBe(0);
    expect(actions(await list('lead@plinth.test', { from: '2024-03-11', to: '2024-03-12' }))).toEqual(['booking.create', 'medical.read']);
    const backwards = await list('lead@plinth.test', { from: '2024-03-12', to: '2024-03-11' });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.details.fields).toHaveProperty('to');
  });

  it('filters combine', async () => {
    expect(actions(await list('admin@plinth.test', { action: 'consent.', q: 'Marrow' }))).toEqual(['consent.sign']);
    expect(actions(await list('admin@plinth.test', { action: 'performer.', performer: id.wren }))).toEqual(['performer.email_change']);
  });
});

describe('paging', () => {
  it('pages through the entries newest first, each once', async () => {
    const seen: Entry[] = [];
    for (const page of [1, 2, 3]) {
      const res = await list('lead@plinth.test', { pageSize: 2, page });
      expect(res.status).toBe(200);
      expect(res.body).toMatchObject({ total: 5, page, pageSize: 2 });
      seen.push(...(res.body.items as Entry[]));
    }
    expect(seen).toHaveLength(5);
    expect(new Set(seen.map((e) => e.id)).size).toBe(5);
    const times = seen.map((e) => e.at);
    expect(times).toEqual(times.toSorted().toReversed());
    const oldestFirst = await list('lead@plinth.test', { pageSize: 2, dir: 'asc' });
    expect((oldestFirst.body.items as Entry[])[0]!.action).toBe('consent.sign');
  });
});
