// Table types for Kysely, following its getting-started rules: one interface per table,
// Generated<> for columns the database fills in, nullable columns as `T | null`.
import type { ColumnType, Generated } from 'kysely';

type Timestamp = ColumnType<Date, Date | string | undefined, never>;
/** A column the database fills in and that nothing may ever write. */
type Assigned<T> = ColumnType<T, never, never>;
/** Columns of append-only tables: written once on insert, never updated. */
type Once<T> = ColumnType<T, T, never>;

export type ProjectRole = 'originator' | 'checker' | 'approver' | 'controller' | 'viewer';
type RevisionScheme = 'letters' | 'numbers';

interface UsersTable {
  id: Generated<string>;
  email: string;
  display_name: string;
  password_hash: string | null;
  is_admin: Generated<boolean>;
  disabled_at: Date | null;
  locked_at: Date | null;
  /** When a timed lock ends; null with locked_at set means locked until an administrator unlocks. */
  lock_expires_at: Date | null;
  failed_sign_ins: Generated<number>;
  password_changed_at: Date | null;
  created_at: Timestamp;
}

export type SignInMethod = 'password' | 'link' | 'oidc';

interface SessionsTable {
  id: Generated<string>;
  user_id: string;
  method: SignInMethod;
  created_at: Timestamp;
  last_seen_at: ColumnType<Date, Date | string | undefined, Date | string>;
  ended_at: Date | null;
  ended_reason: string | null;
  ip: string | null;
  user_agent: string | null;
}

interface SignInAttemptsTable {
  id: Generated<string>;
  email: string;
  ip: string;
  method: string;
  ok: boolean;
  at: Timestamp;
}

export type EmailTokenPurpose = 'sign-in' | 'password-reset' | 'invitation' | 'unlock';

interface EmailTokensTable {
  id: Generated<string>;
  user_id: string;
  purpose: EmailTokenPurpose;
  token_hash: string;
  created_at: Timestamp;
  expires_at: Date;
  used_at: Date | null;
}

interface ApiTokensTable {
  id: Generated<string>;
  user_id: string;
  name: string;
  token_hash: string;
  prefix: string;
  created_at: Timestamp;
  last_used_at: Date | null;
  revoked_at: Date | null;
  /** 'read': GET requests only; 'read-write': any request (signing still asks for the password). */
  scope: ColumnType<ApiTokenScope, ApiTokenScope | undefined, ApiTokenScope>;
  expires_at: ColumnType<Date, Date | string | undefined, Date | string>;
}

export type ApiTokenScope = 'read' | 'read-write';

interface ProjectsTable {
  id: Generated<string>;
  code: string;
  name: string;
  legal_owner: string;
  revision_scheme: ColumnType<RevisionScheme, RevisionScheme | undefined, RevisionScheme>;
  created_by: string | null;
  created_at: Timestamp;
}

interface ProjectMembersTable {
  project_id: string;
  user_id: string;
  role: ProjectRole;
  granted_by: string | null;
  granted_at: Timestamp;
}

interface SheetsTable {
  id: Generated<string>;
  project_id: string;
  number: number;
  title: string;
  safety_related: Generated<boolean>;
  created_by: string;
  created_at: Timestamp;
  updated_at: ColumnType<Date, Date | string | undefined, Date | string>;
  /** Set once, with who and why, when a sheet never issued is voided (lib/sheets/void.ts); never cleared. */
  voided_at: ColumnType<Date | null, never, Date | string>;
  voided_by: ColumnType<string | null, never, string>;
  void_reason: ColumnType<string | null, never, string>;
  /** A worked sheet offered to start new sheets from (demo starters); set when the sheet is made. */
  starter: Generated<boolean>;
  /** The exact version a sheet was started from (lib/sheets/start-from.ts); set at creation, never changed. */
  started_from_version_id: ColumnType<string | null, string | null | undefined, never>;
}

