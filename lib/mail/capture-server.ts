// The local stand-in for a hosted mail service: an SMTP server that accepts every message and
// delivers none, keeping the newest ones in memory, and a small HTTP API to read them:
//
//   GET    /messages      every captured message, newest first (JSON array of CapturedMessage)
//   GET    /messages/:id  one message, or 404
//   DELETE /messages      forgets them all (the tests use it)
//
// Both listen on 127.0.0.1 only; no authentication, no TLS. `npm start` runs it in demo mode and the
// test setup runs one on the test ports. `stop()` closes both servers, so it can go down and be
// started again on the same ports (the tests do, to show that mail waits in the queue).
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { simpleParser, type ParsedMail } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { portIsFree } from '../../db/local-postgres';
import { splitLinks, type CapturedMessage } from './capture-client';

export class MailCaptureError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'MailCaptureError';
  }
}

export interface CaptureServerOptions {
  /** SMTP port; 0 picks a free one (see `smtpPort` of the result). */
  smtpPort: number;
  /** HTTP API port; 0 picks a free one. */
  httpPort: number;
  /** How many messages to keep; older ones are forgotten. Default 500. */
  maxMessages?: number;
  /** Names of the settings that choose the ports, for the message when one is taken. */
  portVariables?: { smtp: string; http: string };
  log?: (line: string) => void;
}

export interface CaptureServer {
  smtpPort: number;
  httpPort: number;
  /** `smtp://127.0.0.1:<smtpPort>`, for WORLDSHEET_SMTP_URL. */
  smtpUrl: string;
  /** `http://127.0.0.1:<httpPort>`, for WORLDSHEET_MAIL_CAPTURE_URL. */
  url: string;
  stop(): Promise<void>;
}

const HOST = '127.0.0.1';
const MAX_MESSAGE_BYTES = 2 * 1024 * 1024;

const HREF_IN_HTML = /\bhref\s*=\s*["'](https?:\/\/[^"']+)["']/gi;

/** The http(s) links of a message: from its text, or from the hrefs of an HTML-only message. */
export function findLinks(text: string, html: string | null): string[] {
  const found = text
    ? splitLinks(text).flatMap((p) => ('href' in p ? [p.href] : []))
    : [...(html ?? '').matchAll(HREF_IN_HTML)].map((m) => m[1].replace(/&amp;/g, '&'));
  return [...new Set(found)];
}

/** `Name <address>` for each address of a header, as written but without quoting. */
function addressText(value: ParsedMail['from']): string {
  return (value?.value ?? []).map((a) => (a.name ? `${a.name} <${a.address ?? ''}>` : (a.address ?? ''))).join(', ');
}

function sendJson(res: ServerResponse, status: number, body: unknown): void {
  const payload = body === undefined ? '' : JSON.stringify(body);
  res.writeHead(status, {
    'content-type': 'application/json; charset=utf-8',
    'cache-control': 'no-store',
    'content-length': Buffer.byteLength(payload),
  });
  res.end(payload);
}

interface Listener {
  listen(port: number, host: string, callback: () => void): unknown;
  once(event: 'error', listener: (error: Error) => void): unknown;
  removeListener(event: 'error', listener: (error: Error) => void): unknown;
}

function listen(server: Listener, port: number): Promise<void> {
  return new Promise((resolve, reject) => {
    const onError = (error: Error) => reject(error);
    server.once('error', onError);
    server.listen(port, HOST, () => {
      server.removeListener('error', onError);
      resolve();
    });
  });
}

function busy(port: number, what: string, variable: string | undefined): MailCaptureError {
  return new MailCaptureError(
    `Port ${port} on ${HOST} (${what}) is already in use. Stop what uses it` +
      (variable ? `, or choose another with ${variable}=<port>.` : '.'),
  );
}

