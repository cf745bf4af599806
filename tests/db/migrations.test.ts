// Every migration applies to an empty database, reverts completely and applies again; instances
// migrating at the same moment apply each migration once.
import { readdir } from 'node:fs/promises';
import path from 'node:path';
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

it('applies each migration once when several instances migrate an empty database at the same moment', async () => {
  // As several app instances starting together do: Kysely's Migrator takes a PostgreSQL advisory lock
  // (in a transaction) around the whole run, so the second and third find nothing left to apply.
  const admin = new pg.Client({ connectionString: inject('adminServerUrl') });
  await admin.connect();
  await admin.query(`drop database if exists ${DB} with (force)`);
  await admin.query(`create database ${DB} owner worldsheet template template0`);
  await admin.end();
  const instances = [1, 2, 3].map(() => createDb(url, { max: 1 }));
  try {
    const applied = await Promise.all(
      instances.map(async (db) => {
        const lines: string[] = [];
        await migrateToLatest(db, (line) => lines.push(line));
        return lines.filter((l) => l.endsWith(': applied')).length;
      }),
    );
    const files = (await readdir(path.join(process.cwd(), 'migrations'))).filter((f) => /\.(ts|mjs|js)$/.test(f));
    // One instance applied every migration; the others none.
    expect([...applied].sort((a, b) => a - b)).toEqual([0, 0, files.length]);
    const rows = await sql<{ name: string }>`select name from kysely_migration order by name`.execute(instances[0]);
    expect(rows.rows.map((r) => r.name)).toEqual(files.map((f) => f.replace(/\.[^.]+$/, '')).sort());
  } finally {
    await Promise.all(instances.map((db) => db.destroy()));
  }
});
