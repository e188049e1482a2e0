import { Kysely, PostgresDialect } from 'kysely';
import { simpleParser } from 'mailparser';
import type { Request } from 'express';
import { describe, expect, it } from 'vitest';
import { CheckSchema, LeadRequestSchema } from '#shared/schemas/checks.ts';
import { runCheck as runCheckService } from '../../../api/features/checks/service.ts';
import { forgetClearanceKept } from '../../../api/features/patch-tests/clearance-cache.ts';
import type { Database } from '../../../api/db/schema.ts';
import { expectWordedMail } from '../../support/mail-wording.ts';
import { api, as, caughtMail, HARBOUR, ids, logCounts, MISTRAL, PIER, QUAYSIDE, runCheck, setClearance, t, useApplicationApp } from './setup.ts';

useApplicationApp();

describe('the check', () => {
  it('answers each product from a kit and one by one, with plain-word reasons and validity, and stops on anything not cleared', async () => {
    await setClearance(ids.juno, HARBOUR, 'cleared');
    await setClearance(ids.juno, PIER, 'caution');
    const kit = await api().post('/api/kits').set('Cookie', as.artist).send({ productionId: ids.lantern, name: 'Day 20', productIds: [ids.products[HARBOUR]!.id, ids.products[PIER]!.id] });
    const res = await runCheck({ kitId: kit.body.id, productIds: [ids.products[MISTRAL]!.id] });
    expect(res.status).toBe(201);
    const check = CheckSchema.parse(res.body);
    expect(check.items.map((i) => [i.productName, i.state])).toEqual([
      [HARBOUR, 'cleared'],
      [PIER, 'caution'],
      [MISTRAL, 'untested'],
    ]);
    // The lead's decision shows as such (product brief §3: overrides are shown), never the lead's note.
    expect(check.items[0]!.reasons[0]!.text).toBe('set by the designated lead');
    expect(check.items[2]!.reasons.map((r) => r.text)).toEqual(['not tested']);
    expect(check.verdict).toBe('stop');
    expect(check.message).toContain(PIER);
    expect(JSON.stringify(res.body)).not.toContain('Lead reviewed the record');
  });

  it('goes when every product is cleared', async () => {
    await setClearance(ids.juno, HARBOUR, 'cleared');
    const check = CheckSchema.parse((await runCheck({ productIds: [ids.products[HARBOUR]!.id] })).body);
    expect(check.verdict).toBe('go');
    expect(check.items[0]!.go).toBe(true);
  });

  it('refuses an unknown performer, one not on the production, an unknown product, an empty kit and nothing chosen, saving nothing', async () => {
    const harbour = [ids.products[HARBOUR]!.id];
    const before = await t.db.db.selectFrom('clearance_checks').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();
    const unknown = await runCheck({ performerId: '00000000-0000-4000-8000-000000000000', productIds: harbour });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.message).toBe('That performer was not found.');
    const elsewhere = await api().post('/api/checks').set('Cookie', as.artist2).send({ productionId: ids.saltglass, performerId: ids.juno, productIds: harbour });
    expect(elsewhere.status).toBe(400);
    expect(elsewhere.body.error.details.fields.performerId).toEqual(['This performer is not engaged on this production.']);
    const product = await runCheck({ productIds: ['00000000-0000-4000-8000-000000000000'] });
    expect(product.status).toBe(400);
    expect(product.body.error.details.fields['productIds.0']).toEqual(['No such product in the catalogue.']);
    const nothing = await runCheck({ productIds: [] });
    expect(nothing.status).toBe(400);
    expect(nothing.body.error.details.fields.productIds).toEqual(['Choose at least one product, a kit or an appliance piece.']);
    const kit = await api().post('/api/kits').set('Cookie', as.artist).send({ productionId: ids.lantern, name: 'Soon empty', productIds: harbour });
    await t.db.db.deleteFrom('kit_products').where('kit_id', '=', kit.body.id).execute();
    const empty = await runCheck({ kitId: kit.body.id });
    expect(empty.status).toBe(400);
    expect(empty.body.error.details.fields.kitId).toEqual(['This kit has no products.']);
    const after = await t.db.db.selectFrom('clearance_checks').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();
    expect(after.n).toBe(before.n);
  });

  it('adds the materials of an appliance piece, and refuses a piece made for another performer', async () => {
    const pieces = await t.db.db
      .selectFrom('appliance_pieces as ap')
      .innerJoin('appliance_builds as b', 'b.id', 'ap.build_id')
      .select(['ap.id', 'b.performer_id'])
      .where('ap.status', '=', 'on_hand')
      .execute();
    const junos = pieces.find((p) => p.performer_id === ids.juno)!;
    const other = pieces.find((p) => p.performer_id !== ids.juno)!;
    const res = await runCheck({ pieceIds: [junos.id] });
    expect(res.status).toBe(201);
    const check = CheckSchema.parse(res.body);
    expect(check.items.length).toBeGreaterThan(1);
    expect(check.items.every((i) => i.fromPieceIds.includes(junos.id))).toBe(true);
    const wrong = await runCheck({ pieceIds: [other.id] });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.details.fields['pieceIds.0']).toEqual(['This piece was made for another performer.']);
  });

  it('the archivist and the performer run no check', async () => {
    expect((await runCheck({ productIds: [ids.products[HARBOUR]!.id] }, 'archivist')).status).toBe(403);
    expect((await runCheck({ productIds: [ids.products[HARBOUR]!.id] }, 'performer')).status).toBe(403);
  });

  it('reads the same number of queries for 3 products as for the whole catalogue, cold or warm', async () => {
    let queries = 0;
    const counted = new Kysely<Database>({ dialect: new PostgresDialect({ pool: t.db.pool }), log: (e) => void (e.level === 'query' && queries++) });
    const artist = { userId: await t.userId('artist@plinth.test'), isAdmin: false, memberships: [{ productionId: ids.lantern, role: 'artist' as const }], leadOf: [], performerIds: [] };
    const all = Object.values(ids.products).map((p) => p.id);
    expect(all.length).toBeGreaterThan(20);
    const run = async (n: number, cold: boolean) => {
      if (cold) forgetClearanceKept(counted);
      queries = 0;
      await runCheckService({ ...t.ctx, db: counted }, artist, { productionId: ids.lantern, performerId: ids.juno, productIds: all.slice(0, n), pieceIds: [] }, {} as Request);
      return queries;
    };
    const few = await run(3, true);
    expect(await run(all.length, true)).toBe(few);
    expect(few).toBeLessThan(20);
    // Warm, the performer's tests and the catalogue's formulations are not read again while their stamps stand.
    await run(all.length, false);
    const warm = await run(all.length, false);
    expect(warm).toBeLessThan(few);
    expect(await run(3, false)).toBe(warm);
  });
});

