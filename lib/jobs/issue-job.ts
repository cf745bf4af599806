// The issuing queue: each job works one issue request (lib/issue/job.ts) to its end. A job that
// throws is retried by pg-boss (QUEUES.issue); one whose worker died expires and is retried; the
// work is resumable, so a retry finishes what the failed run started. When the retries are used
// up the request is marked failed with the reason, and nothing was recorded.
import type PgBoss from 'pg-boss';
import { getDb } from '@/db';
import { ISSUE_QUEUE } from '@/lib/issue/request';
import { failIssueJob, pendingIssueJobs, processIssueJob } from '@/lib/issue/job';
import { getObjectStore } from '@/lib/storage/object-store';

export async function workIssueQueue(
  boss: PgBoss,
  options: { pollingIntervalSeconds: number; log?: (line: string) => void },
): Promise<void> {
  const log = options.log ?? (() => undefined);
  await boss.work<{ issueJobId: string }>(
    ISSUE_QUEUE,
    { batchSize: 1, pollingIntervalSeconds: options.pollingIntervalSeconds, includeMetadata: true },
    async ([job]) => {
      const id = job.data.issueJobId;
      try {
        const revision = await processIssueJob(getDb(), getObjectStore(), id);
        log(`issued: request ${id} → revision ${revision}`);
      } catch (error) {
        const message = error instanceof Error ? error.message : String(error);
        log(`issuing ${id} failed (attempt ${job.retryCount + 1}): ${message}`);
        if (job.retryCount >= job.retryLimit) await failIssueJob(getDb(), id, message);
        throw error;
      }
    },
  );
  // A worker that died mid-job leaves its queue job active until pg-boss expires it (minutes); the
  // work is resumable and recorded once, so pending requests are simply queued again now.
  for (const id of await pendingIssueJobs(getDb())) {
    await boss.send(ISSUE_QUEUE, { issueJobId: id }, { singletonKey: `${id}:resumed:${Date.now()}` });
    log(`issuing: resuming request ${id}`);
  }
}
