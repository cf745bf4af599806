// enqueueMail writes the job on the connection it is given: inside a transaction, the change and its
// mail commit or roll back together. Delivered mail reaches the capture server intact.
import { sql } from 'kysely';
import { expect, it } from 'vitest';
import { ZodError } from 'zod';
import { DEFAULT_MAIL_FROM } from '../../lib/mail/config';
import { enqueueMail } from '../../lib/mail/outbox';
import { testDb } from '../support/database';
import { drainMailQueue, listMail, waitForMail } from '../support/mailbox';

const message = {
  to: 'Ada.Originator@example.test',
  subject: 'Confirm your Worldsheet e-mail address',
  text: 'Hello Ada,\n\nConfirm your address with this link:\n\nhttp://127.0.0.1:3000/verify-email?token=abc123&x=1.\n\nOr ignore this mail.',
  kind: 'verify-email',
};

async function mailJobs(): Promise<{ state: string; retry_count: number }[]> {
  const { rows } = await sql<{ state: string; retry_count: number }>`
    select state::text, retry_count from pgboss.job where name = 'mail' order by created_on`.execute(testDb());
  return rows;
}

it('queues nothing when the transaction rolls back', async () => {
  const db = testDb();
  const refused = new Error('the change is refused after the mail was queued');
  await expect(
    db.transaction().execute(async (trx) => {
      await enqueueMail(trx, message);
      // Inside the transaction the job is there …
      expect(
        (await sql<{ n: number }>`select count(*)::int as n from pgboss.job where name = 'mail'`.execute(trx)).rows[0]
          .n,
      ).toBe(1);
      throw refused;
    }),
  ).rejects.toBe(refused);
  // … and after the rollback it never was.
  expect(await mailJobs()).toEqual([]);
  expect(await drainMailQueue()).toEqual({ delivered: 0, failed: 0, waiting: 0 });
  expect(await listMail()).toEqual([]);
});

it('delivers the mail of a committed transaction with its subject, text and links', async () => {
  const db = testDb();
  const id = await db.transaction().execute((trx) => enqueueMail(trx, message));
  expect(id).toMatch(/^[0-9a-f-]{36}$/);
  expect(await mailJobs()).toEqual([{ state: 'created', retry_count: 0 }]);

  expect(await drainMailQueue()).toEqual({ delivered: 1, failed: 0, waiting: 0 });
  const mail = await waitForMail({ to: 'ada.originator@example.test', subject: message.subject }, 5000);
  expect(mail).toMatchObject({
    from: DEFAULT_MAIL_FROM,
    to: ['ada.originator@example.test'],
    subject: message.subject,
    text: `${message.text}\n`,
    html: null,
    kind: 'verify-email',
    // The sentence's full stop is not part of the link.
    links: ['http://127.0.0.1:3000/verify-email?token=abc123&x=1'],
  });
  expect(await mailJobs()).toEqual([{ state: 'completed', retry_count: 0 }]);
});

it('queues on the plain connection too, and sends an HTML part when given', async () => {
  await enqueueMail(testDb(), {
    ...message,
    html: '<p>Confirm: <a href="http://127.0.0.1:3000/verify-email?token=abc123">link</a></p>',
  });
  expect((await drainMailQueue()).delivered).toBe(1);
  const mail = await waitForMail({ to: message.to, kind: 'verify-email' }, 5000);
  expect(mail.html).toContain('<a href="http://127.0.0.1:3000/verify-email?token=abc123">');
  expect(mail.links).toEqual(['http://127.0.0.1:3000/verify-email?token=abc123&x=1']);
});

it('refuses an invalid message before anything is queued', async () => {
  await expect(enqueueMail(testDb(), { ...message, to: 'not an address' })).rejects.toBeInstanceOf(ZodError);
  await expect(
    enqueueMail(testDb(), { ...message, subject: 'two\r\nBcc: someone@example.test' }),
  ).rejects.toBeInstanceOf(ZodError);
  await expect(enqueueMail(testDb(), { ...message, kind: 'Verify Email' })).rejects.toBeInstanceOf(ZodError);
  expect(await mailJobs()).toEqual([]);
});

it('keeps the mail queue on its retry settings', async () => {
  const { rows } = await sql<{
    retry_limit: number;
    retry_delay: number;
    retry_backoff: boolean;
    expire_seconds: number;
    retention_minutes: number;
  }>`
    select retry_limit, retry_delay, retry_backoff, expire_seconds, retention_minutes from pgboss.queue where name = 'mail'`.execute(
    testDb(),
  );
  expect(rows).toEqual([
    { retry_limit: 20, retry_delay: 5, retry_backoff: true, expire_seconds: 120, retention_minutes: 30 * 24 * 60 },
  ]);
});

it('leaves no job of an earlier test behind', async () => {
  // The previous tests queued mail; tests/setup/each-file.ts empties the queue and the mailbox.
  expect(await mailJobs()).toEqual([]);
  expect(await listMail()).toEqual([]);
});
