// Issuing survives its worker being killed: the job worker process (as `npm start` runs it) is
// killed with SIGKILL in the middle of issuing, started again, and finishes the same request into
// exactly one revision with exactly one stored PDF. Two requests at once give one revision.
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import { afterEach, expect, inject, it } from 'vitest';
import { decide, saveCheckWork, submitForCheck } from '../../lib/checks/workflow';
import { processIssueJob, requestIssue } from '../../lib/issue/issue';
import { createSheet, getVersion, saveVersion } from '../../lib/sheets/sheets';
import { storageConfig } from '../../lib/storage/config';
import { createObjectStore } from '../../lib/storage/object-store';
import { testDb } from '../support/database';
import { makeProject, makeUser, PASSWORD } from '../support/people';

process.env.WORLDSHEET_KEY_FOLDER ??= path.join(mkdtempSync(path.join(tmpdir(), 'ws-crash-')), 'keys');

const children: ChildProcess[] = [];
afterEach(async () => {
  for (const c of children.splice(0)) {
    if (c.exitCode === null && c.signalCode === null) {
      const exited = new Promise((r) => c.once('exit', r));
      c.kill('SIGKILL');
      await exited;
    }
  }
});

function startWorker(extra: Record<string, string> = {}): { child: ChildProcess; output: () => string } {
  const child = spawn(process.execPath, ['--import', 'tsx', path.join('lib', 'jobs', 'worker-main.ts')], {
    cwd: process.cwd(),
    env: { ...process.env, DATABASE_URL: inject('databaseUrl'), WORLDSHEET_SMTP_URL: inject('smtpUrl'), WORLDSHEET_JOB_POLL_SECONDS: '0.5', ...extra },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  children.push(child);
  let output = '';
  child.stdout!.on('data', (d) => (output += d));
  child.stderr!.on('data', (d) => (output += d));
  return { child, output: () => output };
}

async function until<T>(what: string, probe: () => Promise<T | null | undefined | false>, timeoutMs: number): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`${what}: not within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

async function approvedSheet() {
  const db = testDb();
  const [author, checker, approver, controller] = await Promise.all(['author', 'checker', 'approver', 'controller'].map((n) => makeUser(db, `${n}@example.test`)));
  const projectId = await makeProject(db, 'TPT2', [[author, 'originator'], [checker, 'checker'], [approver, 'approver'], [controller, 'controller']]);
  const created = await createSheet(db, author, { id: projectId, code: 'TPT2' }, { title: 'Time of flight', safetyRelated: false, objective: '' });
  const sheet = { id: created.id, project_id: projectId, number: created.number, title: 'Time of flight' };
  const v1 = (await getVersion(db, sheet.id, 1))!;
  await saveVersion(db, author, sheet, { parentNumber: 1, message: 'flight time', content: { ...v1.content, cells: [{ id: 'c1', kind: 'calc', source: 'L = 12.5 m\nt_f = L / speedFromKinetic(150 MeV, m_p) to ns' }] } });
  const { id } = await submitForCheck(db, author, sheet, { versionNumber: 2, checkerId: checker.userId, password: PASSWORD });
  await saveCheckWork(db, checker, id, { verificationMethod: 'design_review' });
  await decide(db, checker, id, { action: 'sign', password: PASSWORD });
  await decide(db, approver, id, { action: 'approve', password: PASSWORD });
  return { controller, sheet };
}

async function pdfObjects(jobId: string): Promise<number> {
  const config = storageConfig();
  const client = new S3Client({ endpoint: config.endpoint, region: config.region, credentials: config.credentials, forcePathStyle: true });
  return (await client.send(new ListObjectsV2Command({ Bucket: config.bucket, Prefix: `revisions/issue-${jobId}` }))).KeyCount ?? 0;
}

it('finishes into one revision and one PDF after the worker is killed in the middle of issuing', { timeout: 180_000 }, async () => {
  const db = testDb();
  const { controller, sheet } = await approvedSheet();
  // Each step pauses 1.5 s so that the kill lands inside the work, not before or after it.
  const first = startWorker({ WORLDSHEET_ISSUE_STEP_PAUSE_MS: '1500' });
  await until('the worker to start', async () => first.output().includes('working the queues'), 60_000);
  const { jobId } = await requestIssue(db, controller, sheet, { versionNumber: 2, password: PASSWORD });
  const step = await until('the job to reach the signing step', async () => {
    const job = await db.selectFrom('issue_jobs').select(['step', 'state']).where('id', '=', jobId).executeTakeFirstOrThrow();
    return job.step === 'signing' ? job : null;
  }, 60_000);
  expect(step.state).toBe('pending');
  first.child.kill('SIGKILL');
  await new Promise((r) => first.child.once('exit', r));
  expect(await db.selectFrom('revisions').select('id').execute()).toEqual([]);

  const second = startWorker();
  await until('the request to be issued', async () => {
    const job = await db.selectFrom('issue_jobs').select('state').where('id', '=', jobId).executeTakeFirstOrThrow();
    return job.state === 'done';
  }, 90_000);
  expect(second.output()).toContain(`issuing: resuming request ${jobId}`);
  expect(await db.selectFrom('revisions').select(['code', 'status']).execute()).toEqual([{ code: 'A', status: 'current' }]);
  expect(await pdfObjects(jobId)).toBe(1);
  expect(await db.selectFrom('signatures').select('id').where('meaning', '=', 'issued').execute()).toHaveLength(1);
});

it('records one revision when the same request is worked twice at once, and refuses a second request while one is pending', { timeout: 120_000 }, async () => {
  const db = testDb();
  const { controller, sheet } = await approvedSheet();
  const results = await Promise.allSettled([
    requestIssue(db, controller, sheet, { versionNumber: 2, password: PASSWORD }),
    requestIssue(db, controller, sheet, { versionNumber: 2, password: PASSWORD }),
  ]);
  expect(results.map((r) => r.status).sort()).toEqual(['fulfilled', 'rejected']);
  const { jobId } = (results.find((r) => r.status === 'fulfilled') as PromiseFulfilledResult<{ jobId: string }>).value;
  const store = createObjectStore(storageConfig());
  const [a, b] = await Promise.all([processIssueJob(db, store, jobId), processIssueJob(db, store, jobId)]);
  expect(a).toBe(b);
  expect(await db.selectFrom('revisions').select('id').execute()).toHaveLength(1);
  expect(await pdfObjects(jobId)).toBe(1);
});
