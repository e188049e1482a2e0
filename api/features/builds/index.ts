import type { BuildMaterialRole } from '#shared/domain/builds.ts';
import type { Db } from '../../db/index.ts';
import { findMaterialUses } from './repo.ts';

// What other features may use of appliance builds.
export { piecesShortTask } from './piece-service.ts';
// A performer's own builds, with their materials and lots (their records export reads them).
export { performerBuilds } from './service.ts';
// Pieces worn for a logged application.
export { listPiecesOnHandFor, listPiecesWornFor, markPiecesWornFor } from './repo-pieces.ts';

/** One build's materials as the artist's check clears them: catalogue ids only, formulation first. */
export interface ApplianceMaterials {
  buildId: string;
  productionId: string;
  /** The performer the build's mold was taken from: a piece is only ever for them. */
  performerId: string;
  /** Of the piece ids asked about, those cut from this build (empty when asked by build id only). */
  pieceIds: string[];
  materials: { role: BuildMaterialRole; productId: string; lotId: string; formulationId: string }[];
}

/**
 * The catalogue products, lots and formulations that went into these appliance pieces or builds, in
 * one query, for the artist's check to add to what it clears (clearance keys on `formulationId`).
 * Ids that match nothing are left out; names are the catalogue's (`findLotsForTest`). The check must
 * still confirm each build's `performerId` is the performer being checked.
 */
export async function findApplianceMaterials(db: Db, ids: { pieceIds?: readonly string[]; buildIds?: readonly string[] }): Promise<ApplianceMaterials[]> {
  const rows = await findMaterialUses(db, ids.pieceIds ?? [], ids.buildIds ?? []);
  const out = new Map<string, ApplianceMaterials>();
  for (const r of rows) {
    const entry = out.get(r.buildId) ?? out.set(r.buildId, { buildId: r.buildId, productionId: r.productionId, performerId: r.performerId, pieceIds: r.pieceIds, materials: [] }).get(r.buildId)!;
    entry.materials.push({ role: r.role, productId: r.productId, lotId: r.lotId, formulationId: r.formulationId });
  }
  return [...out.values()];
}
