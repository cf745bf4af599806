// Queues an e-mail. The job is a row in the same database, written on the connection it is given:
// pass the transaction that makes the change the mail is about, and the change and its mail commit
// or roll back together. The worker process (lib/jobs/worker-main.ts) delivers it over SMTP and
// retries until the mail service takes it.
import type { Kysely } from 'kysely';
import type PgBoss from 'pg-boss';
import type { Database } from '../../db/schema';
import { jobSender, kyselyJobDb } from '../jobs/queue';
import { MAIL_QUEUE, mailMessageSchema, type MailMessage } from './message';

export type { MailMessage } from './message';

/** Retry settings of one job, overriding the queue's (lib/jobs/queue.ts); the tests use short ones. */
export type MailJobOptions = Pick<PgBoss.SendOptions, 'retryLimit' | 'retryDelay' | 'retryBackoff'>;

/**
 * Queues `message` on `db`, which is the app's Kysely instance or a transaction of it (inside
 * `db.transaction().execute(async (trx) => …)` pass `trx`). Returns the job id. Throws a ZodError
 * for an invalid message, and an Error when the mail queue does not exist (the job schema is set
 * up by `npm start` and by the test setup; see ensureJobQueues).
 */
export async function enqueueMail(
  db: Kysely<Database>,
  message: MailMessage,
  options: MailJobOptions = {},
): Promise<string> {
  const data = mailMessageSchema.parse(message);
  const id = await jobSender().send(MAIL_QUEUE, data, { ...options, db: kyselyJobDb(db) });
  if (!id)
    throw new Error(
      `the job queue "${MAIL_QUEUE}" does not exist; run ensureJobQueues (npm start does) before sending mail`,
    );
  return id;
}
