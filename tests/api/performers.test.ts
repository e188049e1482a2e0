import { promises as fs } from 'node:fs';
import path from 'node:path';
import sharp from 'sharp';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { PerformerDetailSchema, PerformerPageSchema } from '#shared/schemas/performers.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { bandColour, cameraJpeg, exifHasGps, largePng, pngBombHeader, smallAvif, smallGif, smallWebp } from '../fixtures/images.ts';
import { EMAILS, makeBooking, makeConsent, makePerformer, makeProduction, performerId, productionId, sessions, type Who } from '../fixtures/performers.ts';
import { snapshotData } from '../fixtures/snapshot.ts';

let t: TestApp;
let as: Record<Who, string>;
let restore: () => Promise<void>;
let lantern: string;
let saltglass: string;

// Demo performers by the name the registry sorts on (preferred name, else legal name).
const LANTERN_BY_NAME = ['Beatrix Nwachukwu', 'Corentin Malik Ashdown', 'Halvard Imre Solberg', 'Juno Castellane', 'Oswin Parfitt-Reyes', 'Tamsin Achebe-Lowry'];

beforeAll(async () => {
  t = await createTestApp();
  as = await sessions(t);
  restore = await snapshotData(t);
});
beforeEach(async () => {
  await restore();
  lantern = await productionId(t, 'The Lantern Keeper');
  saltglass = await productionId(t, 'Saltglass Mile');
});
afterAll(async () => {
  await t?.close();
});

const api = () => request(t.app);
const list = async (who: Who, qs = '') => api().get(`/api/performers${qs}`).set('Cookie', as[who]);
const detail = async (who: Who, id: string) => api().get(`/api/performers/${id}`).set('Cookie', as[who]);
const names = (body: unknown) => PerformerPageSchema.parse(body).items.map((i) => i.legalName);
const count = async (table: 'performers' | 'engagements' | 'files' | 'memberships') =>
  Number((await t.db.db.selectFrom(table).select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow()).n);
const version = async (id: string) => (await t.db.db.selectFrom('performers').select('version').where('id', '=', id).executeTakeFirstOrThrow()).version;

function performerBody(over: Record<string, unknown> = {}) {
  return { legalName: 'Wren Hollis-Marsh', pronouns: 'they/them', email: 'Wren.Hollis@Example.test', phone: '+44 20 7946 0011', engagements: [{ productionId: lantern, characterName: 'The Lighthouse Cat' }], ...over };
}

async function editBody(id: string, over: Record<string, unknown> = {}) {
  const d = PerformerDetailSchema.parse((await detail('head', id)).body);
  return {
    legalName: d.legalName,
    preferredName: d.preferredName,
    pronouns: d.pronouns,
    ...d.contact,
    engagements: d.engagements.map((e) => ({ productionId: e.productionId, characterName: e.characterName, startsOn: e.startsOn, endsOn: e.endsOn })),
    version: d.version,
    ...over,
  };
}

