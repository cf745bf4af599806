// How versions are stored on disk: content and results are LZ4-compressed where the server has LZ4
// (migration 20261202T022800), and what is read back is exactly what was saved.
import { sql } from 'kysely';
import { expect, it } from 'vitest';
import { testDb } from '../support/database';
import { sampleContent } from '../support/fixtures';
import { contentHash } from '../../lib/sheets/content-hash';

it('compresses large content and results with LZ4 and reads them back unchanged', async () => {
  const db = testDb();
  const lz4 = await sql<{
    ok: boolean;
  }>`select exists (select 1 from pg_settings where name = 'default_toast_compression' and 'lz4' = any(enumvals)) as ok`.execute(
    db,
  );
  const content = sampleContent('Storage');
  // Large enough to be compressed (over 2 kB), with characters outside Latin-1 as results have.
  content.cells = Array.from({ length: 300 }, (_, i) => ({
    id: `c${i + 1}`,
    kind: 'calc' as const,
    source: `x_${i + 1} = ${i + 1}.5 MeV  # 2.1 × 10⁻¹⁹ µs·m`,
  }));
  const results = {
    ok: true,
    cells: content.cells.map((c) => ({ id: c.id, text: '1.602 18 × 10⁻¹⁹ J', number: -0.000125 })),
  };
  const user = await db
    .insertInto('users')
    .values({ email: 'storage@example.test', display_name: 'Storage', password_hash: null })
    .returning('id')
    .executeTakeFirstOrThrow();
  const project = await db
    .insertInto('projects')
    .values({ code: 'STO', name: 'Storage', legal_owner: 'Fixture Ltd', created_by: user.id })
    .returning('id')
    .executeTakeFirstOrThrow();
  const sheet = await db
    .insertInto('sheets')
    .values({ project_id: project.id, number: 1, title: 'Storage', created_by: user.id })
    .returning('id')
    .executeTakeFirstOrThrow();
  await db
    .insertInto('versions')
    .values({
      sheet_id: sheet.id,
      number: 1,
      parent_number: null,
      content: JSON.stringify(content),
      content_hash: contentHash(content),
      results: JSON.stringify(results),
      engine_version: null,
      constants_edition: null,
      author_id: user.id,
      message: 'first',
    })
    .execute();

  const row = await sql<{
    content: unknown;
    results: unknown;
    content_method: string | null;
    results_method: string | null;
  }>`
    select content, results, pg_column_compression(content) as content_method, pg_column_compression(results) as results_method
    from versions where sheet_id = ${sheet.id}`.execute(db);
  const stored = row.rows[0];
  expect(stored.content).toEqual(content);
  expect(stored.results).toEqual(results);
  expect(contentHash(stored.content as typeof content)).toBe(contentHash(content));
  if (lz4.rows[0].ok) {
    expect(stored.content_method).toBe('lz4');
    expect(stored.results_method).toBe('lz4');
  }
});
