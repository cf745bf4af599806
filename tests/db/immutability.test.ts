// The database itself refuses to change or remove versions and audit events (product brief,
// "Core objects": immutable, enforced in the database, not only in code). Raw SQL, as the
// application's own role, tries to break each rule.
import { sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import { testDb } from '../support/database';
import { makeSheetWithVersion } from '../support/fixtures';

async function refused(statement: ReturnType<typeof sql>): Promise<string> {
  try {
    await statement.execute(testDb());
  } catch (error) {
    const e = error as { code?: string; message: string };
    return `${e.code}: ${e.message}`;
  }
  throw new Error('the statement was not refused');
}

describe('versions are immutable', () => {
  it('refuses UPDATE of a version row', async () => {
    const { versionId } = await makeSheetWithVersion(testDb());
    const message = await refused(sql`update versions set message = 'rewritten' where id = ${versionId}`);
    expect(message).toMatch(/^WS001: UPDATE on versions is refused/);
    const row = await testDb()
      .selectFrom('versions')
      .select('message')
      .where('id', '=', versionId)
      .executeTakeFirstOrThrow();
    expect(row.message).toBe('first');
  });

  it('refuses UPDATE of the content or its hash', async () => {
    const { versionId } = await makeSheetWithVersion(testDb());
    await refused(sql`update versions set content = '{}'::jsonb where id = ${versionId}`);
    await refused(sql`update versions set content_hash = repeat('0', 64) where id = ${versionId}`);
  });

  it('refuses DELETE and TRUNCATE of versions', async () => {
    const { versionId } = await makeSheetWithVersion(testDb());
    expect(await refused(sql`delete from versions where id = ${versionId}`)).toMatch(/DELETE on versions is refused/);
    expect(await refused(sql`truncate versions cascade`)).toMatch(/TRUNCATE on versions is refused/);
    const count = await testDb()
      .selectFrom('versions')
      .select((eb) => eb.fn.countAll<string>().as('n'))
      .executeTakeFirstOrThrow();
    expect(Number(count.n)).toBe(1);
  });

  it('refuses a second version with the same number and a parent that is not earlier', async () => {
    const { sheetId, userId, hash } = await makeSheetWithVersion(testDb());
    const insert = (number: number, parent: number | null) =>
      sql`insert into versions (sheet_id, number, parent_number, content, content_hash, author_id)
          values (${sheetId}, ${number}, ${parent}, '{}'::jsonb, ${hash}, ${userId})`;
    expect(await refused(insert(1, null))).toMatch(/versions_sheet_number_key/);
    expect(await refused(insert(2, 2))).toMatch(/versions_parent_before_check/);
    expect(await refused(insert(2, null))).toMatch(/versions_first_has_no_parent_check/);
    await insert(2, 1).execute(testDb());
  });

  it('numbers sheets uniquely within a project', async () => {
    const { projectId, userId } = await makeSheetWithVersion(testDb());
    expect(
      await refused(
        sql`insert into sheets (project_id, number, title, created_by) values (${projectId}, 1, 'Duplicate', ${userId})`,
      ),
    ).toMatch(/sheets_project_number_key/);
  });
});

describe('audit events are append-only and hash-chained', () => {
  async function addEvents(n: number) {
    const { userId, projectId } = await makeSheetWithVersion(testDb());
    for (let i = 0; i < n; i++) {
      await testDb()
        .insertInto('audit_events')
        .values({
          actor_id: userId,
          project_id: projectId,
          action: 'test.event',
          object_type: 'test',
          object_id: String(i),
          new_value: JSON.stringify({ i }),
          reason: null,
        })
        .execute();
    }
    return testDb().selectFrom('audit_events').selectAll().orderBy('id').execute();
  }

  it('refuses UPDATE, DELETE and TRUNCATE of audit rows', async () => {
    const [event] = await addEvents(1);
    expect(await refused(sql`update audit_events set reason = 'edited' where id = ${event.id}`)).toMatch(
      /UPDATE on audit_events is refused/,
    );
    expect(await refused(sql`delete from audit_events where id = ${event.id}`)).toMatch(
      /DELETE on audit_events is refused/,
    );
    expect(await refused(sql`truncate audit_events`)).toMatch(/TRUNCATE on audit_events is refused/);
  });

  it('chains each event to the one before and reports no break when untouched', async () => {
    const events = await addEvents(3);
    expect(events.map((e) => e.id)).toEqual(['1', '2', '3']);
    expect(events[0].prev_hash).toBe('0'.repeat(64));
    expect(events[1].prev_hash).toBe(events[0].hash);
    expect(events[2].prev_hash).toBe(events[1].hash);
    const breaks = await sql`select * from audit_chain_breaks()`.execute(testDb());
    expect(breaks.rows).toEqual([]);
  });

  it('ignores a hash or time supplied by the caller', async () => {
    const { userId } = await makeSheetWithVersion(testDb());
    await sql`insert into audit_events (id, occurred_at, actor_id, action, object_type, prev_hash, hash)
              values (999, '2000-01-01', ${userId}, 'test.forged', 'test', 'x', 'y')`.execute(testDb());
    const row = await testDb().selectFrom('audit_events').selectAll().executeTakeFirstOrThrow();
    expect(row.id).toBe('1');
    expect(row.hash).toMatch(/^[0-9a-f]{64}$/);
    expect(row.occurred_at.getFullYear()).toBeGreaterThan(2000);
  });
});
