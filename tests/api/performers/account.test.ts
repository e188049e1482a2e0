import { describe, expect, it } from 'vitest';
import { performerId } from '../../fixtures/performers.ts';
import { usePerformerApp, t, as, lantern, api, version } from './setup.ts';

usePerformerApp();

describe('PUT /api/performers/:id/account', () => {
  /** A sign-in linked the way the performer links one themself, set up directly for these tests. */
  async function linkDirectly(performer: string, email: string) {
    const user = await t.db.db.insertInto('users').values({ email, display_name: 'Oz Parfitt' }).returning('id').executeTakeFirstOrThrow();
    await t.db.db.updateTable('performers').set({ user_id: user.id, version: 2 }).where('id', '=', performer).execute();
    await t.db.db.insertInto('memberships').values({ user_id: user.id, production_id: lantern, role: 'performer' }).execute();
    return user.id;
  }

  it('never links a sign-in on a staff action alone: the reply says how a performer links one', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const user = await t.db.db.insertInto('users').values({ email: 'oz.login@plinth.test', display_name: 'Oz Parfitt' }).returning('id').executeTakeFirstOrThrow();
    for (const who of ['head', 'lead', 'admin'] as const) {
      const res = await api().put(`/api/performers/${oz}/account`).set('Cookie', as[who]).send({ userId: user.id, version: 1 });
      expect(res.status, who).toBe(400);
      expect(res.body.error.details.fields.userId.join(' '), who).toMatch(/invitation/);
    }
    expect(await t.db.db.selectFrom('memberships').select('id').where('user_id', '=', user.id).execute()).toEqual([]);
    expect(await version(oz)).toBe(1);
  });

  it('unlinks: the role goes, the person no longer sees the record, and the change is audited with before and after', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const userId = await linkDirectly(oz, 'oz.login@plinth.test');
    const cookie = await t.sessionFor('oz.login@plinth.test');
    expect((await api().get(`/api/performers/${oz}`).set('Cookie', cookie)).status).toBe(200);

    const unlink = await api().put(`/api/performers/${oz}/account`).set('Cookie', as.head).send({ userId: null, version: 2 });
    expect(unlink.status).toBe(200);
    expect(unlink.body.linkedUser).toBeNull();
    expect(await t.db.db.selectFrom('memberships').select('id').where('user_id', '=', userId).execute()).toEqual([]);
    expect((await api().get(`/api/performers/${oz}`).set('Cookie', cookie)).status).toBe(403);
    const audit = await t.db.db.selectFrom('audit_log').select(['details']).where('action', '=', 'performer.account_unlink').where('entity_id', '=', oz).executeTakeFirstOrThrow();
    expect(audit.details).toMatchObject({ before: userId, after: null });
  });

  it('refuses a stale version', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    await linkDirectly(oz, 'oz.login@plinth.test');
    const stale = await api().put(`/api/performers/${oz}/account`).set('Cookie', as.head).send({ userId: null, version: 1 });
    expect(stale.status).toBe(409);
    expect(await version(oz)).toBe(2);
  });

  it('is open to the studio administrator, who takes the role away on every production engaged', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const userId = await linkDirectly(oz, 'oz2@plinth.test');
    const res = await api().put(`/api/performers/${oz}/account`).set('Cookie', as.admin).send({ userId: null, version: 2 });
    expect(res.status).toBe(200);
    // The administrator sees which sign-in is linked, but no contact details or consents.
    expect(res.body).toMatchObject({ linkedUser: null, contact: null, consents: [], bookings: [], engagements: [] });
    expect(await t.db.db.selectFrom('memberships').select('production_id').where('user_id', '=', userId).execute()).toEqual([]);
  });

  it('is refused to artists, archivists, the Saltglass head, performers and people without a role', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const userId = await linkDirectly(oz, 'oz3@plinth.test');
    for (const who of ['artist', 'archivist', 'artist2', 'performer', 'norole'] as const) {
      expect((await api().put(`/api/performers/${oz}/account`).set('Cookie', as[who]).send({ userId: null, version: 2 })).status, who).toBe(403);
    }
    expect(await t.db.db.selectFrom('memberships').select('id').where('user_id', '=', userId).execute()).toHaveLength(1);
  });
});

