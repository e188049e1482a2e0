// Appliance builds and shared rate-limit counters: database types kept by hand in step with migrations/ (one interface per table).
import type { ColumnType, Generated } from 'kysely';

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>;

export type BuildMaterialRoleCol = 'part_a' | 'part_b' | 'softener' | 'pigment' | 'flocking' | 'cap_material' | 'solvent' | 'release_agent';
export type PieceStatusCol = 'on_hand' | 'used' | 'spoiled';

/** Rate-limit counters shared by every API process (api/http/rate-limit.ts). */
export interface RateLimitHitsTable {
  /** `<limiter name>:<client key>`. */
  key: string;
  hits: number;
  reset_at: Timestamp;
}

/** A run of appliance pieces poured from a performer's mold. */
export interface ApplianceBuildsTable {
  id: Generated<string>;
  production_id: string;
  performer_id: string;
  mold_id: string;
  made_on: ColumnType<string, string, string>;
  made_by: string;
  /** MixInput as parsed by MixInputSchema. */
  mix_input: ColumnType<unknown, string, string>;
  /** MixPlan worked out from mix_input. */
  mix_plan: ColumnType<unknown, string, string>;
  /** What the scale showed for each part, grams or null. */
  weighed: ColumnType<unknown, string, string>;
  coating_input: ColumnType<unknown, string | null, string | null>;
  coating_volumes: ColumnType<unknown, string | null, string | null>;
  cure_minutes: number;
  notes: string | null;
  photo_file_id: string | null;
  photo_thumb_file_id: string | null;
  created_by: string | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  version: Generated<number>;
}

export interface ApplianceBuildMaterialsTable {
  build_id: string;
  position: number;
  role: BuildMaterialRoleCol;
  product_id: string;
  lot_id: string;
  formulation_id: string;
}

export interface AppliancePiecesTable {
  id: Generated<string>;
  build_id: string;
  number: number;
  status: ColumnType<PieceStatusCol, PieceStatusCol | undefined, PieceStatusCol>;
  /** The logged application the piece was worn for. */
  application_id: string | null;
  status_at: Date | null;
  status_by: string | null;
  note: string | null;
  version: Generated<number>;
}

/** Shoot days still to come for one appliance: a mold's pieces on a production. */
export interface AppliancePlansTable {
  id: Generated<string>;
  production_id: string;
  mold_id: string;
  shoot_days_planned: number;
  /** SparesRule as parsed by SparesRuleSchema. */
  spares: ColumnType<unknown, string, string>;
  pieces_per_day: Generated<number>;
  updated_by: string | null;
  updated_at: Timestamp;
  version: Generated<number>;
}
