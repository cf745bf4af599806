import type { Kysely } from 'kysely';
import pg from 'pg';
import { inject } from 'vitest';
import { createDb } from '../../db/index';
import type { Database } from '../../db/schema';

let appDb: Kysely<Database> | null = null;
let admin: pg.Pool | null = null;

/** The test database as the application sees it: the non-superuser role that owns it. */
export function testDb(): Kysely<Database> {
  appDb ??= createDb(inject('databaseUrl'), { max: 4 });
  return appDb;
}

/** A superuser connection to the test database, for resetting it and for tampering tests. */
export function adminPool(): pg.Pool {
  admin ??= new pg.Pool({ connectionString: inject('adminDatabaseUrl'), max: 2 });
  return admin;
}

/**
 * Empties every application table, and the job queue (schema pgboss), so that no job queued by one
 * test runs in another. Versions and audit events refuse TRUNCATE through triggers; the superuser
 * sets session_replication_role = replica, which a normal role cannot, so only the tests can do this.
 */
export async function resetDatabase(): Promise<void> {
  const client = await adminPool().connect();
  try {
    const { rows } = await client.query<{ tablename: string }>(
      "select tablename from pg_tables where schemaname = 'public' and tablename not like 'kysely_%'",
    );
    if (rows.length === 0) return;
    await client.query('begin');
    await client.query('set local session_replication_role = replica');
    await client.query(`truncate ${rows.map((r) => `"${r.tablename}"`).join(', ')} cascade`);
    await client.query("select setval('audit_events_id_seq', 1, false)");
    if ((await client.query("select to_regclass('pgboss.job') is not null as present")).rows[0].present) {
      await client.query('delete from pgboss.job');
    }
    await client.query('commit');
  } catch (error) {
    await client.query('rollback').catch(() => undefined);
    throw error;
  } finally {
    client.release();
  }
}

export async function closeTestDatabase(): Promise<void> {
  await appDb?.destroy();
  await admin?.end();
  appDb = null;
  admin = null;
}