describe('GET /api/performers: search, filters, sort and paging', () => {
  it('lists the production by name, both directions, and pages on the server', async () => {
    const asc = await list('head', `?productionId=${lantern}`);
    expect(asc.status).toBe(200);
    expect(names(asc.body)).toEqual(LANTERN_BY_NAME);
    expect(asc.body.total).toBe(6);
    const desc = await list('head', `?productionId=${lantern}&dir=desc`);
    expect(names(desc.body)).toEqual(LANTERN_BY_NAME.toReversed());
    const page2 = await list('head', `?productionId=${lantern}&pageSize=2&page=2`);
    expect(page2.body).toMatchObject({ total: 6, page: 2, pageSize: 2 });
    expect(names(page2.body)).toEqual(LANTERN_BY_NAME.slice(2, 4));
    const beyond = await list('head', `?productionId=${lantern}&pageSize=5&page=3`);
    expect(beyond.body.items).toEqual([]);
    expect(beyond.body.total).toBe(6);
    const item = PerformerPageSchema.parse(asc.body).items.find((i) => i.legalName === 'Oswin Parfitt-Reyes')!;
    expect(item.preferredName).toBe('Oz Parfitt');
    expect(item.engagements).toEqual([{ productionId: lantern, productionName: 'The Lantern Keeper', characterName: 'The Drowned Sailor', startsOn: '2026-09-14', endsOn: '2027-04-30' }]);
  });

  it('finds a misspelt name with pg_trgm and ranks the best match first', async () => {
    const res = await list('artist', '?q=Castelane');
    expect(res.status).toBe(200);
    expect(names(res.body)[0]).toBe('Juno Castellane');
    expect(names(res.body)).not.toContain('Tamsin Achebe-Lowry');
    expect(names((await list('artist', '?q=Nwachuku')).body)).toEqual(['Beatrix Nwachukwu']);
    // Preferred names are searched too, and a short substring matches by ILIKE.
    expect(names((await list('artist', '?q=oz')).body)).toEqual(['Oswin Parfitt-Reyes']);
    expect((await list('artist', '?q=qqqqzzzz')).body.total).toBe(0);
  });

  it('treats % and _ in the search as literal characters', async () => {
    expect((await list('head', '?q=%25')).body.total).toBe(0);
    expect((await list('head', '?q=_')).body.total).toBe(0);
    await makePerformer(t, 'Percy 100% Real', [{ productionId: lantern }]);
    expect(names((await list('head', '?q=%25')).body)).toEqual(['Percy 100% Real']);
  });

  it('sorts by creation time', async () => {
    const p = await makeProduction(t, 'Sort Test', [{ email: EMAILS.head, role: 'head' }]);
    for (const name of ['Zed First', 'Amy Second', 'Mo Third']) {
      const res = await api().post('/api/performers').set('Cookie', as.head).send({ legalName: name, engagements: [{ productionId: p }] });
      expect(res.status).toBe(201);
    }
    expect(names((await list('head', `?productionId=${p}&sort=createdAt`)).body)).toEqual(['Zed First', 'Amy Second', 'Mo Third']);
    expect(names((await list('head', `?productionId=${p}&sort=createdAt&dir=desc`)).body)).toEqual(['Mo Third', 'Amy Second', 'Zed First']);
    expect(names((await list('head', `?productionId=${p}`)).body)).toEqual(['Amy Second', 'Mo Third', 'Zed First']);
  });

  describe('consent filter, computed in SQL', () => {
    let p: string;
    const ids: Record<string, string> = {};
    beforeEach(async () => {
      p = await makeProduction(t, 'Consent Filter Test', [{ email: EMAILS.head, role: 'head' }]);
      for (const name of ['Ada Complete', 'Ben Partial', 'Cal Expiring', 'Dee Withdrawn']) ids[name] = await makePerformer(t, name, [{ productionId: p }]);
      for (const kind of ['life_casting', 'patch_testing', 'application', 'cast_storage', 'health_data'] as const) {
        await makeConsent(t, ids['Ada Complete']!, kind, { expiresDays: kind === 'application' ? 40 : null });
        await makeConsent(t, ids['Cal Expiring']!, kind, { expiresDays: kind === 'application' ? 10 : 300 });
      }
      await makeConsent(t, ids['Ben Partial']!, 'health_data');
      await makeConsent(t, ids['Ben Partial']!, 'patch_testing');
      await makeConsent(t, ids['Dee Withdrawn']!, 'life_casting', { withdrawnDays: -2 });
      await makeConsent(t, ids['Dee Withdrawn']!, 'patch_testing', { signedDays: -400, expiresDays: -1 });
      // Signed for the future does not count yet.
      await makeConsent(t, ids['Dee Withdrawn']!, 'application', { signedDays: 2 });
    });

    it('filters complete, incomplete, expiring and withdrawn', async () => {
      const q = (consent: string) => list('head', `?productionId=${p}&consent=${consent}`).then((r) => names(r.body));
      expect(await q('any')).toEqual(['Ada Complete', 'Ben Partial', 'Cal Expiring', 'Dee Withdrawn']);
      expect(await q('complete')).toEqual(['Ada Complete', 'Cal Expiring']);
      expect(await q('incomplete')).toEqual(['Ben Partial', 'Dee Withdrawn']);
      expect(await q('expiring')).toEqual(['Cal Expiring']);
      expect(await q('withdrawn')).toEqual(['Dee Withdrawn']);
      const bad = await list('head', `?productionId=${p}&consent=some`);
      expect(bad.status).toBe(400);
      expect(bad.body.error.details.fields.consent).toBeDefined();
    });

    it('reports active kinds, expiring and withdrawn counts on each row', async () => {
      const items = PerformerPageSchema.parse((await list('head', `?productionId=${p}`)).body).items;
      const by = Object.fromEntries(items.map((i) => [i.legalName, i]));
      expect(by['Ada Complete']).toMatchObject({ activeKinds: ['life_casting', 'patch_testing', 'application', 'cast_storage', 'health_data'], expiringSoon: 0, withdrawn: 0 });
      expect(by['Ben Partial']).toMatchObject({ activeKinds: ['patch_testing', 'health_data'], expiringSoon: 0, withdrawn: 0 });
      expect(by['Cal Expiring']).toMatchObject({ expiringSoon: 1, withdrawn: 0 });
      expect(by['Dee Withdrawn']).toMatchObject({ activeKinds: [], expiringSoon: 0, withdrawn: 1 });
    });

    it('shows consents with their state and upcoming bookings with the consent gate in the detail', async () => {
      await makeBooking(t, ids['Ben Partial']!, p, 'patch_test', 2);
      await makeBooking(t, ids['Ben Partial']!, p, 'life_cast', 3);
      await makeBooking(t, ids['Ben Partial']!, p, 'patch_test', -2);
      await makeBooking(t, ids['Ben Partial']!, p, 'patch_test', 4, 'cancelled');
      await makeBooking(t, ids['Cal Expiring']!, p, 'application', 20);
      const ben = PerformerDetailSchema.parse((await detail('head', ids['Ben Partial']!)).body);
      expect(ben.bookings.map((b) => [b.purpose, b.consentMissing])).toEqual([
        ['patch_test', false],
        ['life_cast', true],
      ]);
      const cal = PerformerDetailSchema.parse((await detail('head', ids['Cal Expiring']!)).body);
      // The application consent runs out in 10 days; the session is in 20.
      expect(cal.bookings.map((b) => [b.purpose, b.consentMissing])).toEqual([['application', true]]);
      const dee = PerformerDetailSchema.parse((await detail('head', ids['Dee Withdrawn']!)).body);
      expect(Object.fromEntries(dee.consents.map((c) => [c.kind, c.state]))).toEqual({ life_casting: 'withdrawn', patch_testing: 'expired', application: 'active' });
      const lc = dee.consents.find((c) => c.kind === 'life_casting')!;
      expect(lc).toMatchObject({ title: 'Fixture life_casting consent', templateVersion: 3, performerName: 'Dee Withdrawn', signerName: 'Fixture Signer', signingMethod: 'tablet' });
      expect(lc.withdrawnAt).not.toBeNull();
    });
  });

  it('limits the list to productions where the actor may view performers', async () => {
    for (const who of ['head', 'lead', 'artist', 'archivist', 'artist2'] as const) {
      const res = await list(who);
      expect(res.status, who).toBe(200);
      expect(names(res.body), who).toEqual(LANTERN_BY_NAME);
    }
    // A performer on another production only: invisible to Lantern-only staff, visible to staff there.
    await makePerformer(t, 'Saltglass Only', [{ productionId: saltglass }]);
    expect(names((await list('lead')).body)).not.toContain('Saltglass Only');
    expect(names((await list('artist2')).body)).toContain('Saltglass Only');
    expect(names((await list('head', `?productionId=${saltglass}`)).body)).toEqual(['Saltglass Only']);
    const forbidden = await list('lead', `?productionId=${saltglass}`);
    expect(forbidden.status).toBe(403);
    expect(ErrorBodySchema.parse(forbidden.body).error.code).toBe('forbidden');
  });

  it('answers 403 to a performer, the administrator without a production role, and someone with no role', async () => {
    for (const who of ['performer', 'admin', 'norole'] as const) {
      const res = await list(who);
      expect(res.status, who).toBe(403);
      expect(ErrorBodySchema.parse(res.body).error.code).toBe('forbidden');
    }
  });
});

