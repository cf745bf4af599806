import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.

export async function up(db: Kysely<any>): Promise<void> {
  // A request to issue an approved version; the issuing job works it through to a revision. The
  // signature time is fixed when the controller signs, so a retried job makes the same record.
  await db.schema
    .createTable('issue_jobs')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('sheet_id', 'uuid', (c) => c.notNull().references('sheets.id'))
    .addColumn('project_id', 'uuid', (c) => c.notNull().references('projects.id'))
    .addColumn('version_number', 'integer', (c) => c.notNull())
    .addColumn('version_sha256', 'text', (c) => c.notNull())
    .addColumn('check_id', 'uuid', (c) => c.notNull().references('checks.id'))
    .addColumn('revision_code', 'text', (c) => c.notNull())
    .addColumn('revision_sequence', 'integer', (c) => c.notNull())
    .addColumn('verification_code', 'text', (c) => c.notNull().unique())
    .addColumn('requested_by', 'uuid', (c) => c.notNull().references('users.id'))
    .addColumn('signed_at', 'timestamptz', (c) => c.notNull())
    .addColumn('state', 'text', (c) =>
      c
        .notNull()
        .defaultTo('pending')
        .check(sql`state in ('pending', 'done', 'failed')`),
    )
    .addColumn('step', 'text', (c) => c.notNull().defaultTo('queued'))
    .addColumn('pdf_key', 'text')
    .addColumn('error', 'text')
    .addColumn('revision_id', 'uuid')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('finished_at', 'timestamptz')
    .addForeignKeyConstraint('issue_jobs_version_fkey', ['sheet_id', 'version_number'], 'versions', [
      'sheet_id',
      'number',
    ])
    .execute();
  await sql`create unique index issue_jobs_one_pending_per_sheet on issue_jobs (sheet_id) where state = 'pending'`.execute(
    db,
  );

  // An issued revision: an approved version, its code, its signed PDF (in object storage, by its
  // SHA-256), its status. Only the status moves: current → superseded, or to withdrawn with a reason.
  await db.schema
    .createTable('revisions')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('sheet_id', 'uuid', (c) => c.notNull().references('sheets.id'))
    .addColumn('project_id', 'uuid', (c) => c.notNull().references('projects.id'))
    .addColumn('version_number', 'integer', (c) => c.notNull())
    .addColumn('version_sha256', 'text', (c) => c.notNull())
    .addColumn('check_id', 'uuid', (c) => c.notNull().references('checks.id'))
    .addColumn('issue_job_id', 'uuid', (c) => c.notNull().unique().references('issue_jobs.id'))
    .addColumn('code', 'text', (c) => c.notNull())
    .addColumn('sequence', 'integer', (c) => c.notNull().check(sql`sequence >= 0`))
    .addColumn('status', 'text', (c) =>
      c
        .notNull()
        .defaultTo('current')
        .check(sql`status in ('current', 'superseded', 'withdrawn')`),
    )
    .addColumn('issued_by', 'uuid', (c) => c.notNull().references('users.id'))
    .addColumn('issued_at', 'timestamptz', (c) => c.notNull())
    .addColumn('pdf_key', 'text', (c) => c.notNull())
    .addColumn('pdf_sha256', 'text', (c) =>
      c
        .notNull()
        .unique()
        .check(sql`pdf_sha256 ~ '^[0-9a-f]{64}$'`),
    )
    .addColumn('pdf_size', 'bigint', (c) => c.notNull())
    .addColumn('verification_code', 'text', (c) => c.notNull().unique())
    .addColumn('superseded_by', 'uuid', (c) => c.references('revisions.id'))
    .addColumn('superseded_at', 'timestamptz')
    .addColumn('stamped_key', 'text')
    .addColumn('stamped_sha256', 'text')
    .addColumn('withdrawn_at', 'timestamptz')
    .addColumn('withdrawn_by', 'uuid', (c) => c.references('users.id'))
    .addColumn('withdrawn_reason', 'text')
    .addUniqueConstraint('revisions_sheet_code_key', ['sheet_id', 'code'])
    .addUniqueConstraint('revisions_sheet_sequence_key', ['sheet_id', 'sequence'])
    .addForeignKeyConstraint('revisions_version_fkey', ['sheet_id', 'version_number'], 'versions', [
      'sheet_id',
      'number',
    ])
    .execute();
  await sql`create unique index revisions_one_current_per_sheet on revisions (sheet_id) where status = 'current'`.execute(
    db,
  );
  await sql`create trigger revisions_bind_version before insert on revisions for each row execute function worldsheet_version_hash_matches()`.execute(
    db,
  );
  await sql`create trigger issue_jobs_bind_version before insert on issue_jobs for each row execute function worldsheet_version_hash_matches()`.execute(
    db,
  );
  await sql`
    create function revisions_guard() returns trigger language plpgsql as $$
    begin
      if tg_op = 'DELETE' then
        raise exception 'DELETE on revisions is refused: revisions are records' using errcode = 'WS001';
      end if;
      if new.id <> old.id or new.sheet_id <> old.sheet_id or new.version_number <> old.version_number or new.version_sha256 <> old.version_sha256
         or new.code <> old.code or new.sequence <> old.sequence or new.issued_by <> old.issued_by or new.issued_at <> old.issued_at
         or new.pdf_key <> old.pdf_key or new.pdf_sha256 <> old.pdf_sha256 or new.pdf_size <> old.pdf_size
         or new.verification_code <> old.verification_code or new.check_id <> old.check_id or new.issue_job_id <> old.issue_job_id then
        raise exception 'an issued revision and its PDF never change' using errcode = 'WS001';
      end if;
      if old.stamped_sha256 is not null and (new.stamped_sha256 is distinct from old.stamped_sha256 or new.stamped_key is distinct from old.stamped_key) then
        raise exception 'the stamped copy of a revision is made once' using errcode = 'WS001';
      end if;
      if new.status <> old.status and not (
           (old.status = 'current' and new.status in ('superseded', 'withdrawn'))
        or (old.status = 'superseded' and new.status = 'withdrawn')) then
        raise exception 'a revision cannot go from % to %', old.status, new.status using errcode = 'WS003';
      end if;
      if new.status = 'withdrawn' and (new.withdrawn_reason is null or length(btrim(new.withdrawn_reason)) = 0) then
        raise exception 'withdrawing a revision needs a reason' using errcode = 'WS003';
      end if;
      return new;
    end
    $$`.execute(db);
  await sql`create trigger revisions_guard before update or delete on revisions for each row execute function revisions_guard()`.execute(
    db,
  );
  await sql`create trigger revisions_refuse_truncate before truncate on revisions for each statement execute function worldsheet_refuse_change()`.execute(
    db,
  );
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('revisions').execute();
  await db.schema.dropTable('issue_jobs').execute();
  await sql`drop function revisions_guard()`.execute(db);
}
