import type { Kysely } from 'kysely';
import type { Database } from '../../db/schema';
import { versionContentSchema, emptyRecord, type VersionContent } from '../../lib/sheets/content';
import { contentHash } from '../../lib/sheets/content-hash';

export function sampleContent(title = 'Fixture sheet'): VersionContent {
  return versionContentSchema.parse({
    schema: 1,
    title,
    safetyRelated: false,
    significantFigures: 6,
    record: emptyRecord(),
    cells: [{ id: 'c1', kind: 'calc', source: 'x = 2 m' }],
    attachments: [],
  });
}

/** One user, one project, one sheet with version 1: the smallest world most database tests need. */
export async function makeSheetWithVersion(db: Kysely<Database>) {
  const user = await db
    .insertInto('users')
    .values({ email: 'fixture@example.test', display_name: 'Fixture User', password_hash: null })
    .returning('id')
    .executeTakeFirstOrThrow();
  const project = await db
    .insertInto('projects')
    .values({ code: 'FIX', name: 'Fixture project', legal_owner: 'Fixture Ltd', created_by: user.id })
    .returning('id')
    .executeTakeFirstOrThrow();
  const sheet = await db
    .insertInto('sheets')
    .values({ project_id: project.id, number: 1, title: 'Fixture sheet', created_by: user.id })
    .returning('id')
    .executeTakeFirstOrThrow();
  const content = sampleContent();
  const version = await db
    .insertInto('versions')
    .values({
      sheet_id: sheet.id,
      number: 1,
      parent_number: null,
      content: JSON.stringify(content),
      content_hash: contentHash(content),
      results: null,
      engine_version: null,
      constants_edition: null,
      author_id: user.id,
      message: 'first',
    })
    .returning(['id', 'content_hash'])
    .executeTakeFirstOrThrow();
  return {
    userId: user.id,
    projectId: project.id,
    sheetId: sheet.id,
    versionId: version.id,
    hash: version.content_hash,
  };
}