describe('GET /api/performers/:id', () => {
  it('gives contact details to those who manage the performer and to the performer, and to nobody else', async () => {
    const juno = await performerId(t, 'Juno Castellane');
    const expectations: [Who, number, boolean, boolean, boolean][] = [
      // who, status, contact, canEdit, canSeeMedical
      ['head', 200, true, true, false],
      ['lead', 200, true, true, true],
      ['artist', 200, false, false, false],
      ['archivist', 200, false, false, false],
      ['artist2', 200, false, false, false],
      ['performer', 200, true, false, true],
      ['admin', 403, false, false, false],
      ['norole', 403, false, false, false],
    ];
    for (const [who, status, contact, canEdit, canSeeMedical] of expectations) {
      const res = await detail(who, juno);
      expect(res.status, who).toBe(status);
      if (status !== 200) continue;
      const d = PerformerDetailSchema.parse(res.body);
      expect(d.contact?.email ?? null, who).toBe(contact ? 'performer@plinth.test' : null);
      expect(d.linkedUser?.email ?? null, who).toBe(contact ? 'performer@plinth.test' : null);
      expect([d.canEdit, d.canSeeMedical], who).toEqual([canEdit, canSeeMedical]);
      expect(d.engagements.map((e) => e.characterName), who).toEqual(['The Keeper']);
    }
  });

  it('keeps one performer out of another performer’s record, and answers 404 for an unknown id', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    expect((await detail('performer', oz)).status).toBe(403);
    const missing = await detail('head', '00000000-0000-4000-8000-000000000000');
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe('not_found');
    expect((await detail('head', 'not-a-uuid')).status).toBe(400);
  });

  it('contains no health details for anyone, the designated lead included', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    await makeConsent(t, oz, 'patch_testing', {}, 'FIXTURE-ALLERGY-TO-ROSIN');
    for (const who of ['head', 'lead', 'artist'] as const) {
      const res = await detail(who, oz);
      expect(res.status).toBe(200);
      expect(res.text).not.toContain('FIXTURE-ALLERGY-TO-ROSIN');
      expect(res.text).not.toMatch(/"answers"|"medical"/);
      expect(res.body.consents.some((c: { title: string }) => c.title === 'Fixture patch_testing consent')).toBe(true);
    }
  });

  it('shows staff only the engagements on productions they may view; the performer sees all of theirs', async () => {
    const secret = await makeProduction(t, 'Unannounced Sequel', []);
    const juno = await performerId(t, 'Juno Castellane');
    await t.db.db.insertInto('engagements').values({ performer_id: juno, production_id: secret, character_name: 'Surprise Twin' }).execute();
    const staff = PerformerDetailSchema.parse((await detail('head', juno)).body);
    expect(staff.engagements.map((e) => e.productionName)).toEqual(['The Lantern Keeper']);
    const self = PerformerDetailSchema.parse((await detail('performer', juno)).body);
    expect(self.engagements.map((e) => e.productionName)).toEqual(['The Lantern Keeper', 'Unannounced Sequel']);
  });
});

