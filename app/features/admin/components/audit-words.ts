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
