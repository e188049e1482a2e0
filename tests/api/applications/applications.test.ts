import { describe, expect, it } from 'vitest';
import { simpleParser } from 'mailparser';
import { ApplicationSchema, IncidentListSchema, IncidentSchema, LotTraceSchema } from '#shared/schemas/applications.ts';
import { CheckSchema } from '#shared/schemas/checks.ts';
import { expectWordedMail } from '../../support/mail-wording.ts';
import { sealJson } from '../../../api/crypto/medical.ts';
import { api, applicationBody, as, caughtMail, HARBOUR, ids, logCounts, PIER, QUAYSIDE, runCheck, setClearance, t, useApplicationApp } from './setup.ts';

useApplicationApp();

async function goCheck(performer = ids.juno) {
  await setClearance(performer, HARBOUR, 'cleared');
  await setClearance(performer, PIER, 'cleared');
  const res = await runCheck({ performerId: performer, productIds: [ids.products[HARBOUR]!.id, ids.products[PIER]!.id] });
  return CheckSchema.parse(res.body);
}

async function logged() {
  const check = await goCheck();
  const res = await api().post('/api/applications').set('Cookie', as.artist).send(applicationBody(check.id));
  expect(res.status).toBe(201);
  return ApplicationSchema.parse(res.body);
}

const END = () => new Date(Date.now() - 60_000).toISOString();

describe('logging an application', () => {
  it('logs from a go check with products, lots and the check frozen onto it', async () => {
    const a = await logged();
    expect(a.products).toEqual([expect.objectContaining({ productName: HARBOUR, lotCode: 'HB-2603' })]);
    expect(a.check.verdict).toBe('go');
    expect(a.check.items.map((i) => [i.productName, i.state])).toEqual([
      [HARBOUR, 'cleared'],
      [PIER, 'cleared'],
    ]);
    expect(a.artistName).toBe('Rafe Lindqvist');
    expect(a.canFinish).toBe(true);
    // A second application from the same check is refused.
    const again = await api().post('/api/applications').set('Cookie', as.artist).send(applicationBody(a.check.id));
    expect(again.status).toBe(409);
  });

  it('refuses without an active application consent given to the production, saving nothing', async () => {
    // Oz Parfitt's application consent was signed 400 days ago and has run out (demo data).
    const check = await goCheck(ids.oz);
    const before = await logCounts();
    const res = await api().post('/api/applications').set('Cookie', as.artist).send(applicationBody(check.id));
    expect(res.status).toBe(409);
    expect(res.body.error.message).toContain('no active application consent given to this production');
    expect(await logCounts()).toEqual(before);
  });

  it('refuses an expired lot, a lot of another product, a product not checked and an end before the start, saving nothing', async () => {
    const check = await goCheck();
    const before = await logCounts();
    const harbour = ids.products[HARBOUR]!.id;
    const expired = await api().post('/api/applications').set('Cookie', as.artist).send(applicationBody(check.id, { products: [{ productId: harbour, lotId: ids.lots['HB-2411'] }] }));
    expect(expired.status).toBe(400);
    expect(expired.body.error.details.fields['products.0.lotId'][0]).toMatch(/^Lot HB-2411 expired on 2026-10-31/);
    const other = await api().post('/api/applications').set('Cookie', as.artist).send(applicationBody(check.id, { products: [{ productId: harbour, lotId: ids.lots['PR-2602'] }] }));
    expect(other.body.error.details.fields['products.0.lotId']).toEqual(['Lot PR-2602 belongs to another product.']);
    const unchecked = await api().post('/api/applications').set('Cookie', as.artist).send(applicationBody(check.id, { products: [{ productId: ids.products[QUAYSIDE]!.id, lotId: ids.lots['QA-2602'] }] }));
    expect(unchecked.body.error.details.fields['products.0.productId']).toEqual(['This product was not in the check. Run the check with it first.']);
    const start = new Date(Date.now() - 3600_000);
    const backwards = await api().post('/api/applications').set('Cookie', as.artist).send(applicationBody(check.id, { startedAt: start.toISOString(), endedAt: new Date(start.getTime() - 60_000).toISOString() }));
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.details.fields.endedAt).toEqual(['The end cannot be before the start.']);
    expect(await logCounts()).toEqual(before);
  });

  it('asks for a fresh check when a clearance changed since the check', async () => {
    const check = await goCheck();
    await setClearance(ids.juno, PIER, 'do_not_use', new Date());
    const before = await logCounts();
    const res = await api().post('/api/applications').set('Cookie', as.artist).send(applicationBody(check.id));
    expect(res.status).toBe(409);
    expect(res.body.error.message).toBe(`A clearance changed since the check: ${PIER} (Cleared at the check, Do not use now). Run the check again before logging.`);
    expect(await logCounts()).toEqual(before);
  });

  it('refuses to log from a check that says stop', async () => {
    await setClearance(ids.juno, HARBOUR, 'caution');
    const check = CheckSchema.parse((await runCheck({ productIds: [ids.products[HARBOUR]!.id] })).body);
    const res = await api().post('/api/applications').set('Cookie', as.artist).send(applicationBody(check.id));
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/^The check says stop/);
  });

  it('the head reads applications but logs none; the archivist reads none', async () => {
    const check = await goCheck();
    expect((await api().post('/api/applications').set('Cookie', as.head).send(applicationBody(check.id))).status).toBe(403);
    const a = await logged();
    expect((await api().get(`/api/applications/${a.id}`).set('Cookie', as.head)).status).toBe(200);
    expect((await api().get(`/api/applications/${a.id}`).set('Cookie', as.archivist)).status).toBe(403);
    // The demo's own application is logged the day before; near midnight both fall on one day, so the
    // list is checked for this one and for holding only that day's.
    const today = await api().get('/api/applications').query({ productionId: ids.lantern, day: a.appliedOn }).set('Cookie', as.artist);
    expect(today.body.items.map((i: { id: string }) => i.id)).toContain(a.id);
    expect(new Set(today.body.items.map((i: { appliedOn: string }) => i.appliedOn))).toEqual(new Set([a.appliedOn]));
    const dayBefore = new Date(Date.parse(`${a.appliedOn}T12:00:00Z`) - 86_400_000).toISOString().slice(0, 10);
    const before = await api().get('/api/applications').query({ productionId: ids.lantern, day: dayBefore }).set('Cookie', as.artist);
    expect(before.body.items.map((i: { id: string }) => i.id)).not.toContain(a.id);
  });
});