describe('POST /api/performers', () => {
  it('registers a performer with engagements, lower-cases the e-mail and audits it', async () => {
    const res = await api().post('/api/performers').set('Cookie', as.head).send(performerBody());
    expect(res.status).toBe(201);
    const d = PerformerDetailSchema.parse(res.body);
    expect(d).toMatchObject({ legalName: 'Wren Hollis-Marsh', pronouns: 'they/them', version: 1, canEdit: true, portraitUrl: null });
    expect(d.contact).toMatchObject({ email: 'wren.hollis@example.test', phone: '+44 20 7946 0011', notes: null });
    expect(d.engagements).toEqual([{ productionId: lantern, productionName: 'The Lantern Keeper', characterName: 'The Lighthouse Cat', startsOn: null, endsOn: null }]);
    const audit = await t.db.db.selectFrom('audit_log').select(['action', 'production_id']).where('entity_id', '=', d.id).orderBy('id').execute();
    expect(audit).toEqual([
      { action: 'performer.create', production_id: lantern },
      { action: 'engagement.add', production_id: lantern },
    ]);
  });

  it('refuses a duplicate e-mail, whatever its case, with a field message', async () => {
    const before = await count('performers');
    const res = await api().post('/api/performers').set('Cookie', as.head).send(performerBody({ email: 'OZ.Parfitt@Example.TEST' }));
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.email).toEqual(['Another performer already has this e-mail address.']);
    expect(await count('performers')).toBe(before);
  });

  it('names each bad field', async () => {
    const res = await api().post('/api/performers').set('Cookie', as.head).send({ legalName: ' ', email: 'nope', engagements: [] });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.details.fields).sort()).toEqual(['email', 'engagements', 'legalName']);
    const twice = await api().post('/api/performers').set('Cookie', as.head).send(performerBody({ engagements: [{ productionId: lantern }, { productionId: lantern }] }));
    expect(twice.status).toBe(400);
    expect(twice.body.error.details.fields['engagements.1.productionId']).toEqual(['This production is listed twice.']);
  });

  it('needs performers.manage on every production engaged', async () => {
    const before = await count('performers');
    for (const who of ['artist', 'archivist', 'performer', 'admin', 'norole', 'artist2'] as const) {
      const res = await api().post('/api/performers').set('Cookie', as[who]).send(performerBody());
      expect(res.status, who).toBe(403);
    }
    // Head of Saltglass, only an artist on Lantern.
    expect((await api().post('/api/performers').set('Cookie', as.artist2).send(performerBody({ engagements: [{ productionId: saltglass }, { productionId: lantern }] }))).status).toBe(403);
    // Head of Lantern, only an artist on Saltglass.
    expect((await api().post('/api/performers').set('Cookie', as.head).send(performerBody({ engagements: [{ productionId: lantern }, { productionId: saltglass }] }))).status).toBe(403);
    expect(await count('performers')).toBe(before);
    expect((await api().post('/api/performers').set('Cookie', as.artist2).send(performerBody({ engagements: [{ productionId: saltglass }] }))).status).toBe(201);
  });
});

