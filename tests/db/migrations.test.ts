// Every migration applies to an empty database, reverts completely and applies again.
import { sql } from 'kysely';
import pg from 'pg';
import { afterAll, beforeAll, expect, inject, it } from 'vitest';
import { createDb } from '../../db/index';
import { migrateDownAll, migrateToLatest } from '../../db/migrate';

const DB = 'worldsheet_test_migrations';
let url = '';

beforeAll(async () => {
  const admin = new pg.Client({ connectionString: inject('adminServerUrl') });
  await admin.connect();
  await admin.query(`drop database if exists ${DB} with (force)`);
  await admin.query(`create database ${DB} owner worldsheet template template0`);
  await admin.end();
  url = inject('databaseUrl').replace(/\/[^/]+$/, `/${DB}`);
});

afterAll(async () => {
  const admin = new pg.Client({ connectionString: inject('adminServerUrl') });
  await admin.connect();
  await admin.query(`drop database if exists ${DB} with (force)`);
  await admin.end();
});

async function tables(db: ReturnType<typeof createDb>): Promise<string[]> {
  const r = await sql<{
    tablename: string;
  }>`select tablename from pg_tables where schemaname = 'public' and tablename not like 'kysely_%' order by 1`.execute(
    db,
  );
  return r.rows.map((row) => row.tablename);
}

it('migrates up from nothing, down to nothing and up again', async () => {
  const db = createDb(url, { max: 1 });
  try {
    expect(await tables(db)).toEqual([]);
    await migrateToLatest(db);
    const expected = [
      'api_tokens',
      'attachments',
      'audit_events',
      'check_comments',
      'checks',
      'csp_reports',
      'email_tokens',
      'issue_jobs',
      'project_members',
      'projects',
      'result_cells',
      'revisions',
      'sessions',
      'sheets',
      'sign_in_attempts',
      'signatures',
      'users',
      'verify_rate_limits',
      'version_references',
      'versions',
    ];
    expect(await tables(db)).toEqual(expected);
    await migrateDownAll(db);
    expect(await tables(db)).toEqual([]);
    const functions = await sql<{
      n: string;
    }>`select count(*) as n from pg_proc p join pg_namespace n on n.oid = p.pronamespace where n.nspname = 'public'`.execute(
      db,
    );
    expect(Number(functions.rows[0].n)).toBe(0);
    await migrateToLatest(db);
    expect(await tables(db)).toEqual(expected);
  } finally {
    await db.destroy();
  }
});
