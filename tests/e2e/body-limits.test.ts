// Unbounded request bodies, through the production server: a 300 MiB chunked body (no
// Content-Length) to a public route, to the sheet import and to the verification upload answers 413
// while the client is still sending, and the server's resident memory does not grow by the body.
// Structural, not timed: the client stops sending when the answer arrives, so "sent" counts how much
// the server let in before answering; memory is read from /proc for the process listening on the port.
import { readdirSync, readFileSync, readlinkSync } from 'node:fs';
import http from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApiToken } from '../../lib/auth/api-tokens';
import { resetDatabase, testDb } from '../support/database';
import { makeProject, makeUser } from '../support/people';
import { startApp, type RunningApp } from './harness';

const MiB = 1024 * 1024;
const BODY = 300 * MiB;
/** What the server may keep after all three bodies: well under one of them. */
const RSS_BUDGET = 100 * MiB;

let app: RunningApp;
let token: string;
let projectId: string;

/** The process holding the listening socket of `port` (next start may serve from a child process). */
function listeningPid(port: number): number {
  const hexPort = port.toString(16).toUpperCase().padStart(4, '0');
  const inodes = new Set<string>();
  for (const table of ['/proc/net/tcp', '/proc/net/tcp6']) {
    let text: string;
    try {
      text = readFileSync(table, 'utf8');
    } catch {
      continue;
    }
    for (const line of text.split('\n').slice(1)) {
      const f = line.trim().split(/\s+/);
      if (f.length > 9 && f[1].endsWith(`:${hexPort}`) && f[3] === '0A') inodes.add(f[9]);
    }
  }
  for (const pid of readdirSync('/proc').filter((d) => /^\d+$/.test(d))) {
    let fds: string[];
    try {
      fds = readdirSync(`/proc/${pid}/fd`);
    } catch {
      continue;
    }
    for (const fd of fds) {
      try {
        const m = /^socket:\[(\d+)\]$/.exec(readlinkSync(`/proc/${pid}/fd/${fd}`));
        if (m && inodes.has(m[1])) return Number(pid);
      } catch {
        // closed meanwhile
      }
    }
  }
  throw new Error(`no process listens on port ${port}`);
}

function rssBytes(pid: number): number {
  const m = /^VmRSS:\s+(\d+) kB$/m.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
  return Number(m![1]) * 1024;
}

/** Sends up to `total` bytes as a chunked body, stopping as soon as the answer arrives. */
function sendChunked(
  path: string,
  headers: Record<string, string>,
  total: number,
): Promise<{ status: number; body: string; sent: number }> {
  const url = new URL(path, app.baseUrl);
  return new Promise((resolve, reject) => {
    const chunk = Buffer.alloc(MiB, 0x20);
    let sent = 0;
    let answered = false;
    const request = http.request(url, { method: 'POST', headers: { ...headers, 'transfer-encoding': 'chunked' } });
    request.on('response', (response) => {
      answered = true;
      let body = '';
      response.setEncoding('utf8');
      response.on('data', (d) => (body += d));
      response.on('end', () => {
        request.destroy();
        resolve({ status: response.statusCode ?? 0, body, sent });
      });
    });
    request.on('error', (error) => {
      if (!answered) reject(error);
    });
    const pump = () => {
      while (!answered && sent < total) {
        sent += chunk.length;
        if (!request.write(chunk)) {
          request.once('drain', pump);
          return;
        }
      }
      if (!answered) request.end();
    };
    // The body starts with what looks like the real thing, then never ends.
    request.write('{"email": "');
    pump();
  });
}

beforeAll(async () => {
  await resetDatabase();
  const author = await makeUser(testDb(), 'author@example.test');
  projectId = await makeProject(testDb(), 'BODY', [[author, 'originator']]);
  token = (await createApiToken(testDb(), author, 'body limits')).token;
  app = await startApp();
});

afterAll(async () => {
  await app?.stop();
});

describe('request bodies are read with a byte limit', () => {
  it(
    'answers 413 to 300 MiB chunked bodies while they are being sent, and the server does not keep them',
    { timeout: 180_000 },
    async () => {
      const pid = listeningPid(Number(new URL(app.baseUrl).port));
      // Warm the routes first, so that compiling and loading them is not counted as growth.
      for (const path of ['/api/auth/password-reset', `/api/projects/${projectId}/sheets/import`, '/api/verify']) {
        await fetch(`${app.baseUrl}${path}`, {
          method: 'POST',
          headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
          body: '{}',
        });
      }
      const before = rssBytes(pid);
      const reset = await sendChunked('/api/auth/password-reset', { 'content-type': 'application/json' }, BODY);
      const imported = await sendChunked(
        `/api/projects/${projectId}/sheets/import`,
        { 'content-type': 'application/json', authorization: `Bearer ${token}` },
        BODY,
      );
      const verified = await sendChunked('/api/verify', { 'content-type': 'multipart/form-data; boundary=x' }, BODY);
      const after = rssBytes(pid);
      for (const [name, r] of Object.entries({ reset, imported, verified })) {
        expect(r.status, name).toBe(413);
        expect(JSON.parse(r.body).error.code, name).toBe('too_large');
        // The answer came while the client was still sending: the server did not read the rest first.
        expect(r.sent, name).toBeLessThan(BODY / 2);
      }
      expect(after - before).toBeLessThan(RSS_BUDGET);
      // Nothing was imported.
      expect(await testDb().selectFrom('sheets').select('id').execute()).toEqual([]);
    },
  );
});
