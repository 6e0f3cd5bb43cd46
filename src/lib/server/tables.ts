/**
 * The database's tables as TypeScript sees them: one interface per table, registered with
 * Knex so that `k('users')` is typed and queries need no casts. A migration that adds or
 * changes a column changes its interface here in the same commit.
 */
import type { Role } from '../contract';

/** SQLite answers booleans as 0/1; PostgreSQL as true/false. */
type Bool = boolean | number;

export interface CohortRow {
  id: number;
  name: string;
  graduation_year: number | null;
  demo: Bool;
  created_at: string;
  /** Set when a director archived the cohort: hidden from pickers, kept in every record. */
  archived_at: string | null;
}

export interface UserRow {
  id: number;
  email: string;
  name: string;
  role: Role;
  active: Bool;
  password_hash: string | null;
  /** No longer read: sessions live in `sessions` (kept so old databases need no rebuild). */
  session_version: number;
  cohort_id: number | null;
  demo: Bool;
  /** Review notices wait for one daily digest instead of one e-mail each. */
  mail_digest: Bool;
  created_at: string;
}

export interface AssignmentRow {
  attending_id: number;
  student_id: number;
  created_at: string;
}

export type ReviewStatus = 'open' | 'submitted' | 'approved' | 'returned';

export interface CaseRow {
  id: string;
  student_id: number;
  setting: 'block' | 'extracted' | 'patient';
  tooth: number | null;
  chart_ref: string | null;
  opened_at: string;
  submitted_at: string | null;
  review_status: ReviewStatus;
  /** Set while a `case.discarded` stands: the lifecycle's `discarded` state (review_status is kept beneath it). */
  discarded_at: string | null;
  signed_off_at: string | null;
  updated_at: string;
}

export interface CanalRow {
  id: string;
  case_id: string;
  name: string;
  status: string;
  state_json: string;
  stops: number;
  cautions: number;
  notes: number;
  /** The rules version (RULES_VERSION) and settings version that judged the canal; null before. */
  rules_version: number | null;
  settings_version: number | null;
  updated_at: string;
}

/** The columns of `canals` the projection writes (besides id, case_id). */
export type CanalDerivedRow = Omit<CanalRow, 'id' | 'case_id' | 'updated_at'>;

/** One raising of a finding on a canal, until it is cleared. */
export interface FindingHistoryRow {
  id: number;
  canal_id: string;
  code: string;
  event_id: string | null;
  first_raised_at: string;
  /** Null while the finding is open. */
  cleared_at: string | null;
}

/** The single row (id 1) holding the settings version. */
export interface SettingsVersionRow {
  id: number;
  version: number;
}

/** The background re-judging of unlocked canals. */
export interface RecomputeJobRow {
  name: string;
  rules_version: number;
  settings_version: number;
  /** The last canal id done; null before the first. */
  cursor: string | null;
  finished_at: string | null;
  /** When the re-judging towards these versions began (null on rows written before it was kept). */
  started_at: string | null;
  updated_at: string;
}

export interface EventRow {
  id: string;
  case_id: string;
  canal_id: string | null;
  type: string;
  at: string;
  data_json: string;
  canonical: string;
  user_id: number;
  device_id: string;
  received_at: string;
}

export interface FindingRow {
  id: number;
  canal_id: string;
  case_id: string;
  code: string;
  severity: 'stop' | 'caution' | 'note';
  event_id: string | null;
  message: string;
}

export interface RadiographRow {
  id: string;
  case_id: string;
  canal_id: string | null;
  purpose: 'working-length' | 'maf' | 'cone-fit' | 'fill-check' | 'post-op';
  object_key: string;
  content_type: string;
  size_bytes: number;
  uploaded_by: number;
  uploaded_at: string;
}

export interface SignoffRow {
  id: number;
  case_id: string;
  canal_id: string | null;
  checkpoint: 'cone-fit' | 'fill-check' | 'final';
  decision: 'approved' | 'returned' | 'reopened';
  /** Ratings per canal (`{ [canalId]: { fillLength: 1–4, … } }`); older rows hold other shapes. */
  rubric_json: string | null;
  comment: string | null;
  attending_id: number;
  created_at: string;
  /** The request's client-made id; null on rows written before sign-offs were an API. */
  client_id: string | null;
  /** A final approval superseded by a reopening: when, and the reopening row's id. */
  superseded_at: string | null;
  superseded_by: number | null;
}

