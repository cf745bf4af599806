// The demo mailbox page exists only in demo mode, shows the captured mail in an accessible table and
// each message's text with its links, and says plainly that nothing was delivered. The captured mail
// holds sign-in and reset links, so it is a person's own inbox: signed out nothing is read at all, a
// signed-in person sees only the mail addressed to them, an administrator sees all (audited).
import nodemailer from 'nodemailer';
import { renderToStaticMarkup } from 'react-dom/server';
import { afterEach, expect, it, vi } from 'vitest';
import type { Actor } from '../../lib/auth/actor';
import { DemoMailbox } from '../../components/mail/demo-mailbox';
import { demoMailboxEnabled, loadDemoMailbox } from '../../lib/mail/mailbox';
import { startCaptureServer, type CaptureServer } from '../../lib/mail/capture-server';
import { testDb } from '../support/database';
import { makeUser } from '../support/people';

// The page module reads the session through a server-only module; outside Next that marker throws.
vi.mock('server-only', () => ({}));
const { default: MailboxPage, generateMetadata } = await import('../../app/mailbox/page');

const captures: CaptureServer[] = [];
afterEach(async () => {
  vi.unstubAllEnvs();
  for (const c of captures.splice(0)) await c.stop();
});

async function capture(): Promise<CaptureServer> {
  const server = await startCaptureServer({ smtpPort: 0, httpPort: 0 });
  captures.push(server);
  return server;
}

async function send(
  server: CaptureServer,
  messages: Array<{ to: string; subject: string; text: string }>,
): Promise<void> {
  const transport = nodemailer.createTransport(server.smtpUrl);
  for (const m of messages) await transport.sendMail({ from: 'Worldsheet <no-reply@worldsheet.test>', ...m });
  transport.close();
}

const demo = (server: CaptureServer) => ({ WORLDSHEET_DEMO: '1', WORLDSHEET_MAIL_CAPTURE_URL: server.url });

it('has no data and answers 404 outside demo mode', async () => {
  const ada = await makeUser(testDb(), 'ada@example.test');
  expect(
    await loadDemoMailbox(testDb(), ada, { WORLDSHEET_DEMO: '0', WORLDSHEET_MAIL_CAPTURE_URL: 'http://127.0.0.1:9' }),
  ).toEqual({ status: 'not-demo' });
  expect(await loadDemoMailbox(testDb(), ada, {})).toEqual({ status: 'not-demo' });
  expect(demoMailboxEnabled({ WORLDSHEET_DEMO: '0' })).toBe(false);
  vi.stubEnv('WORLDSHEET_DEMO', '0');
  // notFound() throws Next's 404 signal, which the app turns into the not-found page; the page throws
  // it before awaiting anything, while the status can still be 404 (tests/mail/harness.test.ts).
  let thrown: unknown;
  try {
    MailboxPage();
  } catch (error) {
    thrown = error;
  }
  expect(thrown).toMatchObject({ digest: 'NEXT_HTTP_ERROR_FALLBACK;404' });
  expect(generateMetadata()).toEqual({});
  expect(() => DemoMailbox({ mailbox: { status: 'not-demo' } })).toThrow(
    expect.objectContaining({ digest: 'NEXT_HTTP_ERROR_FALLBACK;404' }),
  );
  vi.stubEnv('WORLDSHEET_DEMO', '1');
  expect(MailboxPage().type).toBeTypeOf('function');
  expect(generateMetadata()).toEqual({ title: 'Demo mailbox' });
});

it('signed out, reads nothing and shows no mail, only that one must sign in', async () => {
  const server = await capture();
  await send(server, [
    {
      to: 'admin@example.test',
      subject: 'Your Worldsheet sign-in link',
      text: 'Sign in: http://127.0.0.1:3000/sign-in/link?token=s3cret',
    },
  ]);
  expect(await loadDemoMailbox(testDb(), null, demo(server))).toEqual({ status: 'signed-out' });
  // With the capture server down the answer is the same: it was never asked.
  await server.stop();
  expect(await loadDemoMailbox(testDb(), null, demo(server))).toEqual({ status: 'signed-out' });

  const html = renderToStaticMarkup(DemoMailbox({ mailbox: { status: 'signed-out' } }));
  expect(html).toContain('Sign in to read your mail');
  expect(html).not.toMatch(/<table|<a |token=|Your Worldsheet sign-in link|admin@example.test/i);
});

it('shows a signed-in person only the mail addressed to them', async () => {
  const server = await capture();
  const ada = await makeUser(testDb(), 'ada@example.test');
  await send(server, [
    {
      to: 'ada@example.test',
      subject: 'For Ada',
      text: 'Your link: http://127.0.0.1:3000/sign-in/link?token=ada-token',
    },
    {
      to: 'admin@example.test',
      subject: 'For the administrator',
      text: 'Your link: http://127.0.0.1:3000/sign-in/link?token=admin-token',
    },
    { to: 'bea@example.test, ADA@example.test', subject: 'For Bea and Ada', text: 'Hello both.' },
  ]);
  const data = await loadDemoMailbox(testDb(), { ...ada, email: 'Ada@Example.test' }, demo(server));
  expect(data).toMatchObject({ status: 'ok', scope: 'own', viewerEmail: 'ada@example.test' });
  expect(data.status === 'ok' && data.messages.map((m) => m.subject)).toEqual(['For Bea and Ada', 'For Ada']);
  const html = renderToStaticMarkup(DemoMailbox({ mailbox: data }));
  expect(html).toContain('Your e-mails');
  expect(html).toContain('ada-token');
  expect(html).not.toContain('admin-token');
  expect(html).not.toContain('For the administrator');
  // No audit event for reading one's own mail.
  expect(await testDb().selectFrom('audit_events').select('action').execute()).toEqual([]);
});

