// The browser harness: builds the production app (into .next-test/, only when sources changed),
// serves it against the test database, with the job worker process delivering its mail to the test
// mail capture server, and drives Debian's Chromium through playwright-core.
// Every page it visits can be saved as a screenshot in tests/.artifacts/screenshots/ (git-ignored).
// A console error or a failed request fails the test that caused it. A Content-Security-Policy
// violation is one of those problems as the page sees it (securitypolicyviolation), and the app's
// stop() throws, after stopping its processes, when any page of its run saw one or reported one to
// the app (table csp_reports) that its test did not acknowledge: the file fails.
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { inject } from 'vitest';
import { CHROMIUM_PATH } from '../../lib/ops/chromium';
import { testDb } from '../support/database';
import { buildIfStale } from '../../lib/ops/next-build';
import { localTestIdentityFiles } from '../../lib/issue/identity';

const root = process.cwd();
export const SCREENSHOT_DIR = path.join(root, 'tests', '.artifacts', 'screenshots');

export interface RunningApp {
  baseUrl: string;
  /** The app server's process (lib/ops/server.ts), for tests of how it stops. */
  server: ChildProcess;
  stop(): Promise<void>;
}

/** A fixed secret for the test server's signed session cookies. */
const TEST_AUTH_SECRET = 'worldsheet-test-secret-not-for-production-use';

/**
 * Starts the app server and a job worker on the test database. `options.port` runs a further
 * instance beside the first (the tests of several instances); it defaults to WORLDSHEET_TEST_APP_PORT.
 */
export async function startApp(
  extraEnv: Record<string, string> = {},
  options: { port?: number } = {},
): Promise<RunningApp> {
  const reportsFrom = BigInt(await lastCspReportId());
  const port = options.port ?? Number(process.env.WORLDSHEET_TEST_APP_PORT ?? 3199);
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: 'production',
    DATABASE_URL: inject('databaseUrl'),
    WORLDSHEET_DEMO: '0',
    NEXT_TELEMETRY_DISABLED: '1',
    WORLDSHEET_SMTP_URL: inject('smtpUrl'),
    WORLDSHEET_MAIL_CAPTURE_URL: inject('mailCaptureUrl'),
    ...inject('objectStoreEnv'),
    NEXTAUTH_URL: `http://127.0.0.1:${port}`,
    NEXTAUTH_SECRET: TEST_AUTH_SECRET,
    ...extraEnv,
  };
  // The production server and worker refuse to start without a signing key and certificate
  // (lib/config.ts): name the local test identity's files, as a deployment names its own.
  if (!env.WORLDSHEET_SIGNING_KEY || !env.WORLDSHEET_SIGNING_CERT) {
    const files = localTestIdentityFiles(env.WORLDSHEET_KEY_FOLDER);
    env.WORLDSHEET_SIGNING_KEY = files.keyFile;
    env.WORLDSHEET_SIGNING_CERT = files.certFile;
  }
  const distDir = process.env.WORLDSHEET_TEST_DIST_DIR ?? '.next-test';
  buildIfStale(root, distDir, env);
  const worker = await startWorker(env);
  // The app's own server, as `npm start` runs it (lib/ops/server.ts).
  const child: ChildProcess = spawn(
    process.execPath,
    ['--import', 'tsx', path.join('lib', 'ops', 'server.ts'), '-H', '127.0.0.1', '-p', String(port)],
    { cwd: root, env: { ...env, WORLDSHEET_DIST_DIR: distDir }, stdio: ['ignore', 'pipe', 'pipe'] },
  );
  let output = '';
  child.stdout!.on('data', (d) => (output += d));
  child.stderr!.on('data', (d) => (output += d));
  const baseUrl = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) {
      await worker.stop();
      throw new Error(`the app server exited (${child.exitCode}):\n${output}`);
    }
    try {
      const r = await fetch(`${baseUrl}/api/health`);
      if (r.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      await worker.stop();
      throw new Error(`the app server did not answer within 60 s:\n${output}`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  return {
    baseUrl,
    server: child,
    async stop() {
      await Promise.all([stopChild(child), worker.stop()]);
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
      if (lines.length > 0)
        throw new Error(`Content-Security-Policy violations while the app ran:\n${lines.join('\n')}`);
    },
  };
}

async function stopChild(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return;
  const exited = new Promise((r) => child.once('exit', r));
  child.kill('SIGTERM');
  await exited;
}

/** The job worker process (lib/jobs/worker-main.ts), as `npm start` runs it, polling twice a second. */
async function startWorker(env: NodeJS.ProcessEnv): Promise<{ stop(): Promise<void> }> {
  const child = spawn(process.execPath, ['--import', 'tsx', path.join('lib', 'jobs', 'worker-main.ts')], {
    cwd: root,
    env: { ...env, NODE_ENV: 'production', WORLDSHEET_JOB_POLL_SECONDS: '0.5' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  const ready = new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`the job worker did not start within 30 s:\n${output}`)), 30_000);
    child.stdout!.on('data', (d) => {
      output += d;
      if (output.includes('working the queues')) {
        clearTimeout(timer);
        resolve();
      }
    });
    child.stderr!.on('data', (d) => (output += d));
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`the job worker exited (${code}):\n${output}`));
    });
  });
  try {
    await ready;
  } catch (error) {
    child.kill('SIGKILL');
    throw error;
  }
  return { stop: () => stopChild(child) };
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
