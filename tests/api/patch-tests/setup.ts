// Shared set-up for the patch-test API tests: the app on a fresh database, sessions for every role,
// demo ids, and a booking helper.
import request from 'supertest';
import { sessions, type Who } from '../../fixtures/performers.ts';
import { createTestApp, type TestApp } from '../../support/app.ts';

export const HOUR = 3_600_000;
export const DAY = 24 * HOUR;

export interface PatchTestWorld {
  t: TestApp;
  as: Record<Who, string>;
  lantern: string;
  juno: string;
  performer(name: string): Promise<string>;
  lot(code: string): Promise<{ id: string; productId: string }>;
  product(name: string): Promise<{ id: string; formulationId: string }>;
  book(body: Partial<BookBody> & { products: BookBody['products'] }, who?: Who): Promise<request.Response>;
  api(): ReturnType<typeof request>;
}

export interface BookBody {
  performerId: string;
  productionId: string;
  protocolId: string;
  startsAt: string;
  endsAt?: string;
  location: string;
  products: { productId: string; lotId: string; site: string }[];
}

export async function patchTestWorld(): Promise<PatchTestWorld> {
  const t = await createTestApp();
  const as = await sessions(t);
  const db = t.db.db;
  const lantern = (await db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow()).id;
  const performer = async (name: string) => (await db.selectFrom('performers').select('id').where('legal_name', '=', name).executeTakeFirstOrThrow()).id;
  const juno = await performer('Juno Castellane');
  const api = () => request(t.app);
  return {
    t,
    as,
    lantern,
    juno,
    performer,
    api,
    async lot(code) {
      const r = await db.selectFrom('product_lots').select(['id', 'product_id']).where('code', '=', code).executeTakeFirstOrThrow();
      return { id: r.id, productId: r.product_id };
    },
    async product(name) {
      const r = await db.selectFrom('products').select(['id', 'current_formulation_id']).where('name', '=', name).executeTakeFirstOrThrow();
      return { id: r.id, formulationId: r.current_formulation_id! };
    },
    book(body, who = 'head') {
      return api()
        .post('/api/patch-tests')
        .set('Cookie', as[who])
        .send({ performerId: juno, productionId: lantern, protocolId: 'occluded-48h', startsAt: new Date(Date.now() + HOUR).toISOString(), location: 'Make-up trailer 2', ...body });
    },
  };
}

/** Rows of the patch-test tables and sessions, to prove a refused write saved nothing. */
export async function counts(t: TestApp): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const table of ['bookings', 'patch_tests', 'patch_test_products', 'patch_test_readings', 'patch_test_photos', 'clearance_overrides'] as const) {
    const r = await t.db.db.selectFrom(table).select((e) => e.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();
    out[table] = Number(r.n);
  }
  return out;
}
