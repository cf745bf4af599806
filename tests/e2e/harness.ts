// The browser harness: the production app on the test services (its processes: app-process.ts;
// one app for the whole browser tier unless a file needs its own: startApp), and Debian's Chromium
// driven through playwright-core.
// Every page it visits can be saved as a screenshot in tests/.artifacts/screenshots/ (git-ignored).
// A console error or a failed request fails the test that caused it. A Content-Security-Policy
// violation is one of those problems as the page sees it (securitypolicyviolation), and the app's
// stop() throws, after stopping its processes, when any page of its run saw one or reported one to
// the app (table csp_reports) that its test did not acknowledge: the file fails.
import type { ChildProcess } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { inject } from 'vitest';
import { CHROMIUM_PATH } from '../../lib/ops/chromium';
import { testDb } from '../support/database';
import { sql } from 'kysely';
import { appEnvironment, launchApp, testAppPort } from './app-process';

const root = process.cwd();
export const SCREENSHOT_DIR = path.join(root, 'tests', '.artifacts', 'screenshots');

export interface RunningApp {
  baseUrl: string;
  /** The app server's process (lib/ops/server.ts), for tests of how it stops. */
  server: ChildProcess;
  stop(): Promise<void>;
}

/**
 * The app on the test services: its own server and job worker (lib/ops/server.ts,
 * lib/jobs/worker-main.ts; tests/e2e/app-process.ts) when `extraEnv` or `options.port` asks for one
 * (a second instance, other settings); otherwise the browser tier's one app, which its global setup
 * started (tests/setup/browser-app.ts) and stops at the end of the run, so that each file does not
 * wait for a server and a worker to start. Either way, stop() throws when a page saw or reported a
 * Content-Security-Policy violation since the call that no test acknowledged; for the shared app it
 * first waits (up to 20 s) for the jobs due to finish, so that none runs on into the next file.
 * `options.port` runs a further instance beside the first (the tests of several instances); the
 * app's own port defaults to WORLDSHEET_TEST_APP_PORT.
 */
export async function startApp(
  extraEnv: Record<string, string> = {},
  options: { port?: number } = {},
): Promise<RunningApp> {
  const reportsFrom = BigInt(await lastCspReportId());
  const shared = Object.keys(extraEnv).length === 0 && options.port === undefined ? inject('sharedAppUrl') : undefined;
  if (shared) {
    return {
      baseUrl: shared,
      get server(): ChildProcess {
        throw new Error(
          "the browser tier's shared app belongs to the run: start an app of its own to stop its process",
        );
      },
      async stop() {
        await jobsSettled();
        await cspCheck(reportsFrom);
      },
    };
  }
  const port = options.port ?? testAppPort();
  const app = await launchApp(
    appEnvironment(
      {
        databaseUrl: inject('databaseUrl'),
        smtpUrl: inject('smtpUrl'),
        mailCaptureUrl: inject('mailCaptureUrl'),
        objectStoreEnv: inject('objectStoreEnv'),
      },
      port,
      extraEnv,
    ),
    port,
  );
  return {
    baseUrl: app.baseUrl,
    server: app.server,
    async stop() {
      await app.stop();
      await cspCheck(reportsFrom);
    },
  };
}

/** Waits (up to 20 s) until no job is running or due in the test database's queue. */
async function jobsSettled(): Promise<void> {
  const deadline = Date.now() + 20_000;
  while (Date.now() < deadline) {
    const { rows } = await sql<{ n: number }>`
      select count(*)::int as n from pgboss.job
      where state = 'active' or (state in ('created', 'retry') and start_after <= now())`.execute(testDb());
    if (rows[0].n === 0) return;
    await new Promise((r) => setTimeout(r, 250));
  }
}

/** Throws when a page saw, or the app stored a report of, a CSP violation after `reportsFrom` that no test acknowledged. */
async function cspCheck(reportsFrom: bigint): Promise<void> {
  const after = reportsFrom > cspReportsAcknowledgedThrough ? reportsFrom : cspReportsAcknowledgedThrough;
  const reported = await testDb()
    .selectFrom('csp_reports')
    .select(['document_uri', 'blocked_uri', 'directive'])
    .where('id', '>', String(after))
    .orderBy('id')
    .execute();
  const lines = [
    ...cspSeen
      .splice(0)
      .map((v) => `seen: ${v.effectiveDirective} blocked ${v.blockedURI || '(inline)'} on ${v.documentURI}`),
    ...reported.map((r) => `reported: ${r.directive} blocked ${r.blocked_uri ?? '(inline)'} on ${r.document_uri}`),
  ];
  if (lines.length > 0) throw new Error(`Content-Security-Policy violations while the app ran:\n${lines.join('\n')}`);
}

export interface BrowserSession {
  page: Page;
  context: BrowserContext;
  /** Console errors, failed requests and CSP violations seen so far; a test asserts this stays empty. */
  problems: string[];
  /** Content-Security-Policy violations the pages saw (securitypolicyviolation events). */
  cspViolations: CspViolationSeen[];
  /** The violation reports the app stored (csp_reports) since the session opened or last acknowledged. */
  cspReports(): Promise<Array<{ document_uri: string | null; blocked_uri: string | null; directive: string | null }>>;
  /** For a test that causes violations on purpose: forgets those seen (this session) and reported (all) so far. */
  acknowledgeCspViolations(): Promise<void>;
  screenshot(name: string): Promise<string>;
  close(): Promise<void>;
}

