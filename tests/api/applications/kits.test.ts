import { describe, expect, it } from 'vitest';
import { KitListSchema, KitSchema } from '#shared/schemas/kits.ts';
import { api, as, HARBOUR, ids, logCounts, MISTRAL, PIER, useApplicationApp } from './setup.ts';

useApplicationApp();

describe('kits', () => {
  it('an artist makes a kit, the head renames it at its version, and a stale edit is refused', async () => {
    const made = await api()
      .post('/api/kits')
      .set('Cookie', as.artist)
      .send({ productionId: ids.lantern, name: 'Day 14 — brow piece', productIds: [ids.products[HARBOUR]!.id, ids.products[PIER]!.id] });
    expect(made.status).toBe(201);
    const kit = KitSchema.parse(made.body);
    expect(kit.products.map((p) => p.name)).toEqual([HARBOUR, PIER]);
    expect(kit.version).toBe(1);

    const renamed = await api()
      .put(`/api/kits/${kit.id}`)
      .set('Cookie', as.head)
      .send({ name: 'Day 14 — brow and powder', productIds: [ids.products[HARBOUR]!.id, ids.products[PIER]!.id, ids.products[MISTRAL]!.id], version: 1 });
    expect(renamed.status).toBe(200);
    expect(renamed.body.version).toBe(2);
    expect(renamed.body.products).toHaveLength(3);

    const stale = await api().put(`/api/kits/${kit.id}`).set('Cookie', as.artist).send({ name: 'Old name', productIds: [ids.products[HARBOUR]!.id], version: 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('conflict');
    const list = KitListSchema.parse((await api().get('/api/kits').query({ productionId: ids.lantern }).set('Cookie', as.artist)).body);
    expect(list.items.filter((k) => k.id === kit.id).map((k) => [k.name, k.products.length])).toEqual([['Day 14 — brow and powder', 3]]);
  });

  it('refuses an empty kit, an unknown product and a second kit of the same name, saving nothing', async () => {
    const before = await logCounts();
    const empty = await api().post('/api/kits').set('Cookie', as.artist).send({ productionId: ids.lantern, name: 'Nothing', productIds: [] });
    expect(empty.status).toBe(400);
    expect(empty.body.error.details.fields.productIds).toEqual(['A kit needs at least one product']);
    const unknown = await api().post('/api/kits').set('Cookie', as.artist).send({ productionId: ids.lantern, name: 'Ghost', productIds: ['00000000-0000-4000-8000-000000000000'] });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details.fields['productIds.0']).toEqual(['No such product in the catalogue.']);
    expect(await logCounts()).toEqual(before);
    const first = await api().post('/api/kits').set('Cookie', as.artist).send({ productionId: ids.lantern, name: 'Removal', productIds: [ids.products[PIER]!.id] });
    expect(first.status).toBe(201);
    const again = await api().post('/api/kits').set('Cookie', as.head).send({ productionId: ids.lantern, name: 'removal', productIds: [ids.products[PIER]!.id] });
    expect(again.status).toBe(400);
    expect(again.body.error.details.fields.name).toEqual(['This production already has a kit of that name.']);
  });

  it('the archivist and the performer make no kits; another production’s artist cannot touch it', async () => {
    const body = { productionId: ids.lantern, name: 'Day 1', productIds: [ids.products[HARBOUR]!.id] };
    expect((await api().post('/api/kits').set('Cookie', as.archivist).send(body)).status).toBe(403);
    expect((await api().post('/api/kits').set('Cookie', as.performer).send(body)).status).toBe(403);
    expect((await api().get('/api/kits').query({ productionId: ids.lantern }).set('Cookie', as.archivist)).status).toBe(403);
    // Sol Varga is an artist on The Lantern Keeper and head on Saltglass Mile: a Saltglass kit is theirs to make, not Rafe's.
    expect((await api().post('/api/kits').set('Cookie', as.artist).send({ ...body, productionId: ids.saltglass })).status).toBe(403);
    expect((await api().post('/api/kits').set('Cookie', as.artist2).send({ ...body, productionId: ids.saltglass })).status).toBe(201);
  });
});
