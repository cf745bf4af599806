// Runs in every test file: points DATABASE_URL at the test database and empties it (and the job
// queue, and the test mailbox) before each test.
import { afterAll, beforeEach, inject } from 'vitest';
import { clearCapturedMessages } from '../../lib/mail/capture-client';
import { closeTestDatabase, resetDatabase } from '../support/database';

process.env.DATABASE_URL = inject('databaseUrl');

beforeEach(async () => {
  await Promise.all([resetDatabase(), clearCapturedMessages(inject('mailCaptureUrl'))]);
});

afterAll(async () => {
  await closeTestDatabase();
});
