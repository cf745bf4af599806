// Benchmark of saving a version (`npm run bench`), reported as ratios measured in one run:
// 16 clients at once each save versions of their own 500-cell sheet through the route handler's
// path (JSON.parse of the request text, parseValue with saveVersionSchema, saveVersion), against 16
// clients at once each doing a bare INSERT of the same content JSON through a pg Pool of the same
// size as the application's. Aim: p95 of a save at most 3 times the p95 of the bare INSERT.
//
// Each client has its own sheet: concurrent saves to one sheet would mostly be refused with 409 by
// design (a save must name the latest version as its parent). Each save is a small edit of one cell
// of the client's latest version, based on that version.
//
// "warm" saves follow an evaluation of the same content with the same sheetKey, as in the editor,
// which evaluates live through /api/evaluate before the user presses save; the evaluator's cell
// cache then already holds every cell (that evaluation is not timed). "cold" saves have no
// evaluation before them: the save evaluates the edited cell and everything that depends on it.
// A second baseline inserts the content and the results JSON, as a version stores them, to show
// how much of a save is the storing itself.
//
// The phases run in interleaved rounds so that other load on the machine falls on all of them, and
// the CPU time per request (this process and PostgreSQL) is reported beside the latencies.
//
// It runs its own PostgreSQL cluster (`.data/pg-bench/`, port WORLDSHEET_BENCH_PG_PORT or 54369)
// with a fresh database, and stops it at the end or on Ctrl-C. WORLDSHEET_BENCH_SAVES sets the
// timed requests per client and phase (15).
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import { createDb, DB_POOL_MAX } from '../../db/index';
import { benchClusterPort, LocalCluster } from '../../db/local-postgres';
import { migrateToLatest } from '../../db/migrate';
import { sandboxOptionsFromEnv } from '../../lib/calc/sandbox/evaluator';
import { evaluationScope, getEvaluator } from '../../lib/sheets/evaluate-sandboxed';
import { parseValue } from '../../lib/http/route';
import { Supervisor } from '../../lib/ops/supervisor';
import { versionContentSchema, type VersionContent } from '../../lib/sheets/content';
import { createSheet, saveVersion, saveVersionSchema } from '../../lib/sheets/sheets';
import { makeProject, makeUser } from '../support/people';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
const DATABASE = 'worldsheet_bench';
const CLIENTS = Number(process.env.WORLDSHEET_BENCH_CLIENTS ?? 16);
const SECTIONS = 50; // of 10 cells each: 500 cells
const SAVES_PER_CLIENT = Number(process.env.WORLDSHEET_BENCH_SAVES ?? 15);
const WARM_UP_SAVES = 2;
const AIM = 3;

// ── The sheet ────────────────────────────────────────────────────────────────────────────────

/**
 * A 500-cell proton beam line sheet: 50 sections of a Markdown heading and note and eight calc cells
 * (inputs with units, library functions, a running total, criteria). Every number of sheet `s`
 * ends in its own digits, so that no two sheets share a cell in the evaluators' caches.
 */
