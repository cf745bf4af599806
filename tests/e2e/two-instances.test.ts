// Two app instances, each with its job worker, on one PostgreSQL and one object store, as behind a
// load balancer (README, "Running on several machines"): a session made on one is valid on the other,
// wrong passwords typed on both count toward one lockout, and versions saved through either are read
// back through the other by their SHA-256, with the audit chain intact; and one instance told to stop
// (SIGTERM) drains (lib/ops/server.ts): it reports itself not ready at once (GET /api/health 503,
// status "draining") while the process stays live (GET /api/health/live 200), keeps answering for
// WORLDSHEET_DRAIN_DELAY_MS, then stops accepting connections, finishes the request in flight, and
// exits 0, while the other goes on serving.
import http from 'node:http';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { createApiToken } from '../../lib/auth/api-tokens';
import { AUTH_SETTINGS } from '../../lib/auth/settings';
import { verifyAuditChain } from '../../lib/audit/verify';
import { resetDatabase, testDb } from '../support/database';
import { makeProject, makeUser, PASSWORD } from '../support/people';
import { closeBrowser, openBrowser, openSignedIn, startApp, submitSignIn, type RunningApp } from './harness';

let a: RunningApp;
let b: RunningApp;
let token: string;
let projectId: string;

beforeAll(async () => {
  await resetDatabase();
  const author = await makeUser(testDb(), 'author@example.test');
  await makeUser(testDb(), 'guesser-target@example.test');
  projectId = await makeProject(testDb(), 'TWIN', [[author, 'originator']]);
  token = (await createApiToken(testDb(), author, 'two instances')).token;
  const port = Number(process.env.WORLDSHEET_TEST_APP_PORT ?? 3199);
  a = await startApp();
  // The second instance drains as behind a load balancer (the last test stops it).
  b = await startApp({ WORLDSHEET_DRAIN_DELAY_MS: '1500', WORLDSHEET_DRAIN_TIMEOUT_MS: '20000' }, { port: port + 1 });
}, 600_000);

afterAll(async () => {
  await closeBrowser();
  await Promise.all([a?.stop(), b?.stop()]);
});

async function api(app: RunningApp, path: string, init: { method?: string; body?: unknown } = {}) {
  const response = await fetch(`${app.baseUrl}${path}`, {
    method: init.method ?? 'GET',
    headers: {
      authorization: `Bearer ${token}`,
      ...(init.body !== undefined ? { 'content-type': 'application/json' } : {}),
    },
    body: init.body === undefined ? undefined : JSON.stringify(init.body),
  });
  return { status: response.status, body: await response.json() };
}

it('a session made on one instance is valid on the other', async () => {
  const session = await openSignedIn(a.baseUrl, 'author@example.test', PASSWORD);
  try {
    await session.page.goto(`${b.baseUrl}/projects`);
    expect(new URL(session.page.url()).pathname).toBe('/projects');
    expect(new URL(session.page.url()).port).toBe(new URL(b.baseUrl).port);
    await session.page.getByText('TWIN').first().waitFor();
    expect(session.problems).toEqual([]);
  } finally {
    await session.close();
  }
});

it('wrong passwords typed on either instance count toward one lockout', async () => {
  const session = await openBrowser();
  const { page } = session;
  try {
    for (let i = 1; i <= AUTH_SETTINGS.lockAfterFailures; i++) {
      const app = i % 2 === 1 ? a : b;
      await submitSignIn(page, app.baseUrl, 'guesser-target@example.test', `wrong password ${i}`);
      const expected =
        i < AUTH_SETTINGS.lockAfterFailures
          ? 'The e-mail address or the password is not right.'
          : /locked after 5 failed sign-in attempts, until .* UTC/;
      await page.getByRole('alert').filter({ hasText: expected }).waitFor();
    }
    // The right password, on the instance that saw only two of the five failures: still locked.
    await submitSignIn(page, b.baseUrl, 'guesser-target@example.test', PASSWORD);
    await page
      .getByRole('alert')
      .filter({ hasText: /locked after 5 failed sign-in attempts/ })
      .waitFor();
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    // next-auth answers a refused credentials sign-in with 401; nothing else may fail.
    expect(session.problems.filter((p) => !/401/.test(p))).toEqual([]);
  } finally {
    await session.close();
  }
});