describe('appliance pieces', () => {
  it('lists the performer’s pieces on the shelf, clears their materials in the check, and marks them worn for the application', async () => {
    const list = await api().get('/api/checks/pieces').query({ productionId: ids.lantern, performerId: ids.juno }).set('Cookie', as.artist);
    expect(list.status).toBe(200);
    const piece = list.body.items[0] as { id: string };
    expect(piece).toBeDefined();
    expect((await api().get('/api/checks/pieces').query({ productionId: ids.lantern, performerId: ids.juno }).set('Cookie', as.archivist)).status).toBe(403);
    // A first check names the materials' formulations; the lead clears them, then the check is run again.
    const first = CheckSchema.parse((await runCheck({ pieceIds: [piece.id] })).body);
    expect(first.items.length).toBeGreaterThan(0);
    expect(first.items.every((i) => i.fromPieceIds.includes(piece.id))).toBe(true);
    for (const item of first.items) {
      await t.db.db
        .insertInto('clearance_overrides')
        .values({ performer_id: ids.juno, production_id: ids.lantern, formulation_id: item.formulationId, state: 'cleared', note: sealJson('Reviewed'), set_by: await t.userId('lead@plinth.test'), set_at: new Date(Date.now() - 120_000) })
        .execute();
    }
    await setClearance(ids.juno, HARBOUR, 'cleared');
    const again = CheckSchema.parse((await runCheck({ pieceIds: [piece.id], productIds: [ids.products[HARBOUR]!.id] })).body);
    expect(again.verdict).toBe('go');
    const res = await api().post('/api/applications').set('Cookie', as.artist).send(applicationBody(again.id, { pieceIds: [piece.id] }));
    expect(res.status).toBe(201);
    const row = await t.db.db.selectFrom('appliance_pieces').select(['status', 'application_id']).where('id', '=', piece.id).executeTakeFirstOrThrow();
    expect(row).toEqual({ status: 'used', application_id: res.body.id });
    expect(res.body.pieces.map((p: { id: string }) => p.id)).toEqual([piece.id]);
    // Each lot that went into the piece's build traces to the application it was worn for.
    const materials = await t.db.db
      .selectFrom('appliance_build_materials as m')
      .innerJoin('appliance_pieces as pc', 'pc.build_id', 'm.build_id')
      .where('pc.id', '=', piece.id)
      .select('m.lot_id')
      .execute();
    expect(materials.length).toBeGreaterThan(0);
    for (const { lot_id } of materials) {
      const trace = LotTraceSchema.parse((await api().get(`/api/lots/${lot_id}/trace`).set('Cookie', as.head)).body);
      expect(trace.applications.filter((x) => x.applicationId === res.body.id).map((x) => x.use)).toEqual(['in_appliance']);
      expect(trace.performers.find((p) => p.id === ids.juno)?.applications).toBeGreaterThanOrEqual(1);
    }
  });
});