export function beamLineContent(s: number): VersionContent {
  const tag = String(s).padStart(2, '0');
  const cells: VersionContent['cells'] = [];
  for (let k = 1; k <= SECTIONS; k++) {
    cells.push(
      {
        id: `s${k}-intro`,
        kind: 'text',
        source: `## ${k}. Drift section D${k}\n\nProton beam at kinetic energy $T_{${k}}$ through a drift of length $L_{0,${k}}$; the magnetic rigidity $B\\rho = p/q$ sets the dipole field (see *reference 2*).`,
      },
      {
        id: `s${k}-in`,
        kind: 'calc',
        source: `T_${k} = ${40 + ((k * 37) % 400)}.${tag}5 MeV\nL0_${k} = ${1 + (k % 9)}.${tag}5 m`,
      },
      {
        id: `s${k}-kin`,
        kind: 'calc',
        source: `p_${k} = momentumFromKinetic(T_${k}, m_p)\nv_${k} = speedFromKinetic(T_${k}, m_p)`,
      },
      {
        id: `s${k}-gam`,
        kind: 'calc',
        source: `g_${k} = lorentzFactor(v_${k})\nbg_${k} = betaGamma(v_${k})\ny_${k} = rapidity(v_${k})`,
      },
      { id: `s${k}-rig`, kind: 'calc', source: `Brho_${k} = magneticRigidity(p_${k}, q_e) to T*m` },
      {
        id: `s${k}-len`,
        kind: 'calc',
        source: `L_${k} = lengthContraction(L0_${k}, v_${k}) to cm\ntof_${k} = timeOfFlight(L0_${k}, T_${k}, m_p) to ns`,
      },
      {
        id: `s${k}-note`,
        kind: 'text',
        source: `The contracted length and the time of flight follow from $\\gamma_{${k}}$; the values are checked below against the specification:\n\n- dipole rigidity under 10 T·m\n- time of flight under 1 µs\n- beam line shorter than 1 km`,
      },
      {
        id: `s${k}-dec`,
        kind: 'calc',
        source: `dl_${k} = decayLength(T_${k}, m_mu, 2.1969811 us) to m\ntau_${k} = timeDilation(2.1969811 us, v_${k}) to us`,
      },
      { id: `s${k}-sum`, kind: 'calc', source: k === 1 ? 'S_1 = L0_1' : `S_${k} = S_${k - 1} + L0_${k}` },
      { id: `s${k}-chk`, kind: 'calc', source: `Brho_${k} < 10 T*m\ntof_${k} < 1000 ns\nS_${k} < 1 km` },
    );
  }
  return versionContentSchema.parse({
    schema: 1,
    title: `Beam line ${tag}: drift sections`,
    safetyRelated: true,
    significantFigures: 6,
    record: {
      objective:
        'Magnetic rigidity, time of flight and decay lengths along the 50 drift sections of the transfer line.',
      inputs: [
        { name: 'Kinetic energies', value: 'per section', source: 'Beam specification BS-12', sourceRevision: 'C' },
        { name: 'Drift lengths', value: 'per section', source: 'Layout drawing LD-440', sourceRevision: '3' },
      ],
      assumptions: [
        { text: 'Drifts are field-free.', needsVerification: false },
        { text: 'Energy loss in the drifts is negligible.', needsVerification: true },
      ],
      method: 'Special-relativistic kinematics with the Worldsheet relativistic library; constants CODATA 2022.',
      references: ['PDG 2024, Review of Particle Physics', 'Wille, The Physics of Particle Accelerators (2000)'],
      conclusions: 'Every section meets the rigidity, flight-time and length limits.',
    },
    cells,
    attachments: [],
  });
}

/** Edit number `edit` of sheet `s`: a new kinetic energy in one section, a value not used before. */
function edited(content: VersionContent, s: number, edit: number): { content: VersionContent; message: string } {
  const k = ((edit * 7 + s * 3) % SECTIONS) + 1;
  const value = `${100 + edit}.${String(s).padStart(2, '0')}7`;
  return {
    content: {
      ...content,
      cells: content.cells.map((c) =>
        c.id === `s${k}-in` ? { ...c, source: c.source.replace(/^T_\d+ = [\d.]+ MeV/, `T_${k} = ${value} MeV`) } : c,
      ),
    },
    message: `Section ${k}: kinetic energy ${value} MeV`,
  };
}

// ── Figures ──────────────────────────────────────────────────────────────────────────────────

/** Nearest-rank percentile. */
function percentile(xs: number[], p: number): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.max(0, Math.ceil(p * s.length) - 1)];
}

interface Figures {
  p50: number;
  p95: number;
  p99: number;
  n: number;
}

function figures(xs: number[]): Figures {
  return { p50: percentile(xs, 0.5), p95: percentile(xs, 0.95), p99: percentile(xs, 0.99), n: xs.length };
}

const ms = (x: number) => `${x.toFixed(1).padStart(7)} ms`;
const row = (label: string, f: Figures) =>
  `  ${label.padEnd(40)} p50 ${ms(f.p50)}   p95 ${ms(f.p95)}   p99 ${ms(f.p99)}   (${f.n} requests)`;

