import { beforeEach, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { PerformerDetailSchema, PerformerPageSchema } from '#shared/schemas/performers.ts';
import { EMAILS, makeBooking, makeConsent, makePerformer, makeProduction } from '../../fixtures/performers.ts';
import { usePerformerApp, t, as, lantern, saltglass, LANTERN_BY_NAME, api, list, detail, names } from './setup.ts';

usePerformerApp();

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

