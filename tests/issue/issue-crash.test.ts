// Issuing survives its worker being killed: the job worker process (as `npm start` runs it) is
// killed with SIGKILL in the middle of issuing, started again, and finishes the same request into
// exactly one revision with exactly one stored PDF. With two workers running, the survivor takes
// over once the killed one's lease lapses, without a restart. Two requests at once give one revision.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import { afterEach, expect, it } from 'vitest';
import { requestIssue } from '../../lib/issue/request';
import { processIssueJob } from '../../lib/issue/job';
import { storageConfig } from '../../lib/storage/config';
import { createObjectStore } from '../../lib/storage/object-store';
import { approvedSheet } from '../support/approved-sheet';
import { testDb } from '../support/database';
import { PASSWORD } from '../support/people';
import { until } from '../support/until';
import { killWorkers, startWorker } from '../support/worker-process';

process.env.WORLDSHEET_KEY_FOLDER ??= path.join(mkdtempSync(path.join(tmpdir(), 'ws-crash-')), 'keys');

afterEach(killWorkers);

async function pdfObjects(jobId: string): Promise<number> {
  const config = storageConfig();
  const client = new S3Client({
    endpoint: config.endpoint,
    region: config.region,
    credentials: config.credentials,
    forcePathStyle: true,
  });
  return (
    (await client.send(new ListObjectsV2Command({ Bucket: config.bucket, Prefix: `revisions/issue-${jobId}` })))
      .KeyCount ?? 0
  );
}

it(
  'finishes into one revision and one PDF after the worker is killed in the middle of issuing',
  { timeout: 180_000 },
  async () => {
    const db = testDb();
    const { controller, sheet } = await approvedSheet(db);
    // Each step pauses 1.5 s so that the kill lands inside the work, not before or after it. The
    // killed worker's lease (3 s here, 30 s by default) must lapse before the new one takes over.
    const first = startWorker({ WORLDSHEET_ISSUE_STEP_PAUSE_MS: '1500', WORLDSHEET_ISSUE_LEASE_SECONDS: '3' });
    await until('the worker to start', async () => first.output().includes('working the queues'), 60_000);
    const { jobId } = await requestIssue(db, controller, sheet, { versionNumber: 2, password: PASSWORD });
    const step = await until(
      'the job to reach the signing step',
      async () => {
        const job = await db
          .selectFrom('issue_jobs')
          .select(['step', 'state'])
          .where('id', '=', jobId)
          .executeTakeFirstOrThrow();
        return job.step === 'signing' ? job : null;
      },
      60_000,
    );
    expect(step.state).toBe('pending');
    first.child.kill('SIGKILL');
    await new Promise((r) => first.child.once('exit', r));
    expect(await db.selectFrom('revisions').select('id').execute()).toEqual([]);

    const second = startWorker({ WORLDSHEET_ISSUE_LEASE_SECONDS: '3' });
    await until(
      'the request to be issued',
      async () => {
        const job = await db.selectFrom('issue_jobs').select('state').where('id', '=', jobId).executeTakeFirstOrThrow();
        return job.state === 'done';
      },
      90_000,
    );
    expect(second.output()).toContain(`issuing: resuming request ${jobId}`);
    expect(await db.selectFrom('revisions').select(['code', 'status']).execute()).toEqual([
      { code: 'A', status: 'current' },
    ]);
    expect(await pdfObjects(jobId)).toBe(1);
    expect(await db.selectFrom('signatures').select('id').where('meaning', '=', 'issued').execute()).toHaveLength(1);
  },
);

it(
  "is finished by the other worker running beside it once the killed worker's lease lapses",
  { timeout: 180_000 },
  async () => {
    const db = testDb();
    const { controller, sheet } = await approvedSheet(db);
    const env = { WORLDSHEET_ISSUE_STEP_PAUSE_MS: '1500', WORLDSHEET_ISSUE_LEASE_SECONDS: '3' };
    const workers = [startWorker(env), startWorker(env)];
    for (const w of workers)
      await until('the workers to start', async () => w.output().includes('working the queues'), 60_000);
    const { jobId } = await requestIssue(db, controller, sheet, { versionNumber: 2, password: PASSWORD });
    const leased = await until(
      'the job to reach the signing step under a lease',
      async () => {
        const job = await db
          .selectFrom('issue_jobs')
          .select(['step', 'state', 'lease_owner'])
          .where('id', '=', jobId)
          .executeTakeFirstOrThrow();
        return job.step === 'signing' && job.lease_owner ? job : null;
      },
      60_000,
    );
    expect(leased.state).toBe('pending');
    const holder = workers.find((w) => leased.lease_owner!.includes(`:${w.child.pid}:`))!;
    const survivor = workers.find((w) => w !== holder)!;
    expect(holder).toBeDefined();
    holder.child.kill('SIGKILL');
    await new Promise((r) => holder.child.once('exit', r));
    expect(await db.selectFrom('revisions').select('id').execute()).toEqual([]);

    await until(
      'the request to be issued by the survivor',
      async () => {
        const job = await db.selectFrom('issue_jobs').select('state').where('id', '=', jobId).executeTakeFirstOrThrow();
        return job.state === 'done';
      },
      90_000,
    );
    expect(survivor.output()).toContain(`issuing: resuming request ${jobId} (its worker's lease lapsed)`);
    const done = await db
      .selectFrom('issue_jobs')
      .select('lease_owner')
      .where('id', '=', jobId)
      .executeTakeFirstOrThrow();
    expect(done.lease_owner).not.toBe(leased.lease_owner);
    expect(await db.selectFrom('revisions').select(['code', 'status']).execute()).toEqual([
      { code: 'A', status: 'current' },
    ]);
    expect(await pdfObjects(jobId)).toBe(1);
    expect(await db.selectFrom('signatures').select('id').where('meaning', '=', 'issued').execute()).toHaveLength(1);
  },
);

it(
  'records one revision when the same request is worked twice at once, and refuses a second request while one is pending',
  { timeout: 120_000 },
  async () => {
    const db = testDb();
    const { controller, sheet } = await approvedSheet(db);
    const results = await Promise.allSettled([
      requestIssue(db, controller, sheet, { versionNumber: 2, password: PASSWORD }),
      requestIssue(db, controller, sheet, { versionNumber: 2, password: PASSWORD }),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual(['fulfilled', 'rejected']);
    const { jobId } = (results.find((r) => r.status === 'fulfilled') as PromiseFulfilledResult<{ jobId: string }>)
      .value;
    const store = createObjectStore(storageConfig());
    const [a, b] = await Promise.all([processIssueJob(db, store, jobId), processIssueJob(db, store, jobId)]);
    expect(a).toBe(b);
    expect(await db.selectFrom('revisions').select('id').execute()).toHaveLength(1);
    expect(await pdfObjects(jobId)).toBe(1);
  },
);
