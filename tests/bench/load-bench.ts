// Load benchmark (`npm run bench`): the production server under 50 concurrent users on loopback,
// each mixing what the editor does — evaluate, read the sheet, save a version, read that version,
// compare it with version 1 — for a minute, then twice more for shorter runs, driven by autocannon.
// Reported beside GET /api/health at the same concurrency in the same run, as ratios.
//
// What it checks (and exits non-zero on): no 5xx answer, no failed or timed-out request, and no lost
// version: every save the server acknowledged with 201 is in the versions table with the SHA-256 it
// acknowledged, which is also the hash of the content sent. What it measures: p50/p95/p99 of the mix
// and of each kind of request, and the app server's resident memory (lib/ops/server.ts and its
// descendants, from /proc, once a second): its peak during each run and its figure after 5 s
// idle; the aim is a peak under 600 MiB and no growth from run to run.
//
// Each user (connection) has an API token of its own and a sheet of its own, and chains its saves on
// the number the previous 201 answered, so a 409 would mean a save was lost or doubled, not a race.
//
// It runs its own PostgreSQL cluster (`.data/pg-bench/`, port WORLDSHEET_BENCH_PG_PORT or 54369) with
// a fresh database, the local object store (WORLDSHEET_BENCH_S3_PORT, 4618), and the app built into
// `.next-bench/` or WORLDSHEET_BENCH_DIST_DIR (rebuilt only when the sources changed; .ci/run names the
// test tiers' build folder, just built from the same sources) on 127.0.0.1:WORLDSHEET_BENCH_APP_PORT
// (3400); it stops everything at the end or on Ctrl-C. WORLDSHEET_BENCH_LOAD_SECONDS sets the first
// run (60), WORLDSHEET_BENCH_LOAD_REPEAT_SECONDS the two repeats (30),
// WORLDSHEET_BENCH_HEALTH_SECONDS the health run (15).
import type { ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
// @ts-expect-error autocannon ships no type declarations
import autocannon from 'autocannon';
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
import { versionContentSchema, type VersionContent } from '../../lib/sheets/content';
import { contentHash } from '../../lib/sheets/content-hash';
import { createSheet } from '../../lib/sheets/sheets';
import { startFakeObjectStore } from '../../lib/storage/fake-server';
import { makeUser } from '../support/people';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
const DATABASE = 'worldsheet_load_bench';
const DIST_DIR = process.env.WORLDSHEET_BENCH_DIST_DIR || '.next-bench';
export const USERS = 50;
const FIRST_SECONDS = Number(process.env.WORLDSHEET_BENCH_LOAD_SECONDS ?? 60);
const REPEAT_SECONDS = Number(process.env.WORLDSHEET_BENCH_LOAD_REPEAT_SECONDS ?? 30);
const HEALTH_SECONDS = Number(process.env.WORLDSHEET_BENCH_HEALTH_SECONDS ?? 15);
const WARM_UP_SECONDS = 5;
const IDLE_SECONDS = 5;
const APP_PORT = Number(process.env.WORLDSHEET_BENCH_APP_PORT ?? 3400);
const S3_PORT = Number(process.env.WORLDSHEET_BENCH_S3_PORT ?? 4618);
/** A request unanswered this long counts as failed; generous so that a slow save is still acknowledged. */
export const REQUEST_TIMEOUT_S = 60;
/** The aim for the app server's resident memory at the peak of the 50-user load. */
const MEMORY_AIM = 600 * 1024 ** 2;

// ── The autocannon API, as far as it is used here ─────────────────────────────────────────────

export interface CannonRequest {
  kind: Kind;
  method: 'GET' | 'POST';
  path: string;
  headers: Record<string, string>;
  setupRequest?: (request: CannonRequest) => CannonRequest;
  onResponse?: (status: number, body: string) => void;
}
export interface CannonClient {
  setRequests(requests: CannonRequest[]): void;
  requestIterator: { currentRequest: CannonRequest };
}
interface CannonResult {
  errors: number;
  timeouts: number;
  duration: number;
}
interface CannonInstance extends Promise<CannonResult> {
  on(event: 'response', listener: (client: CannonClient, status: number, bytes: number, ms: number) => void): void;
  stop(): void;
}
export const cannon = autocannon as (options: Record<string, unknown>) => CannonInstance;

// ── Figures ───────────────────────────────────────────────────────────────────────────────────

export const KINDS = ['evaluate', 'read sheet', 'save version', 'read version', 'compare'] as const;
type Kind = (typeof KINDS)[number] | 'health';

/** Nearest-rank percentile. */
function percentile(sorted: number[], p: number): number {
  return sorted[Math.max(0, Math.ceil(p * sorted.length) - 1)] ?? NaN;
}

interface Figures {
  p50: number;
  p95: number;
  p99: number;
  n: number;
}

export function figures(xs: number[]): Figures {
  const s = [...xs].sort((a, b) => a - b);
  return { p50: percentile(s, 0.5), p95: percentile(s, 0.95), p99: percentile(s, 0.99), n: s.length };
}

const ms = (x: number) => `${x.toFixed(1).padStart(8)} ms`;
const mib = (bytes: number) => `${(bytes / 1024 ** 2).toFixed(0).padStart(5)} MiB`;
export const row = (label: string, f: Figures) =>
  `  ${label.padEnd(16)} p50 ${ms(f.p50)}   p95 ${ms(f.p95)}   p99 ${ms(f.p99)}   (${f.n} requests)`;

/** What one autocannon run saw, by kind of request. */
export class Tally {
  readonly latencies = new Map<Kind, number[]>();
  readonly statuses = new Map<string, number>();
  /** A few bodies of answers other than 2xx (and 409), to say what went wrong. */
  readonly samples: string[] = [];
  errors = 0;
  timeouts = 0;
  seconds = 0;

  record(kind: Kind, status: number, latency: number): void {
    const list = this.latencies.get(kind) ?? [];
    list.push(latency);
    this.latencies.set(kind, list);
    const key = `${kind} ${status}`;
    this.statuses.set(key, (this.statuses.get(key) ?? 0) + 1);
  }

  all(): number[] {
    return [...this.latencies.values()].flat();
  }

  count(test: (status: number) => boolean): number {
    let n = 0;
    for (const [key, count] of this.statuses) if (test(Number(key.slice(key.lastIndexOf(' ') + 1)))) n += count;
    return n;
  }
}

// ── The app server's memory ───────────────────────────────────────────────────────────────────

/** Resident memory of a process and all its descendants (bytes), from /proc; 0 when it is gone. */
function treeRss(rootPid: number): number {
  const children = new Map<number, number[]>();
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = readFileSync(`/proc/${entry}/stat`, 'utf8');
      const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
      children.set(ppid, [...(children.get(ppid) ?? []), Number(entry)]);
    } catch {
      // ended meanwhile
    }
  }
  let total = 0;
  const queue = [rootPid];
  while (queue.length > 0) {
    const pid = queue.pop()!;
    try {
      const m = /^VmRSS:\s+(\d+) kB/m.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
      if (m) total += Number(m[1]) * 1024;
    } catch {
      // ended meanwhile
    }
    queue.push(...(children.get(pid) ?? []));
  }
  return total;
}

