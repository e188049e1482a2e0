import { BODY_REGION_LABELS, CAST_KIND_LABELS } from '#shared/domain/archive-casts.ts';
import { fullCodePath } from '#shared/domain/archive-locations.ts';
import { labelUrl, parseLabelCode } from '#shared/domain/label-codes.ts';
import { can, type Actor } from '#shared/policy.ts';
import { LABEL_SHEET_MAX, type LabelTargetResult } from '#shared/schemas/archive.ts';
import type { AppContext } from '../../context.ts';
import { recordEvent } from '../../http/audit.ts';
import { forbidden, invalid, notFound } from '../../http/errors.ts';
import { castResource, loadCastFor } from './cast-view.ts';
import { renderLabelSheet, type SheetLabel } from './label-sheet.ts';
import { findCastByLabel, findCastsByIds } from './repo-casts.ts';
import { findLocationByLabel, listLocations } from './repo-locations.ts';
import type { Request } from 'express';

/** What a scanned or typed label opens: a cast the person may see, or a place in the store. */
export async function resolveLabel(ctx: AppContext, actor: Actor, raw: string): Promise<LabelTargetResult> {
  const parsed = parseLabelCode(raw);
  if (!parsed.ok) throw invalid({ code: [parsed.message] }, parsed.message);
  if (parsed.target === 'location') {
    const place = await findLocationByLabel(ctx.db, parsed.code);
    if (!place) throw notFound(`The label ${parsed.code}`);
    return { target: 'location', id: place.id, code: parsed.code };
  }
  const cast = await findCastByLabel(ctx.db, parsed.code);
  if (!cast) throw notFound(`The label ${parsed.code}`);
  await loadCastFor(ctx.db, actor, cast.id);
  return { target: 'cast', id: cast.id, code: parsed.code };
}

/**
 * A printable sheet for the chosen casts and places, each label holding the address that opens it
 * in this Plinth. Every cast must be one the person may see; unknown ids are named.
 */
export async function labelSheet(ctx: AppContext, actor: Actor, ids: { casts: string[]; locations: string[] }, req: Request): Promise<Buffer> {
  const total = ids.casts.length + ids.locations.length;
  if (total === 0) throw invalid({ casts: ['Choose at least one cast or place to print a label for.'] });
  if (total > LABEL_SHEET_MAX) throw invalid({ casts: [`Print at most ${LABEL_SHEET_MAX} labels at a time.`] });
  const [tree, casts] = await Promise.all([listLocations(ctx.db), findCastsByIds(ctx.db, ids.casts)]);
  const missingCasts = ids.casts.filter((id) => !casts.some((c) => c.id === id));
  if (missingCasts.length) throw invalid({ casts: [`${missingCasts.length === 1 ? 'A cast' : `${missingCasts.length} casts`} on the list ${missingCasts.length === 1 ? 'was' : 'were'} not found.`] });
  const places = ids.locations.map((id) => tree.find((l) => l.id === id));
  if (places.some((p) => !p)) throw invalid({ locations: ['A place on the list was not found.'] });
  for (const cast of casts) {
    const r = await castResource(ctx.db, cast);
    if (!can(actor, 'casts.read', { productionId: r.productionId, performerProductionIds: r.performerProductionIds })) throw forbidden('print labels for casts you cannot see');
  }
  const origin = ctx.config.appOrigin;
  const labels: SheetLabel[] = [
    ...places.map((p) => ({ url: labelUrl(origin, p!.labelCode), code: p!.labelCode, kind: 'PLACE', lines: [fullCodePath(p!.id, tree), p!.name] })),
    ...ids.casts
      .map((id) => casts.find((c) => c.id === id)!)
      .map((c) => ({
        url: labelUrl(origin, c.labelCode),
        code: c.labelCode,
        kind: 'CAST',
        lines: [`${BODY_REGION_LABELS[c.region]} · ${CAST_KIND_LABELS[c.kind].toLowerCase()}`, c.performerName, `${c.productionName}, ${c.madeOn.slice(0, 4)}`],
      })),
  ];
  const pdf = await renderLabelSheet(labels, { title: `Plinth labels (${labels.length})`, createdAt: new Date() });
  await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'labels.print', entityType: 'archive', req, details: { casts: ids.casts.length, locations: ids.locations.length } });
  return pdf;
}
