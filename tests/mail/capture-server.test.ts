// The local mail capture server: refuses a busy port with a clear message, keeps the newest
// messages within its bound, serves them over HTTP, and can stop and start again on its ports.
import { createServer, type Server } from 'node:net';
import nodemailer from 'nodemailer';
import { afterEach, describe, expect, it } from 'vitest';
import { portIsFree } from '../../db/local-postgres';
import { getCapturedMessage, listCapturedMessages } from '../../lib/mail/capture-client';
import { findLinks, MailCaptureError, startCaptureServer, type CaptureServer } from '../../lib/mail/capture-server';

const running: CaptureServer[] = [];
const blockers: Server[] = [];
afterEach(async () => {
  for (const s of running.splice(0)) await s.stop();
  for (const b of blockers.splice(0)) await new Promise((r) => b.close(r));
});

async function start(options: Partial<Parameters<typeof startCaptureServer>[0]> = {}): Promise<CaptureServer> {
  const server = await startCaptureServer({ smtpPort: 0, httpPort: 0, ...options });
  running.push(server);
  return server;
}

/** Occupies a free port on 127.0.0.1 and returns it. */
async function occupyPort(): Promise<number> {
  const blocker = createServer();
  blockers.push(blocker);
  await new Promise<void>((r) => blocker.listen(0, '127.0.0.1', () => r()));
  return (blocker.address() as { port: number }).port;
}

async function send(smtpUrl: string, to: string, subject: string, text: string) {
  const transport = nodemailer.createTransport(smtpUrl);
  try {
    return await transport.sendMail({ from: 'Tester <tester@example.test>', to, subject, text });
  } finally {
    transport.close();
  }
}

describe('refuses to start on a busy port', () => {
  it('names the SMTP port and the setting that chooses it', async () => {
    const port = await occupyPort();
    const error = await startCaptureServer({
      smtpPort: port,
      httpPort: 0,
      portVariables: { smtp: 'WORLDSHEET_SMTP_PORT', http: 'WORLDSHEET_MAIL_CAPTURE_PORT' },
    }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(MailCaptureError);
    expect((error as Error).message).toBe(
      `Port ${port} on 127.0.0.1 (the local mail capture's SMTP port) is already in use. Stop what uses it, or choose another with WORLDSHEET_SMTP_PORT=<port>.`,
    );
  });

  it('names the HTTP port, and leaves the SMTP port free', async () => {
    const busy = await occupyPort();
    const probe = await start();
    const smtpPort = probe.smtpPort;
    await probe.stop();
    const error = await startCaptureServer({
      smtpPort,
      httpPort: busy,
      portVariables: { smtp: 'WORLDSHEET_TEST_SMTP_PORT', http: 'WORLDSHEET_TEST_MAIL_CAPTURE_PORT' },
    }).catch((e: unknown) => e);
    expect((error as Error).message).toBe(
      `Port ${busy} on 127.0.0.1 (the local mail capture's HTTP API) is already in use. Stop what uses it, or choose another with WORLDSHEET_TEST_MAIL_CAPTURE_PORT=<port>.`,
    );
    expect(await portIsFree(smtpPort)).toBe(true);
  });

  it('refuses one port for both', async () => {
    await expect(startCaptureServer({ smtpPort: 2999, httpPort: 2999 })).rejects.toThrow(
      /both 2999; choose two different ports/,
    );
  });
});

it('captures messages newest first, within its bound, and serves them over HTTP', async () => {
  const server = await start({ maxMessages: 2 });
  const reply = await send(
    server.smtpUrl,
    'One@Example.test',
    'first',
    'see https://example.test/a, and http://example.test/b?x=1&y=2.',
  );
  expect(reply.response).toMatch(/^250 /);
  await send(server.smtpUrl, 'two@example.test', 'second', 'no links');
  await send(server.smtpUrl, 'three@example.test', 'third', 'https://example.test/c');

  const list = await listCapturedMessages(server.url);
  expect(list.map((m) => m.subject)).toEqual(['third', 'second']);
  expect(list[0]).toMatchObject({
    to: ['three@example.test'],
    from: 'Tester <tester@example.test>',
    links: ['https://example.test/c'],
    html: null,
    kind: null,
  });
  expect(Date.parse(list[0].date)).not.toBeNaN();
  expect(await getCapturedMessage(server.url, list[1].id)).toEqual(list[1]);
  expect(await getCapturedMessage(server.url, 'no-such-id')).toBeNull();

  // No kept-alive sockets: a reused socket closed by the server at the same moment fails the request.
  expect((await fetch(`${server.url}/messages`)).headers.get('connection')).toBe('close');
  expect((await fetch(`${server.url}/messages`, { method: 'POST' })).status).toBe(405);
  expect((await fetch(`${server.url}/elsewhere`)).status).toBe(404);
  expect((await fetch(`${server.url}/messages`, { method: 'DELETE' })).status).toBe(204);
  expect(await listCapturedMessages(server.url)).toEqual([]);
});

it('finds the links of a text, or of an HTML-only message', () => {
  expect(
    findLinks('see https://example.test/a, and http://example.test/b?x=1&y=2.\n(https://example.test/c)', null),
  ).toEqual(['https://example.test/a', 'http://example.test/b?x=1&y=2', 'https://example.test/c']);
  expect(
    findLinks('', '<a href="https://example.test/r?t=1&amp;u=2">reset</a> <a href="mailto:x@example.test">x</a>'),
  ).toEqual(['https://example.test/r?t=1&u=2']);
});

it('stops, freeing both ports, and starts again on the same ports', async () => {
  const first = await start();
  const { smtpPort, httpPort } = first;
  await send(first.smtpUrl, 'a@example.test', 'before', 'x');
  await first.stop();
  expect(await portIsFree(smtpPort)).toBe(true);
  expect(await portIsFree(httpPort)).toBe(true);
  await expect(send(first.smtpUrl, 'a@example.test', 'while down', 'x')).rejects.toThrow(/ECONNREFUSED/);

  const second = await start({ smtpPort, httpPort });
  await send(second.smtpUrl, 'a@example.test', 'after', 'x');
  // A new server starts empty.
  expect((await listCapturedMessages(second.url)).map((m) => m.subject)).toEqual(['after']);
});
