// Starts the test PostgreSQL cluster (separate folder and port from the demo cluster, so tests can
// never touch demo data), creates a fresh database for this run and migrates it. Also starts the
// local mail capture server on the test mail ports and sets up the job queues.
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { TestProject } from 'vitest/node';
import { createDb } from '../../db/index';
import { DEFAULT_TEST_PG_PORT, LocalCluster, testClusterPort } from '../../db/local-postgres';
import { migrateToLatest } from '../../db/migrate';
import { ensureJobQueues } from '../../lib/jobs/queue';
import { startCaptureServer } from '../../lib/mail/capture-server';
import { rmSync } from 'node:fs';
import { startFakeObjectStore } from '../../lib/storage/fake-server';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
export const TEST_DATABASE = 'worldsheet_test';

declare module 'vitest' {
  export interface ProvidedContext {
    databaseUrl: string;
    adminDatabaseUrl: string;
    adminServerUrl: string;
    testClusterPort: number;
    testClusterDataFolder: string;
    /** The test mail capture server: SMTP (for WORLDSHEET_SMTP_URL) and its HTTP API. */
    smtpUrl: string;
    mailCaptureUrl: string;
    /** The WORLDSHEET_S3_* variables of the test object store (the local S3-compatible fake). */
    objectStoreEnv: Record<string, string>;
  }
}

/** The test mail ports (npm start uses 2525 and 2580). */
export const DEFAULT_TEST_SMTP_PORT = 2535;
export const DEFAULT_TEST_MAIL_CAPTURE_PORT = 2590;
/** The test object store's port (npm start uses 4568). */
export const DEFAULT_TEST_S3_PORT = 4578;

/**
 * WORLDSHEET_TEST_SMTP_PORT / WORLDSHEET_TEST_MAIL_CAPTURE_PORT when set; otherwise the default
 * shifted as far as the test cluster's port is from its default, so that a second test run with
 * its own WORLDSHEET_TEST_PG_PORT gets its own mail ports too.
 */
function testMailPort(variable: string, base: number): number {
  const explicit = process.env[variable];
  if (explicit) return Number(explicit);
  const port = base + (testClusterPort() - DEFAULT_TEST_PG_PORT);
  return port >= 1024 && port <= 65535 ? port : base;
}

export default async function setup(project: TestProject) {
  const mail = await startCaptureServer({
    smtpPort: testMailPort('WORLDSHEET_TEST_SMTP_PORT', DEFAULT_TEST_SMTP_PORT),
    httpPort: testMailPort('WORLDSHEET_TEST_MAIL_CAPTURE_PORT', DEFAULT_TEST_MAIL_CAPTURE_PORT),
    portVariables: { smtp: 'WORLDSHEET_TEST_SMTP_PORT', http: 'WORLDSHEET_TEST_MAIL_CAPTURE_PORT' },
  });
  // WORLDSHEET_TEST_CLUSTER lets two test runs on one machine use separate clusters.
  const clusterName = process.env.WORLDSHEET_TEST_CLUSTER ?? 'test';
  // A fresh object store per run, as the database is fresh.
  const objectsFolder = path.join(root, '.data', `objects-${clusterName}`);
  rmSync(objectsFolder, { recursive: true, force: true });
  let objects;
  try {
    objects = await startFakeObjectStore({
      port: testMailPort('WORLDSHEET_TEST_S3_PORT', DEFAULT_TEST_S3_PORT),
      directory: objectsFolder,
    });
  } catch (error) {
    await mail.stop();
    throw error;
  }
  const stopServers = () => Promise.all([mail.stop(), objects.stop()]);
  const cluster = new LocalCluster({ name: clusterName, port: testClusterPort(), projectRoot: root });
  try {
    cluster.prepare();
    await cluster.start();
  } catch (error) {
    await stopServers();
    throw error;
  }
  try {
    await cluster.ensureDatabase(TEST_DATABASE, { fresh: true });
    const db = createDb(cluster.appUrl(TEST_DATABASE), { max: 1 });
    try {
      await migrateToLatest(db);
    } finally {
      await db.destroy();
    }
    // The job schema (pgboss) and its queues, so that tests can queue jobs with no worker running.
    await ensureJobQueues(cluster.appUrl(TEST_DATABASE));
  } catch (error) {
    await cluster.stop();
    await stopServers();
    throw error;
  }
  project.provide('databaseUrl', cluster.appUrl(TEST_DATABASE));
  project.provide('adminDatabaseUrl', cluster.adminUrl(TEST_DATABASE));
  project.provide('adminServerUrl', cluster.adminUrl('postgres'));
  project.provide('testClusterPort', cluster.port);
  project.provide('testClusterDataFolder', cluster.dataFolder);
  project.provide('smtpUrl', mail.smtpUrl);
  project.provide('mailCaptureUrl', mail.url);
  project.provide('objectStoreEnv', objects.env);
  return async () => {
    await stopServers();
    await cluster.stop();
  };
}