describe('removal and the skin check', () => {
  it('refuses a skin check before the application ended, then records the end with its removal product', async () => {
    const a = await logged();
    const early = await api().post(`/api/applications/${a.id}/skin-check`).set('Cookie', as.artist).send({ outcome: 'clear' });
    expect(early.status).toBe(409);
    expect(early.body.error.message).toBe('Record the end of the application (its removal) before the skin check.');
    const ended = await api()
      .post(`/api/applications/${a.id}/end`)
      .set('Cookie', as.artist)
      .send({ endedAt: END(), removalProducts: [{ productId: ids.products[PIER]!.id, lotId: ids.lots['PR-2602'] }], version: a.version });
    expect(ended.status).toBe(200);
    expect(ended.body.removalProducts).toEqual([expect.objectContaining({ productName: PIER, lotCode: 'PR-2602' })]);
    expect((await api().post(`/api/applications/${a.id}/end`).set('Cookie', as.artist).send({ endedAt: END(), version: ended.body.version })).status).toBe(409);
    const before = await logCounts();
    const clear = await api().post(`/api/applications/${a.id}/skin-check`).set('Cookie', as.artist).send({ outcome: 'clear' });
    expect(clear.status).toBe(201);
    expect(clear.body.skinCheck).toMatchObject({ reportSent: false, outcome: null });
    expect((await logCounts()).incidents).toBe(before.incidents);
    const second = await api().post(`/api/applications/${a.id}/skin-check`).set('Cookie', as.artist).send({ outcome: 'clear' });
    expect(second.status).toBe(409);
    expect(second.body.error.message).toBe('The skin check after this application is already recorded.');
  });

  it('a reaction needs an observation, opens an incident for the lead (mailed without health detail), and the artist sees only that it was sent', async () => {
    const a = await logged();
    await api().post(`/api/applications/${a.id}/end`).set('Cookie', as.artist).send({ endedAt: END(), version: a.version });
    const bare = await api().post(`/api/applications/${a.id}/skin-check`).set('Cookie', as.artist).send({ outcome: 'reaction' });
    expect(bare.status).toBe(400);
    expect(bare.body.error.details.fields.observation).toEqual(['Describe what you see']);
    const observation = 'Raised red weal along the left jaw where the edge sat';
    const res = await api().post(`/api/applications/${a.id}/skin-check`).set('Cookie', as.artist).send({ outcome: 'reaction', observation });
    expect(res.status).toBe(201);
    expect(res.body.skinCheck).toEqual(expect.objectContaining({ reportSent: true, outcome: null, observation: null }));
    expect(JSON.stringify((await api().get(`/api/applications/${a.id}`).set('Cookie', as.artist)).body)).not.toContain('weal');

    const mail = await caughtMail();
    expect(mail).toHaveLength(1);
    expect(mail[0]).toContain('lead@plinth.test');
    for (const detail of ['weal', 'reaction', HARBOUR, 'HB-2603', 'Juno']) expect(mail[0]).not.toContain(detail);
    expectWordedMail((await simpleParser(mail[0]!)).text);

    expect((await api().get('/api/incidents').query({ productionId: ids.lantern }).set('Cookie', as.artist)).status).toBe(403);
    expect((await api().get('/api/incidents').query({ productionId: ids.lantern }).set('Cookie', as.head)).status).toBe(403);
    const list = IncidentListSchema.parse((await api().get('/api/incidents').query({ productionId: ids.lantern, status: 'open' }).set('Cookie', as.lead)).body);
    const mine = list.items.filter((i) => i.applicationId === a.id);
    expect(mine).toHaveLength(1);
    const incident = IncidentSchema.parse((await api().get(`/api/incidents/${mine[0]!.id}`).set('Cookie', as.lead)).body);
    expect(incident).toMatchObject({ outcome: 'reaction', observation, status: 'open', performerName: 'Juno Castellane' });
    expect(incident.products).toEqual([expect.objectContaining({ productName: HARBOUR, lotCode: 'HB-2603' })]);
    const reads = await t.db.db.selectFrom('audit_log').select('subject_performer_id').where('action', '=', 'medical.read').where('entity_type', '=', 'incident').execute();
    expect(reads.length).toBeGreaterThanOrEqual(2);
    expect(reads.every((r) => r.subject_performer_id === ids.juno)).toBe(true);
    // Sealed at rest.
    const raw = await t.db.db.selectFrom('skin_checks').select('observation').where('application_id', '=', a.id).executeTakeFirstOrThrow();
    expect(raw.observation).not.toContain('weal');

    const closed = await api().post(`/api/incidents/${incident.id}/close`).set('Cookie', as.lead).send({ note: 'Seen by the unit nurse; cleared within the hour', version: incident.version });
    expect(closed.status).toBe(200);
    expect(closed.body.status).toBe('closed');
    expect((await api().post(`/api/incidents/${incident.id}/close`).set('Cookie', as.lead).send({ note: 'again', version: closed.body.version })).status).toBe(409);
  });
});