it('shows an administrator every message, and records each such reading in the audit trail', async () => {
  const server = await capture();
  const admin: Actor = await makeUser(testDb(), 'admin@example.test', { admin: true });
  await send(server, [
    { to: 'ada@example.test', subject: 'For Ada', text: 'Hello Ada.' },
    { to: 'bea@example.test', subject: 'For Bea', text: 'Hello Bea.' },
  ]);
  const data = await loadDemoMailbox(testDb(), admin, demo(server));
  expect(data).toMatchObject({ status: 'ok', scope: 'all' });
  expect(data.status === 'ok' && data.messages.map((m) => m.subject)).toEqual(['For Bea', 'For Ada']);
  expect(renderToStaticMarkup(DemoMailbox({ mailbox: data }))).toContain(
    'Each reading of this list is recorded in the audit trail.',
  );
  await loadDemoMailbox(testDb(), admin, demo(server));
  const events = await testDb()
    .selectFrom('audit_events')
    .select(['action', 'actor_id', 'object_type', 'new_value'])
    .orderBy('id')
    .execute();
  expect(events).toEqual([
    {
      action: 'mail.mailbox-read-all',
      actor_id: admin.userId,
      object_type: 'mailbox',
      new_value: { messages: 2, ids: ['2', '1'] },
    },
    {
      action: 'mail.mailbox-read-all',
      actor_id: admin.userId,
      object_type: 'mailbox',
      new_value: { messages: 2, ids: ['2', '1'] },
    },
  ]);
});

it('says so when the demo mail server does not answer', async () => {
  const ada = await makeUser(testDb(), 'ada@example.test');
  const server = await capture();
  await server.stop();
  const data = await loadDemoMailbox(testDb(), ada, demo(server));
  expect(data).toMatchObject({
    status: 'unavailable',
    captureUrl: server.url,
    reason: expect.stringMatching(/ECONNREFUSED/),
  });
  expect(await loadDemoMailbox(testDb(), ada, { WORLDSHEET_DEMO: '1' })).toMatchObject({
    status: 'unavailable',
    captureUrl: null,
  });
  const html = renderToStaticMarkup(DemoMailbox({ mailbox: data }));
  expect(html).toContain('The demo mail server does not answer');
  expect(html).toContain('These e-mails were never delivered');
});

it('lists the mail in a table with a caption, header cells and clickable links', async () => {
  const server = await capture();
  const ada = await makeUser(testDb(), 'ada@example.test');
  expect(renderToStaticMarkup(DemoMailbox({ mailbox: await loadDemoMailbox(testDb(), ada, demo(server)) }))).toContain(
    'No e-mail to ada@example.test has been captured yet.',
  );
  await send(server, [
    {
      to: 'ada@example.test',
      subject: 'Reset your <Worldsheet> password',
      text: 'Choose a new password here: http://127.0.0.1:3000/reset-password?token=t0k&n=1.\nIt works once.',
    },
  ]);
  const data = await loadDemoMailbox(testDb(), ada, demo(server));
  expect(data.status === 'ok' && data.messages.map((m) => m.subject)).toEqual(['Reset your <Worldsheet> password']);

  const html = renderToStaticMarkup(DemoMailbox({ mailbox: data }));
  expect(html).toContain('role="note" aria-label="About this mailbox"');
  expect(html).toContain('These e-mails were never delivered');
  expect(html).toMatch(/<caption[^>]*>E-mails captured by the demo mail server, newest first<\/caption>/);
  for (const col of ['To', 'Subject', 'Received']) expect(html).toMatch(new RegExp(`<th scope="col"[^>]*>${col}</th>`));
  expect(html).toMatch(
    /<th scope="row"[^>]*><a href="#message-1"[^>]*>Reset your &lt;Worldsheet&gt; password<\/a><\/th>/,
  );
  expect(html).toContain('id="message-1"');
  // The link is clickable and the sentence's full stop stays outside it; the text is escaped, never HTML.
  expect(html).toContain('<a href="http://127.0.0.1:3000/reset-password?token=t0k&amp;n=1" rel="noreferrer"');
  expect(html).toContain('>http://127.0.0.1:3000/reset-password?token=t0k&amp;n=1</a><span>.\nIt works once.');
  expect(html).not.toContain('<Worldsheet>');
  expect(html).toMatch(/<time dateTime="[0-9T:.-]+Z">\d{4}-\d\d-\d\d \d\d:\d\d:\d\d UTC<\/time>/);
});
