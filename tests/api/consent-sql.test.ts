import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { consentState, coversMoment } from '#shared/domain/consent.ts';
import { consentCoversSql, consentStateSql } from '../../api/features/consents/index.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { makeConsent, performerId } from '../fixtures/performers.ts';

// The consent rules are written twice, once for lists the database filters and once for the code:
// both must say the same of every consent at every moment that matters.
let t: TestApp;

beforeAll(async () => {
  t = await createTestApp();
  // Besides the demo consents: one that has expired and one whose withdrawal is still to come.
  const oz = await performerId(t, 'Oswin Parfitt-Reyes');
  await makeConsent(t, oz, 'life_casting', { signedDays: -400, expiresDays: -5 });
  await makeConsent(t, oz, 'cast_storage', { signedDays: -10, withdrawnDays: 3 });
});
afterAll(async () => {
  await t?.close();
});

describe('consent state in SQL and in TypeScript', () => {
  it('agree on every consent, now and at each instant a state could change', async () => {
    const rows = await t.db.db.selectFrom('consents').select(['id', 'signed_at', 'expires_at', 'withdrawn_at']).execute();
    expect(rows.length).toBeGreaterThan(10);
    const states = new Set<string>();
    for (const r of rows) {
      const times = { signedAt: new Date(r.signed_at), expiresAt: r.expires_at ? new Date(r.expires_at) : null, withdrawnAt: r.withdrawn_at ? new Date(r.withdrawn_at) : null };
      const moments = [new Date(), times.signedAt, new Date(times.signedAt.getTime() - 1000)];
      for (const edge of [times.expiresAt, times.withdrawnAt]) if (edge) moments.push(edge, new Date(edge.getTime() - 1000), new Date(edge.getTime() + 1000));
      for (const at of moments) {
        const sqlSays = await t.db.db
          .selectFrom('consents as c')
          .select([consentStateSql('c', at).as('state'), consentCoversSql('c', at).as('covers')])
          .where('c.id', '=', r.id)
          .executeTakeFirstOrThrow();
        expect(sqlSays.state, `${r.id} at ${at.toISOString()}`).toBe(consentState(times, at));
        expect(sqlSays.covers, `${r.id} at ${at.toISOString()}`).toBe(coversMoment(times, at));
        states.add(sqlSays.state);
      }
    }
    // The moments chosen reach every state, so the comparison is not vacuous.
    expect([...states].sort()).toEqual(['active', 'expired', 'withdrawn']);
  });
});
