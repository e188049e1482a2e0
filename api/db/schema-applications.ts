// Tables of kits, the artist's checks, requests to the lead, the application log, skin checks and
// incidents, kept by hand in step with migrations/ (one interface per table).
import type { ColumnType, Generated } from 'kysely';

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>;
/** A named list of products a production uses together ("Day 12 — scar appliance"). */
export interface KitsTable {
  id: Generated<string>;
  production_id: string;
  name: string;
  created_by: string | null;
  updated_by: string | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  version: Generated<number>;
}

export interface KitProductsTable {
  kit_id: string;
  position: number;
  product_id: string;
}

/** One artist's check of a performer against the products planned, as answered (no grade or note). */
export interface ClearanceChecksTable {
  id: Generated<string>;
  production_id: string;
  performer_id: string;
  kit_id: string | null;
  run_by: string | null;
  run_at: Timestamp;
  /** CheckItem[] as parsed by CheckItemSchema. */
  items: ColumnType<unknown, string, string>;
  piece_ids: ColumnType<string[], string[] | undefined, string[]>;
}

export type LeadRequestStatusCol = 'waiting' | 'approved' | 'refused';

/** An artist asking the lead about a Caution or Do not use product in a check. */
export interface LeadRequestsTable {
  id: Generated<string>;
  check_id: string;
  production_id: string;
  performer_id: string;
  product_id: string;
  formulation_id: string;
  state_at_request: 'caution' | 'do_not_use';
  requested_by: string | null;
  requested_at: Timestamp;
  status: ColumnType<LeadRequestStatusCol, LeadRequestStatusCol | undefined, LeadRequestStatusCol>;
  decided_by: string | null;
  decided_at: Date | null;
  /** Sealed (sealJson). */
  decision_note: string | null;
  version: Generated<number>;
}

/** A logged application of products (and perhaps appliance pieces) to a performer. */
export interface ApplicationsTable {
  id: Generated<string>;
  production_id: string;
  performer_id: string;
  check_id: string;
  artist_id: string | null;
  applied_on: ColumnType<string, string, string>;
  description: string | null;
  started_at: Date;
  ended_at: Date | null;
  notes: string | null;
  /** The check as it stood when the application was logged (CheckSnapshotSchema). */
  check_snapshot: ColumnType<unknown, string, string>;
  created_at: Timestamp;
  version: Generated<number>;
}

export interface ApplicationProductsTable {
  application_id: string;
  use: 'applied' | 'removal';
  position: number;
  product_id: string;
  lot_id: string;
  formulation_id: string;
}

export type SkinCheckOutcomeCol = 'clear' | 'redness' | 'reaction';

export interface SkinChecksTable {
  application_id: string;
  /** sealJson(SkinCheckOutcomeCol): a health detail like the observation. */
  outcome: string;
  /** Sealed (sealJson); null only when clear. */
  observation: string | null;
  checked_by: string | null;
  checked_at: Timestamp;
}

/** What a skin check other than clear opens for the lead. */
export interface IncidentsTable {
  id: Generated<string>;
  application_id: string;
  production_id: string;
  performer_id: string;
  reported_by: string | null;
  reported_at: Timestamp;
  status: ColumnType<'open' | 'closed', 'open' | 'closed' | undefined, 'open' | 'closed'>;
  closed_by: string | null;
  closed_at: Date | null;
  /** Sealed (sealJson). */
  closing_note: string | null;
  version: Generated<number>;
}
