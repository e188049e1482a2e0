/**
 * Reading what an archivist types or scans into the one search box: a label code, a scanned label
 * URL, a location code path, or words; and finding casts by label code or by place.
 */
import type { CurrentPlace } from './archive-casts.ts';
import { descendantIds, LOCATION_CODE_PATTERN, normaliseLocationCode, type LocationSet } from './archive-locations.ts';
import { labelCodeFromUrl, parseLabelCode, type LabelTarget } from './label-codes.ts';

/** What a search entry turned out to be, so the box can open a record, a place, or list matches. */
export type ArchiveQuery =
  | { kind: 'empty' }
  | { kind: 'label'; target: LabelTarget; code: string }
  | { kind: 'bad_label'; message: string }
  /** `text` is the entry as words, for when no place has that path ("face/hand" may be either). */
  | { kind: 'code_path'; path: string; text: string; terms: string[] }
  | { kind: 'text'; text: string; terms: string[] };

/** Case, accents and spacing never decide a match: "Renée" finds "renee". */
export function normaliseSearchText(s: string): string {
  return s
    .normalize('NFKD')
    .replace(/\p{M}+/gu, '')
    .toLowerCase()
    .replace(/\s+/g, ' ')
    .trim();
}

const HYPHENED_LABEL = /^[CL]\s*[-\u2010-\u2015]\s*[0-9A-Z]{6}$/i;
const SOLID_LABEL = /^[CL][0-9A-Z]{6}$/i;

/**
 * What a search entry is. A hyphened code that fails its check is reported as a misread label;
 * an unhyphened one that fails is taken as words, since "CASTING" is a word and not a code.
 */
export function classifyArchiveQuery(raw: string, opts: { origin?: string } = {}): ArchiveQuery {
  const trimmed = raw.trim();
  if (trimmed.length === 0) return { kind: 'empty' };

  const fromUrl = labelCodeFromUrl(trimmed, opts.origin);
  if (fromUrl) return fromUrl.ok ? { kind: 'label', target: fromUrl.target, code: fromUrl.code } : { kind: 'bad_label', message: fromUrl.message };

  if (HYPHENED_LABEL.test(trimmed)) {
    const parsed = parseLabelCode(trimmed);
    return parsed.ok ? { kind: 'label', target: parsed.target, code: parsed.code } : { kind: 'bad_label', message: parsed.message };
  }
  if (SOLID_LABEL.test(trimmed) && /\d/.test(trimmed)) {
    const parsed = parseLabelCode(trimmed);
    if (parsed.ok) return { kind: 'label', target: parsed.target, code: parsed.code };
  }

  const text = normaliseSearchText(trimmed);
  const terms = [...new Set(text.split(' '))];
  if (trimmed.includes('/')) {
    const steps = trimmed
      .split('/')
      .map((s) => s.trim())
      .filter((s) => s.length > 0);
    const codes = steps.map(normaliseLocationCode);
    if (steps.length > 0 && steps.every((s) => !/\s/.test(s)) && codes.every((c) => LOCATION_CODE_PATTERN.test(c))) {
      return { kind: 'code_path', path: codes.join('/'), text, terms };
    }
  }
  return { kind: 'text', text, terms };
}

/** Every term must appear in at least one field: more words narrow the list, as people expect. */
export function matchesTerms(fields: readonly (string | null | undefined)[], terms: readonly string[]): boolean {
  const hay = fields.filter((f): f is string => typeof f === 'string' && f.length > 0).map(normaliseSearchText);
  return terms.every((t) => hay.some((h) => h.includes(normaliseSearchText(t))));
}

/** Finds the record a label code names, however the code was typed; null for a malformed or unknown code. */
export function findByLabelCode<T extends { labelCode: string }>(items: Iterable<T>, raw: string): T | null {
  const parsed = parseLabelCode(raw);
  if (!parsed.ok) return null;
  for (const item of items) if (item.labelCode === parsed.code) return item;
  return null;
}

/**
 * The casts whose current place is this location, or (by default) any place below it, so
 * opening a room lists what is on all its shelves.
 */
export function castsAtLocation<T extends { current: CurrentPlace }>(
  casts: Iterable<T>,
  locationId: string,
  nodes: LocationSet,
  opts: { includeBelow?: boolean } = {},
): T[] {
  const ids = opts.includeBelow === false ? new Set([locationId]) : new Set([locationId, ...descendantIds(locationId, nodes)]);
  const out: T[] = [];
  for (const c of casts) if (c.current.kind === 'location' && ids.has(c.current.locationId)) out.push(c);
  return out;
}

/** The casts that call this location home, including those out right now: what should be there. */
export function castsHomedAt<T extends { normalLocationId: string | null }>(casts: Iterable<T>, locationId: string): T[] {
  const out: T[] = [];
  for (const c of casts) if (c.normalLocationId === locationId) out.push(c);
  return out;
}
