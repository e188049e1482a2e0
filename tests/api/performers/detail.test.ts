import { describe, expect, it } from 'vitest';
import { PerformerDetailSchema } from '#shared/schemas/performers.ts';
import { makeConsent, makeProduction, performerId, type Who } from '../../fixtures/performers.ts';
import { usePerformerApp, t, detail } from './setup.ts';

usePerformerApp();

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