/** Samples the tree's RSS once a second; `take()` returns the peak since the last take. */
function memorySampler(pid: number) {
  let peak = 0;
  const sample = () => {
    peak = Math.max(peak, treeRss(pid));
  };
  const timer = setInterval(sample, 1000);
  return {
    take(): number {
      sample();
      const p = peak;
      peak = 0;
      return p;
    },
    now: () => treeRss(pid),
    stop: () => clearInterval(timer),
  };
}

// ── The users and their sheets ────────────────────────────────────────────────────────────────

export interface User {
  index: number;
  token: string;
  sheetId: string;
  /** The latest version number the server acknowledged for this user's sheet. */
  latest: number;
  edits: number;
  content: VersionContent;
  sentHash: string;
}

export interface Ack {
  sheetId: string;
  number: number;
  sha256: string;
  sentHash: string;
}

/**
 * The content user `u` edits: the demo dipole sheet (rigidity, field, criteria; a few relativistic
 * cells) with the highest energy changed on every edit, so that each save is a real change.
 */
function editedContent(base: VersionContent, u: number, edit: number): VersionContent {
  const energy = `${200 + (edit % 50)}.${String(u).padStart(2, '0')}`;
  return versionContentSchema.parse({
    ...base,
    title: `Load user ${u}: ${base.title}`,
    cells: base.cells.map((c) =>
      c.kind === 'calc' ? { ...c, source: c.source.replace(/^T_max = [\d.]+ MeV/m, `T_max = ${energy} MeV`) } : c,
    ),
  });
}

