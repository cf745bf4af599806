import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.
//
// Account security: a lock after failed attempts can be timed (lock_expires_at; null keeps the lock
// until an administrator unlocks), the holder of a locked account can be e-mailed a single-use unlock
// link (purpose 'unlock'), and API tokens have an expiry and a scope (read only, or read and write).

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('users').addColumn('lock_expires_at', 'timestamptz').execute();

  await sql`alter table email_tokens drop constraint email_tokens_purpose_check`.execute(db);
  await sql`alter table email_tokens add constraint email_tokens_purpose_check
            check (purpose in ('sign-in', 'password-reset', 'invitation', 'unlock'))`.execute(db);

  await db.schema
    .alterTable('api_tokens')
    .addColumn('scope', 'text', (c) =>
      c
        .notNull()
        .defaultTo('read-write')
        .check(sql`scope in ('read', 'read-write')`),
    )
    .addColumn('expires_at', 'timestamptz')
    .execute();
  // Tokens made before expiry existed get the default lifetime, counted from their creation.
  await sql`update api_tokens set expires_at = created_at + interval '90 days' where expires_at is null`.execute(db);
  await sql`alter table api_tokens alter column expires_at set not null`.execute(db);
  await sql`alter table api_tokens alter column expires_at set default now() + interval '90 days'`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('api_tokens').dropColumn('expires_at').dropColumn('scope').execute();
  await sql`delete from email_tokens where purpose = 'unlock'`.execute(db);
  await sql`alter table email_tokens drop constraint email_tokens_purpose_check`.execute(db);
  await sql`alter table email_tokens add constraint email_tokens_purpose_check
            check (purpose in ('sign-in', 'password-reset', 'invitation'))`.execute(db);
  await db.schema.alterTable('users').dropColumn('lock_expires_at').execute();
}
