import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.
//
// Accounts: lockout after repeated failures (21 CFR Part 11 §11.300), server-side sessions with an
// inactivity limit, single-use e-mailed tokens (sign-in links, password resets, invitations), API
// tokens stored hashed, and the session or token of each audit event.

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable('users')
    .addColumn('locked_at', 'timestamptz')
    .addColumn('failed_sign_ins', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('password_changed_at', 'timestamptz')
    .execute();

  await db.schema
    .createTable('sessions')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('users.id'))
    .addColumn('method', 'text', (c) => c.notNull().check(sql`method in ('password', 'link', 'oidc')`))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('last_seen_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('ended_at', 'timestamptz')
    .addColumn('ended_reason', 'text')
    .addColumn('ip', 'text')
    .addColumn('user_agent', 'text')
    .execute();
  await db.schema.createIndex('sessions_user_idx').on('sessions').column('user_id').execute();

  await db.schema
    .createTable('sign_in_attempts')
    .addColumn('id', 'bigserial', (c) => c.primaryKey())
    .addColumn('email', 'text', (c) => c.notNull())
    .addColumn('ip', 'text', (c) => c.notNull())
    .addColumn('method', 'text', (c) => c.notNull())
    .addColumn('ok', 'boolean', (c) => c.notNull())
    .addColumn('at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema.createIndex('sign_in_attempts_email_idx').on('sign_in_attempts').columns(['email', 'at']).execute();
  await db.schema.createIndex('sign_in_attempts_ip_idx').on('sign_in_attempts').columns(['ip', 'at']).execute();

  await db.schema
    .createTable('email_tokens')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('users.id'))
    .addColumn('purpose', 'text', (c) => c.notNull().check(sql`purpose in ('sign-in', 'password-reset', 'invitation')`))
    .addColumn('token_hash', 'text', (c) => c.notNull().unique())
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('expires_at', 'timestamptz', (c) => c.notNull())
    .addColumn('used_at', 'timestamptz')
    .execute();

  await db.schema
    .createTable('api_tokens')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('users.id'))
    .addColumn('name', 'text', (c) => c.notNull().check(sql`length(btrim(name)) between 1 and 100`))
    .addColumn('token_hash', 'text', (c) => c.notNull().unique())
    .addColumn('prefix', 'text', (c) => c.notNull())
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('last_used_at', 'timestamptz')
    .addColumn('revoked_at', 'timestamptz')
    .execute();
  await db.schema.createIndex('api_tokens_user_idx').on('api_tokens').column('user_id').execute();

  await db.schema
    .alterTable('audit_events')
    .addColumn('session_id', 'uuid', (c) => c.references('sessions.id'))
    .addColumn('token_id', 'uuid', (c) => c.references('api_tokens.id'))
    .execute();
  // The payload gains the session and token; stripped of nulls and appended, so events recorded
  // before this migration keep exactly the payload (and hash) they were chained with.
  await sql`
    create or replace function audit_event_payload(e audit_events) returns text language sql stable as $$
      select (
        jsonb_build_object(
          'id', e.id,
          'at_us', (extract(epoch from e.occurred_at) * 1000000)::bigint,
          'actor', e.actor_id,
          'project', e.project_id,
          'action', e.action,
          'object_type', e.object_type,
          'object_id', e.object_id,
          'old', e.old_value,
          'new', e.new_value,
          'reason', e.reason
        ) || jsonb_strip_nulls(jsonb_build_object('session', e.session_id, 'token', e.token_id))
      )::text
    $$`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`
    create or replace function audit_event_payload(e audit_events) returns text language sql stable as $$
      select jsonb_build_object(
        'id', e.id,
        'at_us', (extract(epoch from e.occurred_at) * 1000000)::bigint,
        'actor', e.actor_id,
        'project', e.project_id,
        'action', e.action,
        'object_type', e.object_type,
        'object_id', e.object_id,
        'old', e.old_value,
        'new', e.new_value,
        'reason', e.reason
      )::text
    $$`.execute(db);
  // Dropping the columns needs the immutability trigger out of the way for the table rewrite only;
  // ALTER TABLE does not fire row triggers, so no event changes here.
  await db.schema.alterTable('audit_events').dropColumn('session_id').dropColumn('token_id').execute();
  await db.schema.dropTable('api_tokens').execute();
  await db.schema.dropTable('email_tokens').execute();
  await db.schema.dropTable('sign_in_attempts').execute();
  await db.schema.dropTable('sessions').execute();
  await db.schema
    .alterTable('users')
    .dropColumn('locked_at')
    .dropColumn('failed_sign_ins')
    .dropColumn('password_changed_at')
    .execute();
}
