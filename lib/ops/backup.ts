// Backup and restore of a whole installation: the application database (every schema the app owns,
// including pg-boss's `pgboss`, so queued mail survives) and every object in the bucket, written to a
// folder with a manifest of sizes and SHA-256 sums; and the way back into an empty installation,
// followed by a verification of every hash the records cite and of the audit chain (lib/audit/integrity.ts).
//
// The database is dumped first, then the objects listed. Objects are written before any row cites
// them and are never overwritten, so every object the dumped rows cite is in the listing after it.
//
// pg_dump and pg_restore are Debian's programs of the local cluster's major version
// (db/local-postgres.ts); they connect over TCP with the URL they are given, as any OS user. The
// password goes to them in PGPASSWORD, never on the command line.
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { createReadStream, existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import {
  CreateBucketCommand,
  GetObjectCommand,
  ListObjectsCommand,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3';
import { sql, type Kysely } from 'kysely';
import pg from 'pg';
import { ensureServerBinaries } from '../../db/local-postgres';
import type { Database } from '../../db/schema';
import type { StorageConfig } from '../storage/config';
import { inheritedEnvironment } from '../config';

export class BackupError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'BackupError';
  }
}

export const MANIFEST_FILE = 'manifest.json';
const DUMP_FILE = 'database.dump';
const OBJECTS_FOLDER = 'objects';

interface ManifestObject {
  key: string;
  size: number;
  sha256: string;
  contentType: string | null;
}

export interface Manifest {
  format: 'worldsheet-backup';
  formatVersion: 1;
  /** UTC, ISO 8601. */
  createdAt: string;
  appVersion: string;
  /** The newest applied migration (Kysely's kysely_migration table). */
  migration: string | null;
  postgres: { serverVersion: string; dumpProgram: string };
  database: { file: string; size: number; sha256: string };
  bucket: string;
  objects: ManifestObject[];
}

type Log = (line: string) => void;

interface BackupOptions {
  /** The application's connection string (the role that owns the database). */
  databaseUrl: string;
  store: StorageConfig;
  folder: string;
  /** Recorded in the manifest; package.json's version by default. */
  appVersion?: string;
  log?: Log;
  /** Keys per listing call (S3's maximum, 1,000, unless a test wants to see the paging). */
  listPageSize?: number;
}

interface RestoreOptions {
  /** An empty database, owned by the role in this URL, which will own everything restored. */
  databaseUrl: string;
  /** An empty bucket. */
  store: StorageConfig;
  folder: string;
  log?: Log;
}

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

function fileSha256(file: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const hash = createHash('sha256');
    createReadStream(file)
      .on('data', (chunk) => hash.update(chunk))
      .on('error', reject)
      .on('end', () => resolve(hash.digest('hex')));
  });
}

function s3Client(config: StorageConfig): S3Client {
  return new S3Client({
    endpoint: config.endpoint,
    region: config.region,
    credentials: config.credentials,
    forcePathStyle: config.forcePathStyle,
    maxAttempts: 3,
  });
}

/**
 * Every key in the bucket, page by page (at most 1,000 keys per call). ListObjects (version 1) with
 * the last key as the marker rather than ListObjectsV2's continuation token: both page the same way
 * on S3 and S3-compatible stores, but the local fake (s3rver 3.7) makes its V2 tokens with DES, which
 * Node's OpenSSL 3 no longer has, and fails on every truncated V2 page.
 */
async function listAllKeys(client: S3Client, bucket: string, pageSize = 1000): Promise<string[]> {
  const keys: string[] = [];
  let marker: string | undefined;
  for (;;) {
    const page = await client.send(new ListObjectsCommand({ Bucket: bucket, Marker: marker, MaxKeys: pageSize }));
    const contents = (page.Contents ?? []).flatMap((o) => (o.Key ? [o.Key] : []));
    keys.push(...contents);
    if (!page.IsTruncated || contents.length === 0) break;
    marker = page.NextMarker ?? contents[contents.length - 1];
  }
  return [...new Set(keys)].sort();
}

/**
 * Where an object's file lives in the backup folder. Keys are the app's own (`attachments/<sha>`,
 * `revisions/…`), but a key that would leave the folder is refused rather than trusted.
 */
function objectFile(folder: string, key: string): string {
  const parts = key.split('/');
  if (
    key.length === 0 ||
    key.startsWith('/') ||
    parts.some((p) => p === '' || p === '.' || p === '..') ||
    key.includes('\0')
  ) {
    throw new BackupError(
      `The object key ${JSON.stringify(key)} cannot be written as a file; nothing of this backup can be trusted to hold it.`,
    );
  }
  return path.join(folder, OBJECTS_FOLDER, ...parts);
}

/** Splits a postgres:// URL into one without the password, and the password (for PGPASSWORD). */
function connectionForTool(url: string): { dbname: string; env: NodeJS.ProcessEnv } {
  const u = new URL(url);
  const password = decodeURIComponent(u.password);
  u.password = '';
  return { dbname: u.toString(), env: { ...inheritedEnvironment(), PGPASSWORD: password, PGCONNECT_TIMEOUT: '10' } };
}

