// The job worker process: `node --import tsx lib/jobs/worker-main.ts`. Works the job queues on
// DATABASE_URL until SIGINT or SIGTERM, then lets the jobs in hand finish and exits.
//
//   DATABASE_URL                  the application database (required)
//   WORLDSHEET_SMTP_URL           where mail goes (default smtp://127.0.0.1:$WORLDSHEET_SMTP_PORT, 2525)
//   WORLDSHEET_MAIL_FROM          the From of every mail (default Worldsheet <no-reply@worldsheet.test>)
//   WORLDSHEET_JOB_POLL_SECONDS   how often an idle queue is polled (default 1, at least 0.5)
// (read through lib/config.ts; in production it refuses to start without what a deployment needs)
import { checkProduction, ConfigError } from '../config';
import { mailSettingsFromEnv } from './mail-job';
import { startJobWorker } from './worker';

const log = (line: string) => console.log(`[jobs] ${line}`);

async function main(): Promise<void> {
  let settings;
  try {
    settings = checkProduction();
  } catch (error) {
    if (!(error instanceof ConfigError)) throw error;
    console.error(`[jobs] ${error.message}`);
    process.exit(2);
  }
  const databaseUrl = settings.DATABASE_URL;
  if (!databaseUrl) {
    console.error('[jobs] DATABASE_URL is not set; `npm start` starts the worker with it.');
    process.exit(2);
  }
  const pollingIntervalSeconds = Math.max(0.5, settings.WORLDSHEET_JOB_POLL_SECONDS);
  const mail = mailSettingsFromEnv();

  let starting: ReturnType<typeof startJobWorker> | null = null;
  let signalled = false;
  const stop = async (signal: NodeJS.Signals) => {
    if (signalled) return;
    signalled = true;
    log(`${signal}: stopping after the jobs in hand …`);
    try {
      // A signal during start-up waits for the start, then stops what it started.
      const worker = await starting?.catch(() => null);
      await worker?.stop();
      process.exit(0);
    } catch (error) {
      console.error(`[jobs] could not stop cleanly: ${(error as Error).message}`);
      process.exit(1);
    }
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
  // Started by a parent that dies without passing a signal on (SIGKILL): stop rather than run on alone.
  const parent = process.ppid;
  setInterval(() => {
    if (process.ppid !== parent) void stop('SIGTERM');
  }, 1000).unref();

  starting = startJobWorker({ databaseUrl, mail, pollingIntervalSeconds, log });
  await starting;
  if (!signalled)
    log(`working the queues (mail to ${redact(mail.smtpUrl)}, polling every ${pollingIntervalSeconds} s)`);
}

/** The SMTP URL without its password, for the log. */
function redact(url: string): string {
  try {
    const u = new URL(url);
    if (u.password) u.password = '***';
    return u.toString();
  } catch {
    return '(unparsable WORLDSHEET_SMTP_URL)';
  }
}

main().catch((error: Error) => {
  console.error(`[jobs] the worker could not start: ${error.message}`);
  process.exit(1);
});
