// Database types, kept by hand in step with migrations/ (one interface per table).
import type { ColumnType, Generated, Insertable, Selectable, Updateable } from 'kysely';
import type { ApplicationProductsTable, ApplicationsTable, ClearanceChecksTable, IncidentsTable, KitProductsTable, KitsTable, LeadRequestsTable, SkinChecksTable } from './schema-applications.ts';
import type { ClearanceOverridesTable, PatchTestPhotosTable, PatchTestProductsTable, PatchTestReadingsTable, PatchTestsTable } from './schema-patch-tests.ts';

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

export type ConsentKindCol = 'life_casting' | 'patch_testing' | 'application' | 'cast_storage' | 'health_data';

export interface ConsentTemplatesTable {
  id: Generated<string>;
  kind: ConsentKindCol;
  current_version: Generated<number>;
  archived: Generated<boolean>;
  created_at: Timestamp;
}

export interface ConsentTemplateVersionsTable {
  id: Generated<string>;
  template_id: string;
  version: number;
  title: string;
  body: string;
  questions: ColumnType<unknown, string, string>;
  validity_days: number | null;
  created_by: string | null;
  created_at: Timestamp;
}

export interface SigningRequestsTable {
  id: Generated<string>;
  performer_id: string;
  production_id: string | null;
  template_id: string;
  mode: 'tablet' | 'link';
  token_hash: string | null;
  expires_at: Timestamp;
  status: ColumnType<'open' | 'signed' | 'cancelled', 'open' | 'signed' | 'cancelled' | undefined>;
  created_by: string | null;
  created_at: Timestamp;
  opened_at: Date | null;
  signed_at: Date | null;
  bundle_id: ColumnType<string | null, string | null | undefined, string | null>;
  bundle_position: ColumnType<number | null, number | null | undefined, number | null>;
}

export interface SigningBundlesTable {
  id: Generated<string>;
  performer_id: string;
  production_id: string | null;
  mode: 'tablet' | 'link';
  token_hash: string | null;
  expires_at: Timestamp;
  created_by: string | null;
  created_at: Timestamp;
}

export interface StaffSeenTable {
  user_id: string;
  production_id: string;
  topic: 'withdrawals';
  seen_at: Timestamp;
}

export interface HealthReviewsTable {
  performer_id: string;
  production_id: string;
  reviewed_by: string | null;
  reviewed_at: Timestamp;
}

export interface ConsentsTable {
  id: Generated<string>;
  performer_id: string;
  production_id: string | null;
  template_version_id: string;
  kind: ConsentKindCol;
  request_id: string | null;
  idempotency_key: string;
  signer_name: string;
  signed_at: Timestamp;
  expires_at: Date | null;
  signing_method: 'tablet' | 'link';
  ip: string | null;
  user_agent: string | null;
  staff_user_id: string | null;
  signature_file_id: string;
  pdf_file_id: string;
  pdf_sha256: string;
  /** The rendering without health answers, for staff; made at signing (or on first request for older consents). */
  staff_pdf_file_id: ColumnType<string | null, string | null | undefined, string | null>;
  staff_pdf_sha256: ColumnType<string | null, string | null | undefined, string | null>;
  content_sha256: string;
  withdrawn_at: Date | null;
  withdrawn_by_user_id: string | null;
  withdrawn_via: 'performer' | 'lead' | 'link' | null;
  withdrawal_reason: string | null;
  version: Generated<number>;
}

export interface ConsentAnswersTable {
  id: Generated<string>;
  consent_id: string;
  question_id: string;
  question_label: string;
  medical: boolean;
  answer: ColumnType<unknown, string, string>;
}

export interface WithdrawalLinksTable {
  id: Generated<string>;
  performer_id: string;
  token_hash: string;
  expires_at: Timestamp;
  used_at: Date | null;
  created_at: Timestamp;
}

export interface EmailConfirmationsTable {
  id: Generated<string>;
  performer_id: string;
  email: string;
  token_hash: string;
  expires_at: Timestamp;
  created_by: string | null;
  created_at: Timestamp;
  used_at: Date | null;
}

export interface AccountInvitationsTable {
  id: Generated<string>;
  performer_id: string;
  email: string;
  token_hash: string;
  expires_at: Timestamp;
  created_by: string | null;
  created_at: Timestamp;
  accepted_at: Date | null;
  accepted_user_id: string | null;
}

