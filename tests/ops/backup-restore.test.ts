// Backup and restore of a whole installation: a world built through the lib functions (versions, an
// attachment, a check through approval, two issued revisions and a stamped copy, queued mail) is
// backed up to a folder and restored into a fresh empty database and a fresh empty bucket; the
// restored copy must pass verifyInstallation (every version hash, every PDF and attachment hash, the
// audit chain) and hold as many rows as the source. Restoring a backup and then verifying every
// recorded checksum is common practice for proving a backup (no single published source; PostgreSQL's
// own documentation, "Backup and Restore", advises testing restores).
//
// The tests run in order and share the backup: the per-test reset empties only the test database,
// not the restored copies or the backup folder.
import { readFileSync, writeFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { createDb } from '../../db/index';
import type { Database } from '../../db/schema';
import { uploadAttachment } from '../../lib/attachments/attachments';
import { requestIssue } from '../../lib/issue/request';
import { processIssueJob } from '../../lib/issue/job';
import { revisionPdf } from '../../lib/issue/download';
import { enqueueMail } from '../../lib/mail/outbox';
import {
  backup,
  BackupError,
  ensureBucket,
  MANIFEST_FILE,
  readManifest,
  restore,
  tableCounts,
  type Manifest,
} from '../../lib/ops/backup';
import { verifyInstallation } from '../../lib/audit/integrity';
import { createSheet } from '../../lib/sheets/sheets';
import { storageConfig, type StorageConfig } from '../../lib/storage/config';
import { createObjectStore } from '../../lib/storage/object-store';
import { approveNewVersion, makeSheet, makeTeam } from '../support/approved-sheet';
import { testDb } from '../support/database';
import { PASSWORD } from '../support/people';
import { refusal } from '../support/refusal';
import type { Kysely } from 'kysely';

const work = mkdtempSync(path.join(tmpdir(), 'ws-backup-'));
process.env.WORLDSHEET_KEY_FOLDER ??= path.join(work, 'keys');
const backupFolder = path.join(work, 'backup');
const tag = Math.random().toString(36).slice(2, 8);
const scratchDatabases: string[] = [];
const opened: Kysely<Database>[] = [];

const sourceStore = (): StorageConfig => storageConfig();

/** A new empty database owned by the application role, on the test cluster; its app URL. */
async function emptyDatabase(name: string): Promise<{ url: string; adminUrl: string }> {
  const db = `worldsheet_restore_${name}_${tag}`;
  const admin = new pg.Client({ connectionString: inject('adminServerUrl') });
  await admin.connect();
  try {
    await admin.query(`drop database if exists ${db} with (force)`);
    await admin.query(`create database ${db} owner worldsheet template template0`);
  } finally {
    await admin.end();
  }
  scratchDatabases.push(db);
  return {
    url: inject('databaseUrl').replace(/\/[^/]+$/, `/${db}`),
    adminUrl: inject('adminServerUrl').replace(/\/[^/]+$/, `/${db}`),
  };
}

/** A new empty bucket on the test object store. */
async function emptyBucket(name: string): Promise<StorageConfig> {
  const config = { ...sourceStore(), bucket: `restore-${name}-${tag}` };
  await ensureBucket(config);
  return config;
}

function openDb(url: string): Kysely<Database> {
  const db = createDb(url, { max: 2 });
  opened.push(db);
  return db;
}

let manifest: Manifest;
let sourceCounts: Record<string, number>;
let restored: { url: string; adminUrl: string };
let restoredStore: StorageConfig;

async function buildWorld() {
  const db = testDb();
  const store = createObjectStore(sourceStore());
  const team = await makeTeam(db, { code: 'BKP' });
  const { author, controller, projectId } = team;
  const sheet = await makeSheet(
    db,
    author,
    { id: projectId, code: 'BKP' },
    { title: 'Booster extraction kicker', objective: 'Kick angle at extraction' },
  );
  await uploadAttachment(db, store, author, sheet, {
    name: 'kicker-scan.csv',
    type: 'text/csv',
    bytes: new TextEncoder().encode('voltage [kV], angle [mrad]\n10, 0.5\n20, 1.0\n'),
  });
  await createSheet(
    db,
    author,
    { id: projectId, code: 'BKP' },
    { title: 'Second sheet, never issued', safetyRelated: false, objective: '' },
  );

  const approveAndIssue = async (source: string) => {
    const versionNumber = await approveNewVersion(db, team, sheet, {
      message: source,
      cells: [{ id: 'c1', kind: 'calc', source }],
    });
    const { jobId } = await requestIssue(db, controller, sheet, { versionNumber, password: PASSWORD });
    return (await processIssueJob(db, store, jobId))!;
  };
  const a = await approveAndIssue('T_kin = 250 MeV');
  await approveAndIssue('T_kin = 230 MeV');
  // Revision A is superseded now: downloading it makes the stamped copy, recorded in its row.
  expect((await revisionPdf(db, store, a, false)).stamped).toBe(true);
  // Mail still queued at backup time must survive the restore (schema pgboss is in the dump).
  await db.transaction().execute((trx) =>
    enqueueMail(trx, {
      to: 'author@example.test',
      subject: 'Queued before the backup',
      text: 'fictional',
      kind: 'test',
    }),
  );
}

beforeAll(async () => {
  restoredStore = await emptyBucket('main');
});

afterAll(async () => {
  await Promise.all(opened.map((db) => db.destroy()));
  const admin = new pg.Client({ connectionString: inject('adminServerUrl') });
  await admin.connect();
  for (const db of scratchDatabases) await admin.query(`drop database if exists ${db} with (force)`);
  await admin.end();
});

describe('backup and restore', () => {
  it('backs up, restores into an empty database and bucket, and the copy verifies with the same row counts', async () => {
    await buildWorld();
    const source = await verifyInstallation(testDb(), createObjectStore(sourceStore()));
    expect(source.problems).toEqual([]);
    sourceCounts = await tableCounts(testDb());
    expect(sourceCounts['pgboss.job']).toBeGreaterThan(0);

    // Pages of 2 keys, so that the listing's paging is exercised with a handful of objects.
    manifest = await backup({
      databaseUrl: inject('databaseUrl'),
      store: sourceStore(),
      folder: backupFolder,
      listPageSize: 2,
    });
    expect(manifest.objects.length).toBeGreaterThan(2);
    expect(readManifest(backupFolder)).toEqual(manifest);
    expect(manifest.migration).toMatch(/^\d{8}T\d{6}_/);
    expect(manifest.createdAt).toMatch(/Z$/);
    expect(manifest.database.sha256).toMatch(/^[0-9a-f]{64}$/);
    const keys = manifest.objects.map((o) => o.key);
    const revisions = await testDb().selectFrom('revisions').select(['pdf_key', 'stamped_key']).execute();
    const attachments = await testDb().selectFrom('attachments').select('storage_key').execute();
    for (const key of [
      ...revisions.flatMap((r) => [r.pdf_key, r.stamped_key]),
      ...attachments.map((a) => a.storage_key),
    ]) {
      if (key) expect(keys).toContain(key);
    }

    restored = await emptyDatabase('main');
    await restore({ databaseUrl: restored.url, store: restoredStore, folder: backupFolder });
    const copy = openDb(restored.url);
    const report = await verifyInstallation(copy, createObjectStore(restoredStore));
    expect(report.problems).toEqual([]);
    expect(report.ok).toBe(true);
    expect(report.counts).toEqual(source.counts);
    expect(report.counts).toMatchObject({ revisions: 2, stampedCopies: 1, attachments: 1 });
    expect(report.counts.versions).toBeGreaterThanOrEqual(4);
    expect(report.counts.auditEvents).toBeGreaterThan(10);
    expect(await tableCounts(copy)).toEqual(sourceCounts);
    expect((await createObjectStore(restoredStore).list('')).sort()).toEqual([...keys].sort());

    // The restored tables belong to the application role, and its immutability rules still hold.
    const owners = await copy
      .selectFrom('pg_tables' as never)
      .select('tableowner' as never)
      .where('schemaname' as never, 'in', ['public', 'pgboss'] as never)
      .distinct()
      .execute();
    expect(owners).toEqual([{ tableowner: 'worldsheet' }]);
    await expect(copy.deleteFrom('versions').execute()).rejects.toThrow(/refused/i);
  }, 300_000);

  it('refuses a target database or bucket that is not empty, and changes nothing', async () => {
    expect(manifest).toBeDefined();
    const intoUsed = await refusal(
      restore({ databaseUrl: restored.url, store: await emptyBucket('unused'), folder: backupFolder }),
      BackupError,
    );
    expect(intoUsed.message).toMatch(/target database .* is not empty/);
    const fresh = await emptyDatabase('refused');
    const intoFullBucket = await refusal(
      restore({ databaseUrl: fresh.url, store: restoredStore, folder: backupFolder }),
      BackupError,
    );
    expect(intoFullBucket.message).toMatch(/target bucket .* is not empty/);
    const db = openDb(fresh.url);
    const tables = await db
      .selectFrom('pg_tables' as never)
      .select('tablename' as never)
      .where('schemaname' as never, '=', 'public' as never)
      .execute();
    expect(tables).toEqual([]);
  });

  it('refuses a backup whose object was altered on disk, naming the object, before writing anything', async () => {
    const pdf = manifest.objects.find((o) => o.key.startsWith('revisions/'))!;
    const file = path.join(backupFolder, 'objects', ...pdf.key.split('/'));
    const original = readFileSync(file);
    const altered = Buffer.from(original);
    altered[altered.length - 10] ^= 0x01;
    writeFileSync(file, altered);
    try {
      const target = await emptyDatabase('altered');
      const bucket = await emptyBucket('altered');
      const error = await refusal(
        restore({ databaseUrl: target.url, store: bucket, folder: backupFolder }),
        BackupError,
      );
      expect(error.message).toContain(pdf.key);
      expect(error.message).toMatch(/does not match/);
      expect(await createObjectStore(bucket).list('')).toEqual([]);
      const db = openDb(target.url);
      expect(
        await db
          .selectFrom('pg_tables' as never)
          .select('tablename' as never)
          .where('schemaname' as never, '=', 'public' as never)
          .execute(),
      ).toEqual([]);
    } finally {
      writeFileSync(file, original);
    }
    // An altered manifest entry is refused the same way.
    const manifestFile = path.join(backupFolder, MANIFEST_FILE);
    const text = readFileSync(manifestFile, 'utf8');
    try {
      const edited = JSON.parse(text) as Manifest;
      edited.database.sha256 = '0'.repeat(64);
      writeFileSync(manifestFile, JSON.stringify(edited));
      const error = await refusal(
        restore({
          databaseUrl: (await emptyDatabase('dump')).url,
          store: await emptyBucket('dump'),
          folder: backupFolder,
        }),
        BackupError,
      );
      expect(error.message).toMatch(/database dump .* does not match/);
    } finally {
      writeFileSync(manifestFile, text);
    }
  });

  it('reports a restored version whose content was changed behind the triggers, and a changed PDF', async () => {
    const admin = new pg.Client({ connectionString: restored.adminUrl });
    await admin.connect();
    let tampered: { sheet_id: string; number: number };
    try {
      await admin.query('begin');
      await admin.query('set local session_replication_role = replica');
      const r = await admin.query<{ sheet_id: string; number: number }>(
        `update versions set content = jsonb_set(content, '{title}', '"Booster extraction kicker (edited)"')
         where id = (select id from versions order by created_at desc limit 1) returning sheet_id, number`,
      );
      tampered = r.rows[0];
      await admin.query('commit');
    } finally {
      await admin.end();
    }
    const copy = openDb(restored.url);
    const store = createObjectStore(restoredStore);
    // A PDF this installation's register cites (the shared test bucket also holds other test files' objects).
    const cited = await copy.selectFrom('revisions').select('pdf_key').orderBy('sequence').executeTakeFirstOrThrow();
    const pdf = manifest.objects.find((o) => o.key === cited.pdf_key)!;
    // The object store refuses nothing: a PDF replaced under its key is found by its hash.
    const { PutObjectCommand, S3Client } = await import('@aws-sdk/client-s3');
    const s3 = new S3Client({
      endpoint: restoredStore.endpoint,
      region: restoredStore.region,
      credentials: restoredStore.credentials,
      forcePathStyle: true,
    });
    await s3.send(
      new PutObjectCommand({
        Bucket: restoredStore.bucket,
        Key: pdf.key,
        Body: Buffer.from('%PDF-1.7 not the issued file'),
      }),
    );
    s3.destroy();
    // The replacement must be what the store now serves before the check runs (the local fake
    // writes the object and its metadata separately; under load a read can briefly see the old one).
    const replaced = Buffer.from('%PDF-1.7 not the issued file');
    for (let i = 0; i < 100; i++) {
      const now = await store.get(pdf.key);
      if (now && now.equals(replaced)) break;
      await new Promise((r) => setTimeout(r, 100));
    }
    expect((await store.get(pdf.key))?.equals(replaced)).toBe(true);

    const report = await verifyInstallation(copy, store);
    expect(report.ok).toBe(false);
    expect(report.problems).toEqual([
      expect.stringMatching(new RegExp(`^version ${tampered!.number} of sheet BKP #1 .*no longer hashes`)),
      expect.stringContaining(`the object ${pdf.key} does not hash to the recorded`),
    ]);
  });
});
