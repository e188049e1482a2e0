import { buildDateRefusal, buildLotCheckMoment, buildMaterialProblems, materialFigureProblems } from '#shared/domain/builds.ts';
import { lotRefusal } from '#shared/domain/catalogue.ts';
import { CAST_KIND_LABELS } from '#shared/domain/archive-casts.ts';
import type { BuildMaterialInput, CreateBuildValues } from '#shared/schemas/builds.ts';
import type { Db } from '../../db/index.ts';
import { invalid } from '../../http/errors.ts';
import { findCast, type CastRecord } from '../archive/index.ts';
import { findLotsForTest, findProductSummaries } from '../catalogue/index.ts';
import { isEngagedOn } from '../performers/index.ts';

/*
 * The rules a build is checked against before anything is written: its mold, its date, its materials
 * and their lots, and the silicone's own figures. Every problem is gathered and answered at once,
 * each under its field, so nothing is ever saved half-done.
 */

type FieldErrors = Record<string, string[]>;

function merge(into: FieldErrors, more: FieldErrors): void {
  for (const [k, v] of Object.entries(more)) (into[k] ??= []).push(...v);
}

/** The mold a new build or shoot plan names: a mold in the archive, still held, of a performer engaged on the production. */
export async function checkMold(db: Db, moldId: string, productionId: string, field = 'moldId'): Promise<CastRecord> {
  const mold = await findCast(db, moldId);
  if (!mold) throw invalid({ [field]: ['That mold is not in the archive'] });
  if (mold.kind !== 'mold') throw invalid({ [field]: [`${mold.labelCode} is a ${CAST_KIND_LABELS[mold.kind].toLowerCase()}, not a mold`] });
  if (mold.status === 'destroyed' || mold.status === 'returned_to_performer') {
    throw invalid({ [field]: [`${mold.labelCode} is no longer held by the archive (${mold.status === 'destroyed' ? 'destroyed' : 'returned to the performer'})`] });
  }
  if (!(await isEngagedOn(db, mold.performerId, productionId))) throw invalid({ [field]: [`${mold.performerName} is not engaged on this production`] });
  return mold;
}

/** A material with the formulation its lot is of, ready to write. */
export interface CheckedMaterial extends BuildMaterialInput {
  formulationId: string;
}

/**
 * Checks a build's date, materials, lots and figures; answers the materials with their formulations, or
 * throws one 400 naming every problem. Lots the build already listed stay acceptable once retired (a
 * used-up tub is retired after the run), but every lot must be in date on the day the build was made.
 */
export async function checkBuildFields(
  db: Db,
  input: Pick<CreateBuildValues, 'madeOn' | 'materials' | 'mix' | 'coating'>,
  opts: { now: Date; listedLotIds?: ReadonlySet<string> },
): Promise<CheckedMaterial[]> {
  const errors: FieldErrors = {};
  const dateProblem = buildDateRefusal(input.madeOn, opts.now);
  if (dateProblem) errors.madeOn = [dateProblem];
  merge(errors, buildMaterialProblems(input.materials, { mix: input.mix, coating: input.coating }));

  const [lots, products] = await Promise.all([findLotsForTest(db, input.materials.map((m) => m.lotId)), findProductSummaries(db, input.materials.map((m) => m.productId))]);
  // Lots are checked on the build's day; a date refused as in the future is no day to check them on.
  const at = dateProblem ? opts.now : buildLotCheckMoment(input.madeOn);
  const checked: CheckedMaterial[] = [];
  input.materials.forEach((m, i) => {
    if (!products.has(m.productId)) {
      merge(errors, { [`materials.${i}.productId`]: ['That product is not in the catalogue'] });
      return;
    }
    const lot = lots.get(m.lotId);
    const kept = lot && opts.listedLotIds?.has(lot.lotId) ? { ...lot, retiredAt: null } : lot;
    const refusal = lotRefusal(kept, m.productId, at, 'in an appliance build');
    if (refusal) merge(errors, { [`materials.${i}.lotId`]: [refusal] });
    else if (lot) checked.push({ ...m, formulationId: lot.formulationId });
  });

  const partA = input.materials.find((m) => m.role === 'part_a');
  const silicone = partA ? products.get(partA.productId) : undefined;
  if (silicone) merge(errors, materialFigureProblems(silicone, input.mix));

  if (Object.keys(errors).length > 0) throw invalid(errors);
  return checked;
}