export interface BookingsTable {
  id: Generated<string>;
  performer_id: string;
  production_id: string;
  purpose: 'patch_test' | 'life_cast' | 'application';
  starts_at: Timestamp;
  location: string | null;
  status: ColumnType<'booked' | 'cancelled' | 'done', 'booked' | 'cancelled' | 'done' | undefined>;
  created_by: string | null;
  ends_at: ColumnType<Date | null, Date | string | null | undefined, Date | string | null>;
  artist_user_id: ColumnType<string | null, string | null | undefined, string | null>;
  created_at: Timestamp;
  /** The SEQUENCE of the calendar invitation last sent: 0 when booked, one more for each change or the cancellation. */
  invitation_sequence: Generated<number>;
}

export interface MailFailuresTable {
  id: Generated<string>;
  /** The whole message (attachments base64-encoded), to send again as it was. */
  message: ColumnType<unknown, string, string>;
  recipients: string;
  subject: string;
  error: string;
  attempts: Generated<number>;
  failed_at: Timestamp;
  sent_at: Date | null;
}

export type AllergenGroupCol = 'acrylates' | 'rosin' | 'latex' | 'rubber_accelerators' | 'fragrance' | 'preservatives' | 'solvents' | 'silicones' | 'pigments' | 'other';
export type ProductCategoryCol = 'adhesive' | 'remover' | 'sealer' | 'barrier' | 'paint' | 'pigment' | 'silicone' | 'foam_latex' | 'cap_material' | 'cleanser' | 'powder' | 'other';
export type TestKindCol = 'department_use' | 'repeated_open' | 'occluded_patch' | 'short_contact';

export interface IngredientsTable {
  id: Generated<string>;
  inci: string;
  /** normaliseInciName(inci). */
  inci_key: string;
  synonyms: ColumnType<string[], string[] | undefined, string[]>;
  /** The normalised INCI name and synonyms; no key belongs to two ingredients. */
  name_keys: string[];
  cas: string | null;
  allergen_group: AllergenGroupCol;
  trivial: Generated<boolean>;
  created_by: string | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  version: Generated<number>;
}

export interface ProductsTable {
  id: Generated<string>;
  name: string;
  maker: string | null;
  category: ProductCategoryCol;
  exposure: 'leave_on' | 'rinse_off';
  density_g_per_cm3: number | null;
  mix_ratio_a: number | null;
  mix_ratio_b: number | null;
  max_softener_percent: number | null;
  /** Null only inside the transaction that creates the product. */
  current_formulation_id: string | null;
  sds_file_id: string | null;
  sds_file_name: string | null;
  sds_uploaded_at: Date | null;
  sds_uploaded_by: string | null;
  created_by: string | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  version: Generated<number>;
}

export interface ProductFormulationsTable {
  id: Generated<string>;
  product_id: string;
  version: number;
  /** The list as pasted; null while the ingredients are not recorded. */
  inci_label: string | null;
  note: string | null;
  created_by: string | null;
  created_at: Timestamp;
}

export interface FormulationIngredientsTable {
  formulation_id: string;
  /** 0-based, in label order. */
  position: number;
  label_name: string;
  /** Null while the vocabulary lacks the name. */
  ingredient_id: string | null;
  may_contain: Generated<boolean>;
}

export interface ProductLotsTable {
  id: Generated<string>;
  product_id: string;
  formulation_id: string;
  code: string;
  /** Last day of use (YYYY-MM-DD). */
  expires_on: ColumnType<string, string, string>;
  retired_at: Date | null;
  retired_by: string | null;
  created_by: string | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  version: Generated<number>;
}

export interface ProtocolsTable {
  /** The protocol's slug, e.g. "occluded-48h". */
  id: string;
  current_version: Generated<number>;
  created_at: Timestamp;
  updated_at: Timestamp;
}

export interface ProtocolVersionsTable {
  /** What a booked test stores, so it keeps the protocol it was booked with. */
  id: Generated<string>;
  protocol_id: string;
  version: number;
  name: string;
  kind: TestKindCol;
  description: string;
  occlusion_minutes: number | null;
  applications: ColumnType<unknown, string, string>;
  readings: ColumnType<unknown, string, string>;
  created_by: string | null;
  created_at: Timestamp;
}

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
}

export type UserRow = Selectable<UsersTable>;
export type NewUser = Insertable<UsersTable>;
export type UserUpdate = Updateable<UsersTable>;
export type ProductionRow = Selectable<ProductionsTable>;
