// Writes the demo appliance builds (api/db/seed-builds-data.ts) with the same repo functions the API
// uses: each build's weigh-out is worked out from its mix, every material keeps its lot's formulation.
import { coatingVolumes } from '#shared/domain/coating.ts';
import { mixForRun } from '#shared/domain/mix.ts';
import { insertBuild, replaceMaterials } from '../features/builds/repo.ts';
import { insertPieces, insertPlan } from '../features/builds/repo-pieces.ts';
import type { Db } from './index.ts';
import { ARCHIVE_DEMO_CASTS } from './seed-archive-data.ts';
import { SEED_BUILDS, SEED_PLANS } from './seed-builds-data.ts';

const DAY = 86_400_000;

/** Builds, their pieces (some used, some spoiled) and the shoot plans, inside the seed's one transaction. */
export async function seedBuilds(trx: Db, ids: { productionId: string; users: Map<string, { id: string; name: string }>; now: Date }): Promise<void> {
  const labels = new Map(ARCHIVE_DEMO_CASTS.map((c) => [c.key, c.labelCode]));
  const molds = new Map((await trx.selectFrom('casts').select(['id', 'label_code', 'performer_id']).execute()).map((c) => [c.label_code, c]));
  const mold = (key: string) => molds.get(labels.get(key)!)!;
  const lots = await trx.selectFrom('product_lots as l').innerJoin('products as p', 'p.id', 'l.product_id').select(['l.id', 'l.code', 'l.formulation_id', 'p.id as product_id', 'p.name']).execute();
  const lot = (product: string, code: string) => lots.find((l) => l.name === product && l.code === code)!;
  for (const b of SEED_BUILDS) {
    const m = mold(b.moldKey);
    const maker = ids.users.get(b.madeBy)!;
    const madeOn = new Date(ids.now.getTime() - b.madeDaysAgo * DAY).toISOString().slice(0, 10);
    const buildId = await insertBuild(trx, {
      productionId: ids.productionId,
      performerId: m.performer_id,
      moldId: m.id,
      madeOn,
      madeBy: maker.name,
      mix: b.mix,
      plan: mixForRun(b.mix),
      weighed: b.weighed,
      coating: b.coating,
      coatingVolumes: b.coating ? coatingVolumes(b.coating, b.coating.targetMl) : null,
      cureMinutes: b.cureMinutes,
      notes: b.notes,
      createdBy: maker.id,
    });
    await replaceMaterials(
      trx,
      buildId,
      b.materials.map((x) => {
        const l = lot(x.product, x.lot);
        return { role: x.role, productId: l.product_id, lotId: l.id, formulationId: l.formulation_id };
      }),
    );
    await insertPieces(trx, buildId, 1, b.piecesMade);
    const at = new Date(ids.now.getTime() - (b.madeDaysAgo - 2) * DAY);
    for (const [status, numbers] of [
      ['used', Array.from({ length: b.used }, (_, i) => i + 1)],
      ['spoiled', Array.from({ length: b.spoiled }, (_, i) => b.used + i + 1)],
    ] as const) {
      if (numbers.length === 0) continue;
      await trx
        .updateTable('appliance_pieces')
        .set({ status, status_at: at, status_by: maker.id, note: status === 'spoiled' ? 'Torn at the edge on demolding' : null, version: 2 })
        .where('build_id', '=', buildId)
        .where('number', 'in', [...numbers])
        .execute();
    }
  }
  const head = ids.users.get('head')!;
  for (const p of SEED_PLANS) {
    await insertPlan(trx, ids.productionId, mold(p.moldKey).id, { shootDaysPlanned: p.shootDaysPlanned, spares: p.spares, piecesPerDay: p.piecesPerDay, updatedBy: head.id });
  }
}
