// The load test across two app instances (`npm run test:stress`, run by CI after `npm test`): two
// app servers (lib/ops/server.ts) and two job workers (lib/jobs/worker-main.ts), as two machines
// behind a load balancer, on one PostgreSQL and one object store. The load benchmark's 50 users
// (tests/bench/load-bench.ts: evaluate, read, save, read back, compare) are spread over both
// instances for WORLDSHEET_STRESS_SECONDS (60). Meanwhile a document controller asks one instance to
// issue a revision; the instance whose worker holds the request's lease is killed (SIGKILL, its app
// server and its worker) in the middle of the work, and its users' connections with it.
//
// It fails (exit 1) unless: no 5xx from either instance and no 409; no failed request on the
// surviving instance, and on the killed one none before the kill; every save acknowledged by either
// instance is stored with the acknowledged SHA-256, and every stored version of the users' sheets
// holds content whose SHA-256 is the one recorded (no half-written version); the survivor issues the
// revision exactly once (one revision, one "issued" signature, one PDF under the request's prefix,
// the one the revision names); and the audit chain is intact.
//
// Ports: WORLDSHEET_BENCH_APP_PORT (3400) and the next one, WORLDSHEET_BENCH_S3_PORT (4618); the bench
// cluster (.data/pg-bench, WORLDSHEET_BENCH_PG_PORT) with a fresh database. The app is built into
// WORLDSHEET_BENCH_DIST_DIR (.next-bench) when its sources changed.
import type { ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { sql } from 'kysely';
import { createDb } from '../../db/index';
import { benchClusterPort, LocalCluster } from '../../db/local-postgres';
import { migrateToLatest } from '../../db/migrate';
import { DEMO_PROJECT, demoSheets, seedDemo } from '../../db/seed';
import { createApiToken } from '../../lib/auth/api-tokens';
import { localTestIdentityFiles } from '../../lib/issue/identity';
import { ensureJobQueues } from '../../lib/jobs/queue';
import { buildIfStale } from '../../lib/ops/next-build';
import { Supervisor } from '../../lib/ops/supervisor';
import { versionContentSchema } from '../../lib/sheets/content';
import { contentHash } from '../../lib/sheets/content-hash';
import { createSheet } from '../../lib/sheets/sheets';
import { createObjectStore } from '../../lib/storage/object-store';
import { startFakeObjectStore } from '../../lib/storage/fake-server';
import { storageConfig } from '../../lib/storage/config';
import { approveNewVersion, makeSheet, makeTeam } from '../support/approved-sheet';
import { makeUser, PASSWORD } from '../support/people';
import {
  cannon,
  figures,
  KINDS,
  REQUEST_TIMEOUT_S,
  requestsFor,
  row,
  startApp,
  Tally,
  USERS,
  type Ack,
  type CannonClient,
  type User,
} from './load-bench';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
const DATABASE = 'worldsheet_instances_stress';
const DIST_DIR = process.env.WORLDSHEET_BENCH_DIST_DIR || '.next-bench';
const SECONDS = Number(process.env.WORLDSHEET_STRESS_SECONDS ?? 60);
const APP_PORT = Number(process.env.WORLDSHEET_BENCH_APP_PORT ?? 3400);
const S3_PORT = Number(process.env.WORLDSHEET_BENCH_S3_PORT ?? 4618);
/** The issue request is made this far into the run. */
const ISSUE_AFTER_S = Math.min(15, SECONDS / 4);
const LEASE_SECONDS = 5;

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const log = (line: string) => console.log(`[stress] ${line}`);

async function until<T>(what: string, probe: () => Promise<T | null>, timeoutMs: number): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value !== null) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await sleep(100);
  }
}

interface Instance {
  name: string;
  app: { child: ChildProcess; baseUrl: string; output: () => string };
  worker: ChildProcess;
  workerOutput: () => string;
  users: User[];
  tally: Tally;
  /** Errors (failed connections, resets, timeouts) seen before the kill, and after it. */
  errorsBefore: number;
  errorsAfter: number;
  killedAt: number | null;
  run: ReturnType<typeof cannon> | null;
}

