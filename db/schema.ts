/**
 * Table types for Kysely. One interface per table, collected into `Database`.
 *
 * The four authentication tables ("User", "Account", "Session", "VerificationToken") keep the
 * names and camelCase columns that @auth/kysely-adapter expects; every table of our own is
 * snake_case. pg returns bigint and numeric as strings, so such columns are typed as strings
 * and parsed on purpose where they are used.
 */
import type { ColumnType, Generated, Insertable, Selectable, Updateable } from 'kysely';

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>;
type NullableTimestamp = ColumnType<Date | null, Date | string | null | undefined, Date | string | null>;
type Json<T> = ColumnType<T, string, string>;

export const WORKSPACE_ROLES = ['admin', 'member'] as const;
export type WorkspaceRole = (typeof WORKSPACE_ROLES)[number];

export const STUDY_ROLES = ['owner', 'editor', 'consultant', 'writer', 'viewer'] as const;
export type StudyRole = (typeof STUDY_ROLES)[number];

export const STUDY_STATUSES = ['draft', 'in-review', 'signed-off', 'archived'] as const;
export type StudyStatus = (typeof STUDY_STATUSES)[number];

export const EMAIL_TOKEN_PURPOSES = ['verify-email', 'reset-password'] as const;
export type EmailTokenPurpose = (typeof EMAIL_TOKEN_PURPOSES)[number];

export interface UserTable {
  id: string;
  name: string | null;
  email: string;
  emailVerified: NullableTimestamp;
  image: string | null;
  createdAt: Generated<Date>;
}

export interface AccountTable {
  id: Generated<string>;
  userId: string;
  type: string;
  provider: string;
  providerAccountId: string;
  refresh_token: string | null;
  access_token: string | null;
  expires_at: number | null;
  token_type: string | null;
  scope: string | null;
  id_token: string | null;
  session_state: string | null;
}

export interface SessionTable {
  id: Generated<string>;
  sessionToken: string;
  userId: string;
  expires: Timestamp;
}

export interface VerificationTokenTable {
  identifier: string;
  token: string;
  expires: Timestamp;
}

export interface UserCredentialTable {
  user_id: string;
  password_hash: string;
  updated_at: Generated<Date>;
}

export interface EmailTokenTable {
  id: Generated<string>;
  user_id: string;
  purpose: EmailTokenPurpose;
  token_hash: string;
  expires_at: Timestamp;
  used_at: NullableTimestamp;
  created_at: Generated<Date>;
}

export interface WorkspaceTable {
  id: Generated<string>;
  name: string;
  slug: string;
  created_by: string | null;
  created_at: Generated<Date>;
}

export interface WorkspaceMemberTable {
  workspace_id: string;
  user_id: string;
  role: WorkspaceRole;
  created_at: Generated<Date>;
}

export interface InvitationTable {
  id: Generated<string>;
  workspace_id: string;
  study_id: string | null;
  email: string;
  workspace_role: WorkspaceRole;
  study_role: StudyRole | null;
  token_hash: string;
  invited_by: string | null;
  expires_at: Timestamp;
  accepted_at: NullableTimestamp;
  accepted_by: string | null;
  revoked_at: NullableTimestamp;
  created_at: Generated<Date>;
  /** The message that carries the current link (lib/mail/queue.ts). */
  mail_id: Generated<string | null>;
}

export interface StudyTable {
  id: Generated<string>;
  workspace_id: string;
  title: string;
  description: Generated<string>;
  status: Generated<StudyStatus>;
  /** Number of the newest revision; 0 before the first save. */
  current_revision: Generated<number>;
  created_by: string | null;
  created_at: Generated<Date>;
  updated_at: Generated<Date>;
  archived_at: NullableTimestamp;
}

export interface StudyMemberTable {
  study_id: string;
  user_id: string;
  role: StudyRole;
  created_at: Generated<Date>;
}

export interface StudyRevisionTable {
  id: Generated<string>;
  study_id: string;
  number: number;
  design: Json<unknown>;
  note: string | null;
  author_id: string | null;
  created_at: Generated<Date>;
  /** Findings and recommendation computed from this design when it was saved. */
  checks: ColumnType<unknown | null, string | null | undefined, string | null>;
  /** The version this save belongs to (study_versions.number). */
  version_number: ColumnType<number | null, number | null | undefined, number | null>;
}

/** Why a version was closed (db/repositories/versions.ts). */
export const VERSION_CLOSE_REASONS = ['idle', 'other-author', 'named', 'signoff', 'restore', 'left', 'suggestion', 'backfill'] as const;
export type VersionCloseReason = (typeof VERSION_CLOSE_REASONS)[number];

