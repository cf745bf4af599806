// Mail waits while the mail service is down: the job fails, is retried, and the mail arrives once
// the service is back. Once with the worker process as `npm start` runs it, once in this process
// with drainMailQueue. Retries are made short (1 s, no backoff) through enqueueMail's options.
import { sql } from 'kysely';
import { afterEach, expect, it } from 'vitest';
import { startCaptureServer, type CaptureServer } from '../../lib/mail/capture-server';
import { enqueueMail } from '../../lib/mail/outbox';
import { testDb } from '../support/database';
import { drainMailQueue, waitForMail } from '../support/mailbox';
import { until } from '../support/until';
import { killWorkers, startWorker } from '../support/worker-process';

const fastRetry = { retryDelay: 1, retryBackoff: false } as const;

const captures: CaptureServer[] = [];
afterEach(async () => {
  await killWorkers();
  for (const s of captures.splice(0)) await s.stop();
});

/** Two ports that were free a moment ago: a capture server's, stopped again. */
async function portsOfAStoppedServer(): Promise<{ smtpPort: number; httpPort: number; smtpUrl: string; url: string }> {
  const probe = await startCaptureServer({ smtpPort: 0, httpPort: 0 });
  await probe.stop();
  return probe;
}

async function jobState(id: string): Promise<{ state: string; retry_count: number }> {
  const { rows } = await sql<{ state: string; retry_count: number }>`
    select state::text, retry_count from pgboss.job where name = 'mail' and id = ${id}::uuid`.execute(testDb());
  return rows[0];
}

it('the worker process retries while the mail service is down and delivers when it is back', async () => {
  const ports = await portsOfAStoppedServer();
  const worker = startWorker({ WORLDSHEET_SMTP_URL: ports.smtpUrl });
  await until('the worker to start', async () => worker.output().includes('working the queues'), 30_000);

  const id = await testDb()
    .transaction()
    .execute((trx) =>
      enqueueMail(
        trx,
        {
          to: 'checker@example.test',
          subject: 'Please check SHEET-0007',
          text: 'http://127.0.0.1:3000/checks',
          kind: 'check-request',
        },
        fastRetry,
      ),
    );
  // Nothing listens: the first attempt fails, the job waits for its retry, and that fails too.
  await until(
    'a failed retry',
    async () => {
      const job = await jobState(id);
      return job.state === 'retry' && job.retry_count >= 1;
    },
    15_000,
  );
  expect(worker.output()).toMatch(/not delivered .*ECONNREFUSED/);

  // The service comes back on the same port: the next retry delivers.
  const capture = await startCaptureServer({ smtpPort: ports.smtpPort, httpPort: ports.httpPort });
  captures.push(capture);
  const mail = await waitForMail(
    { to: 'checker@example.test', subject: 'Please check SHEET-0007' },
    15_000,
    capture.url,
  );
  expect(mail).toMatchObject({ kind: 'check-request', links: ['http://127.0.0.1:3000/checks'] });
  await until('the job to complete', async () => (await jobState(id)).state === 'completed', 5000);

  // SIGTERM stops the worker cleanly.
  const exited = new Promise<number | null>((r) => worker.child.once('exit', (code) => r(code)));
  worker.child.kill('SIGTERM');
  expect(await exited).toBe(0);
  expect(worker.output()).toContain('SIGTERM: stopping');
});

it('drainMailQueue fails a job while the service is down and delivers it on a later drain', async () => {
  const ports = await portsOfAStoppedServer();
  await enqueueMail(
    testDb(),
    { to: 'approver@example.test', subject: 'Approve SHEET-0008', text: 'Waiting for you.', kind: 'approval-request' },
    fastRetry,
  );

  expect(await drainMailQueue({ smtpUrl: ports.smtpUrl })).toEqual({ delivered: 0, failed: 1, waiting: 1 });

  const capture = await startCaptureServer({ smtpPort: ports.smtpPort, httpPort: ports.httpPort });
  captures.push(capture);
  // The retry is due a second after the failure.
  const result = await until(
    'the retry to be delivered',
    async () => {
      const r = await drainMailQueue({ smtpUrl: ports.smtpUrl });
      return r.delivered === 1 ? r : null;
    },
    10_000,
  );
  expect(result).toEqual({ delivered: 1, failed: 0, waiting: 0 });
  expect((await waitForMail({ to: 'approver@example.test' }, 1000, capture.url)).subject).toBe('Approve SHEET-0008');
});
