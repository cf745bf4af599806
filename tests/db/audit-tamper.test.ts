// Someone with superuser rights can switch the triggers off and edit the table; the hash chain
// still shows where the record was changed.
import { sql } from 'kysely';
import { expect, it } from 'vitest';
import { adminPool, testDb } from '../support/database';
import { makeSheetWithVersion } from '../support/fixtures';

it('reports the first edited event when a superuser bypasses the triggers', async () => {
  const { userId } = await makeSheetWithVersion(testDb());
  for (const reason of ['one', 'two', 'three']) {
    await testDb()
      .insertInto('audit_events')
      .values({ actor_id: userId, action: 'test.event', object_type: 'test', reason })
      .execute();
  }
  const client = await adminPool().connect();
  try {
    await client.query('begin');
    await client.query('set local session_replication_role = replica');
    await client.query("update audit_events set reason = 'changed afterwards' where id = 2");
    await client.query('commit');
  } finally {
    client.release();
  }
  const breaks = await sql<{ id: string; problem: string }>`select * from audit_chain_breaks()`.execute(testDb());
  expect(breaks.rows).toEqual([{ id: '2', problem: 'hash does not match the recorded content' }]);
});