describe('PATCH /api/performers/:id', () => {
  it('saves, bumps the version, and answers a stale edit with 409 keeping the first edit', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const body = await editBody(oz);
    const first = await api().patch(`/api/performers/${oz}`).set('Cookie', as.head).send({ ...body, preferredName: 'Ozzie', agentName: 'Marlowe Talent' });
    expect(first.status).toBe(200);
    expect(PerformerDetailSchema.parse(first.body)).toMatchObject({ preferredName: 'Ozzie', version: 2, contact: { agentName: 'Marlowe Talent' } });
    const stale = await api().patch(`/api/performers/${oz}`).set('Cookie', as.lead).send({ ...body, preferredName: 'Overwritten' });
    expect(stale.status).toBe(409);
    expect(stale.body.error).toMatchObject({ code: 'conflict', details: { currentVersion: 2 } });
    const row = await t.db.db.selectFrom('performers').select(['preferred_name', 'version']).where('id', '=', oz).executeTakeFirstOrThrow();
    expect(row).toEqual({ preferred_name: 'Ozzie', version: 2 });
    const audit = await t.db.db.selectFrom('audit_log').select('details').where('action', '=', 'performer.update').where('entity_id', '=', oz).execute();
    expect(audit.map((a) => a.details)).toEqual([{ fields: ['preferredName', 'agentName'] }]);
  });

  it('refuses an e-mail another performer has', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const res = await api().patch(`/api/performers/${oz}`).set('Cookie', as.head).send(await editBody(oz, { email: 'Bea.N@example.test' }));
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.email).toBeDefined();
    expect(await version(oz)).toBe(1);
  });

  it('is refused to everyone who does not manage the performer, the Saltglass head included', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const body = await editBody(oz, { legalName: 'Hijacked' });
    for (const who of ['artist', 'archivist', 'artist2', 'performer', 'admin', 'norole'] as const) {
      expect((await api().patch(`/api/performers/${oz}`).set('Cookie', as[who]).send(body)).status, who).toBe(403);
    }
    const juno = await performerId(t, 'Juno Castellane');
    expect((await api().patch(`/api/performers/${juno}`).set('Cookie', as.performer).send(await editBody(juno, { legalName: 'Self Edit' }))).status).toBe(403);
    expect(await version(oz)).toBe(1);
  });

  it('replaces engagements only on productions the editor manages; others stay untouched', async () => {
    const both = await makePerformer(t, 'Two Shows', [
      { productionId: lantern, characterName: 'Lantern Part' },
      { productionId: saltglass, characterName: 'Saltglass Part' },
    ]);
    const engagementsOf = async () =>
      (await t.db.db.selectFrom('engagements').select(['production_id', 'character_name']).where('performer_id', '=', both).orderBy('character_name').execute()).map((e) => [
        e.production_id === lantern ? 'lantern' : e.production_id === saltglass ? 'saltglass' : 'other',
        e.character_name,
      ]);
    // The Lantern head sends only Lantern (the Saltglass engagement is not theirs to remove) ...
    let res = await api().patch(`/api/performers/${both}`).set('Cookie', as.head).send({ legalName: 'Two Shows', version: 1, engagements: [{ productionId: lantern, characterName: 'Lantern Part 2' }] });
    expect(res.status).toBe(200);
    expect(await engagementsOf()).toEqual([
      ['lantern', 'Lantern Part 2'],
      ['saltglass', 'Saltglass Part'],
    ]);
    // ... nor to change.
    res = await api().patch(`/api/performers/${both}`).set('Cookie', as.head).send({ legalName: 'Two Shows', version: 2, engagements: [{ productionId: lantern, characterName: 'Lantern Part 2' }, { productionId: saltglass, characterName: 'Changed by the wrong head' }] });
    expect(res.status).toBe(200);
    expect(await engagementsOf()).toEqual([
      ['lantern', 'Lantern Part 2'],
      ['saltglass', 'Saltglass Part'],
    ]);
    // The Saltglass head, the other way round.
    res = await api().patch(`/api/performers/${both}`).set('Cookie', as.artist2).send({ legalName: 'Two Shows', version: 3, engagements: [{ productionId: saltglass, characterName: 'Saltglass Part 2' }] });
    expect(res.status).toBe(200);
    expect(await engagementsOf()).toEqual([
      ['lantern', 'Lantern Part 2'],
      ['saltglass', 'Saltglass Part 2'],
    ]);
    // A new engagement on a production the editor does not manage is refused, and nothing changes.
    const other = await makeProduction(t, 'Not Yours', []);
    res = await api().patch(`/api/performers/${both}`).set('Cookie', as.head).send({ legalName: 'Renamed', version: 4, engagements: [{ productionId: lantern }, { productionId: other }] });
    expect(res.status).toBe(403);
    expect(await version(both)).toBe(4);
  });

  it('removes an engagement the editor manages, and the linked sign-in loses the performer role there', async () => {
    const third = await makeProduction(t, 'Third Stage', [{ email: EMAILS.head, role: 'head' }]);
    const juno = await performerId(t, 'Juno Castellane');
    const junoUser = await t.userId(EMAILS.performer);
    const add = await api().patch(`/api/performers/${juno}`).set('Cookie', as.head).send(await editBody(juno, { engagements: [{ productionId: lantern, characterName: 'The Keeper' }, { productionId: third, characterName: 'Ghost' }] }));
    expect(add.status).toBe(200);
    const roles = async () => (await t.db.db.selectFrom('memberships').select('production_id').where('user_id', '=', junoUser).where('role', '=', 'performer').execute()).map((m) => m.production_id).sort();
    expect(await roles()).toEqual([lantern, third].sort());
    const remove = await api().patch(`/api/performers/${juno}`).set('Cookie', as.head).send(await editBody(juno, { engagements: [{ productionId: lantern, characterName: 'The Keeper' }] }));
    expect(remove.status).toBe(200);
    expect(PerformerDetailSchema.parse(remove.body).engagements.map((e) => e.productionId)).toEqual([lantern]);
    expect(await roles()).toEqual([lantern]);
  });
});

