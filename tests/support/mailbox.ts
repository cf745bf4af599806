// The test mailbox: the mail capture server started by the global setup (tests/setup/global-setup.ts)
// receives every mail the tests send, and these helpers read it through its HTTP API.
//
// Every test starts with an empty mailbox and an empty job queue (tests/setup/each-file.ts). A
// database test queues mail (enqueueMail) and delivers it with drainMailQueue(); a browser test
// has the worker process of tests/e2e/harness.ts deliver it. Both then read it with waitForMail().
import { sql, type Kysely } from 'kysely';
import { inject } from 'vitest';
import type { Database } from '../../db/schema';
import {
  createMailDelivery,
  MAIL_QUEUE,
  runMailJobs,
  bossJobControl,
  type MailJobResult,
} from '../../lib/jobs/mail-job';
import { jobSender, kyselyJobDb } from '../../lib/jobs/queue';
import { clearCapturedMessages, listCapturedMessages, type CapturedMessage } from '../../lib/mail/capture-client';
import { mailFrom } from '../../lib/mail/config';
import { testDb } from './database';

export type { CapturedMessage } from '../../lib/mail/capture-client';

/** The HTTP API of the test capture server, e.g. http://127.0.0.1:2590. */
function mailCaptureUrl(): string {
  return inject('mailCaptureUrl');
}

/** The test capture server's SMTP address, e.g. smtp://127.0.0.1:2535. */
export function testSmtpUrl(): string {
  return inject('smtpUrl');
}

/** Every captured message, newest first. */
export async function listMail(captureUrl = mailCaptureUrl()): Promise<CapturedMessage[]> {
  return listCapturedMessages(captureUrl);
}

/** Forgets the captured messages and deletes the mail jobs not yet delivered. */
export async function clearMailbox(captureUrl = mailCaptureUrl()): Promise<void> {
  await purgeMailQueue();
  await clearCapturedMessages(captureUrl);
}

/** Deletes every mail job, whatever its state, so that none reaches a later test. */
async function purgeMailQueue(db: Kysely<Database> = testDb()): Promise<void> {
  await sql`delete from pgboss.job where name = ${MAIL_QUEUE}`.execute(db);
}

export interface MailMatch {
  /** A recipient address (case does not matter). */
  to: string;
  /** The exact subject, or a pattern it must match. */
  subject?: string | RegExp;
  /** The kind given to enqueueMail, e.g. `verify-email`. */
  kind?: string;
}

function matches(m: CapturedMessage, match: MailMatch): boolean {
  if (!m.to.includes(match.to.toLowerCase())) return false;
  if (match.kind !== undefined && m.kind !== match.kind) return false;
  if (match.subject === undefined) return true;
  return typeof match.subject === 'string' ? m.subject === match.subject : match.subject.test(m.subject);
}

/**
 * Waits until the capture server holds a message matching `match` and returns the newest such one;
 * fails after `timeoutMs` saying what was captured instead. Polls every 50 ms.
 */
export async function waitForMail(
  match: MailMatch,
  timeoutMs = 10_000,
  captureUrl = mailCaptureUrl(),
): Promise<CapturedMessage> {
  const deadline = Date.now() + timeoutMs;
  let seen: CapturedMessage[] = [];
  let lastError: Error | null;
  for (;;) {
    try {
      seen = await listCapturedMessages(captureUrl);
      lastError = null;
      const found = seen.find((m) => matches(m, match));
      if (found) return found;
    } catch (error) {
      // The capture server may be down on purpose (a test restarting it); keep polling.
      lastError = error as Error;
    }
    if (Date.now() >= deadline) {
      const summary = seen.length ? seen.map((m) => `  to ${m.to.join(', ')}: ${m.subject}`).join('\n') : '  (nothing)';
      throw new Error(
        `no mail to ${match.to}${match.subject ? ` with subject ${match.subject}` : ''}${match.kind ? ` of kind ${match.kind}` : ''} within ${timeoutMs} ms; captured:\n${summary}` +
          (lastError ? `\nlast error reading ${captureUrl}: ${lastError.message}` : ''),
      );
    }
    await new Promise((r) => setTimeout(r, 50));
  }
}

export interface DrainResult extends MailJobResult {
  /** Mail jobs still queued (waiting for a retry, or not due yet). */
  waiting: number;
}

/**
 * Runs the mail queue in this process until no job is due: delivers each queued message to the
 * test capture server (or to `smtpUrl`) exactly as the worker process would, completing or failing
 * each job. Failed jobs wait for their retry; call again to try them when due.
 */
export async function drainMailQueue(options: { smtpUrl?: string; db?: Kysely<Database> } = {}): Promise<DrainResult> {
  const db = options.db ?? testDb();
  const connection = { db: kyselyJobDb(db) };
  const boss = jobSender();
  const delivery = createMailDelivery({ smtpUrl: options.smtpUrl ?? testSmtpUrl(), from: mailFrom() });
  const control = bossJobControl(boss, connection);
  const total: MailJobResult = { delivered: 0, failed: 0 };
  try {
    for (;;) {
      const jobs = await boss.fetch(MAIL_QUEUE, { batchSize: 10, ...connection });
      if (jobs.length === 0) break;
      const r = await runMailJobs(jobs, delivery, control);
      total.delivered += r.delivered;
      total.failed += r.failed;
    }
  } finally {
    delivery.close();
  }
  const { rows } = await sql<{ n: number }>`
    select count(*)::int as n from pgboss.job where name = ${MAIL_QUEUE} and state in ('created', 'retry')`.execute(db);
  return { ...total, waiting: rows[0].n };
}
