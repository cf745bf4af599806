// The issuing queue: each job works one issue request (lib/issue/job.ts) to its end. A job that
// throws is retried by pg-boss (QUEUES.issue); one whose worker died expires and is retried; the
// work is resumable, so a retry finishes what the failed run started. When the retries are used
// up the request is marked failed with the reason, and nothing was recorded.
import { randomBytes } from 'node:crypto';
import { hostname } from 'node:os';
import type PgBoss from 'pg-boss';
import { getDb } from '@/db';
import { ISSUE_QUEUE } from '@/lib/issue/request';
import { failIssueJob, lapsedIssueJobs, pendingIssueJobs, processIssueJob, releaseIssueLeases } from '@/lib/issue/job';
import { config } from '@/lib/config';
import { getObjectStore } from '@/lib/storage/object-store';

/** This worker's name in the leases it holds: host, process and a random part (a restarted process differs). */
const OWNER = `${hostname()}:${process.pid}:${randomBytes(4).toString('hex')}`;

export interface IssueQueueWorker {
  /** Stops looking for lapsed requests and ends this worker's leases (after the jobs in hand stopped). */
  close(): Promise<void>;
}

export async function workIssueQueue(
  boss: PgBoss,
  options: { pollingIntervalSeconds: number; log?: (line: string) => void },
): Promise<IssueQueueWorker> {
  const log = options.log ?? (() => undefined);
  await boss.work<{ issueJobId: string }>(
    ISSUE_QUEUE,
    { batchSize: 1, pollingIntervalSeconds: options.pollingIntervalSeconds, includeMetadata: true },
    async ([job]) => {
      const id = job.data.issueJobId;
      try {
        const revision = await processIssueJob(getDb(), getObjectStore(), id, { owner: OWNER });
        log(
          revision ? `issued: request ${id} → revision ${revision}` : `issuing: request ${id} is with another worker`,
        );
      } catch (error) {
        const message = error instanceof Error ? error.message : String(error);
        log(`issuing ${id} failed (attempt ${job.retryCount + 1}): ${message}`);
        if (job.retryCount >= job.retryLimit) await failIssueJob(getDb(), id, message);
        throw error;
      }
    },
  );
  // A worker that died mid-job leaves its queue job active until pg-boss expires it (minutes); the
  // work is resumable and recorded once, so pending requests are queued again at start, and, while
  // this worker runs, every request whose worker's lease lapsed (the other workers keep theirs
  // renewed while they work).
  for (const id of await pendingIssueJobs(getDb())) {
    await boss.send(ISSUE_QUEUE, { issueJobId: id }, { singletonKey: `${id}:resumed:${Date.now()}` });
    log(`issuing: resuming request ${id}`);
  }
  const sweep = async () => {
    for (const { id, lapsedAt } of await lapsedIssueJobs(getDb())) {
      // One queue job per lapse, whichever worker sees it first.
      const sent = await boss.send(
        ISSUE_QUEUE,
        { issueJobId: id },
        { singletonKey: `${id}:lapsed:${lapsedAt.toISOString()}` },
      );
      if (sent) log(`issuing: resuming request ${id} (its worker's lease lapsed)`);
    }
  };
  const everyMs = (config().WORLDSHEET_ISSUE_LEASE_SECONDS * 1000) / 3;
  const timer = setInterval(
    () => void sweep().catch((e: unknown) => log(`issuing: sweep failed: ${String(e)}`)),
    everyMs,
  );
  return {
    async close() {
      clearInterval(timer);
      await releaseIssueLeases(getDb(), OWNER);
    },
  };
}
