// The project's commands, run by lib/ops/bootstrap.mjs after the npm packages are in place:
//   start     local PostgreSQL, migrations, demo seed, production build, app server and job worker,
//             the local object store (S3-compatible fake) unless one is configured, and in demo mode
//             the local mail capture server (npm start)
//   test      the whole test suite against a separate test cluster (npm test)
//   bench     the benchmarks, printed as ratios measured in one run (npm run bench)
//   stress    the load test across two instances, one killed while issuing (npm run test:stress; CI runs it after test)
//   dev       like start, with `next dev` instead of a production build
//   db-start  only the local PostgreSQL, until Ctrl-C
//   db-stop   stops a local PostgreSQL left running by a process that is gone (--test, --bench: those clusters)
//   migrate   applies migrations to DATABASE_URL or the local cluster
//   backup    dumps the database and every stored object into a folder (npm run backup -- FOLDER)
//   restore   restores such a folder into an empty installation and verifies it (npm run restore -- FOLDER)
//   audit     walks the audit chain of the installation, app running or not (npm run -s audit -- verify)
import { execFileSync } from 'node:child_process';
import { closeSync, createWriteStream, mkdirSync, openSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { createDb } from '../../db/index';
import {
  benchClusterPort,
  devClusterPort,
  LocalCluster,
  LocalPostgresError,
  portIsFree,
  testClusterPort,
} from '../../db/local-postgres';
import { migrateToLatest } from '../../db/migrate';
import { seedDemo } from '../../db/seed';
import { checkProduction, config, ConfigError, inheritedEnvironment } from '../config';
import { ensureChromium } from './chromium';
import { localAuthSecret } from './app-secrets';
import { ensureCalcWorkerBundle } from './calc-worker-build';
import { buildIfStale } from './next-build';
import { Supervisor, waitForExit } from './supervisor';
import { plan, runStages } from './test-tiers';
import { ensureJobQueues } from '../jobs/queue';
import { startCaptureServer } from '../mail/capture-server';
import { mailCapturePort, smtpPort } from '../mail/config';
import { FAKE_S3_CREDENTIALS, storageConfig, type StorageConfig } from '../storage/config';
import { startFakeObjectStore } from '../storage/fake-server';
import { createObjectStore } from '../storage/object-store';
import { verifyInstallationAt, type InstallationReport } from '../audit/integrity';
import { auditCommand } from './audit-command';
import { backup, restore } from './backup';
import { localDatabaseUrl } from './local-database';

const root = path.join(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
const log = (line: string) => console.log(`[worldsheet] ${line}`);

interface Database {
  url: string;
  demo: boolean;
}

/** DATABASE_URL when set (a deployment's own server, no demo data); otherwise the local dev cluster. */
async function prepareDatabase(supervisor: Supervisor, options: { seed: boolean }): Promise<Database> {
  const external = config().DATABASE_URL;
  let url: string;
  if (external) {
    log('using the PostgreSQL server named by DATABASE_URL (no demo data)');
    url = external;
  } else {
    const cluster = new LocalCluster({ name: 'dev', port: devClusterPort(), projectRoot: root });
    cluster.prepare();
    supervisor.add('PostgreSQL', () => cluster.stop());
    await cluster.start();
    await cluster.ensureDatabase('worldsheet');
    url = cluster.appUrl('worldsheet');
  }
  const db = createDb(url, { max: 2 });
  try {
    await migrateToLatest(db, log);
    if (!external && options.seed) {
      const r = await seedDemo(db, { studies: true, starters: true });
      log(
        r.usersCreated + r.sheetsCreated + r.membershipsCreated === 0 && !r.projectCreated
          ? 'demo data already in place'
          : `demo data: ${r.usersCreated} accounts, ${r.projectCreated ? 1 : 0} project, ${r.membershipsCreated} roles, ${r.sheetsCreated} sheets added`,
      );
    }
  } finally {
    await db.destroy();
  }
  return { url, demo: !external };
}

function appEnv(database: Database, extra: Record<string, string> = {}): NodeJS.ProcessEnv {
  const settings = config();
  const host = settings.WORLDSHEET_HOST;
  const port = settings.PORT;
  if (!database.demo && !settings.NEXTAUTH_SECRET) {
    throw new LocalPostgresError(
      'Set NEXTAUTH_SECRET (a long random string) for a deployment with its own DATABASE_URL.',
    );
  }
  return {
    ...inheritedEnvironment(),
    DATABASE_URL: database.url,
    WORLDSHEET_DEMO: database.demo ? '1' : '0',
    NEXT_TELEMETRY_DISABLED: '1',
    NEXTAUTH_URL: settings.NEXTAUTH_URL ?? `http://${host}:${port}`,
    NEXTAUTH_SECRET: settings.NEXTAUTH_SECRET ?? localAuthSecret(root),
    ...extra,
  };
}

// ── Mail and jobs ────────────────────────────────────────────────────────────────────────────
// Demo mode (no DATABASE_URL): the local mail capture server, in this process, receives all mail
// and the app shows it at /mailbox. A deployment sets WORLDSHEET_SMTP_URL for its mail service.
// In both cases the job worker process (lib/jobs/worker-main.ts) delivers the queued mail.

/** Starts the demo mail capture server; returns the settings the app and the worker need. */
async function startDemoMail(supervisor: Supervisor, appBaseUrl: string): Promise<Record<string, string>> {
  const capture = await startCaptureServer({
    smtpPort: smtpPort(),
    httpPort: mailCapturePort(),
    portVariables: { smtp: 'WORLDSHEET_SMTP_PORT', http: 'WORLDSHEET_MAIL_CAPTURE_PORT' },
    log: (line) => log(`demo mail: ${line} (read it at ${appBaseUrl}/mailbox)`),
  });
  supervisor.add('mail capture server', () => capture.stop());
  log(`demo mail server: SMTP on ${capture.smtpUrl}, nothing is delivered; captured mail at ${appBaseUrl}/mailbox`);
  return { WORLDSHEET_SMTP_URL: capture.smtpUrl, WORLDSHEET_MAIL_CAPTURE_URL: capture.url };
}

/**
 * Starts the local S3-compatible object store unless the environment names a real one
 * (WORLDSHEET_S3_ENDPOINT or WORLDSHEET_S3_BUCKET); returns the settings the app needs.
 */
async function startLocalObjectStore(supervisor: Supervisor): Promise<Record<string, string>> {
  const settings = config();
  if (settings.WORLDSHEET_S3_ENDPOINT || settings.WORLDSHEET_S3_BUCKET) return {};
  const store = await startFakeObjectStore({
    port: settings.WORLDSHEET_S3_PORT,
    directory: path.join(root, '.data', 'objects-dev'),
  });
  supervisor.add('local object store', () => store.stop());
  log(`local object store: S3-compatible fake on ${store.url}, files kept in .data/objects-dev`);
  return store.env;
}

function spawnJobWorker(supervisor: Supervisor, env: NodeJS.ProcessEnv) {
  return supervisor.spawn(
    'job worker',
    process.execPath,
    ['--import', 'tsx', path.join('lib', 'jobs', 'worker-main.ts')],
    {
      cwd: root,
      env,
    },
  );
}
// ─────────────────────────────────────────────────────────────────────────────────────────────

async function serve(supervisor: Supervisor, mode: 'start' | 'dev'): Promise<void> {
  const settings = config();
  const host = settings.WORLDSHEET_HOST;
  const port = settings.PORT;
  if (!(await portIsFree(port, host))) {
    throw new LocalPostgresError(
      `Port ${port} on ${host} is already in use. Stop what uses it, or choose another with PORT=<port>.`,
    );
  }
  // A deployment (its own DATABASE_URL) without its secret, signing key and certificate or mail service
  // stops here, before anything is started, migrated or built.
  if (mode === 'start' && settings.DATABASE_URL)
    checkProduction({ ...inheritedEnvironment(), NODE_ENV: 'production', WORLDSHEET_DEMO: '0' });
  const mailEnv = settings.DATABASE_URL ? {} : await startDemoMail(supervisor, `http://${host}:${port}`);
  const storeEnv = await startLocalObjectStore(supervisor);
  const database = await prepareDatabase(supervisor, { seed: true });
  await ensureJobQueues(database.url);
  const env = appEnv(database, { ...mailEnv, ...storeEnv });
  // The evaluation workers' prebuilt engine (lib/ops/calc-worker-build.ts); `next dev` too, so its
  // workers start from it until lib/calc is edited (then from source, as before).
  ensureCalcWorkerBundle(root);
  if (mode === 'start') buildIfStale(root, '.next', { ...env, NODE_ENV: 'production' });
  if (supervisor.isStopping) return;
  const worker = spawnJobWorker(supervisor, { ...env, NODE_ENV: 'production' });
  // The app's own server (lib/ops/server.ts): Next.js behind the layer that records the connection's
  // address and sets the Content-Security-Policy.
  const serverArgs = [
    '--import',
    'tsx',
    path.join('lib', 'ops', 'server.ts'),
    ...(mode === 'dev' ? ['--dev'] : []),
    '-H',
    host,
    '-p',
    String(port),
  ];
  const app = supervisor.spawn('app server', process.execPath, serverArgs, {
    cwd: root,
    env: mode === 'start' ? { ...env, NODE_ENV: 'production' } : { ...env, NODE_ENV: 'development' },
  });
  log(`Worldsheet: http://${host}:${port}  (demo accounts are listed in README.md; Ctrl-C stops everything)`);
  const [which, code] = await Promise.race([
    waitForExit(app).then((c) => ['app server', c] as const),
    waitForExit(worker).then((c) => ['job worker', c] as const),
  ]);
  if (!supervisor.isStopping) {
    console.error(`[worldsheet] the ${which} stopped unexpectedly (exit ${code}); stopping the rest.`);
    await supervisor.shutdown(code || 1);
  }
}

async function test(supervisor: Supervisor, args: string[]): Promise<void> {
  ensureChromium(log);
  // The tests' evaluation workers (the sandbox and CLI tests, the served app) load the prebuilt engine.
  ensureCalcWorkerBundle(root);
  // The database and browser tiers' vitest global setup starts the test cluster itself
  // (tests/setup/global-setup.ts) and the browser harness builds and serves the app; this command runs
  // the stages (static checks, then the tiers) to the end (lib/ops/test-tiers.ts).
  const env = {
    ...inheritedEnvironment(),
    NEXT_TELEMETRY_DISABLED: '1',
    WORLDSHEET_TEST_PG_PORT: String(testClusterPort()),
  };
  const code = await runStages(
    plan(args, root),
    async (stage) => {
      if (!stage.background)
        return waitForExit(supervisor.spawn(stage.name, stage.command[0], stage.command.slice(1), { cwd: root, env }));
      // Beside the tiers: its output in a file, shown if it fails (a test tier's last lines also when it passes).
      const logFile = path.join(root, stage.log ?? path.join('.data', 'background.log'));
      mkdirSync(path.dirname(logFile), { recursive: true });
      const out = openSync(logFile, 'w');
      // In a process group of its own, so that stopping it stops `next build` under it too.
      const child = supervisor.spawn(stage.name, stage.command[0], stage.command.slice(1), {
        cwd: root,
        env,
        stdio: ['ignore', out, out],
        detached: true,
      });
      const exit = await waitForExit(child);
      closeSync(out);
      if (exit) console.error(`[worldsheet] the ${stage.name} failed:\n${readFileSync(logFile, 'utf8')}`);
      else if (stage.name.endsWith(' tier'))
        log(`the ${stage.name} passed:\n${readFileSync(logFile, 'utf8').trimEnd().split('\n').slice(-6).join('\n')}`);
      return exit;
    },
    log,
  );
  // Stops what may still run (the app's build, when a tier before the browser tier failed).
  if (!supervisor.isStopping) await supervisor.shutdown(code);
}

/**
 * The benchmarks, one after the other: the calculation engine, saving versions, issuing and the load on
 * the served app (which run their own PostgreSQL cluster in .data/pg-bench on WORLDSHEET_BENCH_PG_PORT
 * and stop it when done). Each one's output is printed and also written, with the time and the
 * commit, to tests/bench/figures/<name>.txt: the figures of the last run.
 */
async function bench(supervisor: Supervisor): Promise<void> {
  let failed = 0;
  ensureCalcWorkerBundle(root);
  const folder = path.join(root, 'tests', 'bench', 'figures');
  mkdirSync(folder, { recursive: true });
  const commit = (() => {
    try {
      return execFileSync('git', ['rev-parse', '--short', 'HEAD'], { cwd: root, encoding: 'utf8' }).trim();
    } catch {
      return 'unknown';
    }
  })();
  for (const file of ['calc-bench.ts', 'save-bench.ts', 'issue-bench.ts', 'load-bench.ts']) {
    const out = createWriteStream(path.join(folder, file.replace(/\.ts$/, '.txt')));
    out.write(`# ${file}, run ${new Date().toISOString()} at commit ${commit}\n`);
    const child = supervisor.spawn(
      `benchmark ${file}`,
      process.execPath,
      // --expose-gc: the calculation benchmark collects garbage before each timing, so that one
      // phase's garbage is not collected in the next one's time.
      ['--expose-gc', '--import', 'tsx', path.join(root, 'tests', 'bench', file)],
      { cwd: root, stdio: ['ignore', 'pipe', 'pipe'] },
    );
    child.stdout?.on('data', (chunk: Buffer) => {
      process.stdout.write(chunk);
      out.write(chunk);
    });
    child.stderr?.on('data', (chunk: Buffer) => {
      process.stderr.write(chunk);
      out.write(chunk);
    });
    // 'close' comes after the last output, where 'exit' may come before it.
    const closed = new Promise<void>((resolve) => child.once('close', () => resolve()));
    const code = await waitForExit(child);
    await closed;
    await new Promise<void>((resolve) => out.end(resolve));
    if (supervisor.isStopping) return;
    if (code !== 0) {
      console.error(`[worldsheet] ${file} failed (exit ${code})`);
      failed ||= code;
    }
  }
  console.log(`[worldsheet] figures written to ${path.relative(root, folder)}/`);
  process.exit(failed);
}

/**
 * The load test (npm run test:stress, run in CI after npm test): two app instances and two job
 * workers on one PostgreSQL and one object store under the load benchmark's 50 users for a minute,
 * one instance killed while its worker issues a revision (tests/bench/instances-stress.ts); it
 * fails on any 5xx, lost or half-written version, failed request on the survivor, or a revision not
 * issued exactly once. `npm run bench` runs the one-instance load benchmark for its figures.
 */
async function stress(supervisor: Supervisor): Promise<void> {
  const env = { WORLDSHEET_STRESS_SECONDS: '60', ...inheritedEnvironment() };
  const child = supervisor.spawn(
    'load test',
    process.execPath,
    ['--import', 'tsx', path.join(root, 'tests', 'bench', 'instances-stress.ts')],
    { cwd: root, env },
  );
  const code = await waitForExit(child);
  if (!supervisor.isStopping) process.exit(code);
}

async function dbOnly(supervisor: Supervisor): Promise<void> {
  const database = await prepareDatabase(supervisor, { seed: true });
  log(`PostgreSQL ready: DATABASE_URL=${database.url}`);
  log('Ctrl-C stops it.');
  await new Promise(() => undefined);
}

function dbStop(args: string[]): void {
  const which = args.includes('--test') ? 'test' : args.includes('--bench') ? 'bench' : 'dev';
  const port = which === 'test' ? testClusterPort() : which === 'bench' ? benchClusterPort() : devClusterPort();
  const cluster = new LocalCluster({ name: which, port, projectRoot: root });
  log(cluster.stopLeftover() ? 'stopped the leftover server' : 'no server was running on that cluster');
}

async function migrateOnly(supervisor: Supervisor): Promise<void> {
  await prepareDatabase(supervisor, { seed: false });
  await supervisor.shutdown(0);
}

// ── Backup, restore and the audit check ──────────────────────────────────────────────────────
// On DATABASE_URL and the configured object store when they are set; otherwise on the local demo
// installation (the dev cluster and .data/objects-dev), started here as npm start does, or the
// running ones when npm start already runs them (lib/ops/local-database.ts).

async function localStoreConfig(supervisor: Supervisor): Promise<StorageConfig> {
  const settings = config();
  if (settings.WORLDSHEET_S3_ENDPOINT || settings.WORLDSHEET_S3_BUCKET) return storageConfig();
  const port = settings.WORLDSHEET_S3_PORT;
  if (!(await portIsFree(port))) {
    // npm start runs the local object store in its own process; talk to that one.
    log(`using the local object store already listening on 127.0.0.1:${port}`);
    return storageConfig({
      ...inheritedEnvironment(),
      WORLDSHEET_S3_ENDPOINT: `http://127.0.0.1:${port}`,
      WORLDSHEET_S3_ACCESS_KEY_ID: FAKE_S3_CREDENTIALS.accessKeyId,
      WORLDSHEET_S3_SECRET_ACCESS_KEY: FAKE_S3_CREDENTIALS.secretAccessKey,
    });
  }
  const store = await startFakeObjectStore({ port, directory: path.join(root, '.data', 'objects-dev') });
  supervisor.add('local object store', () => store.stop());
  return storageConfig({ ...inheritedEnvironment(), ...store.env });
}

function printReport(report: InstallationReport): void {
  const c = report.counts;
  log(
    `verified: ${c.versions} version hashes, ${c.revisions} revision PDFs, ${c.stampedCopies} stamped copies, ` +
      `${c.attachments} attachments, audit chain of ${c.auditEvents} events`,
  );
  if (report.ok) log('every hash matches and the audit chain is intact');
  else for (const p of report.problems) console.error(`[worldsheet] PROBLEM: ${p}`);
}

function folderArgument(args: string[], command: string): string {
  const folder = args.find((a) => !a.startsWith('-'));
  if (!folder) throw new LocalPostgresError(`Name the backup folder: npm run ${command} -- <folder>`);
  return path.resolve(folder);
}

async function backupCommand(supervisor: Supervisor, args: string[]): Promise<void> {
  const folder = folderArgument(args, 'backup');
  const store = await localStoreConfig(supervisor);
  const databaseUrl = await localDatabaseUrl(supervisor, { create: false, log });
  await backup({ databaseUrl, store, folder, log });
  // The installation backed up is checked too: a backup of broken records is worth knowing about.
  const report = await verifyInstallationAt(databaseUrl, createObjectStore(store));
  printReport(report);
  await supervisor.shutdown(report.ok ? 0 : 1);
}

async function restoreCommand(supervisor: Supervisor, args: string[]): Promise<void> {
  const folder = folderArgument(args, 'restore');
  const store = await localStoreConfig(supervisor);
  const databaseUrl = await localDatabaseUrl(supervisor, { create: true, log });
  await restore({ databaseUrl, store, folder, log });
  const report = await verifyInstallationAt(databaseUrl, createObjectStore(store));
  printReport(report);
  await supervisor.shutdown(report.ok ? 0 : 1);
}
// ─────────────────────────────────────────────────────────────────────────────────────────────

export async function runCommand(command: string, args: string[]): Promise<void> {
  const supervisor = new Supervisor();
  try {
    switch (command) {
      case 'start':
        return await serve(supervisor, 'start');
      case 'dev':
        return await serve(supervisor, 'dev');
      case 'test':
        return await test(supervisor, args);
      case 'bench':
        return await bench(supervisor);
      case 'stress':
        return await stress(supervisor);
      case 'db-start':
        return await dbOnly(supervisor);
      case 'db-stop':
        return dbStop(args);
      case 'migrate':
        return await migrateOnly(supervisor);
      case 'backup':
        return await backupCommand(supervisor, args);
      case 'restore':
        return await restoreCommand(supervisor, args);
      case 'audit':
        return await supervisor.shutdown(await auditCommand(supervisor, args));
      default:
        console.error(`[worldsheet] unknown command ${command}`);
        process.exit(2);
    }
  } catch (error) {
    const expected = error instanceof LocalPostgresError || error instanceof ConfigError;
    console.error(`\n[worldsheet] ${expected ? '' : 'error: '}${(error as Error).message}`);
    if (!expected && debugging()) console.error(error);
    // Stop whatever was started before the failure.
    await supervisor.shutdown(1);
  }
}

/** WORLDSHEET_DEBUG: print the stack of an unexpected failure (false when the settings themselves are unreadable). */
function debugging(): boolean {
  try {
    return Boolean(config().WORLDSHEET_DEBUG);
  } catch {
    return false;
  }
}
