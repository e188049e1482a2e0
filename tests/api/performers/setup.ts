// Shared set-up of the performer API tests, one file per endpoint.
import request from 'supertest';
import { afterAll, beforeAll, beforeEach } from 'vitest';
import { PerformerDetailSchema, PerformerPageSchema } from '#shared/schemas/performers.ts';
import { createTestApp, type TestApp } from '../../support/app.ts';
import { productionId, sessions, type Who } from '../../fixtures/performers.ts';
import { snapshotData } from '../../fixtures/snapshot.ts';

// Live bindings: each test file calls usePerformerApp() and reads these once the hooks have run.
export let t: TestApp;
export let as: Record<Who, string>;
let restore: () => Promise<void>;
export let lantern: string;
export let saltglass: string;

// Demo performers by the name the registry sorts on (preferred name, else legal name).
export const LANTERN_BY_NAME = ['Beatrix Nwachukwu', 'Corentin Malik Ashdown', 'Halvard Imre Solberg', 'Juno Castellane', 'Oswin Parfitt-Reyes', 'Tamsin Achebe-Lowry'];

/** The real app on one database for the file, with the demo data put back before every test. */
export function usePerformerApp(): void {
  beforeAll(async () => {
    t = await createTestApp();
    as = await sessions(t);
    restore = await snapshotData(t);
  });
  beforeEach(async () => {
    await restore();
    lantern = await productionId(t, 'The Lantern Keeper');
    saltglass = await productionId(t, 'Saltglass Mile');
  });
  afterAll(async () => {
    await t?.close();
  });
}

export const api = () => request(t.app);
export const list = async (who: Who, qs = '') => api().get(`/api/performers${qs}`).set('Cookie', as[who]);
export const detail = async (who: Who, id: string) => api().get(`/api/performers/${id}`).set('Cookie', as[who]);
export const names = (body: unknown) => PerformerPageSchema.parse(body).items.map((i) => i.legalName);
export const count = async (table: 'performers' | 'engagements' | 'files' | 'memberships') =>
  Number((await t.db.db.selectFrom(table).select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow()).n);
export const version = async (id: string) => (await t.db.db.selectFrom('performers').select('version').where('id', '=', id).executeTakeFirstOrThrow()).version;

export function performerBody(over: Record<string, unknown> = {}) {
  return { legalName: 'Wren Hollis-Marsh', pronouns: 'they/them', email: 'Wren.Hollis@Example.test', phone: '+44 20 7946 0011', engagements: [{ productionId: lantern, characterName: 'The Lighthouse Cat' }], ...over };
}

export async function editBody(id: string, over: Record<string, unknown> = {}) {
  const d = PerformerDetailSchema.parse((await detail('head', id)).body);
  return {
    legalName: d.legalName,
    preferredName: d.preferredName,
    pronouns: d.pronouns,
    ...d.contact,
    engagements: d.engagements.map((e) => ({ productionId: e.productionId, characterName: e.characterName, startsOn: e.startsOn, endsOn: e.endsOn })),
    version: d.version,
    ...over,
  };
}