// ── CPU time ─────────────────────────────────────────────────────────────────────────────────

const CLOCK_TICKS_PER_S = 100; // USER_HZ on Linux

/** CPU time in ms of this process (all threads) and of the PostgreSQL server and its backends. */
function cpuNow(postmasterPid: number | null): { node: number; postgres: number | null } {
  const usage = process.cpuUsage();
  const node = (usage.user + usage.system) / 1000;
  if (postmasterPid === null || !existsSync('/proc')) return { node, postgres: null };
  let ticks = 0;
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    let stat: string;
    try {
      stat = readFileSync(`/proc/${entry}/stat`, 'utf8');
    } catch {
      continue; // ended meanwhile
    }
    const f = stat.slice(stat.lastIndexOf(')') + 2).split(' '); // f[0] is field 3 (state)
    const pid = Number(entry);
    if (pid === postmasterPid)
      ticks += Number(f[11]) + Number(f[12]) + Number(f[13]) + Number(f[14]); // own and reaped children
    else if (Number(f[1]) === postmasterPid) ticks += Number(f[11]) + Number(f[12]);
  }
  return { node, postgres: (ticks * 1000) / CLOCK_TICKS_PER_S };
}

// ── The run ──────────────────────────────────────────────────────────────────────────────────

/** Runs `clients` concurrently, each doing `count` requests one after the other; returns the latencies. */
async function concurrently(
  clients: number,
  count: number,
  request: (client: number, i: number) => Promise<number>,
): Promise<number[]> {
  const latencies: number[][] = Array.from({ length: clients }, () => []);
  await Promise.all(
    latencies.map(async (mine, client) => {
      for (let i = 0; i < count; i++) mine.push(await request(client, i));
    }),
  );
  return latencies.flat();
}

type Phase = 'bare' | 'stored' | 'warm' | 'cold';
const PHASES: Phase[] = ['bare', 'stored', 'warm', 'cold'];
const ROUNDS = 5;

export interface SaveBenchResult {
  /** How many of the sheets each evaluation worker evaluates. */
  sheetsPerWorker: number[];
  contentBytes: number;
  resultsBytes: number;
  storedBytes: { content: number; results: number };
  figures: Record<Phase, Figures>;
  /** CPU ms per request of this process (all threads) and of PostgreSQL. */
  cpu: Record<Phase, { node: number; postgres: number | null }>;
  auditChainBreaks: number;
}

