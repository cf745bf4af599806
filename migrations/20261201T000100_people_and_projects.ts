import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('users')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('email', 'text', (c) => c.notNull().check(sql`email = lower(email) and email like '%_@_%'`))
    .addColumn('display_name', 'text', (c) => c.notNull().check(sql`length(btrim(display_name)) between 1 and 200`))
    .addColumn('password_hash', 'text')
    .addColumn('is_admin', 'boolean', (c) => c.notNull().defaultTo(false))
    .addColumn('disabled_at', 'timestamptz')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema.createIndex('users_email_key').on('users').column('email').unique().execute();

  await db.schema
    .createTable('projects')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('code', 'text', (c) =>
      c
        .notNull()
        .unique()
        .check(sql`code ~ '^[A-Z][A-Z0-9]{1,9}$'`),
    )
    .addColumn('name', 'text', (c) => c.notNull().check(sql`length(btrim(name)) between 1 and 200`))
    .addColumn('legal_owner', 'text', (c) => c.notNull().check(sql`length(btrim(legal_owner)) between 1 and 200`))
    .addColumn('revision_scheme', 'text', (c) =>
      c
        .notNull()
        .defaultTo('letters')
        .check(sql`revision_scheme in ('letters', 'numbers')`),
    )
    .addColumn('created_by', 'uuid', (c) => c.references('users.id'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  // One row per role held: a person can hold several roles in one project.
  await db.schema
    .createTable('project_members')
    .addColumn('project_id', 'uuid', (c) => c.notNull().references('projects.id'))
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('users.id'))
    .addColumn('role', 'text', (c) =>
      c.notNull().check(sql`role in ('originator', 'checker', 'approver', 'controller', 'viewer')`),
    )
    .addColumn('granted_by', 'uuid', (c) => c.references('users.id'))
    .addColumn('granted_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addPrimaryKeyConstraint('project_members_pkey', ['project_id', 'user_id', 'role'])
    .execute();
  await db.schema.createIndex('project_members_user_idx').on('project_members').column('user_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('project_members').execute();
  await db.schema.dropTable('projects').execute();
  await db.schema.dropTable('users').execute();
}
