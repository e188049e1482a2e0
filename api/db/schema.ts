// Database types, kept by hand in step with migrations/ (one interface per table).
import type { ColumnType, Generated, Insertable, Selectable, Updateable } from 'kysely';
import type { ApplicationProductsTable, ApplicationsTable, ClearanceChecksTable, IncidentsTable, KitProductsTable, KitsTable, LeadRequestsTable, SkinChecksTable } from './schema-applications.ts';
import type { ClearanceOverridesTable, ClearanceStampsTable, PatchTestPhotosTable, PatchTestProductsTable, PatchTestReadingsTable, PatchTestsTable } from './schema-patch-tests.ts';
import type { ConsentTemplatesTable, ConsentTemplateVersionsTable, SigningRequestsTable, SigningBundlesTable, StaffSeenTable, HealthReviewsTable, ConsentsTable, ConsentAnswersTable, WithdrawalLinksTable, EmailConfirmationsTable, AccountInvitationsTable, BookingsTable, MailFailuresTable } from './schema-consents.ts';
import type { IngredientsTable, ProductsTable, ProductFormulationsTable, FormulationIngredientsTable, ProductLotsTable, ProtocolsTable, ProtocolVersionsTable } from './schema-catalogue.ts';
import type { ArchiveLocationsTable, CastsTable, CastMovementsTable, CastConditionChecksTable, CastPhotosTable, JobOnceTable } from './schema-archive.ts';
import type { RateLimitHitsTable, ApplianceBuildsTable, ApplianceBuildMaterialsTable, AppliancePiecesTable, AppliancePlansTable } from './schema-builds.ts';
export type * from './schema-consents.ts';
export type * from './schema-catalogue.ts';
export type * from './schema-archive.ts';
export type * from './schema-builds.ts';

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
  /** Changes (from a sequence, by triggers) whenever memberships, lead appointments, performer links or is_admin change. */
  access_version: Generated<string>;
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
  pronouns: string | null;
  phone: string | null;
  emergency_contact_name: string | null;
  emergency_contact_phone: string | null;
  agent_name: string | null;
  agent_contact: string | null;
  notes: string | null;
  portrait_file_id: string | null;
  portrait_thumb_file_id: string | null;
  /** When the performer confirmed `email` as theirs; null while unconfirmed (reset whenever it changes). */
  email_confirmed_at: Date | null;
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
  /** The performer who acted without a sign-in (through a one-time link). */
  actor_performer_id: ColumnType<string | null, string | null | undefined, string | null>;
  /** Whose record the entry is about (a performer), when it is about one. */
  subject_performer_id: ColumnType<string | null, string | null | undefined, string | null>;
  /** The route that made it ("GET /api/consents/:id"). */
  route: ColumnType<string | null, string | null | undefined, string | null>;
}

/** The production and role a person last chose to act in; their next sign-in starts there. */
export interface UserLastSeatsTable {
  user_id: string;
  production_id: string | null;
  role: string;
  chosen_at: Generated<Date>;
}

export interface FilesTable {
  id: Generated<string>;
  purpose: string;
  content_type: string;
  byte_size: number;
  sha256: string;
  storage_path: string;
  width: number | null;
  height: number | null;
  created_by: string | null;
  created_at: Timestamp;
}

export interface Database {
  files: FilesTable;
  consent_templates: ConsentTemplatesTable;
  consent_template_versions: ConsentTemplateVersionsTable;
  signing_requests: SigningRequestsTable;
  signing_bundles: SigningBundlesTable;
  staff_seen: StaffSeenTable;
  health_reviews: HealthReviewsTable;
  consents: ConsentsTable;
  consent_answers: ConsentAnswersTable;
  withdrawal_links: WithdrawalLinksTable;
  bookings: BookingsTable;
  email_confirmations: EmailConfirmationsTable;
  account_invitations: AccountInvitationsTable;
  mail_failures: MailFailuresTable;
  users: UsersTable;
  user_last_seats: UserLastSeatsTable;
  productions: ProductionsTable;
  memberships: MembershipsTable;
  lead_appointments: LeadAppointmentsTable;
  performers: PerformersTable;
  engagements: EngagementsTable;
  sessions: SessionsTable;
  audit_log: AuditLogTable;
  ingredients: IngredientsTable;
  products: ProductsTable;
  product_formulations: ProductFormulationsTable;
  formulation_ingredients: FormulationIngredientsTable;
  product_lots: ProductLotsTable;
  protocols: ProtocolsTable;
  protocol_versions: ProtocolVersionsTable;
  archive_locations: ArchiveLocationsTable;
  casts: CastsTable;
  cast_movements: CastMovementsTable;
  cast_condition_checks: CastConditionChecksTable;
  cast_photos: CastPhotosTable;
  job_once: JobOnceTable;
  rate_limit_hits: RateLimitHitsTable;
  appliance_builds: ApplianceBuildsTable;
  appliance_build_materials: ApplianceBuildMaterialsTable;
  appliance_pieces: AppliancePiecesTable;
  appliance_plans: AppliancePlansTable;
  kits: KitsTable;
  kit_products: KitProductsTable;
  clearance_checks: ClearanceChecksTable;
  lead_requests: LeadRequestsTable;
  applications: ApplicationsTable;
  application_products: ApplicationProductsTable;
  skin_checks: SkinChecksTable;
  incidents: IncidentsTable;
  patch_tests: PatchTestsTable;
  patch_test_products: PatchTestProductsTable;
  patch_test_readings: PatchTestReadingsTable;
  patch_test_photos: PatchTestPhotosTable;
  clearance_overrides: ClearanceOverridesTable;
  clearance_stamps: ClearanceStampsTable;
}

export type UserRow = Selectable<UsersTable>;
export type NewUser = Insertable<UsersTable>;
export type UserUpdate = Updateable<UsersTable>;
export type ProductionRow = Selectable<ProductionsTable>;
