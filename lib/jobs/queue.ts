// The job queue: pg-boss on the application's own PostgreSQL database, in its own schema `pgboss`
// (pg-boss creates and migrates it on start). Jobs are rows, so a job sent inside a transaction
// exists only if that transaction commits.
//
// Two ways in:
//   - `jobSender()` — a pg-boss instance that is never started and has no connection of its own.
//     Every call gives it a connection (`{ db: kyselyJobDb(trx) }`), so the app sends jobs on its
//     Kysely connection or inside its transaction without a second pool or background timers.
//   - `startBoss(url)` — a started instance with its own pool and maintenance, for the worker
//     process (lib/jobs/worker-main.ts) and for setting the queues up.
import { CompiledQuery, type Kysely } from 'kysely';
import PgBoss from 'pg-boss';
import type { Database } from '@/db/schema';

const JOB_SCHEMA = 'pgboss';

/** Every queue and its settings. Add a queue here and a handler in lib/jobs/worker.ts. */
const QUEUES: Record<string, Omit<PgBoss.Queue, 'name'>> = {
  // Retries with exponential backoff: pg-boss waits retryDelay·2^min(n−1, 15)·(1…2) s before retry
  // n (5–10 s, 10–20 s, 20–40 s, …, at most 1.9–3.8 days apart), so mail survives the mail service
  // being down for days; after 20 failed retries (11–23 days in all) the job is left in state
  // `failed`. The retention (how long a job may wait at all) covers the whole series.
  mail: {
    policy: 'standard',
    retryLimit: 20,
    retryDelay: 5,
    retryBackoff: true,
    // A delivery that takes this long is failed and retried (nodemailer's own timeouts are shorter).
    expireInSeconds: 120,
    // 30 days. (pg-boss 10 stores only retentionMinutes for a queue; retentionDays would be ignored.)
    retentionMinutes: 30 * 24 * 60,
  },
  // Issuing a revision (lib/issue/job.ts): rendering, signing, storing and recording are
  // resumable, so a job that failed or whose worker died is simply run again.
  issue: {
    policy: 'standard',
    retryLimit: 30,
    retryDelay: 2,
    retryBackoff: true,
    expireInSeconds: 300,
    retentionMinutes: 30 * 24 * 60,
  },
};

/** pg-boss's connection interface, answered through a Kysely instance or transaction. */
export function kyselyJobDb(db: Kysely<Database>): PgBoss.Db {
  return {
    async executeSql(text: string, values: unknown[] = []) {
      const result = await db.executeQuery(CompiledQuery.raw(text, values));
      return { rows: result.rows as unknown[] };
    },
  };
}

const notConnected: PgBoss.Db = {
  executeSql: () => Promise.reject(new Error('jobSender() has no connection of its own; pass { db: kyselyJobDb(db) }')),
};

const globalForJobs = globalThis as unknown as { worldsheetJobSender?: PgBoss };

/** The connection-less pg-boss instance for send, fetch, complete and fail with `{ db }`. */
export function jobSender(): PgBoss {
  globalForJobs.worldsheetJobSender ??= new PgBoss({
    db: notConnected,
    schema: JOB_SCHEMA,
    schedule: false,
    supervise: false,
    migrate: false,
  });
  return globalForJobs.worldsheetJobSender;
}

export interface BossOptions {
  /** Maintenance (expiring stuck jobs, archiving, deleting old ones). Default true. */
  supervise?: boolean;
  max?: number;
}

/** A pg-boss instance with its own pool on `databaseUrl`, started (schema created or migrated). */
export async function startBoss(databaseUrl: string, options: BossOptions = {}): Promise<PgBoss> {
  const boss = new PgBoss({
    connectionString: databaseUrl,
    schema: JOB_SCHEMA,
    application_name: 'worldsheet-jobs',
    max: options.max ?? 4,
    migrate: true,
    supervise: options.supervise ?? true,
    // No cron schedules are used; the timekeeper would only poll.
    schedule: false,
  });
  await boss.start();
  return boss;
}

/** Creates the queues that do not exist yet and brings existing ones to the settings above. */
export async function createQueues(boss: PgBoss): Promise<void> {
  for (const [name, settings] of Object.entries(QUEUES)) {
    const existing = await boss.getQueue(name);
    if (existing) await boss.updateQueue(name, { name, ...settings });
    else await boss.createQueue(name, { name, ...settings });
  }
}

/**
 * Makes sure the job schema and the queues exist, then disconnects. `npm start` and the test setup
 * call it after the migrations, so the app can send jobs before the worker has started.
 */
export async function ensureJobQueues(databaseUrl: string): Promise<void> {
  const boss = await startBoss(databaseUrl, { supervise: false, max: 1 });
  try {
    await createQueues(boss);
  } finally {
    await boss.stop({ graceful: false, wait: true });
  }
}
