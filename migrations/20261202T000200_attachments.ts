import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.

export async function up(db: Kysely<any>): Promise<void> {
  // A file uploaded to a sheet. The bytes live in object storage under a key derived from their
  // SHA-256; a version cites an attachment by name and SHA-256 in its content. Rows are never
  // changed or removed (a version that cites one must always find it), as versions are not.
  await db.schema
    .createTable('attachments')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('sheet_id', 'uuid', (c) => c.notNull().references('sheets.id'))
    .addColumn('project_id', 'uuid', (c) => c.notNull().references('projects.id'))
    .addColumn('name', 'text', (c) => c.notNull().check(sql`length(name) between 1 and 255`))
    .addColumn('media_type', 'text', (c) => c.notNull())
    .addColumn('size', 'bigint', (c) => c.notNull().check(sql`size >= 0`))
    .addColumn('sha256', 'text', (c) => c.notNull().check(sql`sha256 ~ '^[0-9a-f]{64}$'`))
    .addColumn('storage_key', 'text', (c) => c.notNull())
    .addColumn('table_data', 'jsonb')
    .addColumn('uploaded_by', 'uuid', (c) => c.notNull().references('users.id'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('attachments_sheet_name_sha256_key', ['sheet_id', 'name', 'sha256'])
    .execute();
  await db.schema
    .createIndex('attachments_sheet_sha256_idx')
    .on('attachments')
    .columns(['sheet_id', 'sha256'])
    .execute();
  await sql`create trigger attachments_refuse_update_delete before update or delete on attachments
            for each row execute function worldsheet_refuse_change()`.execute(db);
  await sql`create trigger attachments_refuse_truncate before truncate on attachments
            for each statement execute function worldsheet_refuse_change()`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('attachments').execute();
}
