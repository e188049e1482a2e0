import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { HealthSummarySchema, HealthWorklistSchema } from '#shared/schemas/consent-notices.ts';
import { SigningFormSchema } from '#shared/schemas/consents.ts';
import { api, as, lantern, lastMailTo, performerId, submission, t, useConsentWorkApp } from './setup.ts';

useConsentWorkApp();

const worklist = async (who: 'lead' | 'head' = 'lead') => api().get(`/api/consent-notices/health?productionId=${lantern}`).set('Cookie', as[who]);

describe("the lead's worklist", () => {
  it('lists a "yes" to a health question until the lead confirms having looked, then only newer answers', async () => {
    const juno = await performerId('Juno Castellane');
    const first = HealthWorklistSchema.parse((await worklist()).body);
    const item = first.items.find((i) => i.performerId === juno)!;
    expect(item, 'Juno answered yes on her health-data form (demo data)').toBeDefined();
    expect(item.answers.map((a) => [a.kind, a.answer])).toContainEqual(['health_data', 'Yes']);
    // A free-text answer on a patch-testing form is a health detail, but not a health-data form's: not listed.
    expect(item.answers.map((a) => a.answer)).not.toContain('Sticking plasters make my skin itch');
    expect(item.reviewedAt).toBeNull();
    // Every performer listed was read: one medical read each, naming them.
    const audited = await t.db.db.selectFrom('audit_log').select('subject_performer_id').where('action', '=', 'medical.read').where('actor_user_id', '=', await t.userId('lead@plinth.test')).execute();
    for (const i of first.items) expect(audited.map((a) => a.subject_performer_id)).toContain(i.performerId);

    expect((await api().post('/api/consent-notices/health/reviews').set('Cookie', as.lead).send({ performerId: juno, productionId: lantern, reviewedAt: first.readAt })).status).toBe(200);
    expect(HealthWorklistSchema.parse((await worklist()).body).items.map((i) => i.performerId)).not.toContain(juno);

    // A new health-data form with a free-text question, signed afterwards: Juno is back, with only the new answer.
    const created = await api().post('/api/consent-templates').set('Cookie', as.head).send({
      kind: 'health_data',
      title: 'Skin and health notes',
      body: 'Tell the designated lead anything about your skin or health the artists should know.',
      questions: [{ id: 'notes', type: 'short_text', label: 'Anything about your skin or health', medical: true, required: false }],
      validityDays: 365,
    });
    expect(created.status).toBe(201);
    await api().post('/api/signing-requests').set('Cookie', as.head).send({ performerId: juno, templateId: created.body.id, productionId: lantern, mode: 'link' }).expect(201);
    const token = /\/sign\/([A-Za-z0-9_-]{40,60})/.exec((await lastMailTo('performer@plinth.test')).text ?? '')![1]!;
    const form = SigningFormSchema.parse((await api().get(`/api/signing/${token}`)).body);
    await api().post(`/api/signing/${token}`).send(submission(form, randomUUID(), 'Juno Castellane', { notes: 'Mild eczema on both wrists' })).expect(201);
    const again = HealthWorklistSchema.parse((await worklist()).body).items.find((i) => i.performerId === juno)!;
    expect(again.answers.map((a) => a.answer)).toEqual(['Mild eczema on both wrists']);
    expect(again.answers[0]!.title).toBe('Skin and health notes');
    expect(again.reviewedAt).not.toBeNull();
  });

  it('is the lead\'s alone', async () => {
    for (const who of ['head', 'artist', 'archivist', 'performer', 'admin'] as const) {
      expect((await api().get(`/api/consent-notices/health?productionId=${lantern}`).set('Cookie', as[who])).status, who).toBe(403);
      const confirm = await api().post('/api/consent-notices/health/reviews').set('Cookie', as[who]).send({ performerId: await performerId('Juno Castellane'), productionId: lantern, reviewedAt: new Date().toISOString() });
      expect(confirm.status, who).toBe(403);
    }
  });
});

describe("a performer's health summary", () => {
  it('gathers every health answer with its form and date for the lead, audited', async () => {
    const juno = await performerId('Juno Castellane');
    const res = await api().get(`/api/consent-notices/health-summary?performerId=${juno}`).set('Cookie', as.lead);
    expect(res.status).toBe(200);
    const summary = HealthSummarySchema.parse(res.body);
    const allergy = summary.answers.find((a) => a.answer === 'Sticking plasters make my skin itch')!;
    expect(allergy.kind).toBe('patch_testing');
    expect(new Date(allergy.signedAt).getTime()).toBeLessThan(Date.now());
    expect(summary.answers.some((a) => a.kind === 'health_data')).toBe(true);
    const audit = await t.db.db.selectFrom('audit_log').select(['subject_performer_id', 'details']).where('action', '=', 'medical.read').where('entity_type', '=', 'performer').where('subject_performer_id', '=', juno).execute();
    expect(audit.length).toBeGreaterThan(0);
  });

  it('the performer reads their own; other staff get 403', async () => {
    const juno = await performerId('Juno Castellane');
    expect((await api().get(`/api/consent-notices/health-summary?performerId=${juno}`).set('Cookie', as.performer)).status).toBe(200);
    for (const who of ['head', 'artist', 'archivist', 'admin'] as const) {
      expect((await api().get(`/api/consent-notices/health-summary?performerId=${juno}`).set('Cookie', as[who])).status, who).toBe(403);
    }
  });
});
