import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { BundleLinkViewSchema, SigningBundleSchema } from '#shared/schemas/consent-bundles.ts';
import { TabletStateSchema } from '#shared/schemas/consents.ts';
import { expectWordedMail } from '../../support/mail-wording.ts';
import { api, as, lantern, lastMailTo, mailsTo, performerId, submission, t, templateId, useConsentWorkApp } from './setup.ts';

useConsentWorkApp();

async function consentsOf(pid: string) {
  return t.db.db.selectFrom('consents').select(['id', 'kind', 'request_id', 'pdf_sha256', 'content_sha256', 'pdf_file_id']).where('performer_id', '=', pid).execute();
}

describe('a bundle signed on the tablet', () => {
  it('shows three forms one after another in one hand-over; a decline in the middle keeps the others; one hand-back at the end', async () => {
    const cookie = await t.sessionFor('head@plinth.test');
    const pid = await performerId('Tamsin Achebe-Lowry');
    const before = await consentsOf(pid);
    const kinds = ['life_casting', 'application', 'cast_storage'];
    const created = await api()
      .post('/api/signing-bundles')
      .set('Cookie', cookie)
      .send({ performerId: pid, productionId: lantern, mode: 'tablet', templateIds: await Promise.all(kinds.map(templateId)) });
    expect(created.status).toBe(201);
    const bundle = SigningBundleSchema.parse(created.body);
    expect(bundle.requests.map((r) => r.template.kind)).toEqual(kinds);
    expect(bundle.sentTo).toBeNull();

    const lent = await api().post(`/api/signing-bundles/${bundle.id}/hand-over`).set('Cookie', cookie);
    expect(lent.status).toBe(200);
    // While lent, no staff data answers.
    expect((await api().get(`/api/consents?performerId=${pid}`).set('Cookie', cookie)).status).toBe(401);

    const seen: string[] = [];
    const positions: number[] = [];
    for (const step of ['sign', 'decline', 'sign'] as const) {
      const state = TabletStateSchema.parse((await api().get('/api/tablet').set('Cookie', cookie)).body);
      expect(state.phase).toBe('signing');
      seen.push(state.form!.template.kind);
      positions.push(state.progress!.position);
      expect(state.progress!.total).toBe(3);
      if (step === 'sign') {
        const res = await api().post('/api/tablet/submit').set('Cookie', cookie).send(submission(state.form!, state.idempotencyKey!, 'Tamsin Achebe-Lowry'));
        expect(res.status).toBe(201);
      } else {
        expect((await api().post('/api/tablet/decline').set('Cookie', cookie)).status).toBe(200);
      }
    }
    expect(seen).toEqual(kinds);
    expect(positions).toEqual([1, 2, 3]);
    const after = await api().get('/api/tablet').set('Cookie', cookie);
    expect(after.body).toEqual({ phase: 'handback', form: null, idempotencyKey: null });

    const made = (await consentsOf(pid)).filter((c) => !before.some((b) => b.id === c.id));
    // Two consents, each its own record, PDF and fingerprints; the declined form stays open to sign later.
    expect(made.map((c) => c.kind).sort()).toEqual(['cast_storage', 'life_casting']);
    expect(new Set(made.map((c) => c.pdf_sha256)).size).toBe(2);
    expect(new Set(made.map((c) => c.content_sha256)).size).toBe(2);
    expect(new Set(made.map((c) => c.pdf_file_id)).size).toBe(2);
    const statuses = await t.db.db.selectFrom('signing_requests').select(['id', 'status']).where('bundle_id', '=', bundle.id).orderBy('bundle_position').execute();
    expect(statuses.map((s) => s.status)).toEqual(['signed', 'open', 'signed']);
  });

  it('passes over a form archived between the request and the signing', async () => {
    const cookie = await t.sessionFor('head@plinth.test');
    const pid = await performerId('Tamsin Achebe-Lowry');
    const ids = await Promise.all(['application', 'health_data'].map(templateId));
    const bundle = SigningBundleSchema.parse((await api().post('/api/signing-bundles').set('Cookie', cookie).send({ performerId: pid, productionId: lantern, mode: 'tablet', templateIds: ids })).body);
    expect((await api().post(`/api/signing-bundles/${bundle.id}/hand-over`).set('Cookie', cookie)).status).toBe(200);
    const first = TabletStateSchema.parse((await api().get('/api/tablet').set('Cookie', cookie)).body);
    expect(first.form!.template.kind).toBe('application');
    // The second form is archived while the performer reads the first.
    await t.db.db.updateTable('consent_templates').set({ archived: true }).where('id', '=', ids[1]!).execute();
    expect((await api().post('/api/tablet/submit').set('Cookie', cookie).send(submission(first.form!, first.idempotencyKey!, 'Tamsin Achebe-Lowry'))).status).toBe(201);
    expect((await api().get('/api/tablet').set('Cookie', cookie)).body.phase).toBe('handback');
  });
});

