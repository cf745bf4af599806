// The browser tier's global setup, after tests/setup/global-setup.ts: starts the one app (server and
// job worker, tests/e2e/app-process.ts) that the browser files share, on WORLDSHEET_TEST_APP_PORT + 2
// (the app's own port and the next stay free for the files that start an app of their own: other
// settings, a second instance), and stops it at the end of the run. Each file resets the database
// in its beforeAll, as before; the harness's startApp() hands the file this app
// (tests/e2e/harness.ts).
import type { TestProject } from 'vitest/node';
import { appEnvironment, launchApp, testAppPort } from '../e2e/app-process';

declare module 'vitest' {
  export interface ProvidedContext {
    /** The browser tier's shared app (absent in the other tiers). */
    sharedAppUrl?: string;
  }
}

export default async function setup(project: TestProject) {
  const provided = project.getProvidedContext();
  const port = testAppPort() + 2;
  const app = await launchApp(
    appEnvironment(
      {
        databaseUrl: provided.databaseUrl,
        smtpUrl: provided.smtpUrl,
        mailCaptureUrl: provided.mailCaptureUrl,
        objectStoreEnv: provided.objectStoreEnv,
      },
      port,
    ),
    port,
  );
  project.provide('sharedAppUrl', app.baseUrl);
  return async () => {
    await app.stop();
  };
}
