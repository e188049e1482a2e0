// Database types, kept by hand in step with migrations/ (one interface per table).
import type { ColumnType, Generated, Insertable, Selectable, Updateable } from 'kysely';

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>;
type DateCol = ColumnType<string, string | null | undefined, string | null>;

export interface UsersTable {
  id: Generated<string>;
  email: string;
  display_name: string;
  is_admin: Generated<boolean>;
  oidc_issuer: string | null;
  oidc_subject: string | null;
  last_sign_in_at: Date | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  version: Generated<number>;
}

export interface ProductionsTable {
  id: Generated<string>;
  name: string;
  kind: 'film' | 'television' | 'stage' | 'other';
  starts_on: DateCol | null;
  ends_on: DateCol | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  version: Generated<number>;
}

export interface MembershipsTable {
  id: Generated<string>;
  user_id: string;
  production_id: string;
  role: 'head' | 'artist' | 'archivist' | 'performer';
  created_by: string | null;
  created_at: Timestamp;
}

export interface LeadAppointmentsTable {
  id: Generated<string>;
  production_id: string;
  user_id: string;
  starts_at: Timestamp;
  ends_at: Date | null;
  appointed_by: string | null;
  ended_by: string | null;
}

export interface PerformersTable {
  id: Generated<string>;
  legal_name: string;
  preferred_name: string | null;
  email: string | null;
  user_id: string | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  version: Generated<number>;
}

export interface EngagementsTable {
  id: Generated<string>;
  performer_id: string;
  production_id: string;
  character_name: string | null;
  starts_on: DateCol | null;
  ends_on: DateCol | null;
  created_at: Timestamp;
}

export interface SessionsTable {
  sid: string;
  sess: unknown;
  expire: Date;
}

export interface AuditLogTable {
  id: Generated<string>;
  at: Timestamp;
  actor_user_id: string | null;
  action: string;
  entity_type: string;
  entity_id: string | null;
  production_id: string | null;
  details: ColumnType<Record<string, unknown>, string | undefined, string>;
  ip: string | null;
}

export interface Database {
  users: UsersTable;
  productions: ProductionsTable;
  memberships: MembershipsTable;
  lead_appointments: LeadAppointmentsTable;
  performers: PerformersTable;
  engagements: EngagementsTable;
  sessions: SessionsTable;
  audit_log: AuditLogTable;
}

export type UserRow = Selectable<UsersTable>;
export type NewUser = Insertable<UsersTable>;
export type UserUpdate = Updateable<UsersTable>;
export type ProductionRow = Selectable<ProductionsTable>;
