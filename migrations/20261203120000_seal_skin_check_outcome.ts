import { type Kysely, sql } from 'kysely';

// The skin check's outcome is a health detail like its observation: it is sealed in the row from now
// on, so the column can no longer be checked against its three words in SQL (the API checks them).
// Rows written before stay readable as they are, and Plinth's start seals them under the key
// (the key never reaches a migration); `npm run rotate-medical-key` seals them too.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`alter table skin_checks drop constraint if exists skin_checks_outcome_check`.execute(db);
  await sql`alter table skin_checks drop constraint if exists skin_checks_observation`.execute(db);
  await sql`comment on column skin_checks.outcome is 'sealed: clear, redness or reaction'`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  // Sealed rows cannot satisfy the old checks, so they come back unvalidated.
  await sql`comment on column skin_checks.outcome is null`.execute(db);
  await sql`alter table skin_checks add constraint skin_checks_outcome_check check (outcome in ('clear','redness','reaction')) not valid`.execute(db);
  await sql`alter table skin_checks add constraint skin_checks_observation check (outcome = 'clear' or observation is not null) not valid`.execute(db);
}