export async function startCaptureServer(options: CaptureServerOptions): Promise<CaptureServer> {
  const maxMessages = options.maxMessages ?? 500;
  const log = options.log ?? (() => undefined);
  const vars = options.portVariables;

  // Say which port is taken, and by which setting, before starting anything.
  if (options.smtpPort !== 0 && options.smtpPort === options.httpPort) {
    throw new MailCaptureError(
      `The mail capture's SMTP and HTTP ports are both ${options.smtpPort}; choose two different ports.`,
    );
  }
  if (options.smtpPort !== 0 && !(await portIsFree(options.smtpPort, HOST))) {
    throw busy(options.smtpPort, "the local mail capture's SMTP port", vars?.smtp);
  }
  if (options.httpPort !== 0 && !(await portIsFree(options.httpPort, HOST))) {
    throw busy(options.httpPort, "the local mail capture's HTTP API", vars?.http);
  }

  const messages: CapturedMessage[] = [];
  let nextId = 1;

  const smtp = new SMTPServer({
    name: 'worldsheet-mail-capture',
    banner: 'Worldsheet local mail capture: messages are kept here and never delivered',
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    hideSTARTTLS: true,
    secure: false,
    logger: false,
    // Every client is local; a reverse DNS lookup would only add a delay, or hang without DNS.
    disableReverseLookup: true,
    size: MAX_MESSAGE_BYTES,
    // A stop must not hang on a client that keeps its connection open.
    closeTimeout: 1000,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded) {
            const error = new Error(`Message larger than ${MAX_MESSAGE_BYTES} bytes`) as Error & {
              responseCode: number;
            };
            error.responseCode = 552;
            return callback(error);
          }
          const text = parsed.text ?? '';
          const html = typeof parsed.html === 'string' ? parsed.html : null;
          const kind = parsed.headers.get('x-worldsheet-mail-kind');
          const message: CapturedMessage = {
            id: String(nextId++),
            from: addressText(parsed.from) || (session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
            to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
            subject: parsed.subject ?? '',
            date: new Date().toISOString(),
            text,
            html,
            links: findLinks(text, html),
            kind: typeof kind === 'string' ? kind : null,
          };
          messages.unshift(message);
          if (messages.length > maxMessages) messages.length = maxMessages;
          log(`captured mail ${message.id} to ${message.to.join(', ')}: ${message.subject}`);
          callback();
        })
        .catch((error: Error) => callback(error));
    },
  });
  // A client that drops its connection must not take the process down.
  smtp.on('error', (error) => log(`SMTP: ${error.message}`));

  const http: Server = createServer((req: IncomingMessage, res: ServerResponse) => {
    // One request per connection: a client reusing a kept-alive socket just as the server times it
    // out gets "other side closed"; the API is local and light, so no socket is kept.
    res.setHeader('connection', 'close');
    const path = new URL(req.url ?? '/', `http://${HOST}`).pathname.replace(/\/+$/, '') || '/';
    if (path === '/messages') {
      if (req.method === 'GET' || req.method === 'HEAD') return sendJson(res, 200, messages);
      if (req.method === 'DELETE') {
        messages.length = 0;
        res.writeHead(204, { 'cache-control': 'no-store' }).end();
        return;
      }
      res.setHeader('allow', 'GET, HEAD, DELETE');
      return sendJson(res, 405, { error: 'method not allowed' });
    }
    const one = /^\/messages\/([^/]+)$/.exec(path);
    if (one) {
      if (req.method !== 'GET' && req.method !== 'HEAD') {
        res.setHeader('allow', 'GET, HEAD');
        return sendJson(res, 405, { error: 'method not allowed' });
      }
      const id = decodeURIComponent(one[1]);
      const message = messages.find((m) => m.id === id);
      return message ? sendJson(res, 200, message) : sendJson(res, 404, { error: `no message ${id}` });
    }
    return sendJson(res, 404, { error: 'not found; try GET /messages' });
  });

  try {
    await listen(smtp, options.smtpPort);
  } catch (error) {
    throw (error as NodeJS.ErrnoException).code === 'EADDRINUSE'
      ? busy(options.smtpPort, "the local mail capture's SMTP port", vars?.smtp)
      : error;
  }
  try {
    await listen(http, options.httpPort);
  } catch (error) {
    await new Promise<void>((resolve) => smtp.close(() => resolve()));
    throw (error as NodeJS.ErrnoException).code === 'EADDRINUSE'
      ? busy(options.httpPort, "the local mail capture's HTTP API", vars?.http)
      : error;
  }

  const smtpPort = (smtp.server.address() as AddressInfo).port;
  const httpPort = (http.address() as AddressInfo).port;
  let stopped: Promise<void> | null = null;
  return {
    smtpPort,
    httpPort,
    smtpUrl: `smtp://${HOST}:${smtpPort}`,
    url: `http://${HOST}:${httpPort}`,
    stop() {
      stopped ??= Promise.all([
        new Promise<void>((resolve) => smtp.close(() => resolve())),
        new Promise<void>((resolve) => {
          http.close(() => resolve());
          http.closeAllConnections();
        }),
      ]).then(() => undefined);
      return stopped;
    },
  };
}