interface CspViolationSeen {
  documentURI: string;
  blockedURI: string;
  effectiveDirective: string;
  sample: string;
}

// Reports name a page, not a browser session: one acknowledged by a test (a violation caused on
// purpose) is acknowledged for every session open at the time.
let cspReportsAcknowledgedThrough = 0n;
/** Violations the pages of every session saw and no test acknowledged; the app's stop() reads them. */
const cspSeen: CspViolationSeen[] = [];

async function lastCspReportId(): Promise<string> {
  const row = await testDb()
    .selectFrom('csp_reports')
    .select((eb) => eb.fn.max('id').as('id'))
    .executeTakeFirst();
  return String(row?.id ?? 0);
}

let browser: Browser | null = null;

export async function openBrowser(): Promise<BrowserSession> {
  browser ??= await chromium.launch({
    executablePath: CHROMIUM_PATH,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-background-networking',
      '--disable-component-update',
      '--no-first-run',
      '--disable-sync',
    ],
  });
  const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
  const problems: string[] = [];
  const cspViolations: CspViolationSeen[] = [];
  let reportsAfter = await lastCspReportId();
  // Every page of the context tells the harness about each violation as it happens (the binding and
  // the init script come through the DevTools protocol, which the page's policy does not govern).
  await context.exposeBinding('__worldsheetCspViolation', (_source, v: CspViolationSeen) => {
    cspViolations.push(v);
    cspSeen.push(v);
    problems.push(
      `CSP violation: ${v.effectiveDirective} blocked ${v.blockedURI || '(inline)'} on ${v.documentURI}${v.sample ? ` (${v.sample})` : ''}`,
    );
  });
  await context.addInitScript(() => {
    document.addEventListener(
      'securitypolicyviolation',
      (e) => {
        const report = (window as unknown as { __worldsheetCspViolation: (v: CspViolationSeen) => void })
          .__worldsheetCspViolation;
        report({
          documentURI: e.documentURI,
          blockedURI: e.blockedURI,
          effectiveDirective: e.effectiveDirective,
          sample: e.sample,
        });
      },
      true,
    );
  });
  const page = await context.newPage();
  const cspReports = () => {
    const after =
      BigInt(reportsAfter) > cspReportsAcknowledgedThrough ? reportsAfter : String(cspReportsAcknowledgedThrough);
    return testDb()
      .selectFrom('csp_reports')
      .select(['document_uri', 'blocked_uri', 'directive'])
      .where('id', '>', after)
      .orderBy('id')
      .execute();
  };
  page.on('console', (m) => {
    if (m.type() === 'error') problems.push(`console error: ${m.text()}`);
  });
  page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
  page.on('requestfailed', (r) => {
    // The browser cancels what it no longer needs when a page moves on (Next.js's prefetches of
    // linked pages, an icon still loading): a cancellation, not a failure of the server.
    if (r.failure()?.errorText === 'net::ERR_ABORTED') return;
    problems.push(`request failed: ${r.url()} ${r.failure()?.errorText}`);
  });
  page.on('response', (r) => {
    if (r.status() >= 400) problems.push(`HTTP ${r.status()}: ${r.url()}`);
  });
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  return {
    page,
    context,
    problems,
    cspViolations,
    cspReports,
    async acknowledgeCspViolations() {
      for (const v of cspViolations) if (cspSeen.includes(v)) cspSeen.splice(cspSeen.indexOf(v), 1);
      cspViolations.length = 0;
      for (let i = problems.length - 1; i >= 0; i--)
        if (problems[i].startsWith('CSP violation: ')) problems.splice(i, 1);
      reportsAfter = await lastCspReportId();
      if (BigInt(reportsAfter) > cspReportsAcknowledgedThrough) cspReportsAcknowledgedThrough = BigInt(reportsAfter);
    },
    async screenshot(name: string) {
      const file = path.join(SCREENSHOT_DIR, `${name}.png`);
      await page.screenshot({ path: file, fullPage: true });
      return file;
    },
    async close() {
      await context.close();
    },
  };
}

/** Fills and submits the sign-in form; the caller waits for where it expects to land. */
export async function submitSignIn(
  page: Page,
  baseUrl: string,
  email: string,
  password: string,
  path = '/sign-in',
): Promise<void> {
  await page.goto(`${baseUrl}${path}`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
}

/** A browser session signed in as `email`, on the projects page a sign-in leads to. */
export async function openSignedIn(baseUrl: string, email: string, password: string): Promise<BrowserSession> {
  const session = await openBrowser();
  await submitSignIn(session.page, baseUrl, email, password);
  await session.page.waitForURL(`${baseUrl}/projects`);
  return session;
}

export async function closeBrowser(): Promise<void> {
  await browser?.close();
  browser = null;
}