function run(program: string, args: string[], env: NodeJS.ProcessEnv): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn(program, args, { env, stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (chunk) => (stderr += chunk));
    child.on('error', reject);
    child.on('exit', (code) => {
      if (code === 0) resolve();
      else reject(new BackupError(`${path.basename(program)} failed (exit ${code}):\n${stderr.trim()}`));
    });
  });
}

function packageVersion(): string {
  const file = path.join(path.dirname(fileURLToPath(import.meta.url)), '..', '..', 'package.json');
  try {
    return (JSON.parse(readFileSync(file, 'utf8')) as { version: string }).version;
  } catch {
    return 'unknown';
  }
}

async function migrationLevel(client: pg.Client): Promise<string | null> {
  const present = await client.query("select to_regclass('public.kysely_migration') is not null as present");
  if (!present.rows[0].present) return null;
  const r = await client.query<{ name: string }>('select name from kysely_migration order by name desc limit 1');
  return r.rows[0]?.name ?? null;
}

/** Dumps the database and copies every object of the bucket into `folder`, with manifest.json. */
export async function backup(options: BackupOptions): Promise<Manifest> {
  const log = options.log ?? (() => undefined);
  const folder = path.resolve(options.folder);
  if (existsSync(folder) && readdirSync(folder).length > 0) {
    throw new BackupError(
      `${folder} is not empty; back up into a new or empty folder, so that nothing of an older backup mixes in.`,
    );
  }
  mkdirSync(path.join(folder, OBJECTS_FOLDER), { recursive: true });
  const bin = ensureServerBinaries(log);
  const pgDump = path.join(bin.binDir, 'pg_dump');

  const client = new pg.Client({ connectionString: options.databaseUrl });
  await client.connect();
  let serverVersion: string;
  let migration: string | null;
  try {
    serverVersion = (await client.query<{ v: string }>("select current_setting('server_version') as v")).rows[0].v;
    migration = await migrationLevel(client);
  } finally {
    await client.end();
  }

  log(`dumping the database (pg_dump ${bin.major}, custom format) …`);
  const dumpFile = path.join(folder, DUMP_FILE);
  const conn = connectionForTool(options.databaseUrl);
  // Custom format (-Fc): compressed, and pg_restore can restore it selectively and in order.
  // No owners or grants: the restored database belongs to whichever role restores it.
  await run(
    pgDump,
    ['--format=custom', '--no-owner', '--no-privileges', `--file=${dumpFile}`, `--dbname=${conn.dbname}`],
    conn.env,
  );
  const dumpBytes = readFileSync(dumpFile);

  const s3 = s3Client(options.store);
  const objects: ManifestObject[] = [];
  try {
    const keys = await listAllKeys(s3, options.store.bucket, options.listPageSize);
    log(`copying ${keys.length} objects from bucket ${options.store.bucket} …`);
    for (const key of keys) {
      const file = objectFile(folder, key);
      const out = await s3.send(new GetObjectCommand({ Bucket: options.store.bucket, Key: key }));
      const bytes = Buffer.from(await out.Body!.transformToByteArray());
      mkdirSync(path.dirname(file), { recursive: true });
      writeFileSync(file, bytes);
      objects.push({ key, size: bytes.length, sha256: sha256(bytes), contentType: out.ContentType ?? null });
    }
  } finally {
    s3.destroy();
  }

  const manifest: Manifest = {
    format: 'worldsheet-backup',
    formatVersion: 1,
    createdAt: new Date().toISOString(),
    appVersion: options.appVersion ?? packageVersion(),
    migration,
    postgres: { serverVersion, dumpProgram: `pg_dump ${bin.major}` },
    database: { file: DUMP_FILE, size: dumpBytes.length, sha256: sha256(dumpBytes) },
    bucket: options.store.bucket,
    objects,
  };
  writeFileSync(path.join(folder, MANIFEST_FILE), `${JSON.stringify(manifest, null, 2)}\n`);
  log(`backup written to ${folder}: database ${dumpBytes.length} bytes, ${objects.length} objects`);
  return manifest;
}

export function readManifest(folder: string): Manifest {
  const file = path.join(path.resolve(folder), MANIFEST_FILE);
  if (!existsSync(file)) throw new BackupError(`${file} is missing: ${folder} is not a Worldsheet backup.`);
  const manifest = JSON.parse(readFileSync(file, 'utf8')) as Manifest;
  if (manifest.format !== 'worldsheet-backup' || manifest.formatVersion !== 1) {
    throw new BackupError(`${file} is not a Worldsheet backup manifest of a format this version reads (format 1).`);
  }
  return manifest;
}

