// The app's HTTP edge in Chromium, on the real server (lib/ops/server.ts): the address recorded for a
// sign-in is the connection's whatever the client writes; pages carry a Content-Security-Policy whose
// per-response nonce every script has, and violations reach the report table; a hostile callbackUrl
// keeps the browser on the app's origin; over plain HTTP, no HSTS and no Secure cookies.
import { afterAll, beforeAll, expect, it } from 'vitest';
import { PEER_ADDRESS_HEADER } from '../../lib/http/client-address';
import { CSP_REPORT_LIMITS } from '../../lib/http/csp-reports';
import { resetDatabase, testDb } from '../support/database';
import { makeUser, PASSWORD } from '../support/people';
import { closeBrowser, openBrowser, startApp, submitSignIn, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;
const sessions: BrowserSession[] = [];

beforeAll(async () => {
  await resetDatabase();
  await makeUser(testDb(), 'edge@example.test');
  await makeUser(testDb(), 'redirect@example.test');
  app = await startApp();
});

afterAll(async () => {
  // stop() throws on any CSP violation left unacknowledged.
  for (const s of sessions) await s.close();
  await closeBrowser();
  await app?.stop();
});

async function browser(): Promise<BrowserSession> {
  const s = await openBrowser();
  sessions.push(s);
  return s;
}

it('records the connection address for a sign-in, not the X-Forwarded-For or peer header the client sent', async () => {
  const session = await browser();
  const { page, context } = session;
  await context.setExtraHTTPHeaders({
    'x-forwarded-for': '198.51.100.77',
    [PEER_ADDRESS_HEADER]: '198.51.100.78',
    'x-real-ip': '198.51.100.79',
  });
  // A wrong password first (an attempt), then the right one (a session).
  await submitSignIn(page, app.baseUrl, 'edge@example.test', 'not the password');
  await page.getByRole('alert').filter({ hasText: /./ }).waitFor();
  await page.getByLabel('Password').fill(PASSWORD);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.waitForURL(`${app.baseUrl}/projects`);
  const db = testDb();
  const attempts = await db
    .selectFrom('sign_in_attempts')
    .select(['ip', 'ok'])
    .where('email', '=', 'edge@example.test')
    .execute();
  expect(attempts.length).toBeGreaterThanOrEqual(1);
  expect(new Set(attempts.map((a) => a.ip))).toEqual(new Set(['127.0.0.1']));
  const user = await db
    .selectFrom('users')
    .select('id')
    .where('email', '=', 'edge@example.test')
    .executeTakeFirstOrThrow();
  const rows = await db.selectFrom('sessions').select('ip').where('user_id', '=', user.id).execute();
  expect(rows.map((r) => r.ip)).toEqual(['127.0.0.1']);
  expect(session.problems.filter((p) => !/status of 401|HTTP 401/.test(p))).toEqual([]);
});

it('serves pages with a strict policy whose fresh nonce every script carries; no HSTS and no Secure cookie over HTTP', async () => {
  const first = await fetch(`${app.baseUrl}/sign-in`);
  const second = await fetch(`${app.baseUrl}/sign-in`);
  const policy = first.headers.get('content-security-policy')!;
  expect(policy).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]+' 'strict-dynamic'/);
  for (const d of [
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    'report-uri /api/csp-report',
  ])
    expect(policy).toContain(d);
  expect(policy).not.toMatch(/script-src[^;]*'unsafe-inline'/);
  const nonce = /'nonce-([^']+)'/.exec(policy)![1];
  expect(/'nonce-([^']+)'/.exec(second.headers.get('content-security-policy')!)![1]).not.toBe(nonce);
  const html = await first.text();
  const scripts = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
  expect(scripts.length).toBeGreaterThan(3);
  expect(scripts.filter((s) => !s.includes(`nonce="${nonce}"`))).toEqual([]);
  // The fonts are WOFF2, preloaded (React sends the preloads as a Link header, before the page).
  const preloads = (first.headers.get('link') ?? '').split(/,\s*(?=<)/).filter((l) => /rel=preload; as="font"/.test(l));
  expect(preloads).toHaveLength(6);
  for (const l of preloads) expect(l).toMatch(/^<\/_next\/static\/media\/[^>]+\.woff2>;.*type="font\/woff2"/);
  expect(first.headers.get('strict-transport-security')).toBeNull();

  const session = await browser();
  await submitSignIn(session.page, app.baseUrl, 'edge@example.test', PASSWORD);
  await session.page.waitForURL(`${app.baseUrl}/projects`);
  const cookie = (await session.context.cookies()).find((c) => c.name.endsWith('next-auth.session-token'))!;
  expect(cookie).toMatchObject({ name: 'next-auth.session-token', secure: false, httpOnly: true, sameSite: 'Lax' });
  expect(session.problems).toEqual([]);
  expect(session.cspViolations).toEqual([]);
});

it('sees and stores a violation: injected markup with an inline handler does not run, and is reported to /api/csp-report', async () => {
  const session = await browser();
  const { page } = session;
  await page.goto(`${app.baseUrl}/sign-in`);
  // What an XSS would try: markup with an event handler (a script the page did not send, no nonce).
  const ran = await page.evaluate(() => {
    const box = document.createElement('div');
    box.innerHTML = '<a id="injected" href="#" onclick="window.__injected = true; return false">x</a>';
    document.body.append(box);
    document.getElementById('injected')!.click();
    return (window as unknown as { __injected?: boolean }).__injected === true;
  });
  expect(ran).toBe(false);
  await expect.poll(() => session.cspViolations.length).toBeGreaterThan(0);
  expect(session.cspViolations[0]).toMatchObject({ effectiveDirective: 'script-src-attr', blockedURI: 'inline' });
  expect(session.problems.some((p) => p.startsWith('CSP violation: script-src-attr'))).toBe(true);
  await expect.poll(async () => (await session.cspReports()).length, { timeout: 10_000 }).toBeGreaterThan(0);
  expect((await session.cspReports())[0]).toMatchObject({
    document_uri: `${app.baseUrl}/sign-in`,
    blocked_uri: 'inline',
    directive: 'script-src-attr',
  });
  await session.acknowledgeCspViolations();
  expect(session.problems.filter((p) => !p.startsWith('console error:'))).toEqual([]);
});

