// The one Kysely instance of the application. Connection settings come from DATABASE_URL, which
// `npm start` and `npm test` set for the local cluster and a deployment sets for its own server.
import { Kysely, PostgresDialect } from 'kysely';
import pg from 'pg';
import type { Database } from './schema';

// bigint (int8) columns such as audit_events.id arrive as strings, never as lossy numbers.
pg.types.setTypeParser(pg.types.builtins.INT8, (value) => value);

/** Connections in the application's pool (the server's and the benchmarks'). */
export const DB_POOL_MAX = 10;

export function createDb(connectionString: string, options: { max?: number } = {}): Kysely<Database> {
  const pool = new pg.Pool({
    connectionString,
    max: options.max ?? DB_POOL_MAX,
    connectionTimeoutMillis: 3000,
    idleTimeoutMillis: 30_000,
    application_name: 'worldsheet',
  });
  // A dropped connection must not take the process down; the next query reports the error.
  // The pool listens for errors only on idle clients: a client checked out (in a transaction, say)
  // whose server goes away emits 'error' with no listener, an uncaught exception. Each client
  // therefore gets its own listener; its queries still fail, and the pool drops it on release.
  pool.on('error', () => undefined);
  pool.on('connect', (client) => client.on('error', () => undefined));
  return new Kysely<Database>({ dialect: new PostgresDialect({ pool }) });
}

const globalForDb = globalThis as unknown as { worldsheetDb?: Kysely<Database> };

function connectionString(): string {
  // db/ may not import lib/ (the walls), so it reads its own variables; lib/config.ts validates them at start.
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('DATABASE_URL is not set; start the app with `npm start`.');
  return url;
}

/** The shared instance, created on first use so that importing this module never connects. */
export function getDb(): Kysely<Database> {
  globalForDb.worldsheetDb ??= createDb(connectionString());
  return globalForDb.worldsheetDb;
}

export type { Database } from './schema';
