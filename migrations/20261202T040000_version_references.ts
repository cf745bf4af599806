import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.

export async function up(db: Kysely<any>): Promise<void> {
  // Which issued revisions a version's cells cite (`fromRevision("…", "B", "Brho")`), one row per
  // cited name. Written with the version, in its transaction, and as immutable as the version.
  await db.schema
    .createTable('version_references')
    .addColumn('version_id', 'uuid', (c) => c.notNull().references('versions.id'))
    .addColumn('revision_id', 'uuid', (c) => c.notNull().references('revisions.id'))
    .addColumn('name', 'text', (c) => c.notNull().check(sql`length(name) between 1 and 100`))
    .addPrimaryKeyConstraint('version_references_pkey', ['version_id', 'revision_id', 'name'])
    .execute();
  await db.schema
    .createIndex('version_references_revision_idx')
    .on('version_references')
    .column('revision_id')
    .execute();
  await sql`create trigger version_references_refuse_update_delete before update or delete on version_references
            for each row execute function worldsheet_refuse_change()`.execute(db);
  await sql`create trigger version_references_refuse_truncate before truncate on version_references
            for each statement execute function worldsheet_refuse_change()`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('version_references').execute();
}
