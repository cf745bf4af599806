// The database of the commands that work on an installation (backup, restore, audit): DATABASE_URL
// when it is set; otherwise the local demo cluster, started here as npm start starts it and stopped
// again when the command ends, or the running one when npm start already runs it.
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { createDb } from '../../db/index';
import { devClusterPort, LocalCluster, LocalPostgresError } from '../../db/local-postgres';
import { config } from '../config';

const root = path.join(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

/** Where a command registers what it started, to be stopped when it ends (a Supervisor). */
export interface Stoppers {
  add(name: string, stop: () => Promise<void>): void;
}

/**
 * The application's URL of the installation's database. `create` makes the database when missing
 * (restore). `cluster` names another local cluster than the dev one (the tests' own); with it,
 * DATABASE_URL is not looked at.
 */
export async function localDatabaseUrl(
  stoppers: Stoppers,
  options: { create: boolean; cluster?: LocalCluster; log: (line: string) => void },
): Promise<string> {
  if (!options.cluster) {
    const external = config().DATABASE_URL;
    if (external) return external;
  }
  const cluster =
    options.cluster ??
    new LocalCluster({
      name: 'dev',
      port: devClusterPort(),
      projectRoot: root,
      log: (line) => options.log(`PostgreSQL: ${line}`),
    });
  cluster.prepare();
  try {
    // Registered first, so that an interruption while it starts stops it too; a no-op when this
    // command did not start it.
    stoppers.add('PostgreSQL', () => cluster.stop());
    await cluster.start();
  } catch (error) {
    // The cluster is already running (npm start): use it if our credentials get in.
    if (!(error instanceof LocalPostgresError) || !/already running/.test(error.message)) throw error;
    const probe = createDb(cluster.appUrl('postgres'), { max: 1 });
    try {
      await probe.selectNoFrom((eb) => eb.val(1).as('one')).execute();
    } catch {
      throw error;
    } finally {
      await probe.destroy();
    }
    options.log(`using the ${cluster.name} cluster that is already running`);
  }
  if (options.create) await cluster.ensureDatabase('worldsheet');
  return cluster.appUrl('worldsheet');
}
