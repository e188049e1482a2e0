import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ConsentDetailSchema } from '#shared/schemas/consents.ts';
import { createTestApp, type TestApp } from '../support/app.ts';

let t: TestApp;
let lead: string;

beforeAll(async () => {
  t = await createTestApp();
  lead = await t.sessionFor('lead@plinth.test');
});
afterAll(async () => {
  await t?.close();
});

describe('GET /api/consents/:id', () => {
  it('gives the answers in the order the form asked the questions, whatever order the rows are stored in', async () => {
    // Juno Castellane's patch-testing consent (demo data) answers several questions.
    const performer = await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow();
    const consent = await t.db.db
      .selectFrom('consents as c')
      .innerJoin('consent_template_versions as v', 'v.id', 'c.template_version_id')
      .select(['c.id', 'v.questions'])
      .where('c.performer_id', '=', performer.id)
      .where('c.kind', '=', 'patch_testing')
      .executeTakeFirstOrThrow();
    const formOrder = (consent.questions as { id: string }[]).map((q) => q.id);
    expect(formOrder.length).toBeGreaterThanOrEqual(3);

    // Store the rows so that their ids sort in the reverse of the form's order.
    const rows = await t.db.db.selectFrom('consent_answers').select(['id', 'question_id']).where('consent_id', '=', consent.id).execute();
    expect(rows.length).toBe(formOrder.length);
    for (const [i, qid] of formOrder.entries()) {
      const row = rows.find((r) => r.question_id === qid)!;
      const id = `00000000-0000-4000-8000-${String(900 - i).padStart(12, '0')}`;
      await t.db.db.updateTable('consent_answers').set({ id }).where('id', '=', row.id).execute();
    }

    const res = await request(t.app).get(`/api/consents/${consent.id}`).set('Cookie', lead);
    expect(res.status).toBe(200);
    expect(ConsentDetailSchema.parse(res.body).answers.map((a) => a.questionId)).toEqual(formOrder);
  });
});
