import type { Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.

export async function up(db: Kysely<any>): Promise<void> {
  // The per-project storage quota sums the sizes of a project's distinct attachment contents at
  // every upload: an index on (project_id, sha256) keeps that to the project's own rows.
  await db.schema
    .createIndex('attachments_project_sha256_idx')
    .on('attachments')
    .columns(['project_id', 'sha256'])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropIndex('attachments_project_sha256_idx').execute();
}