function startWorker(supervisor: Supervisor, name: string, env: NodeJS.ProcessEnv) {
  const child = supervisor.spawn(
    `job worker ${name}`,
    process.execPath,
    ['--import', 'tsx', path.join('lib', 'jobs', 'worker-main.ts')],
    { cwd: root, env, stdio: ['ignore', 'pipe', 'pipe'] },
  );
  let output = '';
  const keep = (d: Buffer) => {
    output = (output + d.toString()).slice(-50_000);
  };
  child.stdout!.on('data', keep);
  child.stderr!.on('data', keep);
  return { child, output: () => output };
}

async function main(supervisor: Supervisor): Promise<boolean> {
  process.chdir(root);
  const cluster = new LocalCluster({ name: 'bench', port: benchClusterPort(), projectRoot: root });
  cluster.prepare();
  supervisor.add('PostgreSQL', () => cluster.stop());
  await cluster.start();
  await cluster.ensureDatabase(DATABASE, { fresh: true });
  const folder = mkdtempSync(path.join(os.tmpdir(), 'ws-stress-'));
  const objects = await startFakeObjectStore({ port: S3_PORT, directory: path.join(folder, 'objects') });
  supervisor.add('object store', async () => {
    await objects.stop();
    rmSync(folder, { recursive: true, force: true });
  });
  const url = cluster.appUrl(DATABASE);
  const db = createDb(url);
  supervisor.add('database pool', () => db.destroy());
  await migrateToLatest(db);
  await ensureJobQueues(url);

  // The load's users, as in the load benchmark: one originator, token and sheet each.
  await seedDemo(db);
  const project = await db
    .selectFrom('projects')
    .select(['id', 'code'])
    .where('code', '=', DEMO_PROJECT.code)
    .executeTakeFirstOrThrow();
  const base = demoSheets()[0].content;
  const users: User[] = [];
  for (let u = 0; u < USERS; u++) {
    const actor = await makeUser(db, `stress-${u}@bench.example`, { password: null });
    await db
      .insertInto('project_members')
      .values({ project_id: project.id, user_id: actor.userId, role: 'originator' })
      .execute();
    const { token } = await createApiToken(db, actor, 'stress');
    const sheet = await createSheet(db, actor, project, {
      title: `Stress user ${u}`,
      safetyRelated: true,
      objective: '',
    });
    users.push({ index: u, token, sheetId: sheet.id, latest: 1, edits: 0, content: base, sentHash: '' });
  }
  // The sheet to issue: version 2 checked and approved; the controller asks through an API token
  // (issuing asks for the password whatever the token).
  const team = await makeTeam(db, { code: 'TWN', domain: 'stress.example' });
  const toIssue = await makeSheet(db, team.author, { id: team.projectId, code: 'TWN' }, { title: 'Drift time' });
  await approveNewVersion(db, team, toIssue, {
    message: 'drift time',
    cells: [{ id: 'c1', kind: 'calc', source: 'L = 12.5 m\nt_f = L / speedFromKinetic(150 MeV, m_p) to ns' }],
  });
  const controllerToken = (await createApiToken(db, team.controller, 'stress issuing')).token;

  const identity = localTestIdentityFiles(path.join(folder, 'keys'));
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    ...objects.env,
    NODE_ENV: 'production',
    DATABASE_URL: url,
    WORLDSHEET_DEMO: '0',
    NEXT_TELEMETRY_DISABLED: '1',
    NEXTAUTH_URL: `http://127.0.0.1:${APP_PORT}`,
    NEXTAUTH_SECRET: randomBytes(32).toString('base64url'),
    WORLDSHEET_KEY_FOLDER: path.join(folder, 'keys'),
    WORLDSHEET_DIST_DIR: DIST_DIR,
    WORLDSHEET_SIGNING_KEY: identity.keyFile,
    WORLDSHEET_SIGNING_CERT: identity.certFile,
    // No mail service here: the workers' deliveries fail and are retried later; nothing waits for them.
    WORLDSHEET_SMTP_URL: 'smtp://127.0.0.1:9',
    WORLDSHEET_JOB_POLL_SECONDS: '0.5',
    // Issuing slowly enough that the kill lands inside the work, and a short lease to take it over.
    WORLDSHEET_ISSUE_STEP_PAUSE_MS: '1500',
    WORLDSHEET_ISSUE_LEASE_SECONDS: String(LEASE_SECONDS),
  };
  if (buildIfStale(root, DIST_DIR, env)) log('built.');
  const instances: Instance[] = [];
  for (const [i, name] of ['A', 'B'].entries()) {
    const app = await startApp(supervisor, env, APP_PORT + i);
    const worker = startWorker(supervisor, name, env);
    await until(
      'the job worker to start',
      async () => (worker.output().includes('working the queues') ? true : null),
      60_000,
    );
    instances.push({
      name,
      app,
      worker: worker.child,
      workerOutput: worker.output,
      users: users.filter((u) => u.index % 2 === i),
      tally: new Tally(),
      errorsBefore: 0,
      errorsAfter: 0,
      killedAt: null,
      run: null,
    });
  }
  log(`two instances on ${instances.map((x) => x.app.baseUrl).join(' and ')}, ${USERS} users, ${SECONDS} s …`);

  const acks: Ack[] = [];
  const started = Date.now();
  const runs = instances.map((inst) => {
    let next = 0;
    const run = cannon({
      url: inst.app.baseUrl,
      connections: inst.users.length,
      duration: SECONDS,
      timeout: REQUEST_TIMEOUT_S,
      setupClient: (client: CannonClient) =>
        client.setRequests(requestsFor(inst.users[next++ % inst.users.length], base, acks, () => inst.tally)),
    });
    run.on('response', (client, status, _bytes, latency) =>
      inst.tally.record(client.requestIterator.currentRequest.kind, status, latency),
    );
    (run as unknown as { on(e: 'reqError', l: () => void): void }).on('reqError', () => {
      if (inst.killedAt === null) inst.errorsBefore++;
      else inst.errorsAfter++;
    });
    inst.run = run;
    return run;
  });

  // The issue request, to instance B, and the kill of whichever instance's worker holds its lease.
  await sleep(ISSUE_AFTER_S * 1000);
  const asked = await fetch(`${instances[1].app.baseUrl}/api/sheets/${toIssue.id}/revisions`, {
    method: 'POST',
    headers: { authorization: `Bearer ${controllerToken}`, 'content-type': 'application/json' },
    body: JSON.stringify({ versionNumber: 2, password: PASSWORD }),
  });
  if (asked.status !== 202) throw new Error(`the issue request was answered ${asked.status}: ${await asked.text()}`);
  const { jobId } = (await asked.json()) as { jobId: string };
  const leased = await until(
    'a worker to start rendering under a lease',
    async () => {
      const job = await db
        .selectFrom('issue_jobs')
        .select(['step', 'lease_owner'])
        .where('id', '=', jobId)
        .executeTakeFirstOrThrow();
      return job.lease_owner && ['rendering', 'signing'].includes(job.step) ? job : null;
    },
    60_000,
  );
  const victim = instances.find((x) => leased.lease_owner!.includes(`:${x.worker.pid}:`));
  if (!victim) throw new Error(`no instance's worker holds the lease (${leased.lease_owner})`);
  const survivor = instances.find((x) => x !== victim)!;
  log(`instance ${victim.name}'s worker is issuing (step ${leased.step}): killing instance ${victim.name} (SIGKILL)`);
  victim.killedAt = Date.now();
  victim.worker.kill('SIGKILL');
  victim.app.child.kill('SIGKILL');
  // Its users' connections fail from now on; the load balancer would stop sending them there.
  victim.run!.stop();
  await Promise.all(runs);

  const issued = await until(
    'the survivor to issue the revision',
    async () => {
      const job = await db
        .selectFrom('issue_jobs')
        .select(['state', 'lease_owner', 'revision_id'])
        .where('id', '=', jobId)
        .executeTakeFirstOrThrow();
      return job.state === 'done' ? job : null;
    },
    120_000,
  );

  // ── What the record holds ──
  const stored = await db
    .selectFrom('versions')
    .select(['sheet_id', 'number', 'content_hash', 'content'])
    .where(
      'sheet_id',
      'in',
      users.map((u) => u.sheetId),
    )
    .execute();
  const byKey = new Map(stored.map((v) => [`${v.sheet_id}/${v.number}`, v.content_hash]));
  const lost = acks.filter((a) => byKey.get(`${a.sheetId}/${a.number}`) !== a.sha256);
  const hashNotSent = acks.filter((a) => a.sha256 !== a.sentHash);
  const halfWritten = stored.filter((v) => contentHash(versionContentSchema.parse(v.content)) !== v.content_hash);
  const revisions = await db
    .selectFrom('revisions')
    .select(['id', 'code', 'pdf_key'])
    .where('sheet_id', '=', toIssue.id)
    .execute();
  const signatures = await db
    .selectFrom('signatures')
    .select('id')
    .where('sheet_id', '=', toIssue.id)
    .where('meaning', '=', 'issued')
    .execute();
  const pdfs = await createObjectStore(storageConfig({ ...process.env, ...objects.env })).list(
    `revisions/issue-${jobId}/`,
  );
  const breaks = await sql<{ id: string }>`select * from audit_chain_breaks()`.execute(db);
  const resumed = survivor.workerOutput().includes(`issuing: resuming request ${jobId}`);

  // ── The report ──
  console.log(
    `\nTwo app instances, each with its job worker, on one PostgreSQL and one object store; ${USERS} users (${instances.map((x) => `${x.users.length} on ${x.name}`).join(', ')}) for ${SECONDS} s.`,
  );
  for (const inst of instances) {
    const mix = figures(inst.tally.all());
    const fiveXx = inst.tally.count((s) => s >= 500);
    const other = inst.tally.count((s) => (s < 200 || s >= 300) && s < 500 && s !== 409);
    const killed =
      inst.killedAt === null ? '' : ` (killed ${((inst.killedAt - started) / 1000).toFixed(0)} s into the run)`;
    console.log(
      `\nInstance ${inst.name}${killed}: ${mix.n} answers, ${fiveXx} 5xx, ${inst.tally.count((s) => s === 409)} 409, ${other} other non-2xx (429: the server's queue of evaluations was full, by design); connection errors ${inst.errorsBefore} before the kill, ${inst.errorsAfter} after it`,
    );
    console.log(row('whole mix', mix));
    for (const kind of KINDS) console.log(row(kind, figures(inst.tally.latencies.get(kind) ?? [])));
    for (const s of inst.tally.samples) console.log(`  e.g. ${s}`);
  }
  console.log(
    `\nSaves: ${acks.length} acknowledged, ${lost.length} lost, ${hashNotSent.length} acknowledged with a hash other than the content's; ${stored.length} versions stored, ${halfWritten.length} whose content does not hash to the SHA-256 recorded`,
  );
  console.log(
    `Issuing: request ${jobId} made on B, worked by ${victim.name} when it was killed; ${resumed ? `resumed by ${survivor.name}` : 'NOT resumed by the survivor'}; ${revisions.length} revision(s) (${revisions.map((r) => r.code).join(', ')}), ${signatures.length} "issued" signature(s), ${pdfs.length} PDF object(s) under the request's prefix${revisions.length === 1 && pdfs.length === 1 && pdfs[0] === revisions[0].pdf_key ? ', the one the revision names' : ''}`,
  );
  console.log(`Audit chain breaks: ${breaks.rows.length}`);

  const fiveXx = instances.reduce((n, x) => n + x.tally.count((s) => s >= 500), 0);
  const conflicts = instances.reduce((n, x) => n + x.tally.count((s) => s === 409), 0);
  const ok =
    fiveXx === 0 &&
    conflicts === 0 &&
    survivor.errorsBefore + survivor.errorsAfter === 0 &&
    victim.errorsBefore === 0 &&
    lost.length === 0 &&
    hashNotSent.length === 0 &&
    halfWritten.length === 0 &&
    resumed &&
    issued.lease_owner !== leased.lease_owner &&
    revisions.length === 1 &&
    signatures.length === 1 &&
    pdfs.length === 1 &&
    pdfs[0] === revisions[0].pdf_key &&
    breaks.rows.length === 0;
  if (!ok) {
    console.log('FAILED (see above). The surviving instance said:');
    console.log(survivor.app.output().split('\n').slice(-30).join('\n'));
    console.log(survivor.workerOutput().split('\n').slice(-30).join('\n'));
  } else console.log('PASSED');
  return ok;
}

if (process.argv[1]?.endsWith('instances-stress.ts')) {
  const supervisor = new Supervisor();
  try {
    const ok = await main(supervisor);
    await supervisor.shutdown(ok ? 0 : 1);
  } catch (error) {
    if (!supervisor.isStopping) console.error(`[stress] ${(error as Error).stack ?? error}`);
    await supervisor.shutdown(1);
  }
}