/** One person's continuous editing of a design: revisions first_revision..last_revision. */
export interface StudyVersionTable {
  study_id: string;
  number: number;
  first_revision: number;
  last_revision: number;
  saves: Generated<number>;
  author_id: string | null;
  co_author_id: string | null;
  suggestion_id: string | null;
  restored_from: number | null;
  name: string | null;
  named_by: string | null;
  named_at: NullableTimestamp;
  opened_at: Timestamp;
  last_saved_at: Timestamp;
  closed_at: NullableTimestamp;
  close_reason: VersionCloseReason | null;
}

export interface StudySignoffTable {
  id: Generated<string>;
  study_id: string;
  version_number: number;
  revision_number: number;
  signer_id: string | null;
  statement: string;
  conditions: string | null;
  created_at: Generated<Date>;
  withdrawn_at: NullableTimestamp;
  withdrawn_by: string | null;
  withdrawal_reason: string | null;
}

export const FINDING_NOTE_STATUSES = ['addressed', 'reopened'] as const;
export type FindingNoteStatus = (typeof FINDING_NOTE_STATUSES)[number];

export interface FindingNoteTable {
  id: Generated<string>;
  study_id: string;
  rule_id: string;
  finding_key: string;
  status: FindingNoteStatus;
  reason: string;
  revision_number: number;
  actor_id: string | null;
  created_at: Generated<Date>;
}

export interface ActivityTable {
  /** bigserial: returned by pg as a string. */
  id: Generated<string>;
  workspace_id: string | null;
  study_id: string | null;
  actor_id: string | null;
  action: string;
  details: Json<Record<string, unknown>>;
  created_at: Generated<Date>;
}

/** A paced allowance (lib/rate-limit.ts): attempts so far, spaced window/limit apart, reach `paced_until`. */
export interface RateLimitTable {
  key: string;
  paced_until: Timestamp;
  window_seconds: number;
}

export const MAIL_STATUSES = ['queued', 'sending', 'sent', 'retrying', 'failed', 'suppressed'] as const;
export type MailStatus = (typeof MAIL_STATUSES)[number];

/** One outgoing message (lib/mail/queue.ts); text and html are erased once it is sent. */
export interface MailTable {
  id: Generated<string>;
  idempotency_key: string;
  kind: string;
  recipient: string;
  subject: string;
  text: string | null;
  html: string | null;
  status: Generated<MailStatus>;
  attempts: Generated<number>;
  last_error: string | null;
  claimed_at: NullableTimestamp;
  sent_at: NullableTimestamp;
  created_at: Generated<Date>;
  updated_at: Generated<Date>;
  /** Extra header lines (List-Unsubscribe on notifications); null for none. */
  headers: ColumnType<Record<string, string> | null, string | null | undefined, string | null>;
}

export const NOTIFICATION_DELIVERIES = ['immediate', 'digest', 'none'] as const;
export type NotificationDelivery = (typeof NOTIFICATION_DELIVERIES)[number];

/** One recipient's copy of a review event (lib/notifications/notify.ts). */
export interface NotificationTable {
  id: Generated<string>;
  recipient_id: string;
  study_id: string;
  actor_id: string | null;
  kind: string;
  subject: string;
  text: string;
  /** Path inside the app that shows the thing. */
  path: string;
  dedupe_key: string;
  /** The recipient's choice when it happened. */
  delivery: NotificationDelivery;
  /** The message that carried it (immediate, or the digest's). */
  mail_id: string | null;
  /** When an immediate message was queued for it or a digest took it. */
  delivered_at: NullableTimestamp;
  created_at: Generated<Date>;
}

/** A person's choice per kind of notification; no row means the kind's default. */
export interface NotificationSettingTable {
  user_id: string;
  kind: string;
  delivery: NotificationDelivery;
  updated_at: Generated<Date>;
}

export const SIMULATION_STATUSES = ['queued', 'running', 'done', 'failed', 'cancelled'] as const;
export type SimulationStatus = (typeof SIMULATION_STATUSES)[number];

export interface SimulationTable {
  id: Generated<string>;
  /** Null for a run from a compact specification: it belongs to its creator alone. */
  study_id: string | null;
  revision_number: number | null;
  created_by: string | null;
  spec: Json<unknown>;
  status: Generated<SimulationStatus>;
  replicates_total: number;
  replicates_done: Generated<number>;
  chunk_size: number;
  chunk_count: number;
  /** pg-boss job ids of the chunks (withdrawn when the run is cancelled). */
  job_ids: ColumnType<string[], string[] | undefined, string[]>;
  /** The run's place in the fair queue: its k-th chunk is served at turn first_turn + k (null: queued before turns). */
  first_turn: ColumnType<number | null, number | null | undefined, number | null>;
  error: string | null;
  results: ColumnType<unknown | null, string | null | undefined, string | null>;
  started_at: NullableTimestamp;
  finished_at: NullableTimestamp;
  created_at: Generated<Date>;
}

