/** The words the audit page uses for the kinds of record an entry is about. */
const RECORD_WORDS: Record<string, string> = {
  performer: 'Performer',
  user: 'User',
  cast: 'Life cast',
  product: 'Product',
  product_lot: 'Product lot',
  signing_request: 'Signing request',
  consent: 'Consent',
  consent_template: 'Consent form',
  consent_pdf: 'Signed copy',
  production: 'Production',
  archive_location: 'Storage place',
  archive: 'Archive',
  appliance_build: 'Appliance build',
  appliance_piece: 'Appliance piece',
  ingredient: 'Ingredient',
  booking: 'Session',
  records_export: 'Records export',
  protocol: 'Test protocol',
};

/** "signing_request" → "Signing request": known kinds by name, any other in plain words. */
export function recordWords(entityType: string): string {
  return RECORD_WORDS[entityType] ?? humanize(entityType);
}

/** "emailConfirmed" or "email_confirmed" → "Email confirmed". */
export function humanize(key: string): string {
  const words = key
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .replace(/[._-]+/g, ' ')
    .trim()
    .toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** A detail's value in words: yes/no, lists joined, before → after; a bare record id is left out. */
export function detailWords(value: unknown): string | null {
  if (value === null || value === undefined || value === '') return null;
  if (typeof value === 'boolean') return value ? 'Yes' : 'No';
  if (typeof value === 'number') return new Intl.NumberFormat().format(value);
  if (typeof value === 'string') return UUID.test(value) ? null : humanizeCode(value);
  if (Array.isArray(value)) {
    const parts = value.map(detailWords).filter((v): v is string => v !== null);
    return parts.length ? parts.join(', ') : null;
  }
  if (typeof value === 'object') {
    const o = value as Record<string, unknown>;
    if ('before' in o || 'after' in o) return `${detailWords(o.before) ?? 'none'} → ${detailWords(o.after) ?? 'none'}`;
    const parts = Object.entries(o)
      .map(([k, v]) => {
        const w = detailWords(v);
        return w === null ? null : `${humanize(k)}: ${w}`;
      })
      .filter((v): v is string => v !== null);
    return parts.length ? parts.join('; ') : null;
  }
  return String(value);
}

/** A snake_case code ("email_bound_to_other_subject") reads as words; free text stays as written. */
function humanizeCode(value: string): string {
  return /^[a-z]+(_[a-z]+)+$/.test(value) ? humanize(value) : value;
}

/** What a group of events is about, for the "What happened" filter ("consent." → "Consents"). */
const GROUP_WORDS: Record<string, string> = {
  auth: 'Signing in and out',
  user: 'Users',
  production: 'Productions',
  membership: 'Roles on a production',
  lead: 'The lead appointment',
  performer: 'Performer records',
  engagement: 'Engagements',
  template: 'Consent forms',
  signing_request: 'Signing requests',
  tablet: 'The signing tablet',
  consent: 'Consents',
  withdrawal_link: 'Withdrawal links',
  booking: 'Sessions',
  patch_test: 'Patch tests',
  ingredient: 'Ingredients',
  product: 'Products',
  formulation: 'Formulations',
  lot: 'Product lots',
  location: 'Storage places',
  cast: 'Life casts',
  build: 'Appliance builds',
  kit: 'Kits',
  lead_request: 'Questions to the lead',
  application: 'Applications',
  incident: 'Incidents',
};

export interface ActionChoice {
  /** The filter's value: an event code, or a group's prefix ending with a dot. */
  value: string;
  words: string;
}

/**
 * The "What happened" choices, in words: every group of two or more events ("Consents: any"),
 * then every single event, each list alphabetical. The filter never asks for a code.
 */
export function auditActionChoices(labels: Record<string, string>): { groups: ActionChoice[]; events: ActionChoice[] } {
  const perGroup = new Map<string, number>();
  for (const code of Object.keys(labels)) {
    const prefix = code.slice(0, code.indexOf('.'));
    perGroup.set(prefix, (perGroup.get(prefix) ?? 0) + 1);
  }
  const byWords = (a: ActionChoice, b: ActionChoice) => a.words.localeCompare(b.words);
  const groups = [...perGroup]
    .filter(([, n]) => n > 1)
    .map(([prefix]) => ({ value: `${prefix}.`, words: `${GROUP_WORDS[prefix] ?? humanize(prefix)}: any` }))
    .sort(byWords);
  const events = Object.entries(labels)
    .map(([value, words]) => ({ value, words }))
    .sort(byWords);
  return { groups, events };
}