export function requestsFor(user: User, base: VersionContent, acks: Ack[], tallyOf: () => Tally): CannonRequest[] {
  const headers = { authorization: `Bearer ${user.token}` };
  const json = { ...headers, 'content-type': 'application/json' };
  const sheet = `/api/sheets/${user.sheetId}`;
  const note = (status: number, body: string) => {
    const tally = tallyOf();
    if ((status < 200 || status >= 300) && tally.samples.length < 5)
      tally.samples.push(`${status} ${body.slice(0, 300)}`);
  };
  return [
    {
      kind: 'evaluate',
      method: 'POST',
      path: '/api/evaluate',
      headers: json,
      // The editor evaluates the edited cells live, with the sheet as its key, before the save.
      setupRequest: (r) => {
        user.edits += 1;
        user.content = editedContent(base, user.index, user.edits);
        return {
          ...r,
          body: JSON.stringify({
            cells: user.content.cells,
            significantFigures: user.content.significantFigures,
            sheetKey: user.sheetId,
          }),
        } as CannonRequest;
      },
      onResponse: note,
    },
    { kind: 'read sheet', method: 'GET', path: sheet, headers, onResponse: note },
    {
      kind: 'save version',
      method: 'POST',
      path: `${sheet}/versions`,
      headers: json,
      setupRequest: (r) => {
        user.sentHash = contentHash(user.content);
        return {
          ...r,
          body: JSON.stringify({
            parentNumber: user.latest,
            message: `Highest energy, edit ${user.edits}`,
            content: user.content,
          }),
        } as CannonRequest;
      },
      onResponse: (status, body) => {
        note(status, body);
        if (status === 201) {
          const saved = JSON.parse(body) as { number: number; sha256: string };
          acks.push({ sheetId: user.sheetId, number: saved.number, sha256: saved.sha256, sentHash: user.sentHash });
          user.latest = saved.number;
        } else if (status === 409) {
          // Only if a save was lost or doubled: follow the server so that the run goes on.
          const latest = (JSON.parse(body) as { error?: { details?: { latestNumber?: number } } }).error?.details
            ?.latestNumber;
          if (latest) user.latest = latest;
        }
      },
    },
    {
      kind: 'read version',
      method: 'GET',
      path: '',
      headers,
      setupRequest: (r) => ({ ...r, path: `${sheet}/versions/${user.latest}` }),
      onResponse: note,
    },
    {
      kind: 'compare',
      method: 'GET',
      path: '',
      headers,
      setupRequest: (r) => ({ ...r, path: `${sheet}/compare?base=1&target=${user.latest}` }),
      onResponse: note,
    },
  ];
}

// ── The app server ────────────────────────────────────────────────────────────────────────────