export interface SimulationChunkTable {
  simulation_id: string;
  scenario_index: number;
  chunk_index: number;
  replicate_from: number;
  replicate_to: number;
  /** Per-replicate results of the chunk, encoded by lib/jobs/codec.ts. */
  results: Buffer;
  finished_at: Generated<Date>;
}

export interface PlanResultTable {
  /** bigserial: returned by pg as a string. */
  id: Generated<string>;
  study_id: string;
  /** The design revision the result was computed from. */
  revision_number: number;
  kind: string;
  request: Json<unknown>;
  output: Json<unknown>;
  note: string | null;
  created_by: string | null;
  created_at: Generated<Date>;
}

/** A write's Idempotency-Key and the answer it got (lib/api/idempotency.ts); kept 24 hours. */
export interface IdempotencyKeyTable {
  user_id: string;
  key: string;
  method: string;
  path: string;
  request_hash: string;
  /** Null only inside the transaction that claimed the key, never in a committed row. */
  response_status: number | null;
  response_body: string | null;
  created_at: Generated<Date>;
}

export const THREAD_ANCHOR_KINDS = ['section', 'field', 'finding', 'plan', 'simulation'] as const;
export type ThreadAnchorKind = (typeof THREAD_ANCHOR_KINDS)[number];
export const THREAD_STATUSES = ['open', 'resolved'] as const;
export type ThreadStatus = (typeof THREAD_STATUSES)[number];
export const SUGGESTION_STATUSES = ['pending', 'accepted', 'declined'] as const;
export type SuggestionStatus = (typeof SUGGESTION_STATUSES)[number];

/** A review thread, anchored to one part of a study (issue 12). */
export interface ReviewThreadTable {
  id: Generated<string>;
  study_id: string;
  anchor_kind: ThreadAnchorKind;
  /** The anchor in one string (`field:outcome.name`, `finding:<rule>:<key>`, `plan:<id>`, …). */
  anchor_key: string;
  anchor: Json<Record<string, unknown>>;
  anchor_label: string;
  /** A fingerprint of the anchored content when the thread started; null for results. */
  anchor_fingerprint: string | null;
  revision_number: number;
  status: Generated<ThreadStatus>;
  created_by: string | null;
  created_at: Generated<Date>;
  resolved_by: string | null;
  resolved_at: NullableTimestamp;
  last_activity_at: Generated<Date>;
}

export interface ReviewCommentTable {
  id: Generated<string>;
  thread_id: string;
  /** bigserial: returned by pg as a string; orders the comments of a thread. */
  seq: Generated<string>;
  author_id: string | null;
  body: string;
  mentions: ColumnType<string[], string[] | undefined, string[]>;
  created_at: Generated<Date>;
}

/** A proposed change to one field of the design, decided once. */
export interface ReviewSuggestionTable {
  id: Generated<string>;
  study_id: string;
  field_path: string;
  field_label: string;
  old_value: Json<unknown>;
  new_value: Json<unknown>;
  reason: string;
  revision_number: number;
  status: Generated<SuggestionStatus>;
  created_by: string | null;
  created_at: Generated<Date>;
  decided_by: string | null;
  decided_at: NullableTimestamp;
  decision_reason: string | null;
  accepted_revision: number | null;
}

export interface Database {
  User: UserTable;
  Account: AccountTable;
  Session: SessionTable;
  VerificationToken: VerificationTokenTable;
  user_credentials: UserCredentialTable;
  email_tokens: EmailTokenTable;
  workspaces: WorkspaceTable;
  workspace_members: WorkspaceMemberTable;
  invitations: InvitationTable;
  studies: StudyTable;
  study_members: StudyMemberTable;
  study_revisions: StudyRevisionTable;
  study_versions: StudyVersionTable;
  study_signoffs: StudySignoffTable;
  activity_log: ActivityTable;
  rate_limits: RateLimitTable;
  mail: MailTable;
  finding_notes: FindingNoteTable;
  plan_results: PlanResultTable;
  simulations: SimulationTable;
  simulation_chunks: SimulationChunkTable;
  idempotency_keys: IdempotencyKeyTable;
  review_threads: ReviewThreadTable;
  review_comments: ReviewCommentTable;
  review_suggestions: ReviewSuggestionTable;
  notifications: NotificationTable;
  notification_settings: NotificationSettingTable;
}

export type UserRow = Selectable<UserTable>;
export type NewUser = Insertable<UserTable>;
export type WorkspaceRow = Selectable<WorkspaceTable>;
export type InvitationRow = Selectable<InvitationTable>;
export type NewInvitation = Insertable<InvitationTable>;
export type StudyRow = Selectable<StudyTable>;
export type NewStudy = Insertable<StudyTable>;
export type StudyUpdate = Updateable<StudyTable>;
export type StudyRevisionRow = Selectable<StudyRevisionTable>;
export type ActivityRow = Selectable<ActivityTable>;
export type SimulationRow = Selectable<SimulationTable>;
