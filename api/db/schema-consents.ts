// Consents, signing, sessions (bookings) and mail kept for the Outbox: database types kept by hand in step with migrations/ (one interface per table).
import type { ColumnType, Generated } from 'kysely';

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>;

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
  /** The whole message (attachments base64-encoded), to send again as it was; sealed (sealJson) as a JSON string. */
  message: ColumnType<unknown, string, string>;
  recipients: string;
  subject: string;
  error: string;
  attempts: Generated<number>;
  failed_at: Timestamp;
  sent_at: Date | null;
}