it('takes reports in both browser formats, refuses other types and oversized bodies, and caps an address', async () => {
  const post = (type: string, body: string) =>
    fetch(`${app.baseUrl}/api/csp-report`, { method: 'POST', headers: { 'content-type': type }, body });
  const count = async () =>
    Number(
      (
        await testDb()
          .selectFrom('csp_reports')
          .select((eb) => eb.fn.countAll().as('n'))
          .executeTakeFirstOrThrow()
      ).n,
    );
  const lastId = String(
    (
      await testDb()
        .selectFrom('csp_reports')
        .select((eb) => eb.fn.max('id').as('id'))
        .executeTakeFirst()
    )?.id ?? 0,
  );
  const before = await count();
  const uri = {
    'csp-report': {
      'document-uri': `${app.baseUrl}/x`,
      'blocked-uri': 'eval',
      'effective-directive': 'script-src',
      disposition: 'enforce',
    },
  };
  expect((await post('application/csp-report', JSON.stringify(uri))).status).toBe(204);
  const api = [
    {
      type: 'csp-violation',
      url: `${app.baseUrl}/y`,
      body: { documentURL: `${app.baseUrl}/y`, blockedURL: 'inline', effectiveDirective: 'style-src-attr' },
    },
  ];
  expect((await post('application/reports+json', JSON.stringify(api))).status).toBe(204);
  expect((await post('text/plain', JSON.stringify(uri))).status).toBe(415);
  expect((await post('application/csp-report', 'x'.repeat(100 * 1024))).status).toBe(413);
  expect((await post('application/csp-report', '{"not":"a report"}')).status).toBe(400);
  const rows = await testDb()
    .selectFrom('csp_reports')
    .select(['ip', 'directive'])
    .orderBy('id', 'desc')
    .limit(2)
    .execute();
  expect(rows).toEqual([
    { ip: '127.0.0.1', directive: 'style-src-attr' },
    { ip: '127.0.0.1', directive: 'script-src' },
  ]);
  // Past the per-address cap: 429 with Retry-After, and nothing more stored.
  let last: Response | null = null;
  for (let i = 0; i <= CSP_REPORT_LIMITS.perAddress.count; i++) {
    last = await post('application/csp-report', JSON.stringify(uri));
    if (last.status === 429) break;
  }
  expect(last!.status).toBe(429);
  expect(Number(last!.headers.get('retry-after'))).toBeGreaterThan(0);
  // Every report this address sent in the last 10 minutes (the earlier test's browser report too): the cap, no more.
  const fromHere = await testDb()
    .selectFrom('csp_reports')
    .select((eb) => eb.fn.countAll().as('n'))
    .where('ip', '=', '127.0.0.1')
    .executeTakeFirstOrThrow();
  expect(Number(fromHere.n)).toBe(CSP_REPORT_LIMITS.perAddress.count);
  expect((await count()) - before).toBeLessThanOrEqual(CSP_REPORT_LIMITS.perAddress.count);
  // These were not a browser session's: removed, so that no session's close() counts them.
  await testDb().deleteFrom('csp_reports').where('id', '>', lastId).execute();
});

it('keeps the browser on the app after signing in with a hostile callbackUrl (/\\host)', async () => {
  const session = await browser();
  const { page } = session;
  await submitSignIn(
    page,
    app.baseUrl,
    'redirect@example.test',
    PASSWORD,
    '/sign-in?callbackUrl=/%5Clocalhost:8766/pwned',
  );
  await page.waitForURL((url) => url.pathname === '/projects');
  expect(new URL(page.url()).origin).toBe(app.baseUrl);
  await page.getByRole('heading', { level: 1 }).waitFor();
  // The same through next-auth's own redirect (the callback of a sign-out).
  const same = await page.evaluate(async () => {
    const csrf = (await (await fetch('/api/auth/csrf')).json()) as { csrfToken: string };
    const r = await fetch('/api/auth/signout', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ csrfToken: csrf.csrfToken, callbackUrl: '/\\localhost:8766/pwned', json: 'true' }),
    });
    return ((await r.json()) as { url: string }).url;
  });
  expect(same).toBe(`${app.baseUrl}/`);
  expect(session.problems).toEqual([]);
});

it('answers 400, not 500, for a callback URL that is not a URL, in the query or in its cookie', async () => {
  for (const path of [
    '/api/auth/session?callbackUrl=http://%5B',
    '/api/auth/providers?callbackUrl=not%20a%20url',
    '/api/auth/signin?callbackUrl=http://%5B',
  ]) {
    const r = await fetch(`${app.baseUrl}${path}`, { redirect: 'manual' });
    expect(r.status, path).toBe(400);
    expect(await r.json()).toMatchObject({ error: { code: 'bad_request' } });
  }
  const cookie = await fetch(`${app.baseUrl}/api/auth/session`, {
    headers: { cookie: 'next-auth.callback-url=http%3A%2F%2F%5B' },
  });
  expect(cookie.status).toBe(400);
  // The sign-in page itself renders, sending the browser home after sign-in.
  expect((await fetch(`${app.baseUrl}/sign-in?callbackUrl=http://%5B&callbackUrl=/x`)).status).toBe(200);
});