describe('PUT /api/performers/:id/account', () => {
  /** A sign-in linked the way the performer links one themself, set up directly for these tests. */
  async function linkDirectly(performer: string, email: string) {
    const user = await t.db.db.insertInto('users').values({ email, display_name: 'Oz Parfitt' }).returning('id').executeTakeFirstOrThrow();
    await t.db.db.updateTable('performers').set({ user_id: user.id, version: 2 }).where('id', '=', performer).execute();
    await t.db.db.insertInto('memberships').values({ user_id: user.id, production_id: lantern, role: 'performer' }).execute();
    return user.id;
  }

  it('never links a sign-in on a staff action alone: the reply says how a performer links one', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const user = await t.db.db.insertInto('users').values({ email: 'oz.login@plinth.test', display_name: 'Oz Parfitt' }).returning('id').executeTakeFirstOrThrow();
    for (const who of ['head', 'lead', 'admin'] as const) {
      const res = await api().put(`/api/performers/${oz}/account`).set('Cookie', as[who]).send({ userId: user.id, version: 1 });
      expect(res.status, who).toBe(400);
      expect(res.body.error.details.fields.userId.join(' '), who).toMatch(/invitation/);
    }
    expect(await t.db.db.selectFrom('memberships').select('id').where('user_id', '=', user.id).execute()).toEqual([]);
    expect(await version(oz)).toBe(1);
  });

  it('unlinks: the role goes, the person no longer sees the record, and the change is audited with before and after', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const userId = await linkDirectly(oz, 'oz.login@plinth.test');
    const cookie = await t.sessionFor('oz.login@plinth.test');
    expect((await api().get(`/api/performers/${oz}`).set('Cookie', cookie)).status).toBe(200);

    const unlink = await api().put(`/api/performers/${oz}/account`).set('Cookie', as.head).send({ userId: null, version: 2 });
    expect(unlink.status).toBe(200);
    expect(unlink.body.linkedUser).toBeNull();
    expect(await t.db.db.selectFrom('memberships').select('id').where('user_id', '=', userId).execute()).toEqual([]);
    expect((await api().get(`/api/performers/${oz}`).set('Cookie', cookie)).status).toBe(403);
    const audit = await t.db.db.selectFrom('audit_log').select(['details']).where('action', '=', 'performer.account_unlink').where('entity_id', '=', oz).executeTakeFirstOrThrow();
    expect(audit.details).toMatchObject({ before: userId, after: null });
  });

  it('refuses a stale version', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    await linkDirectly(oz, 'oz.login@plinth.test');
    const stale = await api().put(`/api/performers/${oz}/account`).set('Cookie', as.head).send({ userId: null, version: 1 });
    expect(stale.status).toBe(409);
    expect(await version(oz)).toBe(2);
  });

  it('is open to the studio administrator, who takes the role away on every production engaged', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const userId = await linkDirectly(oz, 'oz2@plinth.test');
    const res = await api().put(`/api/performers/${oz}/account`).set('Cookie', as.admin).send({ userId: null, version: 2 });
    expect(res.status).toBe(200);
    // The administrator sees which sign-in is linked, but no contact details or consents.
    expect(res.body).toMatchObject({ linkedUser: null, contact: null, consents: [], bookings: [], engagements: [] });
    expect(await t.db.db.selectFrom('memberships').select('production_id').where('user_id', '=', userId).execute()).toEqual([]);
  });

  it('is refused to artists, archivists, the Saltglass head, performers and people without a role', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const userId = await linkDirectly(oz, 'oz3@plinth.test');
    for (const who of ['artist', 'archivist', 'artist2', 'performer', 'norole'] as const) {
      expect((await api().put(`/api/performers/${oz}/account`).set('Cookie', as[who]).send({ userId: null, version: 2 })).status, who).toBe(403);
    }
    expect(await t.db.db.selectFrom('memberships').select('id').where('user_id', '=', userId).execute()).toHaveLength(1);
  });
});

