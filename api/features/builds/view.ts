import { tallyOfPieces } from '#shared/domain/builds.ts';
import { piecesShortfall, piecesRemaining } from '#shared/domain/pieces.ts';
import type { ApplianceOutlook, BuildListItem, BuildMaterial, MoldRef, Piece } from '#shared/schemas/builds.ts';
import type { Db } from '../../db/index.ts';
import { findCastsByIds, type CastRecord } from '../archive/index.ts';
import { findLotsForTest, findProductSummaries, type LotForTestRow, type ProductSummary } from '../catalogue/index.ts';
import { listMaterials, type BuildRow, type MaterialRow } from './repo.ts';
import { listPieces, type PieceRow, type PlanRow } from './repo-pieces.ts';

/*
 * Builds as the screens read them: the build's own rows with the names of its mold, performer,
 * products and lots, gathered for a whole list at once from the features that own them.
 */

export function buildPhotoUrl(buildId: string, fileId: string, size: 'photo' | 'thumbnail'): string {
  return `/api/appliance-builds/${buildId}/photo?${new URLSearchParams({ ...(size === 'thumbnail' ? { size } : {}), v: fileId }).toString()}`;
}

export function moldRef(c: CastRecord): MoldRef {
  return { id: c.id, labelCode: c.labelCode, region: c.region, kind: c.kind, productionName: c.productionName };
}

/** Everything named by some builds, looked up in one round per owner. */
export interface BuildNames {
  molds: Map<string, CastRecord>;
  materials: Map<string, MaterialRow[]>;
  products: Map<string, ProductSummary>;
  lots: Map<string, LotForTestRow>;
  pieces: Map<string, PieceRow[]>;
}

export async function namesFor(db: Db, builds: readonly BuildRow[]): Promise<BuildNames> {
  const ids = builds.map((b) => b.id);
  const [molds, materials, pieces] = await Promise.all([findCastsByIds(db, [...new Set(builds.map((b) => b.moldId))]), listMaterials(db, ids), listPieces(db, ids)]);
  const all = [...materials.values()].flat();
  const [products, lots] = await Promise.all([findProductSummaries(db, all.map((m) => m.productId)), findLotsForTest(db, all.map((m) => m.lotId))]);
  return { molds: new Map(molds.map((m) => [m.id, m])), materials, products, lots, pieces };
}

export function materialsView(rows: readonly MaterialRow[], names: Pick<BuildNames, 'products' | 'lots'>): BuildMaterial[] {
  return rows.map((m) => {
    const product = names.products.get(m.productId);
    const lot = names.lots.get(m.lotId);
    return {
      position: m.position,
      role: m.role,
      product: { id: m.productId, name: product?.name ?? 'Unknown product', category: product?.category ?? 'other' },
      lot: { id: m.lotId, code: lot?.code ?? '?', expiresOn: lot?.expiresOn ?? '' },
      formulationId: m.formulationId,
      safetySheetUrl: product?.safetySheetUrl ?? null,
    };
  });
}

export function piecesView(rows: readonly PieceRow[]): Piece[] {
  return rows.map((p) => ({
    id: p.id,
    number: p.number,
    status: p.status,
    applicationId: p.applicationId,
    statusAt: p.statusAt?.toISOString() ?? null,
    statusBy: p.statusBy,
    note: p.note,
    version: p.version,
  }));
}

export function listItem(b: BuildRow, names: BuildNames): BuildListItem {
  const mold = names.molds.get(b.moldId);
  const partA = (names.materials.get(b.id) ?? []).find((m) => m.role === 'part_a');
  return {
    id: b.id,
    productionId: b.productionId,
    madeOn: b.madeOn,
    madeBy: b.madeBy,
    performer: { id: b.performerId, name: mold?.performerName ?? 'Unknown performer' },
    mold: mold ? moldRef(mold) : { id: b.moldId, labelCode: '?', region: 'other', kind: 'mold', productionName: '' },
    silicone: partA ? { productName: names.products.get(partA.productId)?.name ?? 'Unknown product', lotCode: names.lots.get(partA.lotId)?.code ?? '?' } : null,
    tally: tallyOfPieces(names.pieces.get(b.id) ?? []),
    thumbnailUrl: b.photoThumbFileId ? buildPhotoUrl(b.id, b.photoThumbFileId, 'thumbnail') : null,
  };
}

/** One appliance on a production: its pieces across builds against the shoot days planned, when they are. */
export function outlookView(
  productionId: string,
  mold: CastRecord,
  counts: { builds: number; made: number; used: number; spoiled: number } | undefined,
  plan: PlanRow | undefined,
): ApplianceOutlook {
  const c = counts ?? { builds: 0, made: 0, used: 0, spoiled: 0 };
  const remaining = piecesRemaining(c);
  return {
    productionId,
    mold: moldRef(mold),
    performer: { id: mold.performerId, name: mold.performerName },
    builds: c.builds,
    tally: { made: c.made, used: c.used, spoiled: c.spoiled, remaining },
    plan: plan
      ? { shootDaysPlanned: plan.shootDaysPlanned, spares: plan.spares, piecesPerDay: plan.piecesPerDay, updatedAt: plan.updatedAt.toISOString(), updatedBy: plan.updatedBy, version: plan.version }
      : null,
    shortfall: plan ? piecesShortfall(remaining, plan.shootDaysPlanned, plan.spares, plan.piecesPerDay) : null,
  };
}