export async function startApp(
  supervisor: Supervisor,
  env: NodeJS.ProcessEnv,
  port = APP_PORT,
): Promise<{ child: ChildProcess; baseUrl: string; output: () => string }> {
  // The app's own server, as `npm start` runs it (lib/ops/server.ts).
  const child = supervisor.spawn(
    `app server ${port}`,
    process.execPath,
    ['--import', 'tsx', path.join('lib', 'ops', 'server.ts'), '-H', '127.0.0.1', '-p', String(port)],
    {
      cwd: root,
      env,
      stdio: ['ignore', 'pipe', 'pipe'],
    },
  );
  let output = '';
  const keep = (d: Buffer) => {
    output = (output + d.toString()).slice(-20_000);
  };
  child.stdout!.on('data', keep);
  child.stderr!.on('data', keep);
  const baseUrl = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`the app server exited (${child.exitCode}):\n${output}`);
    try {
      if ((await fetch(`${baseUrl}/api/health`)).ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error(`the app server did not answer within 60 s:\n${output}`);
    await new Promise((r) => setTimeout(r, 200));
  }
  return { child, baseUrl, output: () => output };
}

// ── The run ───────────────────────────────────────────────────────────────────────────────────

const sleep = (s: number) => new Promise((r) => setTimeout(r, s * 1000));

/** One autocannon run: every connection is one user looping over its five requests. */
async function mixedRun(
  baseUrl: string,
  users: User[],
  base: VersionContent,
  acks: Ack[],
  seconds: number,
): Promise<Tally> {
  const tally = new Tally();
  let next = 0;
  const instance = cannon({
    url: baseUrl,
    connections: USERS,
    duration: seconds,
    timeout: REQUEST_TIMEOUT_S,
    setupClient: (client: CannonClient) =>
      client.setRequests(requestsFor(users[next++ % users.length], base, acks, () => tally)),
  });
  instance.on('response', (client, status, _bytes, latency) =>
    tally.record(client.requestIterator.currentRequest.kind, status, latency),
  );
  const result = await instance;
  tally.errors = result.errors;
  tally.timeouts = result.timeouts;
  tally.seconds = result.duration;
  return tally;
}

async function healthRun(baseUrl: string, seconds: number): Promise<Tally> {
  const tally = new Tally();
  const instance = cannon({
    url: `${baseUrl}/api/health`,
    connections: USERS,
    duration: seconds,
    timeout: REQUEST_TIMEOUT_S,
  });
  instance.on('response', (_client, status, _bytes, latency) => tally.record('health', status, latency));
  const result = await instance;
  tally.errors = result.errors;
  tally.timeouts = result.timeouts;
  tally.seconds = result.duration;
  return tally;
}