describe('portraits', () => {
  beforeEach(async () => {
    // The database is reset for each test; the stored bytes of earlier tests are cleared here.
    for (const dir of ['portrait', 'portrait_thumb']) await fs.rm(path.join(t.config.storageDir, dir), { recursive: true, force: true });
  });
  const put = (who: Who, id: string, bytes: Buffer, filename = 'photo.jpg', contentType = 'image/jpeg') =>
    api().put(`/api/performers/${id}/portrait`).set('Cookie', as[who]).attach('portrait', bytes, { filename, contentType });
  const storedFiles = async () => {
    const out: string[] = [];
    for (const dir of ['portrait', 'portrait_thumb']) {
      const abs = path.join(t.config.storageDir, dir);
      out.push(...(await fs.readdir(abs).catch(() => [] as string[])).map((f) => `${dir}/${f}`));
    }
    return out.sort();
  };

  it('stores an upright JPEG without EXIF or GPS, and a 256×256 thumbnail', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const photo = await cameraJpeg();
    // The fixture really carries what must be dropped.
    const original = await sharp(photo).metadata();
    expect(original).toMatchObject({ width: 400, height: 200, orientation: 6 });
    expect(exifHasGps(original.exif)).toBe(true);
    expect(original.exif!.includes(Buffer.from('PlinthTestCam'))).toBe(true);

    const res = await put('head', oz, photo);
    expect(res.status).toBe(200);
    const d = PerformerDetailSchema.parse(res.body);
    const files = await t.db.db.selectFrom('files').select(['id', 'purpose', 'width', 'height', 'content_type']).where('purpose', 'in', ['portrait', 'portrait_thumb']).orderBy('purpose').execute();
    expect(files.map((f) => [f.purpose, f.width, f.height, f.content_type])).toEqual([
      ['portrait', 200, 400, 'image/jpeg'],
      ['portrait_thumb', 256, 256, 'image/jpeg'],
    ]);
    expect(d.portraitUrl).toBe(`/api/performers/${oz}/portrait?v=${files[0]!.id}`);
    expect(d.thumbnailUrl).toBe(`/api/performers/${oz}/portrait/thumbnail?v=${files[1]!.id}`);

    const big = await api().get(d.portraitUrl!).set('Cookie', as.artist).buffer(true);
    expect(big.status).toBe(200);
    expect(big.headers['content-type']).toBe('image/jpeg');
    const meta = await sharp(big.body).metadata();
    expect(meta).toMatchObject({ format: 'jpeg', width: 200, height: 400 });
    expect(meta.exif).toBeUndefined();
    expect(meta.orientation).toBeUndefined();
    expect(meta.xmp).toBeUndefined();
    expect(big.body.includes(Buffer.from('PlinthTestCam'))).toBe(false);
    // Orientation 6 means "turn 90° clockwise": the red left half is now on top.
    const top = await bandColour(big.body, 'top');
    const bottom = await bandColour(big.body, 'bottom');
    expect(top.r).toBeGreaterThan(150);
    expect(top.b).toBeLessThan(80);
    expect(bottom.b).toBeGreaterThan(150);
    expect(bottom.r).toBeLessThan(80);

    const thumb = await api().get(d.thumbnailUrl!).set('Cookie', as.archivist).buffer(true);
    expect(thumb.status).toBe(200);
    const tm = await sharp(thumb.body).metadata();
    expect([tm.width, tm.height, tm.exif]).toEqual([256, 256, undefined]);
    // The list shows the thumbnail too.
    const row = PerformerPageSchema.parse((await list('artist', '?q=Parfitt')).body).items[0]!;
    expect(row.thumbnailUrl).toBe(d.thumbnailUrl);
  });

  it('accepts PNG and WebP, fits large photos inside 1600 px, and replaces the old files', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const first = await put('lead', oz, await largePng(), 'big.png', 'image/png');
    expect(first.status).toBe(200);
    const meta = await sharp((await api().get(first.body.portraitUrl).set('Cookie', as.head).buffer(true)).body).metadata();
    expect([meta.format, meta.width, meta.height]).toEqual(['jpeg', 1600, 1067]);
    const firstFiles = await storedFiles();
    expect(firstFiles).toHaveLength(2);
    const second = await put('head', oz, await smallWebp(), 'x.webp', 'image/webp');
    expect(second.status).toBe(200);
    expect(second.body.portraitUrl).not.toBe(first.body.portraitUrl);
    // The replaced photo is gone, rows and bytes.
    expect(await t.db.db.selectFrom('files').select('id').where('purpose', 'in', ['portrait', 'portrait_thumb']).execute()).toHaveLength(2);
    const now = await storedFiles();
    expect(now).toHaveLength(2);
    expect(now.some((f) => firstFiles.includes(f))).toBe(false);
    expect((await api().get(first.body.portraitUrl).set('Cookie', as.head)).status).toBe(200);
  });

  it('refuses a text file named .jpg, and a GIF, with the field message', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const filesBefore = await count('files');
    for (const [bytes, name] of [
      [Buffer.from('this is just some text pretending to be a photo\n'), 'holiday.jpg'],
      [await smallGif(), 'anim.gif'],
    ] as const) {
      const res = await put('head', oz, bytes, name);
      expect(res.status).toBe(400);
      expect(res.body.error.details.fields.portrait).toEqual(['This is not a photo Plinth can read (JPEG, PNG, WebP or AVIF)']);
    }
    expect(await count('files')).toBe(filesBefore);
    expect(await storedFiles()).toEqual([]);
    expect(PerformerDetailSchema.parse((await detail('head', oz)).body).portraitUrl).toBeNull();
  });

  it('accepts AVIF (HEIF) and refuses a header claiming more than 100 megapixels before decoding it', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const avif = await put('head', oz, await smallAvif(), 'x.avif', 'image/avif');
    expect(avif.status).toBe(200);
    const meta = await sharp((await api().get(avif.body.portraitUrl).set('Cookie', as.head).buffer(true)).body).metadata();
    expect([meta.format, meta.width, meta.height]).toEqual(['jpeg', 64, 48]);
    const bomb = await put('head', oz, pngBombHeader(), 'bomb.png', 'image/png');
    expect(bomb.status).toBe(400);
    expect(bomb.body.error.details.fields.portrait).toEqual(['This photo has more than 100 megapixels. Send a smaller copy.']);
    expect(avif.body.portraitUrl).toBe(PerformerDetailSchema.parse((await detail('head', oz)).body).portraitUrl);
  });

  it('answers a file over 10 MB with 413 and stores nothing', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const filesBefore = await count('files');
    const tooBig = Buffer.concat([await cameraJpeg(), Buffer.alloc(10 * 1024 * 1024, 0x20)]);
    const res = await put('head', oz, tooBig);
    expect(res.status).toBe(413);
    expect(ErrorBodySchema.parse(res.body).error.code).toBe('payload_too_large');
    expect(await count('files')).toBe(filesBefore);
    expect(await storedFiles()).toEqual([]);
  });

  it('asks for the photo when none is sent, and names the field when it is sent under another name', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const none = await api().put(`/api/performers/${oz}/portrait`).set('Cookie', as.head).field('note', 'no file');
    expect(none.status).toBe(400);
    expect(none.body.error.details.fields.portrait).toEqual(['Choose a photo to upload.']);
    const wrong = await api().put(`/api/performers/${oz}/portrait`).set('Cookie', as.head).attach('photo', await cameraJpeg(), 'a.jpg');
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.details.fields.portrait).toBeDefined();
  });

  it('removes the portrait and its files', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const set = await put('head', oz, await cameraJpeg());
    expect(set.status).toBe(200);
    expect((await api().delete(`/api/performers/${oz}/portrait`).set('Cookie', as.artist)).status).toBe(403);
    const del = await api().delete(`/api/performers/${oz}/portrait`).set('Cookie', as.head);
    expect(del.status).toBe(204);
    expect(PerformerDetailSchema.parse((await detail('head', oz)).body)).toMatchObject({ portraitUrl: null, thumbnailUrl: null });
    expect((await api().get(`/api/performers/${oz}/portrait`).set('Cookie', as.head)).status).toBe(404);
    expect((await api().get(`/api/performers/${oz}/portrait/thumbnail`).set('Cookie', as.head)).status).toBe(404);
    expect(await t.db.db.selectFrom('files').select('id').where('purpose', 'in', ['portrait', 'portrait_thumb']).execute()).toEqual([]);
    expect(await storedFiles()).toEqual([]);
  });
});

