// Stopping one app instance of several behind a load balancer (lib/ops/server.ts): on SIGTERM it
// reports itself not ready at once (GET /api/health 503, status "draining") while the process stays
// live (GET /api/health/live 200), keeps answering for WORLDSHEET_DRAIN_DELAY_MS, then stops
// accepting connections, finishes the request in flight, and exits 0.
import http from 'node:http';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { startApp, type RunningApp } from './harness';

let app: RunningApp;
beforeAll(async () => {
  app = await startApp({ WORLDSHEET_DRAIN_DELAY_MS: '1500', WORLDSHEET_DRAIN_TIMEOUT_MS: '20000' });
}, 600_000);
afterAll(async () => {
  await app?.stop();
});

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

it('drains on SIGTERM: not ready at once, then no new connections, the request in flight answered, exit 0', async () => {
  expect((await fetch(`${app.baseUrl}/api/health`)).status).toBe(200);
  const live = await fetch(`${app.baseUrl}/api/health/live`);
  expect(live.status).toBe(200);
  expect(await live.json()).toMatchObject({ status: 'ok' });

  // A request in flight across the signal: its body arrives in two parts, the second after the
  // server stopped accepting connections (a CSP report that turns out not to be JSON: 400, no row).
  const { hostname, port } = new URL(app.baseUrl);
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
  const exited = new Promise<number | null>((resolve) => app.server.once('exit', (code) => resolve(code)));
  const signalledAt = Date.now();
  app.server.kill('SIGTERM');

  // Within the drain delay: still answering, but not ready.
  await sleep(200);
  const ready = await fetch(`${app.baseUrl}/api/health`, { headers: { connection: 'close' } });
  expect(ready.status).toBe(503);
  expect(await ready.json()).toMatchObject({ status: 'draining', database: { status: 'up' } });
  expect((await fetch(`${app.baseUrl}/api/health/live`, { headers: { connection: 'close' } })).status).toBe(200);
  expect(Date.now() - signalledAt).toBeLessThan(1500);

  // After it: new connections are refused.
  let refused = false;
  for (let i = 0; i < 40 && !refused; i++) {
    await sleep(100);
    refused = await fetch(`${app.baseUrl}/api/health/live`, { headers: { connection: 'close' } }).then(
      () => false,
      () => true,
    );
  }
  expect(refused).toBe(true);
  expect(Date.now() - signalledAt).toBeGreaterThanOrEqual(1500);
  expect(app.server.exitCode).toBeNull();

  // The request in flight is answered, then the process exits 0.
  inFlight();
  expect(await answered).toBe(400);
  expect(await exited).toBe(0);
  expect(Date.now() - signalledAt).toBeLessThan(15_000);
});