export interface CommentRow {
  id: number;
  case_id: string;
  canal_id: string | null;
  event_id: string | null;
  author_id: number;
  text: string;
  created_at: string;
  client_id: string | null;
}

export type MailStatus = 'held' | 'pending' | 'sent' | 'digested';

/** One e-mail waiting to go, or gone (src/lib/server/mail-outbox.ts). */
export interface MailOutboxRow {
  id: string;
  /** Null for e-mail to an address with no account yet (an invitation). */
  recipient_id: number | null;
  to_address: string;
  case_id: string | null;
  kind: string;
  subject: string;
  body_text: string;
  status: MailStatus;
  attempts: number;
  next_attempt_at: string;
  claimed_until: string | null;
  claim_token: string | null;
  sent_at: string | null;
  last_error: string | null;
  digest_id: string | null;
  digest_key: string | null;
  created_at: string;
}

/** An invitation to make an account (src/lib/server/invitations.ts, docs/accounts.md). */
export interface InvitationRow {
  id: number;
  email: string;
  role: Role;
  cohort_id: number | null;
  /** SHA-256 (hex) of the link's token; the token itself is never stored. */
  token_hash: string;
  invited_by: number;
  expires_at: string;
  accepted_at: string | null;
  created_at: string;
  /** The name the director suggested; the invitee may change it. */
  name: string | null;
  /** A student's attendings-to-be, a JSON list of user ids. */
  attending_ids_json: string | null;
  revoked_at: string | null;
  revoked_by: number | null;
  accepted_user_id: number | null;
  sent_count: number;
  last_sent_at: string | null;
}

/** One e-mailed link to set a new password (src/lib/server/password-resets.ts). */
export interface PasswordResetRow {
  id: number;
  user_id: number;
  /** SHA-256 (hex) of the link's token; the token itself is never stored. */
  token_hash: string;
  expires_at: string;
  used_at: string | null;
  created_at: string;
  /** Null when the account holder asked; the director's id when a director sent it. */
  requested_by: number | null;
  /** Set when a newer link for the account replaced this one. */
  superseded_at: string | null;
}

export interface SettingRow {
  key: string;
  value_json: string;
  updated_by: number | null;
  updated_at: string;
}

export interface AuditRow {
  id: number;
  at: string;
  actor_id: number | null;
  action: string;
  subject_type: string | null;
  subject_id: string | null;
  detail_json: string | null;
}

export interface SessionRow {
  id: string;
  user_id: number;
  created_at: string;
  expires_at: string;
  ended_at: string | null;
  ended_by: string | null;
}

/** rate-limiter-flexible's own columns (points consumed; expiry in epoch milliseconds). */
export interface SigninLimitRow {
  key: string;
  points: number;
  expire: number | null;
}

/** The public routes' rate-limiter counters (src/lib/server/public-limits.ts). */
export type PublicLimitRow = SigninLimitRow;

export interface RequestIdRow {
  id: string;
  user_id: number;
  route: string;
  body_hash: string;
  status: number;
  answer_json: string;
  at: string;
}

declare module 'knex/types/tables' {
  interface Tables {
    cohorts: CohortRow;
    users: UserRow;
    assignments: AssignmentRow;
    cases: CaseRow;
    canals: CanalRow;
    events: EventRow;
    findings: FindingRow;
    radiographs: RadiographRow;
    signoffs: SignoffRow;
    comments: CommentRow;
    invitations: InvitationRow;
    password_resets: PasswordResetRow;
    settings: SettingRow;
    audit_log: AuditRow;
    sessions: SessionRow;
    signin_limits: SigninLimitRow;
    public_limits: PublicLimitRow;
    request_ids: RequestIdRow;
    finding_history: FindingHistoryRow;
    settings_version: SettingsVersionRow;
    recompute_jobs: RecomputeJobRow;
    mail_outbox: MailOutboxRow;
  }
}