describe('asking the lead', () => {
  it('from a Caution the artist asks; the lead is mailed a link only, approves with a note, and the check then goes', async () => {
    await setClearance(ids.juno, HARBOUR, 'caution');
    const check = CheckSchema.parse((await runCheck({ productIds: [ids.products[HARBOUR]!.id] })).body);
    expect(check.verdict).toBe('stop');
    const asked = await api().post(`/api/checks/${check.id}/requests`).set('Cookie', as.artist).send({ formulationId: check.items[0]!.formulationId });
    expect(asked.status).toBe(201);
    expect(asked.body.items[0].request.status).toBe('waiting');
    const mail = await caughtMail();
    expect(mail).toHaveLength(1);
    expect(mail[0]).toContain('lead@plinth.test');
    for (const detail of [HARBOUR, 'Juno', 'Caution', 'set by the designated lead']) expect(mail[0]).not.toContain(detail);
    expectWordedMail((await simpleParser(mail[0]!)).text);

    const again = await api().post(`/api/checks/${check.id}/requests`).set('Cookie', as.artist).send({ formulationId: check.items[0]!.formulationId });
    expect(again.status).toBe(409);

    const requestId = asked.body.items[0].request.id as string;
    const byArtist = await api().post(`/api/lead-requests/${requestId}/decision`).set('Cookie', as.artist).send({ decision: 'approved', note: 'fine', version: 1 });
    expect(byArtist.status).toBe(403);
    expect((await api().get('/api/lead-requests').query({ productionId: ids.lantern }).set('Cookie', as.artist)).status).toBe(403);
    const waiting = await api().get('/api/lead-requests').query({ productionId: ids.lantern, status: 'waiting' }).set('Cookie', as.lead);
    expect(waiting.body.items.filter((r: { checkId: string }) => r.checkId === check.id).map((r: { productName: string }) => r.productName)).toEqual([HARBOUR]);

    const decided = await api().post(`/api/lead-requests/${requestId}/decision`).set('Cookie', as.lead).send({ decision: 'approved', note: 'Small area only, along the jaw', version: 1 });
    expect(decided.status).toBe(200);
    expect(LeadRequestSchema.parse(decided.body).status).toBe('approved');
    // The artist who asked is mailed that there is an answer: a link to the check, no health detail.
    const mailed = await caughtMail();
    expect(mailed).toHaveLength(2);
    const answered = await simpleParser(mailed[1]!);
    expect(answered.to && !Array.isArray(answered.to) ? answered.to.value.map((v) => v.address) : []).toEqual(['artist@plinth.test']);
    expect(answered.subject).toBe('Plinth: the designated lead has answered your question');
    expect(answered.text).toContain(`/check?checkId=${check.id}`);
    expectWordedMail(answered.text);
    for (const detail of [HARBOUR, 'Juno', 'Small area only', 'approved', 'Caution']) expect(answered.text).not.toContain(detail);
    const twice = await api().post(`/api/lead-requests/${requestId}/decision`).set('Cookie', as.lead).send({ decision: 'refused', note: 'changed my mind', version: 2 });
    expect(twice.status).toBe(409);

    const after = CheckSchema.parse((await api().get(`/api/checks/${check.id}`).set('Cookie', as.artist)).body);
    expect(after.verdict).toBe('go');
    expect(after.items[0]).toMatchObject({ approved: true, request: { status: 'approved', decidedByName: 'Dr. Tomasz Brill' } });
    expect(JSON.stringify(after)).not.toContain('Small area only');

    // The lead reads the note back, and that read is logged against the performer.
    const read = await api().get(`/api/lead-requests/${requestId}`).set('Cookie', as.lead);
    expect(read.body.note).toBe('Small area only, along the jaw');
    const logged = await t.db.db.selectFrom('audit_log').select(['subject_performer_id']).where('action', '=', 'medical.read').where('entity_id', '=', requestId).execute();
    expect(logged).toEqual([{ subject_performer_id: ids.juno }]);
    // The note is sealed at rest.
    const raw = await t.db.db.selectFrom('lead_requests').select('decision_note').where('id', '=', requestId).executeTakeFirstOrThrow();
    expect(raw.decision_note).not.toContain('Small area');
  });

  it('a Cleared product needs no request; an approved Do not use still stops', async () => {
    await setClearance(ids.juno, HARBOUR, 'cleared');
    await setClearance(ids.juno, QUAYSIDE, 'do_not_use');
    const before = await logCounts();
    const check = CheckSchema.parse((await runCheck({ productIds: [ids.products[HARBOUR]!.id, ids.products[QUAYSIDE]!.id] })).body);
    const cleared = await api().post(`/api/checks/${check.id}/requests`).set('Cookie', as.artist).send({ formulationId: check.items[0]!.formulationId });
    expect(cleared.status).toBe(400);
    const asked = await api().post(`/api/checks/${check.id}/requests`).set('Cookie', as.artist).send({ formulationId: check.items[1]!.formulationId });
    const requestId = asked.body.items[1].request.id as string;
    await api().post(`/api/lead-requests/${requestId}/decision`).set('Cookie', as.lead).send({ decision: 'approved', note: 'Noted', version: 1 });
    const after = CheckSchema.parse((await api().get(`/api/checks/${check.id}`).set('Cookie', as.artist)).body);
    expect(after.verdict).toBe('stop');
    expect((await logCounts()).requests).toBe(before.requests + 1);
  });
});