interface VersionsTable {
  id: Generated<string>;
  sheet_id: Once<string>;
  number: Once<number>;
  parent_number: Once<number | null>;
  content: ColumnType<unknown, string, never>;
  content_hash: Once<string>;
  /** Results as one document: versions saved before results were stored by cell (read through version_results). */
  results: ColumnType<unknown | null, string | null | undefined, never>;
  /** The results without their cells, and the digests of their cells in result_cells (lib/sheets/result-storage.ts). */
  result_head: ColumnType<unknown | null, string | null | undefined, never>;
  result_cells: ColumnType<Buffer | null, Buffer | null | undefined, never>;
  engine_version: Once<string | null>;
  constants_edition: Once<string | null>;
  author_id: Once<string>;
  message: ColumnType<string, string | undefined, never>;
  created_at: Timestamp;
}

/** One cell's result, stored once for every version whose results hold it; never changed. */
interface ResultCellsTable {
  hash: ColumnType<Buffer, Buffer, never>;
  result: ColumnType<unknown, string, never>;
}

interface AttachmentsTable {
  id: Generated<string>;
  sheet_id: Once<string>;
  project_id: Once<string>;
  name: Once<string>;
  media_type: Once<string>;
  /** bigint: pg returns it as a string. */
  size: ColumnType<string, number, never>;
  sha256: Once<string>;
  storage_key: Once<string>;
  table_data: ColumnType<unknown | null, string | null, never>;
  uploaded_by: Once<string>;
  created_at: Timestamp;
}

export type CheckState = 'in_check' | 'returned' | 'checked' | 'approved' | 'approval_returned';
export type VerificationMethod = 'design_review' | 'alternate_calculation' | 'qualification_test';
export type SignatureMeaning = 'prepared' | 'checked' | 'approved' | 'issued';

interface ChecksTable {
  id: Generated<string>;
  sheet_id: Once<string>;
  project_id: Once<string>;
  version_number: Once<number>;
  version_sha256: Once<string>;
  base_version_number: Once<number | null>;
  submitted_by: Once<string>;
  checker_id: Once<string>;
  state: Generated<CheckState>;
  verification_method: VerificationMethod | null;
  checker_notes: Generated<string>;
  alternate_cells: ColumnType<unknown, string | undefined, string>;
  alternate_results: ColumnType<unknown | null, string | null | undefined, string | null>;
  /** The checker's relative tolerance for the alternate comparison, and as written ("0.1 %"). */
  tolerance: number | null;
  tolerance_text: string | null;
  /** Work carried over from the returned check of an earlier version (lib/checks/carry-over.ts). */
  carried_over: ColumnType<unknown | null, string | null | undefined, string | null>;
  /** What the originator acknowledged in writing on submitting (lib/checks/submission-findings.ts); immutable. */
  acknowledgements: ColumnType<unknown, string | undefined, never>;
  return_reason: string | null;
  decided_by: string | null;
  created_at: Timestamp;
  updated_at: ColumnType<Date, Date | string | undefined, Date | string>;
  closed_at: ColumnType<Date | null, Date | string | null | undefined, Date | string | null>;
}

interface SignaturesTable {
  id: Generated<string>;
  sheet_id: Once<string>;
  version_number: Once<number>;
  version_sha256: Once<string>;
  check_id: Once<string | null>;
  user_id: Once<string>;
  printed_name: Once<string>;
  meaning: Once<SignatureMeaning>;
  signed_at: Timestamp;
}

interface CheckCommentsTable {
  id: Generated<string>;
  check_id: Once<string>;
  thread_id: Once<string | null>;
  cell_id: Once<string>;
  statement_line: Once<number | null>;
  author_id: Once<string>;
  body: Once<string>;
  created_at: Timestamp;
  resolved_at: ColumnType<Date | null, never, Date | string>;
  resolved_by: ColumnType<string | null, never, string>;
}

export type RevisionStatus = 'current' | 'superseded' | 'withdrawn';