describe('a bundle sent as one link', () => {
  it('arrives as one e-mail with one link that walks through the forms in order; declining one keeps the others', async () => {
    const pid = await performerId('Halvard Imre Solberg');
    const kinds = ['life_casting', 'application', 'health_data'];
    const created = await api().post('/api/signing-bundles').set('Cookie', as.head).send({ performerId: pid, productionId: lantern, mode: 'link', templateIds: await Promise.all(kinds.map(templateId)) });
    expect(created.status).toBe(201);
    const bundle = SigningBundleSchema.parse(created.body);
    expect(bundle.sentTo).toBe('h.solberg@example.test');
    const sent = await mailsTo('h.solberg@example.test');
    expect(sent).toHaveLength(1);
    const mail = sent[0]!;
    // The mail names the production and its department head, and prints the date in words.
    expect(mail.subject).toContain('The Lantern Keeper');
    expect(mail.text).toContain('Marta Oyelaran');
    expectWordedMail(mail.text);
    expect(mail.text).toMatch(/until (Monday|Tuesday|Wednesday|Thursday|Friday|Saturday|Sunday) \d{1,2} (January|February|March|April|May|June|July|August|September|October|November|December) \d{4} at \d{2}:\d{2}/);
    const tokens = [...(mail.text ?? '').matchAll(/\/sign\/bundle\/([A-Za-z0-9_-]{40,60})/g)].map((m) => m[1]);
    expect(tokens).toHaveLength(1);
    const token = tokens[0]!;

    const view = BundleLinkViewSchema.parse((await api().get(`/api/signing-bundles/link/${token}`)).body);
    expect(view.items.map((i) => i.kind)).toEqual(kinds);
    expect(view.items.every((i) => i.state === 'to_sign' && i.form)).toBe(true);

    // Signs the first, leaves the second, signs the third.
    for (const i of [0, 2]) {
      const item = view.items[i]!;
      const res = await api().post(`/api/signing-bundles/link/${token}/requests/${item.requestId}`).send(submission(item.form!, randomUUID(), 'Halvard Imre Solberg'));
      expect(res.status).toBe(201);
      expect(res.body.emailedTo).toBe('h.solberg@example.test');
    }
    const again = BundleLinkViewSchema.parse((await api().get(`/api/signing-bundles/link/${token}`)).body);
    expect(again.items.map((i) => i.state)).toEqual(['signed', 'to_sign', 'signed']);
    // A signed form of the bundle cannot be signed twice through the link.
    const twice = await api().post(`/api/signing-bundles/link/${token}/requests/${view.items[0]!.requestId}`).send(submission(view.items[0]!.form!, randomUUID(), 'Halvard Imre Solberg'));
    expect(twice.status).toBe(409);
    // A request id from outside the bundle is not reachable through its link.
    const other = await api().post(`/api/signing-bundles/link/${token}/requests/${randomUUID()}`).send(submission(view.items[1]!.form!, randomUUID(), 'Halvard Imre Solberg'));
    expect(other.status).toBe(404);
    // Each signed form is mailed as its own copy.
    const copies = (await mailsTo('h.solberg@example.test')).filter((m) => m.subject?.startsWith('Your signed consent'));
    expect(copies).toHaveLength(2);
    for (const c of copies) {
      expect(c.subject).toContain('The Lantern Keeper');
      expect(c.text).toContain('department head: Marta Oyelaran');
      expectWordedMail(c.text, undefined, undefined, { dateOnly: true });
      expect(c.attachments).toHaveLength(1);
    }
  });

  it('a form archived after sending shows as unavailable and refuses a signing, saving nothing', async () => {
    const pid = await performerId('Halvard Imre Solberg');
    const ids = await Promise.all(['application', 'cast_storage'].map(templateId));
    await api().post('/api/signing-bundles').set('Cookie', as.head).send({ performerId: pid, productionId: lantern, mode: 'link', templateIds: ids }).expect(201);
    const token = /\/sign\/bundle\/([A-Za-z0-9_-]{40,60})/.exec((await lastMailTo('h.solberg@example.test')).text ?? '')![1]!;
    const view = BundleLinkViewSchema.parse((await api().get(`/api/signing-bundles/link/${token}`)).body);
    await t.db.db.updateTable('consent_templates').set({ archived: true }).where('id', '=', ids[1]!).execute();
    const count = async () => Number((await t.db.db.selectFrom('consents').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow()).n);
    const n = await count();
    const res = await api().post(`/api/signing-bundles/link/${token}/requests/${view.items[1]!.requestId}`).send(submission(view.items[1]!.form!, randomUUID(), 'Halvard Imre Solberg'));
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('conflict');
    expect(res.body.error.details.reason).toBe('archived');
    expect(await count()).toBe(n);
    const after = BundleLinkViewSchema.parse((await api().get(`/api/signing-bundles/link/${token}`)).body);
    expect(after.items.map((i) => i.state)).toEqual(['to_sign', 'unavailable']);
  });
});

