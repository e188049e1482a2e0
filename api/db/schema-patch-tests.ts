// Patch-test tables, kept by hand in step with migrations/ (one interface per table).
import type { ColumnType, Generated } from 'kysely';

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>;

export type TestStatusCol = 'booked' | 'applied' | 'closed' | 'cancelled';

/** A patch test: a booking of purpose patch_test and the protocol version it was booked on. */
export interface PatchTestsTable {
  booking_id: string;
  performer_id: string;
  production_id: string;
  protocol_version_id: string;
  status: ColumnType<TestStatusCol, TestStatusCol | undefined, TestStatusCol>;
  applied_at: Date | null;
  applied_by: string | null;
  removed_at: Date | null;
  closed_at: Date | null;
  closed_by: string | null;
  cancelled_at: Date | null;
  created_by: string | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  version: Generated<number>;
}

/** One product on a test: its lot, the lot's formulation, and the site it went on. */
export interface PatchTestProductsTable {
  id: Generated<string>;
  test_id: string;
  position: number;
  product_id: string;
  lot_id: string;
  formulation_id: string;
  site: string;
}

/** One reading of one tested product at one reading point; code and note are sealed. */
export interface PatchTestReadingsTable {
  id: Generated<string>;
  test_product_id: string;
  point_id: string;
  read_at: Timestamp;
  /** sealJson(IcdrgCode). */
  code: string;
  /** sealJson(string) or null. */
  note: string | null;
  late: Generated<boolean>;
  read_by: string | null;
  created_at: Timestamp;
}

/** A photo of a test site at a reading (sealed files). */
export interface PatchTestPhotosTable {
  id: Generated<string>;
  reading_id: string;
  file_id: string;
  thumb_file_id: string;
  width: number;
  height: number;
  created_by: string | null;
  created_at: Timestamp;
}

/** The lead's decision on a formulation for a performer; the note is sealed. */
export interface ClearanceOverridesTable {
  id: Generated<string>;
  performer_id: string;
  production_id: string;
  formulation_id: string;
  state: 'cleared' | 'caution' | 'do_not_use' | 'untested';
  /** sealJson(string). */
  note: string;
  expires_at: Date | null;
  set_by: string | null;
  set_at: Timestamp;
}

/** Moved by triggers whenever a row clearance reads changes ('performer:<id>', 'catalogue'); read-only to the app. */
export interface ClearanceStampsTable {
  key: ColumnType<string, never, never>;
  /** bigint, as a string. */
  stamp: ColumnType<string, never, never>;
}
