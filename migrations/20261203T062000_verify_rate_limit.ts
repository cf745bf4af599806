import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.
//
// Verification (POST /api/verify) is open to anyone, so it is rate limited per client address, in
// the database so that every app instance counts against the same window: one row per address with
// the start of its current fixed window and the requests counted in it.

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('verify_rate_limits')
    .addColumn('address', 'text', (c) => c.primaryKey().check(sql`length(address) between 1 and 100`))
    .addColumn('window_started_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('requests', 'integer', (c) => c.notNull().check(sql`requests >= 0`))
    .execute();
  await db.schema
    .createIndex('verify_rate_limits_window_idx')
    .on('verify_rate_limits')
    .column('window_started_at')
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('verify_rate_limits').execute();
}
