// The job worker process (lib/jobs/worker-main.ts) as `npm start` runs it, for the tests that kill
// it, restart it or watch it retry: pointed at the test database and the test mail capture server,
// polling twice a second. A test file calls killWorkers() in its afterEach.
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { inject } from 'vitest';

export interface WorkerProcess {
  child: ChildProcess;
  /** Everything the process wrote to stdout and stderr so far. */
  output: () => string;
}

const children: ChildProcess[] = [];

/** Starts a worker; `env` adds to or overrides its environment (e.g. WORLDSHEET_SMTP_URL). */
export function startWorker(env: Record<string, string> = {}): WorkerProcess {
  const child = spawn(process.execPath, ['--import', 'tsx', path.join('lib', 'jobs', 'worker-main.ts')], {
    cwd: process.cwd(),
    env: {
      ...process.env,
      DATABASE_URL: inject('databaseUrl'),
      WORLDSHEET_SMTP_URL: inject('smtpUrl'),
      WORLDSHEET_JOB_POLL_SECONDS: '0.5',
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  children.push(child);
  let output = '';
  child.stdout!.on('data', (d) => (output += d));
  child.stderr!.on('data', (d) => (output += d));
  return { child, output: () => output };
}

/** Kills (SIGKILL) every worker started by startWorker that is still running, and waits for each to exit. */
export async function killWorkers(): Promise<void> {
  for (const c of children.splice(0)) {
    if (c.exitCode === null && c.signalCode === null) {
      const exited = new Promise((r) => c.once('exit', r));
      c.kill('SIGKILL');
      await exited;
    }
  }
}
