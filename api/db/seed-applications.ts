// The demo's kits, checks and application log (all invented): two kits on The Lantern Keeper, the lead's
// decisions on Juno Castellane's kit products, yesterday's application from a check that went, with a
// skin check showing redness and the incident it opened, and this morning's check held up by a Caution
// with its question waiting on the lead. Written with the features' own repo functions.
import { sealJson } from '../crypto/medical.ts';
import { insertApplication, insertApplicationProducts, insertSkinCheck } from '../features/applications/repo.ts';
import { insertIncident } from '../features/applications/incident-repo.ts';
import { answersFor, judge } from '../features/checks/service.ts';
import { insertCheck, insertRequest } from '../features/checks/repo.ts';
import { insertKit, replaceKitProducts } from '../features/kits/repo.ts';
import type { Db } from './index.ts';

const HOUR = 3_600_000;
const DAY_12 = ['Dune barrier cream', 'Harbour Bond silicone adhesive', 'Mistral setting powder', 'Pier silicone adhesive remover'];
const EVERYDAY = ['Tern gentle skin cleanser', 'Dune barrier cream', 'Mistral setting powder'];

export async function seedApplications(trx: Db, ids: { productionId: string; users: Map<string, { id: string; name: string }>; now: Date }): Promise<void> {
  const products = new Map((await trx.selectFrom('products').select(['id', 'name', 'current_formulation_id']).execute()).map((p) => [p.name, p]));
  const lots = new Map((await trx.selectFrom('product_lots').select(['id', 'code', 'product_id', 'formulation_id']).execute()).map((l) => [l.code, l]));
  const artist = ids.users.get('artist')!.id;
  const lead = ids.users.get('lead')!.id;
  const juno = (await trx.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow()).id;
  const product = (name: string) => products.get(name)!;

  const day12 = await insertKit(trx, { productionId: ids.productionId, name: 'Day 12 — scar appliance', userId: artist });
  await replaceKitProducts(
    trx,
    day12,
    DAY_12.map((n) => product(n).id),
  );
  const everyday = await insertKit(trx, { productionId: ids.productionId, name: 'Everyday base', userId: ids.users.get('head')!.id });
  await replaceKitProducts(
    trx,
    everyday,
    EVERYDAY.map((n) => product(n).id),
  );

  // The lead's decisions on the Day 12 products for Juno, set a week ago; Flotsam as Caution.
  const weekAgo = new Date(ids.now.getTime() - 7 * 24 * HOUR);
  for (const [name, state] of [...DAY_12.map((n) => [n, 'cleared'] as const), ['Flotsam prosthetic adhesive', 'caution'] as const]) {
    await trx
      .insertInto('clearance_overrides')
      .values({ performer_id: juno, production_id: ids.productionId, formulation_id: product(name).current_formulation_id!, state, note: sealJson('Reviewed with the performer before the shoot'), set_by: lead, set_at: weekAgo })
      .execute();
  }

  // Yesterday: the Day 12 check went, the scar appliance was worn and removed, and the skin showed redness.
  const yesterday = new Date(ids.now.getTime() - 24 * HOUR);
  const planned = { productIds: DAY_12.map((n) => product(n).id), materials: new Map() };
  const items = await answersFor(trx, juno, planned, yesterday);
  const judged = judge(items, new Set(), []);
  const checkId = await insertCheck(trx, { productionId: ids.productionId, performerId: juno, kitId: day12, userId: artist, items, pieceIds: [], runAt: yesterday });
  if (judged.verdict === 'go') {
    const start = new Date(yesterday.getTime() + 15 * 60_000);
    const applicationId = await insertApplication(trx, {
      productionId: ids.productionId,
      performerId: juno,
      checkId,
      artistId: artist,
      appliedOn: start.toISOString().slice(0, 10),
      description: 'Scar appliance along the left jaw',
      startedAt: start,
      endedAt: new Date(start.getTime() + 9 * HOUR),
      notes: 'Edges blended with a light stipple; touched up after lunch',
      snapshot: { id: checkId, runAt: yesterday.toISOString(), verdict: judged.verdict, message: judged.message, items: judged.items },
    });
    const lot = (code: string) => ({ productId: lots.get(code)!.product_id, lotId: lots.get(code)!.id, formulationId: lots.get(code)!.formulation_id });
    await insertApplicationProducts(trx, applicationId, 'applied', [lot('DB-2602'), lot('HB-2603'), lot('MS-2604')]);
    await insertApplicationProducts(trx, applicationId, 'removal', [lot('PR-2602')]);
    await insertSkinCheck(trx, { applicationId, outcome: 'redness', observation: 'Pink patch about 2 cm along the jaw line where the edge sat; no swelling', userId: artist });
    await insertIncident(trx, { applicationId, productionId: ids.productionId, performerId: juno, userId: artist });
  }

  // This morning: a check with Flotsam, held up by its Caution, and the artist's question waiting on the lead.
  const morning = new Date(ids.now.getTime() - 2 * HOUR);
  const flotsam = product('Flotsam prosthetic adhesive');
  const todays = await answersFor(trx, juno, { productIds: [...DAY_12.map((n) => product(n).id), flotsam.id], materials: new Map() }, morning);
  const todayCheck = await insertCheck(trx, { productionId: ids.productionId, performerId: juno, kitId: day12, userId: artist, items: todays, pieceIds: [], runAt: morning });
  const caution = todays.find((i) => i.productId === flotsam.id && i.state === 'caution');
  if (caution) await insertRequest(trx, { checkId: todayCheck, productionId: ids.productionId, performerId: juno, productId: flotsam.id, formulationId: caution.formulationId, state: 'caution', userId: artist });
}
