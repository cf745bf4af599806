// Runs in every test file: points DATABASE_URL at the test database (and object storage at the test store) and empties it (and the job
// queue, and the test mailbox) before each test.
import { afterAll, beforeEach, inject } from 'vitest';
import { clearCapturedMessages } from '../../lib/mail/capture-client';
import { closeTestDatabase, resetDatabase } from '../support/database';

process.env.DATABASE_URL = inject('databaseUrl');
Object.assign(process.env, inject('objectStoreEnv'));

// Browser journeys (tests/e2e/) build their world in beforeAll (starting with resetDatabase()) and
// walk through it test by test, so they are not emptied between tests.
beforeEach(async (context) => {
  if (context.task.file.filepath.includes('/tests/e2e/')) return;
  await Promise.all([resetDatabase(), clearCapturedMessages(inject('mailCaptureUrl'))]);
});

afterAll(async () => {
  await closeTestDatabase();
});
