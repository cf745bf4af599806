// The demo mailbox page exists only in demo mode, shows the captured mail in an accessible table and
// each message's text with its links, and says plainly that nothing was delivered.
import nodemailer from 'nodemailer';
import { renderToStaticMarkup } from 'react-dom/server';
import { afterEach, expect, it, vi } from 'vitest';
import MailboxPage, { generateMetadata } from '../../app/mailbox/page';
import { DemoMailbox } from '../../components/mail/demo-mailbox';
import { demoMailboxEnabled, loadDemoMailbox } from '../../lib/mail/mailbox';
import { startCaptureServer, type CaptureServer } from '../../lib/mail/capture-server';

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

it('has no data and answers 404 outside demo mode', async () => {
  expect(await loadDemoMailbox({ WORLDSHEET_DEMO: '0', WORLDSHEET_MAIL_CAPTURE_URL: 'http://127.0.0.1:9' })).toEqual({ status: 'not-demo' });
  expect(await loadDemoMailbox({})).toEqual({ status: 'not-demo' });
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
  await expect(DemoMailbox()).rejects.toMatchObject({ digest: 'NEXT_HTTP_ERROR_FALLBACK;404' });
  vi.stubEnv('WORLDSHEET_DEMO', '1');
  expect(MailboxPage().type).toBe(DemoMailbox);
  expect(generateMetadata()).toEqual({ title: 'Demo mailbox' });
});

it('says so when the demo mail server does not answer', async () => {
  const server = await capture();
  await server.stop();
  const data = await loadDemoMailbox({ WORLDSHEET_DEMO: '1', WORLDSHEET_MAIL_CAPTURE_URL: server.url });
  expect(data).toMatchObject({ status: 'unavailable', captureUrl: server.url, reason: expect.stringMatching(/ECONNREFUSED/) });
  expect(await loadDemoMailbox({ WORLDSHEET_DEMO: '1' })).toMatchObject({ status: 'unavailable', captureUrl: null });

  vi.stubEnv('WORLDSHEET_DEMO', '1');
  vi.stubEnv('WORLDSHEET_MAIL_CAPTURE_URL', server.url);
  const html = renderToStaticMarkup(await DemoMailbox());
  expect(html).toContain('The demo mail server does not answer');
  expect(html).toContain('These e-mails were never delivered');
});

it('lists the captured mail in demo mode, with a caption, header cells and clickable links', async () => {
  const server = await capture();
  vi.stubEnv('WORLDSHEET_DEMO', '1');
  vi.stubEnv('WORLDSHEET_MAIL_CAPTURE_URL', server.url);
  expect(renderToStaticMarkup(await DemoMailbox())).toContain('No e-mail has been captured yet.');

  const transport = nodemailer.createTransport(server.smtpUrl);
  await transport.sendMail({
    from: 'Worldsheet <no-reply@worldsheet.test>',
    to: 'ada@example.test',
    subject: 'Reset your <Worldsheet> password',
    text: 'Choose a new password here: http://127.0.0.1:3000/reset-password?token=t0k&n=1.\nIt works once.',
  });
  transport.close();

  const data = await loadDemoMailbox({ WORLDSHEET_DEMO: '1', WORLDSHEET_MAIL_CAPTURE_URL: server.url });
  expect(data.status === 'ok' && data.messages.map((m) => m.subject)).toEqual(['Reset your <Worldsheet> password']);

  const html = renderToStaticMarkup(await DemoMailbox());
  expect(html).toContain('role="note" aria-label="About this mailbox"');
  expect(html).toContain('These e-mails were never delivered');
  expect(html).toMatch(/<caption[^>]*>E-mails captured by the demo mail server, newest first<\/caption>/);
  for (const col of ['To', 'Subject', 'Received']) expect(html).toMatch(new RegExp(`<th scope="col"[^>]*>${col}</th>`));
  expect(html).toMatch(/<th scope="row"[^>]*><a href="#message-1"[^>]*>Reset your &lt;Worldsheet&gt; password<\/a><\/th>/);
  expect(html).toContain('id="message-1"');
  // The link is clickable and the sentence's full stop stays outside it; the text is escaped, never HTML.
  expect(html).toContain('<a href="http://127.0.0.1:3000/reset-password?token=t0k&amp;n=1" rel="noreferrer"');
  expect(html).toContain('>http://127.0.0.1:3000/reset-password?token=t0k&amp;n=1</a><span>.\nIt works once.');
  expect(html).not.toContain('<Worldsheet>');
  expect(html).toMatch(/<time dateTime="[0-9T:.\-]+Z">\d{4}-\d\d-\d\d \d\d:\d\d:\d\d UTC<\/time>/);
});
