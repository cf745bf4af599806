// The local cluster stops with a clear message, and changes nothing, when the port is taken, the
// data folder belongs to another PostgreSQL major version or a lock file is stale.
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createServer, type Server } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, inject, it } from 'vitest';
import {
  chooseClusterFolder,
  findServerBinaries,
  LocalCluster,
  LocalPostgresError,
  lookupOsUser,
  portIsFree,
} from '../../db/local-postgres';

const made: string[] = [];
const clusters: LocalCluster[] = [];
afterEach(async () => {
  // A cluster under test must never really start; stop it if a regression lets it.
  for (const c of clusters.splice(0)) await c.stop();
  for (const dir of made.splice(0)) rmSync(dir, { recursive: true, force: true });
});

const runAs = process.getuid?.() === 0 ? lookupOsUser('postgres') : null;

/**
 * A project root whose cluster folder (wherever the cluster will look for it: in the checkout, or
 * under /var/tmp when the postgres user cannot reach the checkout) holds a hand-made data folder,
 * so no initdb is needed to reach the checks under test.
 */
function fakeProject(pgVersion: string): { dataFolder: string; cluster: LocalCluster } {
  const root = path.join(
    process.cwd(),
    '.data',
    'test-roots',
    `r${Date.now()}${Math.random().toString(16).slice(2, 8)}`,
  );
  made.push(root);
  const folder = chooseClusterFolder({ projectRoot: root, name: 'probe', runAs, log: () => undefined });
  if (!folder.startsWith(root)) made.push(path.dirname(folder));
  const dataFolder = path.join(folder, 'data');
  mkdirSync(dataFolder, { recursive: true });
  writeFileSync(path.join(dataFolder, 'PG_VERSION'), `${pgVersion}\n`);
  const cluster = new LocalCluster({ name: 'probe', port: 54399, projectRoot: root, log: () => undefined });
  clusters.push(cluster);
  return { dataFolder, cluster };
}

const major = findServerBinaries()!.major;

describe('LocalCluster refuses to start and says why', () => {
  it('when the data folder was made by another major version', () => {
    const { cluster, dataFolder } = fakeProject('11');
    expect(() => cluster.prepare()).toThrowError(LocalPostgresError);
    expect(() => cluster.prepare()).toThrowError(
      new RegExp(`made by PostgreSQL 11, but this machine has PostgreSQL ${major}.*Nothing was changed`),
    );
    expect(readdirSync(dataFolder)).toEqual(['PG_VERSION']);
  });

  it('when a lock file is left by a server that is gone', async () => {
    const { cluster, dataFolder } = fakeProject(String(major));
    const lock = path.join(dataFolder, 'postmaster.pid');
    // pid 2^22 + 1 is above Linux's default pid_max, so no process can have it.
    writeFileSync(lock, '4194305\n/elsewhere\n');
    cluster.prepare();
    await expect(cluster.start()).rejects.toThrowError(/lock file .*postmaster\.pid is stale.*delete that one file/);
    expect(readFileSync(lock, 'utf8')).toBe('4194305\n/elsewhere\n');
  });

  it('when a lock file names a running server', async () => {
    const { cluster, dataFolder } = fakeProject(String(major));
    // The test cluster started by the global setup is a running postgres process.
    const running = readFileSync(path.join(inject('testClusterDataFolder'), 'postmaster.pid'), 'utf8').split('\n')[0];
    writeFileSync(path.join(dataFolder, 'postmaster.pid'), `${running}\n`);
    cluster.prepare();
    await expect(cluster.start()).rejects.toThrowError(
      new RegExp(`pid ${running}\\) is already running.*npm run db:stop`),
    );
  });

  it('when the port is already in use', async () => {
    const { cluster } = fakeProject(String(major));
    const blocker: Server = createServer();
    await new Promise<void>((resolve) => blocker.listen(54399, '127.0.0.1', resolve));
    try {
      expect(await portIsFree(54399)).toBe(false);
      cluster.prepare();
      await expect(cluster.start()).rejects.toThrowError(
        /Port 54399 on 127\.0\.0\.1 is already in use.*WORLDSHEET_PG_PORT/,
      );
    } finally {
      await new Promise((resolve) => blocker.close(resolve));
    }
    expect(await portIsFree(54399)).toBe(true);
  });
});

describe.runIf(process.getuid?.() === 0)('as root', () => {
  it('keeps the cluster where the postgres user can reach it when the checkout is in a private folder', () => {
    const privateRoot = mkdtempSync(path.join(tmpdir(), 'ws-private-'));
    made.push(privateRoot);
    const chosen = chooseClusterFolder({ projectRoot: privateRoot, name: 'probe', runAs, log: () => undefined });
    made.push(path.dirname(chosen));
    expect(chosen.startsWith('/var/tmp/worldsheet-')).toBe(true);
    expect(readFileSync(path.join(privateRoot, '.data', 'pg-probe', 'WHERE-IS-THE-DATA.txt'), 'utf8')).toContain(
      chosen,
    );
  });
});
