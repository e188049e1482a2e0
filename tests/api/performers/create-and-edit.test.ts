import { describe, expect, it } from 'vitest';
import { PerformerDetailSchema } from '#shared/schemas/performers.ts';
import { EMAILS, makePerformer, makeProduction, performerId } from '../../fixtures/performers.ts';
import { usePerformerApp, t, as, lantern, saltglass, api, count, version, performerBody, editBody } from './setup.ts';

usePerformerApp();

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