describe('lot trace', () => {
  it('the lead sees every application a lot touched with its skin check; the head the same without health detail; the artist nothing', async () => {
    const a = await logged();
    await api().post(`/api/applications/${a.id}/end`).set('Cookie', as.artist).send({ endedAt: END(), removalProducts: [{ productId: ids.products[PIER]!.id, lotId: ids.lots['PR-2602'] }], version: a.version });
    await api().post(`/api/applications/${a.id}/skin-check`).set('Cookie', as.artist).send({ outcome: 'redness', observation: 'Faint pink patch on the cheek' });
    const lead = LotTraceSchema.parse((await api().get(`/api/lots/${ids.lots['HB-2603']}/trace`).set('Cookie', as.lead)).body);
    const seeded = await t.db.db.selectFrom('application_products').select('application_id').where('lot_id', '=', ids.lots['HB-2603']!).execute();
    expect(lead.performers).toEqual([{ id: ids.juno, name: 'Juno Castellane', applications: seeded.length }]);
    expect(lead.applications.find((x) => x.applicationId === a.id)).toMatchObject({ applicationId: a.id, use: 'applied', outcome: 'redness', observation: 'Faint pink patch on the cheek', reportSent: true });
    const head = LotTraceSchema.parse((await api().get(`/api/lots/${ids.lots['HB-2603']}/trace`).set('Cookie', as.head)).body);
    expect(head.applications.find((x) => x.applicationId === a.id)).toMatchObject({ outcome: null, observation: null, reportSent: true });
    expect(head.applications.every((x) => x.outcome === null && x.observation === null)).toBe(true);
    expect(JSON.stringify(head)).not.toContain('pink');
    const removal = LotTraceSchema.parse((await api().get(`/api/lots/${ids.lots['PR-2602']}/trace`).set('Cookie', as.head)).body);
    expect(removal.applications.find((x) => x.applicationId === a.id)!.use).toBe('removal');
    expect((await api().get(`/api/lots/${ids.lots['HB-2603']}/trace`).set('Cookie', as.artist)).status).toBe(403);
    expect((await api().get('/api/lots/00000000-0000-4000-8000-000000000000/trace').set('Cookie', as.head)).status).toBe(404);
  });
});
