// Starts the test PostgreSQL cluster (separate folder and port from the demo cluster, so tests can
// never touch demo data), creates a fresh database for this run and migrates it.
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { TestProject } from 'vitest/node';
import { createDb } from '../../db/index';
import { LocalCluster, testClusterPort } from '../../db/local-postgres';
import { migrateToLatest } from '../../db/migrate';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
export const TEST_DATABASE = 'worldsheet_test';

declare module 'vitest' {
  export interface ProvidedContext {
    databaseUrl: string;
    adminDatabaseUrl: string;
    adminServerUrl: string;
    testClusterPort: number;
    testClusterDataFolder: string;
  }
}

export default async function setup(project: TestProject) {
  // WORLDSHEET_TEST_CLUSTER lets two test runs on one machine use separate clusters.
  const cluster = new LocalCluster({ name: process.env.WORLDSHEET_TEST_CLUSTER ?? 'test', port: testClusterPort(), projectRoot: root });
  cluster.prepare();
  await cluster.start();
  try {
    await cluster.ensureDatabase(TEST_DATABASE, { fresh: true });
    const db = createDb(cluster.appUrl(TEST_DATABASE), { max: 1 });
    try {
      await migrateToLatest(db);
    } finally {
      await db.destroy();
    }
  } catch (error) {
    await cluster.stop();
    throw error;
  }
  project.provide('databaseUrl', cluster.appUrl(TEST_DATABASE));
  project.provide('adminDatabaseUrl', cluster.adminUrl(TEST_DATABASE));
  project.provide('adminServerUrl', cluster.adminUrl('postgres'));
  project.provide('testClusterPort', cluster.port);
  project.provide('testClusterDataFolder', cluster.dataFolder);
  return async () => {
    await cluster.stop();
  };
}
