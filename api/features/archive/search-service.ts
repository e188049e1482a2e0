import { BODY_REGIONS, BODY_REGION_LABELS, CAST_KINDS, CAST_KIND_LABELS, type BodyRegion, type CastKind } from '#shared/domain/archive-casts.ts';
import { breadcrumb, descendantIds, fullCodePath, LOCATION_CODE_PATTERN, normaliseLocationCode, resolveCodePath } from '#shared/domain/archive-locations.ts';
import { classifyArchiveQuery, normaliseSearchText } from '#shared/domain/archive-search.ts';
import type { Actor } from '#shared/policy.ts';
import type { CastListQuery, CastPage } from '#shared/schemas/archive.ts';
import type { Db } from '../../db/index.ts';
import { invalid } from '../../http/errors.ts';
import { castScope, toListItem } from './cast-view.ts';
import { searchCasts, type CastSearch } from './repo-casts.ts';
import { findLocationByLabel, listLocations, type LocationRecord } from './repo-locations.ts';

// British spellings and plurals people type for the cast kinds.
const KIND_WORDS: Record<string, CastKind> = { mould: 'mold', moulds: 'mold', molds: 'mold', positives: 'positive', cores: 'core' };

function regionsFor(term: string): BodyRegion[] {
  const t = term.replace(/s$/, '');
  return BODY_REGIONS.filter((r) => r !== 'other' && normaliseSearchText(BODY_REGION_LABELS[r]).split(' ').some((w) => w === term || w === t));
}

function kindsFor(term: string): CastKind[] {
  const word = KIND_WORDS[term];
  if (word) return [word];
  return CAST_KINDS.filter((k) => k !== 'other' && normaliseSearchText(CAST_KIND_LABELS[k]) === term);
}

/** The places a typed code names, wherever they sit ("R2" is every rack 2), with everything below them. */
function placesCoded(term: string, tree: readonly LocationRecord[]): string[] {
  const code = normaliseLocationCode(term);
  if (!LOCATION_CODE_PATTERN.test(code)) return [];
  const hits = tree.filter((l) => l.code === code);
  return [...new Set(hits.flatMap((l) => [l.id, ...descendantIds(l.id, tree)]))];
}

function termsOf(terms: readonly string[], tree: readonly LocationRecord[]): NonNullable<CastSearch['terms']> {
  return terms
    .flatMap((t) => t.split('/'))
    .filter(Boolean)
    .map((term) => ({ term, regions: regionsFor(term), kinds: kindsFor(term), placeIds: placesCoded(term, tree) }));
}

function below(id: string, tree: readonly LocationRecord[]): string[] {
  return [id, ...descendantIds(id, tree)];
}

/**
 * The Find screen's one search box: a label code opens that cast or lists that place's casts, a
 * code path ("GH/NORTH/R1") lists what is there, and words must each match the performer's name
 * (closely), the production, the region, the kind or a place's code.
 */
export async function findCasts(db: Db, actor: Actor, query: CastListQuery, origin: string, now = new Date()): Promise<CastPage> {
  const tree = await listLocations(db);
  const scope = castScope(actor, 'casts.read');
  const search: CastSearch = { filters: query };
  let matched: CastPage['matched'] = 'all';
  let place: LocationRecord | undefined;
  const read = classifyArchiveQuery(query.q ?? '', { origin });
  switch (read.kind) {
    case 'empty':
      break;
    case 'bad_label':
      throw invalid({ q: [read.message] }, read.message);
    case 'label':
      matched = 'label';
      if (read.target === 'cast') search.labelCode = read.code;
      else {
        place = await findLocationByLabel(db, read.code);
        search.placeIds = place ? below(place.id, tree) : [];
      }
      break;
    case 'code_path':
      place = resolveCodePath(read.path, tree) as LocationRecord | undefined;
      if (place) {
        matched = 'code_path';
        search.placeIds = below(place.id, tree);
      } else {
        // A path no place has is read as words ("face/hand" is two words).
        matched = 'text';
        search.terms = termsOf(read.terms, tree);
      }
      break;
    case 'text':
      matched = 'text';
      search.terms = termsOf(read.terms, tree);
      break;
  }
  const { items, total } = await searchCasts(db, scope, search, now);
  return {
    items: items.map((c) => toListItem(c, tree, now)),
    total,
    page: query.page,
    pageSize: query.pageSize,
    matched,
    place: place ? { id: place.id, path: fullCodePath(place.id, tree), breadcrumb: breadcrumb(place.id, tree) } : null,
  };
}
