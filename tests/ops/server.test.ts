// The app server's request layer (lib/ops/server.ts prepareRequest) on a real socket: the address a
// route handler sees is the connection's, whatever the client writes; the policy and its nonce are
// on the request Next.js renders and on the response.
import { createServer, request as httpRequest, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, afterEach, beforeAll, expect, it } from 'vitest';
import { clientAddress, PEER_ADDRESS_HEADER } from '../../lib/http/client-address';
import { prepareRequest } from '../../lib/ops/server';

let server: Server;
let port: number;

beforeAll(async () => {
  // Stands in for Next.js's handler: answers what the app would read from the request.
  server = createServer((req, res) => {
    const headers = prepareRequest(req, { dev: false, https: process.env.TEST_HTTPS === '1' });
    for (const [k, v] of Object.entries(headers)) res.setHeader(k, v);
    res.setHeader('content-type', 'application/json');
    res.end(JSON.stringify({ seen: req.headers, address: clientAddress(req.headers as Record<string, string>) }));
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  port = (server.address() as AddressInfo).port;
});

afterAll(async () => {
  await new Promise((r) => server.close(r));
});

afterEach(() => {
  delete process.env.WORLDSHEET_TRUSTED_PROXIES;
  delete process.env.TEST_HTTPS;
});

// A raw request, so that any header (even the peer header) can be sent as a client would.
function get(headers: Record<string, string>): Promise<{
  headers: Record<string, string | string[] | undefined>;
  body: { seen: Record<string, string>; address: string };
}> {
  return new Promise((resolve, reject) => {
    const req = httpRequest({ host: '127.0.0.1', port, path: '/', headers }, (res) => {
      let text = '';
      res.on('data', (d) => (text += d));
      res.on('end', () => resolve({ headers: res.headers, body: JSON.parse(text) }));
    });
    req.on('error', reject);
    req.end();
  });
}

it('overwrites a client-sent peer header and drops its X-Forwarded-* headers', async () => {
  const { body } = await get({
    [PEER_ADDRESS_HEADER]: '198.51.100.23',
    'x-forwarded-for': '198.51.100.24',
    'x-forwarded-host': 'evil.example',
    'x-real-ip': '198.51.100.25',
  });
  expect(body.seen[PEER_ADDRESS_HEADER]).toBe('127.0.0.1');
  expect(body.address).toBe('127.0.0.1');
  expect(body.seen['x-forwarded-for']).toBeUndefined();
  expect(body.seen['x-forwarded-host']).toBeUndefined();
  expect(body.seen['x-real-ip']).toBeUndefined();
});

it('keeps X-Forwarded-For from a trusted proxy, and the client is its right-most untrusted hop', async () => {
  process.env.WORLDSHEET_TRUSTED_PROXIES = '127.0.0.1';
  const { body } = await get({ 'x-forwarded-for': '6.6.6.6, 198.51.100.24' });
  expect(body.seen[PEER_ADDRESS_HEADER]).toBe('127.0.0.1');
  expect(body.address).toBe('198.51.100.24');
});

it('puts the same policy, with a fresh nonce, on the request and the response; a client-sent policy is replaced', async () => {
  const a = await get({
    'content-security-policy': "script-src 'nonce-chosenbyclient'",
    'content-security-policy-report-only': 'x',
  });
  const b = await get({});
  const policy = a.headers['content-security-policy'] as string;
  expect(a.body.seen['content-security-policy']).toBe(policy);
  expect(a.body.seen['content-security-policy-report-only']).toBeUndefined();
  expect(policy).not.toContain('chosenbyclient');
  const nonce = (p: string) => /'nonce-([^']+)'/.exec(p)![1];
  expect(nonce(policy)).not.toBe(nonce(b.headers['content-security-policy'] as string));
  expect(a.headers['strict-transport-security']).toBeUndefined();
});

it('sends HSTS when served over HTTPS', async () => {
  process.env.TEST_HTTPS = '1';
  const { headers } = await get({});
  expect(headers['strict-transport-security']).toBe('max-age=63072000');
});