async function main(supervisor: Supervisor): Promise<boolean> {
  process.chdir(root);
  const load = () =>
    os
      .loadavg()
      .map((x) => x.toFixed(2))
      .join(' ');
  console.log(`[load-bench] load average before: ${load()} (${os.cpus().length} CPUs)`);
  const cluster = new LocalCluster({ name: 'bench', port: benchClusterPort(), projectRoot: root });
  cluster.prepare();
  supervisor.add('PostgreSQL', () => cluster.stop());
  await cluster.start();
  await cluster.ensureDatabase(DATABASE, { fresh: true });
  const folder = mkdtempSync(path.join(os.tmpdir(), 'ws-load-bench-'));
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

  // The demo project and its people, and one more originator per user with a token and a sheet.
  await seedDemo(db);
  const project = await db
    .selectFrom('projects')
    .select(['id', 'code'])
    .where('code', '=', DEMO_PROJECT.code)
    .executeTakeFirstOrThrow();
  const base = demoSheets()[0].content;
  const users: User[] = [];
  for (let u = 0; u < USERS; u++) {
    const actor = await makeUser(db, `load-${u}@bench.example`, { password: null });
    await db
      .insertInto('project_members')
      .values({ project_id: project.id, user_id: actor.userId, role: 'originator' })
      .execute();
    const { token } = await createApiToken(db, actor, 'load benchmark');
    const sheet = await createSheet(db, actor, project, {
      title: `Load user ${u}`,
      safetyRelated: true,
      objective: '',
    });
    users.push({ index: u, token, sheetId: sheet.id, latest: 1, edits: 0, content: base, sentHash: '' });
  }

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
  };
  // What the production server refuses to start without (lib/config.ts): a signing key and certificate
  // (the local test identity's files) and a mail service (no job worker runs here: mail stays queued).
  const identity = localTestIdentityFiles(path.join(folder, 'keys'));
  env.WORLDSHEET_SIGNING_KEY = identity.keyFile;
  env.WORLDSHEET_SIGNING_CERT = identity.certFile;
  env.WORLDSHEET_SMTP_URL = 'smtp://127.0.0.1:9';
  if (buildIfStale(root, DIST_DIR, env)) console.log('[load-bench] built.');
  const app = await startApp(supervisor, env);
  if (!existsSync(`/proc/${app.child.pid}/status`)) throw new Error('reading the app server memory needs /proc');
  const memory = memorySampler(app.child.pid!);
  supervisor.add('memory sampler', async () => memory.stop());
  const startRss = memory.now();

  const acks: Ack[] = [];
  // A run ends by closing its connections, some with a save in flight: the server may store it with
  // nobody left to read the 201. After each run (and the idle that lets those finish) every user
  // goes on from the sheet's latest number in the database; those saves are counted, not lost.
  let abandoned = 0;
  const resync = async () => {
    const latest = await db
      .selectFrom('versions')
      .select(['sheet_id', sql<number>`max(number)::int`.as('latest')])
      .groupBy('sheet_id')
      .execute();
    const bySheet = new Map(latest.map((v) => [v.sheet_id, v.latest]));
    for (const user of users) {
      const n = bySheet.get(user.sheetId) ?? user.latest;
      abandoned += n - user.latest;
      user.latest = n;
    }
  };
  console.log(`[load-bench] ${USERS} users: warm-up ${WARM_UP_SECONDS} s …`);
  const warmUp = await mixedRun(app.baseUrl, users, base, acks, WARM_UP_SECONDS);
  await sleep(IDLE_SECONDS);
  await resync();
  console.log(`[load-bench] GET /api/health, ${USERS} connections, ${HEALTH_SECONDS} s …`);
  const health = await healthRun(app.baseUrl, HEALTH_SECONDS);
  await sleep(IDLE_SECONDS);
  memory.take();

  const runs: Array<{ seconds: number; tally: Tally; peak: number; settled: number }> = [];
  for (const seconds of [FIRST_SECONDS, REPEAT_SECONDS, REPEAT_SECONDS]) {
    console.log(`[load-bench] run ${runs.length + 1}: mixed load, ${USERS} users, ${seconds} s …`);
    const tally = await mixedRun(app.baseUrl, users, base, acks, seconds);
    const peak = memory.take();
    await sleep(IDLE_SECONDS);
    const settled = memory.now();
    memory.take();
    await resync();
    runs.push({ seconds, tally, peak: Math.max(peak, settled), settled });
  }
  memory.stop();

  // Every acknowledged save must be in the database with the acknowledged hash.
  const stored = await db
    .selectFrom('versions')
    .select(['sheet_id', 'number', 'content_hash'])
    .where(
      'sheet_id',
      'in',
      users.map((u) => u.sheetId),
    )
    .execute();
  const byKey = new Map(stored.map((v) => [`${v.sheet_id}/${v.number}`, v.content_hash]));
  const lost = acks.filter((a) => byKey.get(`${a.sheetId}/${a.number}`) !== a.sha256);
  const hashNotSent = acks.filter((a) => a.sha256 !== a.sentHash);
  const breaks = await sql<{ id: string }>`select * from audit_chain_breaks()`.execute(db);

  // ── The report ──
  const tallies = [warmUp, health, ...runs.map((r) => r.tally)];
  const fiveXx = tallies.reduce((n, t) => n + t.count((s) => s >= 500), 0);
  const conflicts = tallies.reduce((n, t) => n + t.count((s) => s === 409), 0);
  const otherNon2xx = tallies.reduce((n, t) => n + t.count((s) => (s < 200 || s >= 300) && s < 500 && s !== 409), 0);
  const failed = tallies.reduce((n, t) => n + t.errors + t.timeouts, 0);
  const h = figures(health.all());
  console.log(
    `\nLoad on loopback: ${USERS} users at once, each on its own sheet (the ${base.cells.length}-cell demo dipole sheet, one input edited each loop),`,
  );
  console.log(
    'looping evaluate → read sheet → save version → read that version → compare with version 1; latency of every answer.',
  );
  console.log(
    `Health: GET /api/health with ${USERS} connections for ${HEALTH_SECONDS} s in the same run, before the mixed runs.\n`,
  );
  console.log(row('GET /api/health', h) + `   ${(h.n / health.seconds).toFixed(0)} req/s`);
  for (const [i, r] of runs.entries()) {
    const mix = figures(r.tally.all());
    console.log(
      `\nRun ${i + 1} (${r.seconds} s): ${(mix.n / r.tally.seconds).toFixed(1)} req/s, ${r.tally.latencies.get('save version')?.length ?? 0} saves`,
    );
    console.log(row('whole mix', mix));
    for (const kind of KINDS) console.log(row(kind, figures(r.tally.latencies.get(kind) ?? [])));
    console.log(
      `  ratio mix / health:  p50 ${(mix.p50 / h.p50).toFixed(1)}   p95 ${(mix.p95 / h.p95).toFixed(1)}   p99 ${(mix.p99 / h.p99).toFixed(1)}`,
    );
  }
  console.log(
    '\nApp server resident memory (lib/ops/server.ts and its children, sampled every second; aim: peak under 600 MiB, no growth)',
  );
  console.log(`  after start ${mib(startRss)}`);
  for (const [i, r] of runs.entries())
    console.log(`  run ${i + 1}: peak ${mib(r.peak)}   settled (after ${IDLE_SECONDS} s idle) ${mib(r.settled)}`);
  const overAim = runs.some((r) => r.peak >= MEMORY_AIM);
  // Runs 2 and 3 are the same length: a leak shows as run 3 settling higher than run 2 and run 1.
  const grew = runs[2].settled > runs[1].settled * 1.1 && runs[2].settled > runs[0].settled * 1.1;
  console.log(
    `  peak ${mib(Math.max(...runs.map((r) => r.peak)))}: ${overAim ? 'OVER the aim of 600 MiB' : 'under the aim of 600 MiB'}; ${grew ? 'GREW: run 3 settled more than 10 % above runs 1 and 2 (possible leak)' : 'no growth over 10 % from run to run'}`,
  );

  console.log(
    `\nAnswers: ${fiveXx} 5xx, ${conflicts} 409, ${otherNon2xx} other non-2xx, ${failed} failed or timed out (over ${REQUEST_TIMEOUT_S} s)`,
  );
  for (const t of tallies) for (const s of t.samples) console.log(`  e.g. ${s}`);
  console.log(
    `Saves: ${acks.length} acknowledged, ${lost.length} lost (not in the database with the acknowledged hash), ${hashNotSent.length} acknowledged with a hash other than the content's; ${abandoned} stored but in flight when a run closed its connections; audit chain breaks: ${breaks.rows.length}`,
  );
  console.log(`[load-bench] load average after: ${load()}`);
  // Each user saves only to its own sheet, always on the number it was last answered: a 409 means a
  // save was lost or doubled.
  const ok =
    fiveXx === 0 &&
    conflicts === 0 &&
    lost.length === 0 &&
    hashNotSent.length === 0 &&
    failed === 0 &&
    breaks.rows.length === 0;
  if (!ok) {
    console.log('FAILED: a 5xx, a 409, a failed request or a lost version (see above). The app server said:');
    console.log(app.output().split('\n').slice(-40).join('\n'));
  }
  return ok;
}

if (process.argv[1]?.endsWith('load-bench.ts')) {
  const supervisor = new Supervisor();
  try {
    const ok = await main(supervisor);
    await supervisor.shutdown(ok ? 0 : 1);
  } catch (error) {
    if (!supervisor.isStopping) console.error(`[load-bench] ${(error as Error).stack ?? error}`);
    await supervisor.shutdown(1);
  }
}