interface IssueJobsTable {
  id: Generated<string>;
  sheet_id: Once<string>;
  project_id: Once<string>;
  version_number: Once<number>;
  version_sha256: Once<string>;
  check_id: Once<string>;
  revision_code: Once<string>;
  revision_sequence: Once<number>;
  verification_code: Once<string>;
  requested_by: Once<string>;
  signed_at: ColumnType<Date, Date | string, never>;
  state: Generated<'pending' | 'done' | 'failed'>;
  step: Generated<string>;
  pdf_key: string | null;
  error: string | null;
  revision_id: string | null;
  created_at: Timestamp;
  finished_at: ColumnType<Date | null, Date | string | null | undefined, Date | string | null>;
  /** The job worker working the request, and until when (renewed while it works; lib/issue/job.ts). */
  lease_owner: string | null;
  lease_expires_at: ColumnType<Date | null, Date | string | null | undefined, Date | string | null>;
}

interface RevisionsTable {
  id: Generated<string>;
  sheet_id: Once<string>;
  project_id: Once<string>;
  version_number: Once<number>;
  version_sha256: Once<string>;
  check_id: Once<string>;
  issue_job_id: Once<string>;
  code: Once<string>;
  sequence: Once<number>;
  status: Generated<RevisionStatus>;
  issued_by: Once<string>;
  issued_at: ColumnType<Date, Date | string, never>;
  pdf_key: Once<string>;
  pdf_sha256: Once<string>;
  pdf_size: ColumnType<string, number, never>;
  verification_code: Once<string>;
  superseded_by: string | null;
  superseded_at: ColumnType<Date | null, Date | string | null | undefined, Date | string | null>;
  stamped_key: string | null;
  stamped_sha256: string | null;
  withdrawn_at: ColumnType<Date | null, Date | string | null | undefined, Date | string | null>;
  withdrawn_by: string | null;
  withdrawn_reason: string | null;
}

/** A version's citation of a named result of an issued revision (immutable, like the version). */
interface VersionReferencesTable {
  version_id: Once<string>;
  revision_id: Once<string>;
  name: Once<string>;
}

interface AuditEventsTable {
  id: Assigned<string>;
  occurred_at: Assigned<Date>;
  actor_id: Once<string | null>;
  project_id: Once<string | null>;
  action: Once<string>;
  object_type: Once<string>;
  object_id: Once<string | null>;
  old_value: ColumnType<unknown | null, string | null | undefined, never>;
  new_value: ColumnType<unknown | null, string | null | undefined, never>;
  reason: ColumnType<string | null, string | null | undefined, never>;
  prev_hash: Assigned<string>;
  hash: Assigned<string>;
  session_id: ColumnType<string | null, string | null | undefined, never>;
  token_id: ColumnType<string | null, string | null | undefined, never>;
}

/** A Content-Security-Policy violation report a browser sent (lib/http/csp-reports.ts). */
interface CspReportsTable {
  id: Generated<string>;
  received_at: Generated<Date>;
  ip: string;
  document_uri: string | null;
  blocked_uri: string | null;
  directive: string | null;
  disposition: string | null;
  report: ColumnType<unknown, string, never>;
}

/** Verification requests per client address in the current fixed window (lib/issue/verify-rate-limit.ts). */
interface VerifyRateLimitsTable {
  address: string;
  window_started_at: Generated<Date>;
  requests: number;
}

export interface Database {
  users: UsersTable;
  projects: ProjectsTable;
  project_members: ProjectMembersTable;
  sheets: SheetsTable;
  versions: VersionsTable;
  result_cells: ResultCellsTable;
  attachments: AttachmentsTable;
  checks: ChecksTable;
  signatures: SignaturesTable;
  check_comments: CheckCommentsTable;
  issue_jobs: IssueJobsTable;
  revisions: RevisionsTable;
  version_references: VersionReferencesTable;
  audit_events: AuditEventsTable;
  sessions: SessionsTable;
  sign_in_attempts: SignInAttemptsTable;
  email_tokens: EmailTokensTable;
  api_tokens: ApiTokensTable;
  verify_rate_limits: VerifyRateLimitsTable;
  csp_reports: CspReportsTable;
}
