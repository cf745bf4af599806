import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('sheets')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('project_id', 'uuid', (c) => c.notNull().references('projects.id'))
    .addColumn('number', 'integer', (c) => c.notNull().check(sql`number > 0`))
    .addColumn('title', 'text', (c) => c.notNull().check(sql`length(btrim(title)) between 1 and 300`))
    .addColumn('safety_related', 'boolean', (c) => c.notNull().defaultTo(false))
    .addColumn('created_by', 'uuid', (c) => c.notNull().references('users.id'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('sheets_project_number_key', ['project_id', 'number'])
    .execute();

  // A version is what one save produced. It never changes: the triggers below refuse UPDATE,
  // DELETE and TRUNCATE whatever role or code asks.
  await db.schema
    .createTable('versions')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('sheet_id', 'uuid', (c) => c.notNull().references('sheets.id'))
    .addColumn('number', 'integer', (c) => c.notNull().check(sql`number > 0`))
    .addColumn('parent_number', 'integer')
    .addColumn('content', 'jsonb', (c) => c.notNull())
    .addColumn('content_hash', 'text', (c) => c.notNull().check(sql`content_hash ~ '^[0-9a-f]{64}$'`))
    .addColumn('results', 'jsonb')
    .addColumn('engine_version', 'text')
    .addColumn('constants_edition', 'text')
    .addColumn('author_id', 'uuid', (c) => c.notNull().references('users.id'))
    .addColumn('message', 'text', (c) => c.notNull().defaultTo(''))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('versions_sheet_number_key', ['sheet_id', 'number'])
    .addCheckConstraint(
      'versions_parent_before_check',
      sql`parent_number is null or (parent_number > 0 and parent_number < number)`,
    )
    .addCheckConstraint('versions_first_has_no_parent_check', sql`(number = 1) = (parent_number is null)`)
    .execute();
  await db.schema.createIndex('versions_content_hash_idx').on('versions').column('content_hash').execute();

  await sql`
    create function worldsheet_refuse_change() returns trigger language plpgsql as $$
    begin
      raise exception '% on % is refused: these rows are immutable records', tg_op, tg_table_name
        using errcode = 'WS001', hint = 'Records are only ever added; make a new one instead.';
    end
    $$`.execute(db);
  await sql`create trigger versions_refuse_update_delete before update or delete on versions
            for each row execute function worldsheet_refuse_change()`.execute(db);
  await sql`create trigger versions_refuse_truncate before truncate on versions
            for each statement execute function worldsheet_refuse_change()`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('versions').execute();
  await db.schema.dropTable('sheets').execute();
  await sql`drop function worldsheet_refuse_change()`.execute(db);
}
