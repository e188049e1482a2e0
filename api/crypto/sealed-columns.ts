/**
 * Every column that holds sealed health details, for the key rotation to re-seal. A feature that
 * seals a new column adds it here (and a test reads its raw rows to prove no plain text is left).
 */
export const SEALED_COLUMNS: readonly { table: string; key: string; column: string; jsonb: boolean }[] = [
  { table: 'consent_answers', key: 'id', column: 'answer', jsonb: true },
  { table: 'consents', key: 'id', column: 'withdrawal_reason', jsonb: false },
  { table: 'patch_test_readings', key: 'id', column: 'code', jsonb: false },
  { table: 'patch_test_readings', key: 'id', column: 'note', jsonb: false },
  { table: 'clearance_overrides', key: 'id', column: 'note', jsonb: false },
  { table: 'lead_requests', key: 'id', column: 'decision_note', jsonb: false },
  { table: 'skin_checks', key: 'application_id', column: 'observation', jsonb: false },
  { table: 'incidents', key: 'id', column: 'closing_note', jsonb: false },
];
