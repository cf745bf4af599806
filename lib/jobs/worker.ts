// Works every queue of lib/jobs/queue.ts until stopped. Runs in its own process
// (lib/jobs/worker-main.ts), started by `npm start` and by the browser test harness.
import { createQueues, startBoss } from './queue';
import { workIssueQueue, type IssueQueueWorker } from './issue-job';
import { workMailQueue, type MailDelivery, type MailDeliverySettings } from './mail-job';

export interface JobWorkerOptions {
  databaseUrl: string;
  mail: MailDeliverySettings;
  /** How often an idle queue is polled; at least 0.5 s. */
  pollingIntervalSeconds?: number;
  log?: (line: string) => void;
}

export interface JobWorker {
  /** Stops fetching, lets the jobs in hand finish (up to `timeoutMs`), then disconnects. */
  stop(timeoutMs?: number): Promise<void>;
}

export async function startJobWorker(options: JobWorkerOptions): Promise<JobWorker> {
  const log = options.log ?? (() => undefined);
  const boss = await startBoss(options.databaseUrl);
  // A lost connection or a failing poll is reported and retried by pg-boss, never fatal.
  boss.on('error', (error) => log(`job queue error: ${error.message}`));
  const deliveries: MailDelivery[] = [];
  let issuing: IssueQueueWorker | null = null;
  try {
    await createQueues(boss);
    deliveries.push(
      await workMailQueue(boss, {
        settings: options.mail,
        pollingIntervalSeconds: options.pollingIntervalSeconds ?? 1,
        log,
      }),
    );
    issuing = await workIssueQueue(boss, { pollingIntervalSeconds: options.pollingIntervalSeconds ?? 1, log });
  } catch (error) {
    await boss.stop({ graceful: false });
    throw error;
  }
  let stopping: Promise<void> | null = null;
  return {
    stop(timeoutMs = 10_000) {
      stopping ??= (async () => {
        // wait: true resolves once the jobs in hand are finished (or failed at the timeout) and the pool is closed.
        await boss.stop({ graceful: true, wait: true, timeout: timeoutMs });
        for (const d of deliveries) d.close();
        // A request still in hand at the timeout goes to another worker at once, not after its lease.
        await issuing?.close();
      })();
      return stopping;
    },
  };
}
