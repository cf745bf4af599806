// Benchmark of issuing (`npm run bench`): the time from the issue request to the stored, signed PDF
// of a 200-cell sheet with typeset formulas, through the same path as the app (requestIssue, then
// the job's processIssueJob: gather, render with MathJax formulas, sign, store in the local
// S3-compatible store, record). Reported with its parts and, as a ratio measured in the same run,
// against rendering alone. Runs its own PostgreSQL cluster (.data/pg-bench) and object store.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { createDb } from '../../db/index';
import { benchClusterPort, LocalCluster } from '../../db/local-postgres';
import { migrateToLatest } from '../../db/migrate';
import { ensureJobQueues } from '../../lib/jobs/queue';
import { requestIssue } from '../../lib/issue/request';
import { processIssueJob, revisionPdfData } from '../../lib/issue/job';
import { renderRevisionPdf } from '../../lib/issue/pdf/render';
import { Supervisor } from '../../lib/ops/supervisor';
import { createObjectStore } from '../../lib/storage/object-store';
import { startFakeObjectStore } from '../../lib/storage/fake-server';
import { storageConfig } from '../../lib/storage/config';
import { approveNewVersion, makeSheet, makeTeam } from '../support/approved-sheet';
import { PASSWORD } from '../support/people';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
const DATABASE = 'worldsheet_issue_bench';
const RUNS = Number(process.env.WORLDSHEET_BENCH_ISSUES ?? 3);

/** 200 cells: 40 sections of a text cell and four calculation cells (two or three statements each). */
function sheetCells(run: number) {
  const cells = [];
  for (let k = 1; k <= 40; k++) {
    cells.push(
      {
        id: `t${k}`,
        kind: 'text' as const,
        source: `## Section ${k}\n\nProtons at $T_{${k}}$; rigidity $B\\rho = p/q$, Lorentz factor $\\gamma \\le 3$.`,
      },
      { id: `a${k}`, kind: 'calc' as const, source: `T_${k} = ${70 + k * 9}.${run} MeV\nL_${k} = ${k}.5 m` },
      {
        id: `b${k}`,
        kind: 'calc' as const,
        source: `p_${k} = momentumFromKinetic(T_${k}, m_p)\nBrho_${k} = magneticRigidity(p_${k}, q_e) to T*m`,
      },
      {
        id: `c${k}`,
        kind: 'calc' as const,
        source: `g_${k} = lorentzFactor(speedFromKinetic(T_${k}, m_p))\ntof_${k} = timeOfFlight(L_${k}, T_${k}, m_p) to ns`,
      },
      { id: `d${k}`, kind: 'calc' as const, source: `Brho_${k} < 5 T*m\ng_${k} <= 1.6` },
    );
  }
  return cells;
}

async function main(supervisor: Supervisor) {
  process.chdir(root);
  const cluster = new LocalCluster({ name: 'bench', port: benchClusterPort(), projectRoot: root });
  cluster.prepare();
  supervisor.add('PostgreSQL', () => cluster.stop());
  await cluster.start();
  await cluster.ensureDatabase(DATABASE, { fresh: true });
  const folder = mkdtempSync(path.join(tmpdir(), 'ws-issue-bench-'));
  const objects = await startFakeObjectStore({
    port: Number(process.env.WORLDSHEET_BENCH_S3_PORT ?? 4598),
    directory: path.join(folder, 'objects'),
  });
  supervisor.add('object store', async () => {
    await objects.stop();
    rmSync(folder, { recursive: true, force: true });
  });
  Object.assign(process.env, objects.env, { WORLDSHEET_KEY_FOLDER: path.join(folder, 'keys') });
  const url = cluster.appUrl(DATABASE);
  process.env.DATABASE_URL = url;
  const db = createDb(url);
  supervisor.add('database pool', () => db.destroy());
  await migrateToLatest(db);
  await ensureJobQueues(url);
  const store = createObjectStore(storageConfig());

  const team = await makeTeam(db, { code: 'BNCH', domain: 'bench.example' });
  const totals: number[] = [];
  const requests: number[] = [];
  const renders: number[] = [];
  const sizes: number[] = [];
  for (let run = 0; run <= RUNS; run++) {
    const sheet = await makeSheet(db, team.author, { id: team.projectId, code: 'BNCH' }, { title: `Beam line ${run}` });
    await approveNewVersion(db, team, sheet, { message: '200 cells', cells: sheetCells(run) });

    const t0 = performance.now();
    const { jobId } = await requestIssue(db, team.controller, sheet, { versionNumber: 2, password: PASSWORD });
    const requested = performance.now() - t0;
    const revisionId = await processIssueJob(db, store, jobId);
    const total = performance.now() - t0;
    const r0 = performance.now();
    const pdf = await renderRevisionPdf(await revisionPdfData(db, jobId));
    const render = performance.now() - r0;
    if (!revisionId) throw new Error('no revision');
    // The first run warms MathJax, fonts and the database; it is not counted.
    if (run === 0) continue;
    totals.push(total);
    requests.push(requested);
    renders.push(render);
    sizes.push(pdf.length);
  }
  const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
  console.log(
    `\nIssuing a 200-cell sheet (160 calculation cells, 360 statements typeset with MathJax), ${RUNS} runs after one warm-up`,
  );
  console.log(
    `  request to stored signed PDF: median ${median(totals).toFixed(0)} ms (runs: ${totals.map((t) => t.toFixed(0)).join(', ')} ms)   (aim ≤ 3000 ms)`,
  );
  console.log(
    `  of which the request (password check with argon2, recording the job): median ${median(requests).toFixed(0)} ms; the job (gather, typeset new formulas, render, sign, store, record): median ${median(totals.map((t, i) => t - requests[i])).toFixed(0)} ms`,
  );
  console.log(
    `  rendering alone (again, its formulas already typeset): median ${median(renders).toFixed(0)} ms; PDF ${Math.round(median(sizes) / 1024)} KiB before signing`,
  );
  console.log(
    `  ratio issue / rendering alone: ${(median(totals) / median(renders)).toFixed(2)}   (the rest: argon2 password check, signing, storing, recording)`,
  );
  await supervisor.shutdown(0);
}

if (process.argv[1]?.endsWith('issue-bench.ts')) {
  const supervisor = new Supervisor();
  try {
    await main(supervisor);
  } catch (error) {
    if (!supervisor.isStopping) console.error(`[issue-bench] ${(error as Error).stack ?? error}`);
    await supervisor.shutdown(1);
  }
}
