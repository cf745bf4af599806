// The app's processes on the test services, as `npm start` runs them: the production server
// (lib/ops/server.ts) serving the build in the test dist folder (built first when its sources
// changed) and a job worker (lib/jobs/worker-main.ts) delivering mail to the test mail capture.
// Used by the browser harness (an app of a test's own) and by the browser tier's global setup (the
// one app the files share, tests/setup/browser-app.ts); no vitest API here, so both can load it.
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { buildIfStale } from '../../lib/ops/next-build';
import { localTestIdentityFiles } from '../../lib/issue/identity';

const root = process.cwd();

/** A fixed secret for the test server's signed session cookies. */
const TEST_AUTH_SECRET = 'worldsheet-test-secret-not-for-production-use';

/** The app's port: WORLDSHEET_TEST_APP_PORT (3199). */
export function testAppPort(): number {
  return Number(process.env.WORLDSHEET_TEST_APP_PORT ?? 3199);
}

/** The test services, as the global setup provides them. */
export interface TestServices {
  databaseUrl: string;
  smtpUrl: string;
  mailCaptureUrl: string;
  objectStoreEnv: Record<string, string>;
}

/** The environment of an app on the test services at `port`, with `extraEnv` over it. */
export function appEnvironment(
  services: TestServices,
  port: number,
  extraEnv: Record<string, string> = {},
): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: 'production',
    DATABASE_URL: services.databaseUrl,
    WORLDSHEET_DEMO: '0',
    NEXT_TELEMETRY_DISABLED: '1',
    WORLDSHEET_SMTP_URL: services.smtpUrl,
    WORLDSHEET_MAIL_CAPTURE_URL: services.mailCaptureUrl,
    ...services.objectStoreEnv,
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
  return env;
}

export interface LaunchedApp {
  baseUrl: string;
  server: ChildProcess;
  /** Stops the server and the worker. */
  stop(): Promise<void>;
}

/** Builds the app if its sources changed, then starts its server and job worker; resolves when both are ready. */
export async function launchApp(env: NodeJS.ProcessEnv, port: number): Promise<LaunchedApp> {
  const distDir = process.env.WORLDSHEET_TEST_DIST_DIR ?? '.next-test';
  buildIfStale(root, distDir, env);
  // A server left on the port by an earlier run would answer the readiness check below for this one.
  const taken = await fetch(`http://127.0.0.1:${port}/api/health/live`).then(
    () => true,
    () => false,
  );
  if (taken) throw new Error(`port ${port} is already served (a server left running by an earlier test run?)`);
  // The worker and the server start side by side (each loads its modules for some seconds); the app
  // is returned once both are ready and the server has rendered a first page.
  const starting = startWorker(env).then(
    (w) => ({ worker: w, error: null }),
    (error: unknown) => ({ worker: null, error }),
  );
  const stopWorker = async () => (await starting).worker?.stop();
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
      await stopWorker();
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
      await stopWorker();
      throw new Error(`the app server did not answer within 60 s:\n${output}`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  // Meanwhile a first page, so that the server has loaded what rendering needs before the first test.
  const [{ worker, error }] = await Promise.all([starting, fetch(`${baseUrl}/sign-in`).catch(() => undefined)]);
  if (!worker) {
    await stopChild(child);
    throw error;
  }
  return {
    baseUrl,
    server: child,
    stop: async () => {
      await Promise.all([stopChild(child), worker.stop()]);
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