it('versions saved through either instance are read back through the other by their SHA-256; the audit chain is intact', async () => {
  const created = await api(a, `/api/projects/${projectId}/sheets`, {
    method: 'POST',
    body: { title: 'Drift through both instances', safetyRelated: true },
  });
  expect(created.status).toBe(201);
  const sheetId = created.body.id as string;
  let content = (await api(b, `/api/sheets/${sheetId}`)).body.version.content;
  const acknowledged: Array<{ number: number; sha256: string; by: RunningApp }> = [];
  for (let i = 0; i < 6; i++) {
    const by = i % 2 === 0 ? b : a;
    content = { ...content, cells: [{ id: 'c1', kind: 'calc', source: `L_0 = ${10 + i}.5 m` }] };
    const saved = await api(by, `/api/sheets/${sheetId}/versions`, {
      method: 'POST',
      body: { parentNumber: i + 1, message: `edit ${i + 1}`, content },
    });
    expect(saved.status).toBe(201);
    acknowledged.push({ number: saved.body.number, sha256: saved.body.sha256, by });
  }
  for (const ack of acknowledged) {
    const other = ack.by === a ? b : a;
    const read = await api(other, `/api/sheets/${sheetId}/versions/${ack.number}`);
    expect(read.status).toBe(200);
    expect(read.body.version.sha256).toBe(ack.sha256);
  }
  // A save based on a version the other instance already superseded is refused, not stored twice.
  const stale = await api(a, `/api/sheets/${sheetId}/versions`, {
    method: 'POST',
    body: { parentNumber: 6, message: 'stale', content },
  });
  expect(stale.status).toBe(409);
  expect(stale.body.error.details).toMatchObject({ latestNumber: 7 });
  expect(await verifyAuditChain(testDb())).toMatchObject({ ok: true });
});

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

it('drains one instance on SIGTERM while the other serves: not ready at once, then no new connections, the request in flight answered, exit 0', async () => {
  expect((await fetch(`${b.baseUrl}/api/health`)).status).toBe(200);
  const live = await fetch(`${b.baseUrl}/api/health/live`);
  expect(live.status).toBe(200);
  expect(await live.json()).toMatchObject({ status: 'ok' });

  // A request in flight across the signal: its body arrives in two parts, the second after the
  // server stopped accepting connections (a CSP report that turns out not to be JSON: 400, no row).
  const { hostname, port } = new URL(b.baseUrl);
  const [first, second] = ['{"csp-report": ', '}'];
  let inFlight: () => void = () => undefined;
  const answered = new Promise<number>((resolve, reject) => {
    const req = http.request(
      {
        host: hostname,
        port: Number(port),
        method: 'POST',
        path: '/api/csp-report',
        headers: { 'content-type': 'application/csp-report', 'content-length': Buffer.byteLength(first + second) },
      },
      (res) => {
        res.resume();
        res.on('end', () => resolve(res.statusCode ?? 0));
      },
    );
    req.on('error', reject);
    req.write(first);
    inFlight = () => {
      req.end(second);
    };
  });
  await sleep(300);
  const exited = new Promise<number | null>((resolve) => b.server.once('exit', (code) => resolve(code)));
  const signalledAt = Date.now();
  b.server.kill('SIGTERM');

  // Within the drain delay: still answering, but not ready.
  await sleep(200);
  const ready = await fetch(`${b.baseUrl}/api/health`, { headers: { connection: 'close' } });
  expect(ready.status).toBe(503);
  expect(await ready.json()).toMatchObject({ status: 'draining', database: { status: 'up' } });
  expect((await fetch(`${b.baseUrl}/api/health/live`, { headers: { connection: 'close' } })).status).toBe(200);
  expect(Date.now() - signalledAt).toBeLessThan(1500);

  // After it: new connections are refused.
  let refused = false;
  for (let i = 0; i < 40 && !refused; i++) {
    await sleep(100);
    refused = await fetch(`${b.baseUrl}/api/health/live`, { headers: { connection: 'close' } }).then(
      () => false,
      () => true,
    );
  }
  expect(refused).toBe(true);
  expect(Date.now() - signalledAt).toBeGreaterThanOrEqual(1500);
  expect(b.server.exitCode).toBeNull();

  // The request in flight is answered, then the process exits 0.
  inFlight();
  expect(await answered).toBe(400);
  expect(await exited).toBe(0);
  expect(Date.now() - signalledAt).toBeLessThan(15_000);
  // The other instance served throughout and still does.
  expect((await fetch(`${a.baseUrl}/api/health`)).status).toBe(200);
});