export async function runSaveBench(
  databaseUrl: string,
  options: { postmasterPid?: number | null; log?: (line: string) => void } = {},
): Promise<SaveBenchResult> {
  const log = options.log ?? (() => undefined);
  const db = createDb(databaseUrl, { max: 1 });
  await migrateToLatest(db);
  await db.destroy();

  const app = createDb(databaseUrl); // the application's pool: DB_POOL_MAX connections
  const bare = new pg.Pool({
    connectionString: databaseUrl,
    max: DB_POOL_MAX,
    connectionTimeoutMillis: 3000,
    application_name: 'worldsheet-bench',
  });
  bare.on('error', () => undefined); // as the application's pool: a dropped idle connection is not fatal
  const evaluator = getEvaluator();
  try {
    // One originator per client, as in use: the evaluator limits the saves one person has in
    // evaluation at once (four: lib/calc/sandbox/evaluator.ts, perUserSaves), so one account for all
    // clients would be refused.
    const authors = await Promise.all(
      Array.from({ length: CLIENTS }, (_, k) =>
        makeUser(app, `bench-originator-${k + 1}@example.test`, { password: null }),
      ),
    );
    const author = authors[0];
    const projectId = await makeProject(
      app,
      'BEN',
      authors.map((a) => [a, 'originator'] as [typeof a, 'originator']),
    );
    const project = { id: projectId, code: 'BEN' };
    // Sheets go to evaluation workers by a hash of their id: 16 random ids split 8 and 8 only one
    // time in five, and 10 and 6 or worse almost half the time; the busier worker then sets the p95.
    // The run takes the same number of sheets for each worker, so that its figures do not depend on
    // the ids drawn.
    const sheets: Array<{ id: string; project_id: string }> = [];
    const perWorker = Array.from({ length: evaluator.options.workers }, () => 0);
    for (let n = 1; sheets.length < CLIENTS; n++) {
      const created = await createSheet(app, author, project, {
        title: `Beam line ${n}`,
        safetyRelated: true,
        objective: '',
      });
      const worker = evaluator.workerFor(created.id);
      if (perWorker[worker] >= Math.ceil(CLIENTS / perWorker.length)) continue;
      perWorker[worker]++;
      sheets.push({ id: created.id, project_id: projectId });
    }
    // The baselines' tables: the content alone, and content with results; their columns are
    // compressed as the columns of versions are.
    await bare.query('create table bench_bare (id bigserial primary key, content jsonb not null)');
    await bare.query('create table bench_stored (id bigserial primary key, content jsonb not null, results jsonb)');
    const compression = await bare.query<{ attname: string; attcompression: string }>(
      "select attname, attcompression from pg_attribute where attrelid = 'versions'::regclass and attname in ('content', 'results')",
    );
    for (const c of compression.rows) {
      const method = c.attcompression === 'l' ? 'lz4' : c.attcompression === 'p' ? 'pglz' : 'default';
      if (c.attname === 'content')
        await bare.query(`alter table bench_bare alter column content set compression ${method}`);
      await bare.query(`alter table bench_stored alter column ${c.attname} set compression ${method}`);
    }

    // Version 2 of every sheet: the full 500-cell content, evaluated from nothing (not timed).
    log(`${CLIENTS} sheets of 500 cells: first full evaluation and save …`);
    const current = sheets.map((_, s) => beamLineContent(s));
    const resultsJson: string[] = [];
    const latest = sheets.map(() => 1);
    await concurrently(CLIENTS, 1, async (s) => {
      const options = { significantFigures: current[s].significantFigures, tables: [] };
      resultsJson[s] = JSON.stringify(await evaluator.evaluate(current[s].cells, options, sheets[s].id));
      const saved = await saveVersion(app, authors[s], sheets[s], {
        parentNumber: latest[s],
        message: 'Beam line sheet',
        content: current[s],
      });
      if (!saved.ok) throw new Error(`the generated sheet ${s} has errors`);
      latest[s] = saved.number;
      return 0;
    });
    const sheetsPerWorker = Array.from(
      { length: evaluator.options.workers },
      (_, w) => sheets.filter((sheet) => evaluator.workerFor(sheet.id) === w).length,
    );
    const contentBytes = Buffer.byteLength(JSON.stringify(current[0]));
    const resultsBytes = Buffer.byteLength(resultsJson[0]);

    const edits = sheets.map(() => 0);
    const nextEdit = (s: number) => edited(current[s], s, edits[s]++);

    /**
     * One save as the route handler does it, once the request body has arrived. A refusal (409 or
     * any other) ends the run: with one client per sheet there should be none.
     */
    const save = async (s: number, evaluateFirst: boolean): Promise<number> => {
      const { content, message } = nextEdit(s);
      const body = JSON.stringify({ parentNumber: latest[s], message, content });
      // The editor's live evaluation through /api/evaluate before the user presses save (not timed).
      // As the editor does: the sheet's project is the cache scope a save of it evaluates in.
      if (evaluateFirst)
        await evaluator.evaluate(
          content.cells,
          { significantFigures: content.significantFigures, tables: [] },
          { scope: evaluationScope({ projectId }), affinity: sheets[s].id },
        );
      const t0 = performance.now();
      const saved = await saveVersion(app, authors[s], sheets[s], parseValue(JSON.parse(body), saveVersionSchema));
      const elapsed = performance.now() - t0;
      if (!saved.ok) throw new Error(`a save of sheet ${s} has errors`);
      latest[s] = saved.number;
      current[s] = content;
      return elapsed;
    };

    /** A bare INSERT of the same content JSON (with `withResults`, and of results JSON of the same sheet). */
    const insert = async (s: number, withResults: boolean): Promise<number> => {
      const json = JSON.stringify(nextEdit(s).content);
      const t0 = performance.now();
      if (withResults)
        await bare.query('insert into bench_stored (content, results) values ($1::jsonb, $2::jsonb)', [
          json,
          resultsJson[s],
        ]);
      else await bare.query('insert into bench_bare (content) values ($1::jsonb)', [json]);
      return performance.now() - t0;
    };

    const run = (phase: Phase, count: number) =>
      concurrently(CLIENTS, count, (s) =>
        phase === 'bare' || phase === 'stored' ? insert(s, phase === 'stored') : save(s, phase === 'warm'),
      );

    log('warming up …');
    for (const phase of PHASES) await run(phase, WARM_UP_SAVES);

    // Rounds of the four phases one after the other, so that whatever else the machine does in the
    // meantime falls on all of them alike.
    const perRound = Math.max(1, Math.round(SAVES_PER_CLIENT / ROUNDS));
    log(
      `measuring: ${ROUNDS} rounds of ${CLIENTS} clients × ${perRound} requests in each of ${PHASES.length} phases …`,
    );
    const latencies: Record<Phase, number[]> = { bare: [], stored: [], warm: [], cold: [] };
    const cpu: Record<Phase, { node: number; postgres: number | null }> = {
      bare: { node: 0, postgres: 0 },
      stored: { node: 0, postgres: 0 },
      warm: { node: 0, postgres: 0 },
      cold: { node: 0, postgres: 0 },
    };
    for (let round = 1; round <= ROUNDS; round++) {
      for (const phase of PHASES) {
        const before = cpuNow(options.postmasterPid ?? null);
        latencies[phase].push(...(await run(phase, perRound)));
        const after = cpuNow(options.postmasterPid ?? null);
        cpu[phase].node += after.node - before.node;
        cpu[phase].postgres =
          after.postgres === null || before.postgres === null
            ? null
            : cpu[phase].postgres! + after.postgres - before.postgres;
      }
    }
    for (const phase of PHASES) {
      const n = latencies[phase].length;
      cpu[phase] = {
        node: cpu[phase].node / n,
        postgres: cpu[phase].postgres === null ? null : cpu[phase].postgres / n,
      };
    }

    const breaks = await bare.query<{ n: number }>('select count(*)::int as n from audit_chain_breaks()');
    const sizes = await bare.query<{ content: number; results: number }>(
      // Results: a version's head and cell digests, and its share of the cell results stored (each once).
      `select avg(pg_column_size(content))::int as content,
              (avg(coalesce(pg_column_size(results), 0) + coalesce(pg_column_size(result_head), 0) + coalesce(pg_column_size(result_cells), 0))
               + (select coalesce(sum(pg_column_size(result)), 0) from result_cells) / count(*))::int as results
       from versions where number > 1`,
    );
    return {
      sheetsPerWorker,
      contentBytes,
      resultsBytes,
      storedBytes: sizes.rows[0],
      figures: {
        bare: figures(latencies.bare),
        stored: figures(latencies.stored),
        warm: figures(latencies.warm),
        cold: figures(latencies.cold),
      },
      cpu,
      auditChainBreaks: breaks.rows[0].n,
    };
  } finally {
    await evaluator.close();
    await bare.end();
    await app.destroy();
  }
}

