// The life-cast archive and the job runner's once-only keys: database types kept by hand in step with migrations/ (one interface per table).
import type { ColumnType, Generated } from 'kysely';

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>;
type DateCol = ColumnType<string, string | null | undefined, string | null>;

export type LocationLevelCol = 'site' | 'room' | 'rack' | 'shelf' | 'bin';

export type CastStatusCol = 'in_store' | 'checked_out' | 'on_loan' | 'returned_to_performer' | 'destroyed';

export interface ArchiveLocationsTable {
  id: Generated<string>;
  parent_id: string | null;
  level: LocationLevelCol;
  code: string;
  name: string;
  environment: string | null;
  label_code: string;
  created_at: Timestamp;
  updated_at: Timestamp;
  version: Generated<number>;
}

export interface CastsTable {
  id: Generated<string>;
  label_code: string;
  performer_id: string;
  production_id: string;
  region: 'face' | 'head' | 'head_and_shoulders' | 'torso' | 'arm' | 'hand' | 'leg' | 'foot' | 'teeth' | 'other';
  kind: 'mold' | 'positive' | 'core' | 'other';
  material: string;
  made_on: DateCol;
  made_by: string;
  poured_from_id: string | null;
  status: ColumnType<CastStatusCol, CastStatusCol | undefined, CastStatusCol>;
  normal_location_id: string | null;
  current_location_id: string | null;
  current_holder: string | null;
  current_holder_user_id: string | null;
  current_production: string | null;
  due_back_at: Date | null;
  since: Timestamp;
  notes: string | null;
  created_by: string | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  version: Generated<number>;
}

export interface CastMovementsTable {
  id: Generated<string>;
  cast_id: string;
  kind: 'check_out' | 'check_in' | 'relocation' | 'loan' | 'return_to_performer' | 'destruction';
  at: Timestamp;
  moved_by: string;
  authorised_by: string;
  from_place: ColumnType<unknown, string, string>;
  to_place: ColumnType<unknown, string, string>;
  from_label: string;
  to_label: string;
  status_before: CastStatusCol;
  status_after: CastStatusCol;
  normal_before: string | null;
  normal_after: string | null;
  reason: string | null;
  due_back_at: Date | null;
  witness: string | null;
  method: string | null;
  contact: string | null;
  note: string | null;
  holder_user_id: string | null;
  recorded_by: string | null;
  created_at: Timestamp;
}

export interface CastConditionChecksTable {
  id: Generated<string>;
  cast_id: string;
  checked_on: DateCol;
  checked_by: string;
  grade: 'good' | 'fair' | 'poor' | 'damaged';
  notes: string | null;
  created_by: string | null;
  created_at: Timestamp;
}

export interface CastPhotosTable {
  id: Generated<string>;
  cast_id: string;
  condition_check_id: string | null;
  file_id: string;
  thumb_file_id: string;
  width: number;
  height: number;
  created_by: string | null;
  created_at: Timestamp;
}

/** Work claimed by a background job that must happen at most once (api/jobs/once.ts). */
export interface JobOnceTable {
  key: string;
  job: string;
  claimed_at: Timestamp;
  done_at: Date | null;
}
