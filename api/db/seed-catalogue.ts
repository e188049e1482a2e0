import { ingredientValues, insertFormulation, insertIngredients, insertLots, insertProduct, setFirstFormulation, writeIngredients } from '../features/catalogue/index.ts';
import { ensureDefaultProtocols } from '../features/protocols/index.ts';
import type { Db } from './index.ts';
import { SEED_INGREDIENTS, SEED_PRODUCTS } from './seed-catalogue-data.ts';

/**
 * Loads the demo vocabulary and catalogue through the same functions the API uses, so every label is
 * parsed and matched exactly as a pasted one would be: products, each formulation (the last one current)
 * with its ingredients in label order, and lots (one already expired). Runs inside the seed's transaction.
 */
export async function seedCatalogue(trx: Db, createdBy: string): Promise<void> {
  await ensureDefaultProtocols(trx);
  await insertIngredients(trx, SEED_INGREDIENTS.map(ingredientValues), createdBy);
  const lots: Parameters<typeof insertLots>[1][number][] = [];
  for (const p of SEED_PRODUCTS) {
    const figures = p.figures ?? { densityGPerCm3: null, mixRatio: null, makerMaxSoftenerPercent: null };
    const productId = await insertProduct(trx, { name: p.name, maker: p.maker, category: p.category, exposure: p.exposure, ...figures }, createdBy);
    const byVersion = new Map<number, string>();
    for (const f of p.formulations) {
      const id = await insertFormulation(trx, { productId, version: f.version, inciLabel: f.inciLabel, note: null, createdBy });
      await writeIngredients(trx, id, f.inciLabel);
      byVersion.set(f.version, id);
    }
    await setFirstFormulation(trx, productId, byVersion.get(Math.max(...byVersion.keys()))!);
    for (const l of p.lots) lots.push({ productId, formulationId: byVersion.get(l.formulationVersion)!, code: l.code, expiresOn: l.expiresOn, createdBy });
  }
  await insertLots(trx, lots);
}
