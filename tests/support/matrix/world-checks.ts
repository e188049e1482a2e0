// The artist's check in the seeded world: the demo's kit, check, waiting lead request, application
// with its skin check and incident, and the fresh checks and applications that a write needs to be valid.
import request from 'supertest';
import type { TestApp } from '../app.ts';

async function one(t: TestApp, text: string, values: unknown[] = []): Promise<string> {
  const { rows } = await t.db.pool.query<{ id: string }>(text, values);
  if (!rows[0]) throw new Error(`no row for ${text}`);
  return rows[0].id;
}

/** Reads the demo's records of the check and makes, as the artist, those a valid write starts from. */
export async function buildChecksWorld(t: TestApp, id: Record<string, string>): Promise<void> {
  id.kit = await one(t, `select id from kits where name = 'Day 12 — scar appliance' and production_id = $1`, [id.lantern]);
  id.leadRequest = await one(t, `select id from lead_requests where status = 'waiting' and performer_id = $1 order by requested_at limit 1`, [id.juno]);
  id.check = await one(t, `select check_id as id from lead_requests where id = $1`, [id.leadRequest]);
  id.application = await one(t, `select a.id from applications a join skin_checks s on s.application_id = a.id where a.performer_id = $1 order by a.started_at limit 1`, [id.juno]);
  id.incident = await one(t, `select id from incidents where application_id = $1`, [id.application]);
  id.traceLot = await one(t, `select id from product_lots where code = 'HB-2603'`);
  const flotsam = await one(t, `select id from products where name = 'Flotsam prosthetic adhesive'`);

  const artist = await t.sessionFor('artist@plinth.test');
  const check = async (body: object) => {
    const res = await request(t.app).post('/api/checks').set('Cookie', artist).send({ productionId: id.lantern, performerId: id.juno, ...body });
    if (res.status !== 201) throw new Error(`check: ${res.status} ${res.text}`);
    return res.body as { id: string; verdict: string; items: { formulationId: string; productId: string; state: string }[] };
  };
  const kitCheck = async () => {
    const c = await check({ kitId: id.kit });
    if (c.verdict !== 'go') throw new Error(`the kit's check says ${c.verdict}`);
    return c.id;
  };
  // A check that went, with no application logged from it yet.
  id.goCheck = await kitCheck();
  // A check held up by a Caution, with no question to the lead yet.
  const caution = await check({ productIds: [flotsam] });
  id.cautionCheck = caution.id;
  id.cautionFormulation = caution.items.find((i) => i.productId === flotsam && i.state === 'caution')!.formulationId;
  // The lots of the kit's products on the performer and the remover, as yesterday's application used them.
  const { rows } = await t.db.pool.query<{ product_id: string; id: string; code: string }>(`select product_id, id, code from product_lots where code in ('DB-2602', 'HB-2603', 'MS-2604', 'PR-2602') order by code`);
  const lot = (code: string) => {
    const l = rows.find((r) => r.code === code)!;
    return { productId: l.product_id, lotId: l.id };
  };
  id.applied = JSON.stringify(['DB-2602', 'HB-2603', 'MS-2604'].map(lot));
  id.removal = JSON.stringify([lot('PR-2602')]);
  const log = async (endedAt: string | null) => {
    const startedAt = new Date(Date.now() - 3 * 3_600_000).toISOString();
    const res = await request(t.app)
      .post('/api/applications')
      .set('Cookie', artist)
      .send({ checkId: await kitCheck(), appliedOn: startedAt.slice(0, 10), description: 'Scar appliance along the left jaw', products: JSON.parse(id.applied!), startedAt, endedAt });
    if (res.status !== 201) throw new Error(`application: ${res.status} ${res.text}`);
    return res.body.id as string;
  };
  // An application still on the performer, and one taken off whose skin check is not yet recorded.
  id.openApplication = await log(null);
  id.endedApplication = await log(new Date(Date.now() - 3_600_000).toISOString());
}