describe('every performer route × every role', () => {
  type Case = { route: string; run: (who: Who) => Promise<request.Response> };
  const small = () => cameraJpeg();
  const csv = () => Buffer.from('legal_name,email\nMatrix Person,matrix.person@example.test\n');
  let oz: string;
  beforeEach(async () => {
    oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const set = await api().put(`/api/performers/${oz}/portrait`).set('Cookie', as.head).attach('portrait', await small(), 'p.jpg');
    expect(set.status).toBe(200);
  });
  const cases: Case[] = [
    { route: 'GET /api/performers', run: (who) => list(who) },
    { route: 'GET /api/performers/export.csv', run: (who) => api().get('/api/performers/export.csv').set('Cookie', as[who]) },
    { route: 'GET /api/performers/:id', run: (who) => detail(who, oz) },
    { route: 'POST /api/performers', run: (who) => api().post('/api/performers').set('Cookie', as[who]).send(performerBody({ email: `${who}.made@example.test`, engagements: [{ productionId: lantern }] })) },
    { route: 'PATCH /api/performers/:id', run: async (who) => api().patch(`/api/performers/${oz}`).set('Cookie', as[who]).send(await editBody(oz, { notes: `edited by ${who}` })) },
    { route: 'PUT /api/performers/:id/account', run: async (who) => api().put(`/api/performers/${oz}/account`).set('Cookie', as[who]).send({ userId: null, version: await version(oz) }) },
    { route: 'PUT /api/performers/:id/portrait', run: async (who) => api().put(`/api/performers/${oz}/portrait`).set('Cookie', as[who]).attach('portrait', await small(), 'p.jpg') },
    { route: 'DELETE /api/performers/:id/portrait', run: (who) => api().delete(`/api/performers/${oz}/portrait`).set('Cookie', as[who]) },
    { route: 'GET /api/performers/:id/portrait', run: (who) => api().get(`/api/performers/${oz}/portrait`).set('Cookie', as[who]) },
    { route: 'GET /api/performers/:id/portrait/thumbnail', run: (who) => api().get(`/api/performers/${oz}/portrait/thumbnail`).set('Cookie', as[who]) },
    { route: 'POST /api/performers/import', run: (who) => api().post(`/api/performers/import?productionId=${lantern}`).set('Cookie', as[who]).attach('file', csv(), 'p.csv') },
  ];
  // Lantern's head and lead manage; its artists (artist2 is head of Saltglass only) and archivist view;
  // Juno (performer) sees only her own record; the administrator holds no production role here.
  const ok = { view: ['head', 'lead', 'artist', 'archivist', 'artist2'], manage: ['head', 'lead'] } as const;
  const expected: Record<string, { allowed: readonly Who[]; status: number }> = {
    'GET /api/performers': { allowed: ok.view, status: 200 },
    'GET /api/performers/export.csv': { allowed: ok.view, status: 200 },
    'GET /api/performers/:id': { allowed: ok.view, status: 200 },
    'POST /api/performers': { allowed: ok.manage, status: 201 },
    'PATCH /api/performers/:id': { allowed: ok.manage, status: 200 },
    'PUT /api/performers/:id/account': { allowed: [...ok.manage, 'admin'], status: 200 },
    'PUT /api/performers/:id/portrait': { allowed: ok.manage, status: 200 },
    'DELETE /api/performers/:id/portrait': { allowed: ok.manage, status: 204 },
    'GET /api/performers/:id/portrait': { allowed: ok.view, status: 200 },
    'GET /api/performers/:id/portrait/thumbnail': { allowed: ok.view, status: 200 },
    'POST /api/performers/import': { allowed: ok.manage, status: 200 },
  };
  const everyone: Who[] = ['head', 'lead', 'artist', 'archivist', 'artist2', 'performer', 'admin', 'norole'];
  for (const c of cases) {
    for (const who of everyone) {
      const e = expected[c.route]!;
      const allowed = e.allowed.includes(who);
      it(`${c.route} answers ${allowed ? e.status : 403} to ${who}`, async () => {
        const performersBefore = await count('performers');
        const versionBefore = await version(oz);
        const res = await c.run(who);
        expect(res.status).toBe(allowed ? e.status : 403);
        if (!allowed) {
          expect(ErrorBodySchema.parse(res.body).error.code).toBe('forbidden');
          expect(await count('performers')).toBe(performersBefore);
          expect(await version(oz)).toBe(versionBefore);
        }
      });
    }
  }
  it('covers every performer route', async () => {
    const { allRoutes } = await import('../../api/routes.ts');
    const mine = allRoutes.filter((r) => r.tag === 'performers').map((r) => `${r.method.toUpperCase()} ${r.path}`);
    expect(mine.sort()).toEqual(cases.map((c) => c.route).sort());
  });
});
