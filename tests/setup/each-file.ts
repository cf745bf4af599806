// Runs in every test file: points DATABASE_URL at the test database and empties it before each test.
import { afterAll, beforeEach, inject } from 'vitest';
import { closeTestDatabase, resetDatabase } from '../support/database';

process.env.DATABASE_URL = inject('databaseUrl');

beforeEach(async () => {
  await resetDatabase();
});

afterAll(async () => {
  await closeTestDatabase();
});
