// Consent forms: the seeded templates, new versions and the questionnaire's own rules.
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { TemplateListSchema } from '#shared/schemas/consents.ts';
import { head, lead, t, useConsentApp } from './setup.ts';

useConsentApp();

describe('consent templates', () => {
  it('seeds one original template of each kind', async () => {
    const res = await request(t.app).get('/api/consent-templates').set('Cookie', head);
    const list = TemplateListSchema.parse(res.body);
    expect(list.items.map((x) => x.kind).sort()).toEqual(['application', 'cast_storage', 'health_data', 'life_casting', 'patch_testing']);
    const life = list.items.find((x) => x.kind === 'life_casting')!;
    // The life-casting form covers each safety point the department must raise.
    for (const phrase of [/nostrils/i, /stop signal/i, /claustrophobia/i, /brows/i, /contact lenses/i, /plaster.*(warm|heat)/is]) expect(life.body).toMatch(phrase);
    const storage = list.items.find((x) => x.kind === 'cast_storage')!;
    for (const phrase of [/own/i, /five years|how long/i, /return to you or destruction/i]) expect(storage.body).toMatch(phrase);
  });

  it('editing publishes a new version and refuses an edit made on a stale version', async () => {
    const created = await request(t.app).post('/api/consent-templates').set('Cookie', head).send({
      kind: 'application', title: 'Extra application form', body: 'A body that is long enough to be a consent text.', questions: [{ id: 'ok', type: 'yes_no', label: 'All fine?', medical: false, required: true }], validityDays: 30,
    });
    expect(created.status).toBe(201);
    expect(created.body.version).toBe(1);
    const edit = { kind: 'application', title: 'Extra application form (rev)', body: 'A revised body that is long enough to be a consent text.', questions: [], validityDays: 60 };
    const v2 = await request(t.app).put(`/api/consent-templates/${created.body.id}`).set('Cookie', head).send({ ...edit, version: 1 });
    expect(v2.status).toBe(200);
    expect(v2.body.version).toBe(2);
    const stale = await request(t.app).put(`/api/consent-templates/${created.body.id}`).set('Cookie', lead).send({ ...edit, title: 'Lost edit', version: 1 });
    expect(stale.status).toBe(409);
    const versions = await request(t.app).get(`/api/consent-templates/${created.body.id}/versions`).set('Cookie', head);
    expect(versions.body.items.map((v: { version: number }) => v.version)).toEqual([2, 1]);
  });

  it('refuses a questionnaire with duplicate ids or a choice without options', async () => {
    const res = await request(t.app).post('/api/consent-templates').set('Cookie', head).send({
      kind: 'application', title: 'Bad', body: 'A body that is long enough to be a consent text.', validityDays: null,
      questions: [{ id: 'a', type: 'choice', label: 'Pick', medical: false, required: true, options: ['one'] }, { id: 'a', type: 'yes_no', label: 'Again', medical: false, required: false }],
    });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.details.fields)).toEqual(expect.arrayContaining(['questions.0.options', 'questions']));
  });
});