function postmasterPid(cluster: LocalCluster): number | null {
  try {
    return Number(readFileSync(path.join(cluster.dataFolder, 'postmaster.pid'), 'utf8').split('\n')[0]) || null;
  } catch {
    return null;
  }
}

async function main(supervisor: Supervisor) {
  const cluster = new LocalCluster({ name: 'bench', port: benchClusterPort(), projectRoot: root });
  cluster.prepare();
  supervisor.add('PostgreSQL', () => cluster.stop());
  await cluster.start();
  await cluster.ensureDatabase(DATABASE, { fresh: true });

  // The evaluation workers are started from lib/ relative to the working directory, as in the app.
  process.chdir(root);
  const sandbox = sandboxOptionsFromEnv(process.env);
  const loadBefore = os.loadavg()[0];
  const r = await runSaveBench(cluster.appUrl(DATABASE), {
    postmasterPid: postmasterPid(cluster),
    log: (line) => console.log(`[save-bench] ${line}`),
  });
  const f = r.figures;
  const ratio = (a: Figures, b: Figures) => (a.p95 / b.p95).toFixed(2);
  const aim = (a: Figures) => `${ratio(a, f.bare)}   (aim ≤ ${AIM}: ${a.p95 / f.bare.p95 <= AIM ? 'met' : 'not met'})`;
  const cpu = (phase: Phase) => {
    const c = r.cpu[phase];
    return `${c.node.toFixed(1)} ms Node.js${c.postgres === null ? '' : ` + ${c.postgres.toFixed(1)} ms PostgreSQL`}`;
  };
  const kib = (bytes: number) => `${Math.round(bytes / 1024)} KiB`;

  console.log(`\nSaving a version of a 500-cell sheet, ${CLIENTS} clients at once, ${ROUNDS} interleaved rounds`);
  console.log('  (one sheet per client: concurrent saves to one sheet are refused with 409 by design)');
  console.log(
    `  content ${kib(r.contentBytes)} of JSON, results ${kib(r.resultsBytes)}; stored after compression: ${kib(r.storedBytes.content)} and ${kib(r.storedBytes.results)}`,
  );
  console.log(
    `  database pool ${DB_POOL_MAX} connections for each; ${sandbox.workers} evaluation workers (sheets on each: ${r.sheetsPerWorker.join(', ')})`,
  );
  console.log(
    `  ${os.availableParallelism()} CPUs; load average ${loadBefore.toFixed(1)} before the run, ${os.loadavg()[0].toFixed(1)} after it (all figures are shared with whatever else runs)`,
  );
  console.log(row('bare INSERT of the content JSON', f.bare));
  console.log(row('bare INSERT of content + results JSON', f.stored));
  console.log(row('save, warm (evaluated before, editor)', f.warm));
  console.log(row('save, cold (no evaluation before)', f.cold));
  console.log(`  ratio p95 warm save / bare INSERT:                 ${aim(f.warm)}`);
  console.log(`  ratio p95 cold save / bare INSERT:                 ${aim(f.cold)}`);
  console.log(
    `  ratio p95 bare INSERT with results / bare INSERT:  ${ratio(f.stored, f.bare)}   (what storing the results costs by itself)`,
  );
  console.log(`  ratio p95 warm save / bare INSERT with results:    ${ratio(f.warm, f.stored)}`);
  console.log('  CPU per request (PostgreSQL: all its processes, background work included):');
  console.log(`    bare INSERT ${cpu('bare')}; with results ${cpu('stored')}`);
  console.log(`    warm save ${cpu('warm')} (the editor's evaluation before it included); cold save ${cpu('cold')}`);
  const total = (phase: Phase) => r.cpu[phase].node + (r.cpu[phase].postgres ?? 0);
  if (r.cpu.bare.postgres !== null) {
    console.log(
      `  ratio CPU per request, cold save / bare INSERT:    ${(total('cold') / total('bare')).toFixed(1)}   (less sensitive to other load than the p95; at saturation latency follows it)`,
    );
  }
  console.log(`  every save accepted; audit chain breaks after the run: ${r.auditChainBreaks}`);
  await supervisor.shutdown(r.auditChainBreaks === 0 ? 0 : 1);
}

if (process.argv[1]?.endsWith('save-bench.ts')) {
  // Stops the cluster on Ctrl-C, on SIGTERM from `npm run bench` and when the run fails.
  const supervisor = new Supervisor();
  try {
    await main(supervisor);
  } catch (error) {
    // Once stopping (Ctrl-C), the requests in flight fail as the server goes: nothing to report.
    if (!supervisor.isStopping) console.error(`[save-bench] ${(error as Error).stack ?? error}`);
    await supervisor.shutdown(1);
  }
}
