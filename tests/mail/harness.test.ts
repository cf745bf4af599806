// The browser harness runs the job worker beside the app: mail queued in the test database reaches
// the test capture server with no drain. Outside demo mode the app has no mailbox page.
import { afterAll, beforeAll, expect, it } from 'vitest';
import { enqueueMail } from '../../lib/mail/outbox';
import { closeBrowser, openBrowser, startApp, type BrowserSession, type RunningApp } from '../e2e/harness';
import { testDb } from '../support/database';
import { waitForMail } from '../support/mailbox';

let app: RunningApp;
let session: BrowserSession;

beforeAll(async () => {
  app = await startApp();
  session = await openBrowser();
});

afterAll(async () => {
  await session?.close();
  await closeBrowser();
  await app?.stop();
});

it('has no mailbox page outside demo mode', async () => {
  const r = await fetch(`${app.baseUrl}/mailbox`);
  // Every page is streamed inside the Suspense boundary of app/loading.tsx, so Next answers
  // notFound() with status 200, a noindex robots tag and the 404 signal for the browser to show the
  // not-found page; it would be a plain 404 if the page were not streamed.
  expect([200, 404]).toContain(r.status);
  const html = await r.text();
  expect(html).toContain('<meta name="robots" content="noindex"/>');
  expect(html).toContain('NEXT_HTTP_ERROR_FALLBACK;404');
  expect(html).not.toMatch(/Demo mailbox|never delivered|captured by/i);

  const { page } = session;
  await page.goto(`${app.baseUrl}/mailbox`);
  await page.getByRole('heading', { level: 1, name: 'Not found' }).waitFor();
  expect(await page.title()).toBe('Worldsheet');
  expect(await page.getByRole('table').count()).toBe(0);
  expect(session.problems).toEqual([]);
});

it('delivers queued mail through the worker process', async () => {
  await testDb()
    .transaction()
    .execute((trx) =>
      enqueueMail(trx, {
        to: 'bea@example.test',
        subject: 'Welcome to Worldsheet',
        text: 'Sign in at http://127.0.0.1:3000/sign-in',
        kind: 'invitation',
      }),
    );
  const mail = await waitForMail(
    { to: 'bea@example.test', subject: 'Welcome to Worldsheet', kind: 'invitation' },
    10_000,
  );
  expect(mail.links).toEqual(['http://127.0.0.1:3000/sign-in']);
});