describe('bad bundles', () => {
  const rowCounts = async () => {
    const [b, r] = await Promise.all([
      t.db.db.selectFrom('signing_bundles').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow(),
      t.db.db.selectFrom('signing_requests').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow(),
    ]);
    return [Number(b.n), Number(r.n)];
  };

  it('refuses an empty bundle, naming the field', async () => {
    const before = await rowCounts();
    const res = await api().post('/api/signing-bundles').set('Cookie', as.head).send({ performerId: await performerId('Halvard Imre Solberg'), productionId: lantern, mode: 'tablet', templateIds: [] });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.fields.templateIds[0]).toMatch(/at least one form/i);
    expect(await rowCounts()).toEqual(before);
  });

  it('refuses a link bundle for a performer with no confirmed e-mail, saving nothing', async () => {
    const pid = await performerId('Halvard Imre Solberg');
    await t.db.db.updateTable('performers').set({ email_confirmed_at: null }).where('id', '=', pid).execute();
    const before = await rowCounts();
    const res = await api().post('/api/signing-bundles').set('Cookie', as.head).send({ performerId: pid, productionId: lantern, mode: 'link', templateIds: [await templateId('application'), await templateId('life_casting')] });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.mode[0]).toMatch(/not yet confirmed/);
    expect(await rowCounts()).toEqual(before);
    expect(await mailsTo('h.solberg@example.test')).toHaveLength(0);
  });

  it('refuses an archived form at the request, naming which one, and saves none of the others', async () => {
    const ids = [await templateId('application'), await templateId('health_data')];
    await t.db.db.updateTable('consent_templates').set({ archived: true }).where('id', '=', ids[1]!).execute();
    const before = await rowCounts();
    const res = await api().post('/api/signing-bundles').set('Cookie', as.head).send({ performerId: await performerId('Halvard Imre Solberg'), productionId: lantern, mode: 'tablet', templateIds: ids });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.details.fields)).toEqual(['templateIds.1']);
    expect(await rowCounts()).toEqual(before);
  });

  it('artists and archivists may not send forms', async () => {
    for (const who of ['artist', 'archivist'] as const) {
      const res = await api().post('/api/signing-bundles').set('Cookie', as[who]).send({ performerId: await performerId('Halvard Imre Solberg'), productionId: lantern, mode: 'tablet', templateIds: [await templateId('application')] });
      expect(res.status, who).toBe(403);
    }
  });
});