/** Refuses unless the database has no tables in `public` and no `pgboss` schema. */
async function assertEmptyDatabase(databaseUrl: string): Promise<void> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    const tables = await client.query<{ n: number }>(
      "select count(*)::int as n from pg_tables where schemaname = 'public'",
    );
    const boss = await client.query<{ n: number }>(
      "select count(*)::int as n from pg_namespace where nspname = 'pgboss'",
    );
    if (tables.rows[0].n > 0 || boss.rows[0].n > 0) {
      const name = (await client.query<{ d: string }>('select current_database() as d')).rows[0].d;
      throw new BackupError(
        `The target database ${name} is not empty (${tables.rows[0].n} tables in public${boss.rows[0].n ? ', a pgboss schema' : ''}). ` +
          'Restore only into a new, empty database; nothing was changed.',
      );
    }
  } finally {
    await client.end();
  }
}

async function assertEmptyBucket(client: S3Client, bucket: string): Promise<void> {
  const page = await client.send(new ListObjectsCommand({ Bucket: bucket, MaxKeys: 1 }));
  if ((page.Contents?.length ?? 0) > 0) {
    throw new BackupError(
      `The target bucket ${bucket} is not empty. Restore only into an empty bucket; nothing was changed.`,
    );
  }
}

/**
 * Restores a backup folder into an empty database and an empty bucket. Every file is checked
 * against the manifest before anything is written; a mismatch stops the restore naming the file.
 */
export async function restore(options: RestoreOptions): Promise<Manifest> {
  const log = options.log ?? (() => undefined);
  const folder = path.resolve(options.folder);
  const manifest = readManifest(folder);
  const s3 = s3Client(options.store);
  try {
    await assertEmptyDatabase(options.databaseUrl);
    await assertEmptyBucket(s3, options.store.bucket);

    log(`checking the backup against its manifest (${manifest.objects.length} objects) …`);
    const dumpFile = path.join(folder, manifest.database.file);
    if (!existsSync(dumpFile)) throw new BackupError(`The database dump ${dumpFile} is missing; nothing was restored.`);
    if ((await fileSha256(dumpFile)) !== manifest.database.sha256) {
      throw new BackupError(
        `The database dump ${dumpFile} does not match the SHA-256 in the manifest; nothing was restored.`,
      );
    }
    for (const o of manifest.objects) {
      const file = objectFile(folder, o.key);
      if (!existsSync(file))
        throw new BackupError(`The object ${o.key} is missing from the backup (${file}); nothing was restored.`);
      const bytes = readFileSync(file);
      if (bytes.length !== o.size || sha256(bytes) !== o.sha256) {
        throw new BackupError(
          `The object ${o.key} in the backup does not match its size and SHA-256 in the manifest; nothing was restored.`,
        );
      }
    }

    const bin = ensureServerBinaries(log);
    log(`restoring the database (pg_restore ${bin.major}) …`);
    const conn = connectionForTool(options.databaseUrl);
    // One transaction: a failure leaves the database as empty as it was. --exit-on-error so that no
    // error is passed over.
    await run(
      path.join(bin.binDir, 'pg_restore'),
      ['--no-owner', '--no-privileges', '--single-transaction', '--exit-on-error', `--dbname=${conn.dbname}`, dumpFile],
      conn.env,
    );

    log(`uploading ${manifest.objects.length} objects to bucket ${options.store.bucket} …`);
    for (const o of manifest.objects) {
      const bytes = readFileSync(objectFile(folder, o.key));
      // Read again just before the upload: the file must still be the one checked above.
      if (sha256(bytes) !== o.sha256)
        throw new BackupError(`The object ${o.key} changed on disk during the restore; the restore is incomplete.`);
      await s3.send(
        new PutObjectCommand({
          Bucket: options.store.bucket,
          Key: o.key,
          Body: bytes,
          ContentType: o.contentType ?? undefined,
          ContentMD5: createHash('md5').update(bytes).digest('base64'),
        }),
      );
    }
  } finally {
    s3.destroy();
  }
  log('restore done');
  return manifest;
}

/** Creates the bucket when the store has none of that name (an empty installation's first step). */
export async function ensureBucket(config: StorageConfig): Promise<void> {
  const s3 = s3Client(config);
  try {
    await s3.send(new CreateBucketCommand({ Bucket: config.bucket }));
  } catch (error) {
    const name = (error as { name?: string }).name;
    if (name !== 'BucketAlreadyOwnedByYou' && name !== 'BucketAlreadyExists') throw error;
  } finally {
    s3.destroy();
  }
}

/** Rows in every table of the app's schemas (public and pgboss), for comparing two installations. */
export async function tableCounts(db: Kysely<Database>): Promise<Record<string, number>> {
  const tables = await sql<{ schemaname: string; tablename: string }>`
    select schemaname, tablename from pg_tables where schemaname in ('public', 'pgboss') order by 1, 2`.execute(db);
  const counts: Record<string, number> = {};
  for (const t of tables.rows) {
    const r = await sql<{
      n: number;
    }>`select count(*)::int as n from ${sql.table(`${t.schemaname}.${t.tablename}`)}`.execute(db);
    counts[`${t.schemaname}.${t.tablename}`] = r.rows[0].n;
  }
  return counts;
}
