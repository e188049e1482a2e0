/**
 * Every column that holds sealed health details, for the key rotation to re-seal. A feature that
 * seals a new column adds it here (and a test reads its raw rows to prove no plain text is left).
 * `where` narrows a column to the rows that are health details (a consent's other answers are not).
 */
export interface SealedColumn {
  table: string;
  key: string;
  column: string;
  jsonb: boolean;
  where?: string;
}

export const SEALED_COLUMNS: readonly SealedColumn[] = [
  // Questionnaire answers marked as health details.
  { table: 'consent_answers', key: 'id', column: 'answer', jsonb: true, where: 'medical' },
  { table: 'consents', key: 'id', column: 'withdrawal_reason', jsonb: false },
  // Patch-test reading grades (ICDRG code) and notes; the photos are sealed files.
  { table: 'patch_test_readings', key: 'id', column: 'code', jsonb: false },
  { table: 'patch_test_readings', key: 'id', column: 'note', jsonb: false },
  { table: 'clearance_overrides', key: 'id', column: 'note', jsonb: false },
  // The lead's answer to an artist's request.
  { table: 'lead_requests', key: 'id', column: 'decision_note', jsonb: false },
  // The skin check after removal: what was seen and what it came to.
  { table: 'skin_checks', key: 'application_id', column: 'outcome', jsonb: false },
  { table: 'skin_checks', key: 'application_id', column: 'observation', jsonb: false },
  { table: 'incidents', key: 'id', column: 'closing_note', jsonb: false },
  // A message kept to send again may carry a signed copy with health answers.
  { table: 'mail_failures', key: 'id', column: 'message', jsonb: true },
];

/** The sealed columns grouped by table, in the order above (a rotation seals each table in one transaction). */
export function sealedTables(): { table: string; key: string; columns: SealedColumn[] }[] {
  const byTable = new Map<string, { table: string; key: string; columns: SealedColumn[] }>();
  for (const c of SEALED_COLUMNS) {
    const t = byTable.get(c.table) ?? { table: c.table, key: c.key, columns: [] };
    t.columns.push(c);
    byTable.set(c.table, t);
  }
  return [...byTable.values()];
}
