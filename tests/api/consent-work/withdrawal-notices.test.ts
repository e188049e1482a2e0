import { describe, expect, it } from 'vitest';
import { BookingListSchema } from '#shared/schemas/bookings.ts';
import { WithdrawalNoticeListSchema } from '#shared/schemas/consent-notices.ts';
import { api, as, lantern, mailsTo, performerId, t, useConsentWorkApp } from './setup.ts';

useConsentWorkApp();

const REASON = 'A rash came up on my forearm after the last test';
const DAY = 86_400_000;

/** Oswin's patch-test consent, a patch test booked on it in five days, then the lead withdraws it for him with a reason. */
async function withdrawWithSessionBooked() {
  const pid = await performerId('Oswin Parfitt-Reyes');
  const consent = await t.db.db.selectFrom('consents').select(['id', 'version']).where('performer_id', '=', pid).where('kind', '=', 'patch_testing').executeTakeFirstOrThrow();
  const lot = await t.db.db.selectFrom('product_lots').select(['id', 'product_id']).where('code', '=', 'QA-2602').executeTakeFirstOrThrow();
  const booked = await api()
    .post('/api/patch-tests')
    .set('Cookie', as.head)
    .send({ performerId: pid, productionId: lantern, protocolId: 'occluded-48h', startsAt: new Date(Date.now() + 5 * DAY).toISOString(), location: 'Make-up room 2', products: [{ productId: lot.product_id, lotId: lot.id, site: 'Left inner forearm 1' }] });
  expect(booked.status).toBe(201);
  expect(booked.body.consentMissing).toBe(false);
  const res = await api().post(`/api/consents/${consent.id}/withdraw`).set('Cookie', as.lead).send({ version: consent.version, reason: REASON });
  expect(res.status).toBe(200);
  return { pid, consentId: consent.id, bookingId: booked.body.id as string };
}

describe('a withdrawal reaches the staff', () => {
  it('mails the head without the reason and the lead pointing to their home, naming the sessions it leaves waiting', async () => {
    await withdrawWithSessionBooked();
    const [head] = await mailsTo('head@plinth.test');
    expect(head, 'the head is mailed').toBeDefined();
    expect(head!.subject).toContain('Oz Parfitt');
    expect(head!.subject).toContain('The Lantern Keeper');
    expect(head!.text).toContain('Patch test');
    expect(head!.text).toContain('Make-up room 2');
    expect(head!.text).toMatch(/(Monday|Tuesday|Wednesday|Thursday|Friday|Saturday|Sunday) \d{1,2} [A-Z][a-z]+ \d{4} at \d{2}:\d{2}/);
    expect(head!.text).not.toContain(REASON);
    expect(head!.text).not.toMatch(/rash|forearm/i);
    // The lead also had the test's calendar invitation; the withdrawal notice is the one that says so.
    const lead = (await mailsTo('lead@plinth.test')).find((m) => m.subject?.startsWith('Consent withdrawn'));
    expect(lead, 'the lead is mailed').toBeDefined();
    expect(lead!.text).toMatch(/reason.*on your home/);
    // Mail is less safe than the audited screen: the reason is not in the lead's mail either.
    expect(lead!.text).not.toContain(REASON);
    // The performer's own confirmation says who and where, with the date in words.
    const own = (await mailsTo('oz.parfitt@example.test')).find((m) => /withdrawn/i.test(m.subject ?? ''));
    expect(own!.subject).toContain('The Lantern Keeper');
    expect(own!.text).toContain('Marta Oyelaran');
    expect(own!.text).toMatch(/withdrawn as of (Monday|Tuesday|Wednesday|Thursday|Friday|Saturday|Sunday) \d{1,2} [A-Z][a-z]+ \d{4} at \d{2}:\d{2}/);
  });

  it('flags the session that lost its consent, on the Sessions list and on the performer page', async () => {
    const { pid, bookingId } = await withdrawWithSessionBooked();
    const list = BookingListSchema.parse((await api().get(`/api/bookings?productionId=${lantern}`).set('Cookie', as.head)).body);
    const flagged = list.items.find((b) => b.id === bookingId)!;
    expect(flagged).toMatchObject({ consentMissing: true, consentWithdrawn: true });
    // A session that never had its consent waits, but was not withdrawn from.
    const never = list.items.find((b) => b.performerName === 'Oz Parfitt' && b.purpose === 'life_cast');
    if (never) expect(never.consentWithdrawn).toBe(false);
    const page = await api().get(`/api/performers/${pid}`).set('Cookie', as.head);
    expect(page.body.bookings.find((b: { id: string }) => b.id === bookingId)).toMatchObject({ consentMissing: true, consentWithdrawn: true });
  });

  it("the head's home counts withdrawals since they last looked; the list shows no reason; marking seen clears the count", async () => {
    const { consentId, bookingId } = await withdrawWithSessionBooked();
    const card = async () => (await api().get('/api/home').set('Cookie', as.head)).body.tasks.find((x: { id: string }) => x.id === 'withdrawn-since-last-look');
    const before = await card();
    // Oz's withdrawal now, and Bea's life-casting withdrawal twelve days ago (demo data), both within the first look-back.
    expect(before.count).toBe(2);
    const list = WithdrawalNoticeListSchema.parse((await api().get(`/api/consent-notices/withdrawals?productionId=${lantern}`).set('Cookie', as.head)).body);
    expect(list.reasonsShown).toBe(false);
    const oz = list.items.find((w) => w.consentId === consentId)!;
    expect(oz.reason).toBeNull();
    expect(oz.sessionsAffected.map((b) => b.id)).toContain(bookingId);
    expect(JSON.stringify(list)).not.toContain(REASON);

    expect((await api().post('/api/consent-notices/withdrawals/seen').set('Cookie', as.head).send({ productionId: lantern, seenAt: list.readAt })).status).toBe(200);
    expect((await card()).count).toBe(0);
    // The lead's own "last looked" is theirs: still two for them.
    const leadCard = (await api().get('/api/home').set('Cookie', as.lead)).body.tasks.find((x: { id: string }) => x.id === 'withdrawn-since-last-look');
    expect(leadCard?.count ?? null).toBe(2);
  });

  it('the lead reads the reason, and the read is audited as a medical read of that performer', async () => {
    const { pid } = await withdrawWithSessionBooked();
    const list = WithdrawalNoticeListSchema.parse((await api().get(`/api/consent-notices/withdrawals?productionId=${lantern}`).set('Cookie', as.lead)).body);
    expect(list.reasonsShown).toBe(true);
    expect(list.items.map((w) => w.reason)).toContain(REASON);
    const audit = await t.db.db.selectFrom('audit_log').select(['subject_performer_id', 'actor_user_id']).where('action', '=', 'medical.read').where('subject_performer_id', '=', pid).execute();
    expect(audit.map((a) => a.actor_user_id)).toContain(await t.userId('lead@plinth.test'));
  });

  it('artists and archivists get no withdrawal list, and a future "seen" moment is refused', async () => {
    for (const who of ['artist', 'archivist', 'performer'] as const) {
      expect((await api().get(`/api/consent-notices/withdrawals?productionId=${lantern}`).set('Cookie', as[who])).status, who).toBe(403);
    }
    const res = await api().post('/api/consent-notices/withdrawals/seen').set('Cookie', as.head).send({ productionId: lantern, seenAt: new Date(Date.now() + DAY).toISOString() });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.seenAt).toBeDefined();
  });
});
