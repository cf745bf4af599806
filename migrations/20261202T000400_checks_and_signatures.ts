import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.

export async function up(db: Kysely<any>): Promise<void> {
  // A check: one exact version submitted to one named checker, reviewed against the last approved
  // version (or none), then returned, or signed as checked and then approved or returned by an
  // approver. The version it names never changes; only the state moves, along the allowed edges.
  await db.schema
    .createTable('checks')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('sheet_id', 'uuid', (c) => c.notNull().references('sheets.id'))
    .addColumn('project_id', 'uuid', (c) => c.notNull().references('projects.id'))
    .addColumn('version_number', 'integer', (c) => c.notNull())
    .addColumn('version_sha256', 'text', (c) => c.notNull())
    .addColumn('base_version_number', 'integer')
    .addColumn('submitted_by', 'uuid', (c) => c.notNull().references('users.id'))
    .addColumn('checker_id', 'uuid', (c) => c.notNull().references('users.id'))
    .addColumn('state', 'text', (c) =>
      c
        .notNull()
        .defaultTo('in_check')
        .check(sql`state in ('in_check', 'returned', 'checked', 'approved', 'approval_returned')`),
    )
    .addColumn('verification_method', 'text', (c) =>
      c.check(sql`verification_method in ('design_review', 'alternate_calculation', 'qualification_test')`),
    )
    .addColumn('checker_notes', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('alternate_cells', 'jsonb', (c) => c.notNull().defaultTo(sql`'[]'::jsonb`))
    .addColumn('alternate_results', 'jsonb')
    .addColumn('return_reason', 'text')
    .addColumn('decided_by', 'uuid', (c) => c.references('users.id'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('closed_at', 'timestamptz')
    .addForeignKeyConstraint('checks_version_fkey', ['sheet_id', 'version_number'], 'versions', ['sheet_id', 'number'])
    .execute();
  // At most one open check per sheet.
  await sql`create unique index checks_one_open_per_sheet on checks (sheet_id) where state in ('in_check', 'checked')`.execute(
    db,
  );
  await db.schema.createIndex('checks_checker_idx').on('checks').columns(['checker_id', 'state']).execute();

  // A signature (21 CFR Part 11 §11.50): printed name, UTC time, meaning; bound to the SHA-256 of
  // one version (§11.70), which the database checks against the version itself. Never changed.
  await db.schema
    .createTable('signatures')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('sheet_id', 'uuid', (c) => c.notNull().references('sheets.id'))
    .addColumn('version_number', 'integer', (c) => c.notNull())
    .addColumn('version_sha256', 'text', (c) => c.notNull())
    .addColumn('check_id', 'uuid', (c) => c.references('checks.id'))
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('users.id'))
    .addColumn('printed_name', 'text', (c) => c.notNull().check(sql`length(btrim(printed_name)) > 0`))
    .addColumn('meaning', 'text', (c) =>
      c.notNull().check(sql`meaning in ('prepared', 'checked', 'approved', 'issued')`),
    )
    .addColumn('signed_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addForeignKeyConstraint('signatures_version_fkey', ['sheet_id', 'version_number'], 'versions', [
      'sheet_id',
      'number',
    ])
    .execute();
  await db.schema
    .createIndex('signatures_sheet_idx')
    .on('signatures')
    .columns(['sheet_id', 'version_number'])
    .execute();

  await sql`
    create function worldsheet_version_hash_matches() returns trigger language plpgsql as $$
    begin
      if not exists (select 1 from versions v where v.sheet_id = new.sheet_id and v.number = new.version_number and v.content_hash = new.version_sha256) then
        raise exception 'the SHA-256 % is not that of version % of this sheet', new.version_sha256, new.version_number
          using errcode = 'WS002';
      end if;
      return new;
    end
    $$`.execute(db);
  await sql`create trigger signatures_bind_version before insert on signatures for each row execute function worldsheet_version_hash_matches()`.execute(
    db,
  );
  await sql`create trigger checks_bind_version before insert on checks for each row execute function worldsheet_version_hash_matches()`.execute(
    db,
  );
  await sql`create trigger signatures_refuse_update_delete before update or delete on signatures
            for each row execute function worldsheet_refuse_change()`.execute(db);
  await sql`create trigger signatures_refuse_truncate before truncate on signatures
            for each statement execute function worldsheet_refuse_change()`.execute(db);

  // A check's identity never changes and its state moves only along the workflow's edges.
  await sql`
    create function checks_guard() returns trigger language plpgsql as $$
    begin
      if tg_op = 'DELETE' then
        raise exception 'DELETE on checks is refused: checks are records' using errcode = 'WS001';
      end if;
      if new.sheet_id <> old.sheet_id or new.version_number <> old.version_number or new.version_sha256 <> old.version_sha256
         or new.submitted_by <> old.submitted_by or new.checker_id <> old.checker_id
         or new.base_version_number is distinct from old.base_version_number or new.created_at <> old.created_at then
        raise exception 'a check always names the same version, checker and base' using errcode = 'WS001';
      end if;
      if new.state <> old.state and not (
           (old.state = 'in_check' and new.state in ('returned', 'checked'))
        or (old.state = 'checked' and new.state in ('approved', 'approval_returned'))) then
        raise exception 'a check cannot go from % to %', old.state, new.state using errcode = 'WS003';
      end if;
      if old.state not in ('in_check', 'checked') then
        raise exception 'a % check is closed and does not change', old.state using errcode = 'WS003';
      end if;
      return new;
    end
    $$`.execute(db);
  await sql`create trigger checks_guard before update or delete on checks for each row execute function checks_guard()`.execute(
    db,
  );

  // Comments anchored to a cell (and optionally a statement line), in threads: a reply names its
  // thread's first comment. Only the resolution of a thread is ever written after the fact, once.
  await db.schema
    .createTable('check_comments')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('check_id', 'uuid', (c) => c.notNull().references('checks.id'))
    .addColumn('thread_id', 'uuid', (c) => c.references('check_comments.id'))
    .addColumn('cell_id', 'text', (c) => c.notNull())
    .addColumn('statement_line', 'integer')
    .addColumn('author_id', 'uuid', (c) => c.notNull().references('users.id'))
    .addColumn('body', 'text', (c) => c.notNull().check(sql`length(btrim(body)) between 1 and 10000`))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('resolved_at', 'timestamptz')
    .addColumn('resolved_by', 'uuid', (c) => c.references('users.id'))
    .execute();
  await db.schema
    .createIndex('check_comments_check_idx')
    .on('check_comments')
    .columns(['check_id', 'created_at'])
    .execute();
  await sql`
    create function check_comments_guard() returns trigger language plpgsql as $$
    begin
      if tg_op = 'DELETE' then
        raise exception 'DELETE on check_comments is refused: comments are records' using errcode = 'WS001';
      end if;
      if old.resolved_at is not null or new.id <> old.id or new.check_id <> old.check_id or new.thread_id is distinct from old.thread_id
         or new.cell_id <> old.cell_id or new.statement_line is distinct from old.statement_line or new.author_id <> old.author_id
         or new.body <> old.body or new.created_at <> old.created_at or new.resolved_at is null or new.resolved_by is null then
        raise exception 'a comment is only ever resolved, once' using errcode = 'WS001';
      end if;
      return new;
    end
    $$`.execute(db);
  await sql`create trigger check_comments_guard before update or delete on check_comments for each row execute function check_comments_guard()`.execute(
    db,
  );
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('check_comments').execute();
  await db.schema.dropTable('signatures').execute();
  await db.schema.dropTable('checks').execute();
  await sql`drop function check_comments_guard()`.execute(db);
  await sql`drop function checks_guard()`.execute(db);
  await sql`drop function worldsheet_version_hash_matches()`.execute(db);
}
