import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.
//
// Content-Security-Policy violation reports that browsers send to /api/csp-report (unauthenticated):
// a few fields to read at a glance and the report itself, size-capped by the route. The browser tests
// read this table to fail on any violation.

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('csp_reports')
    .addColumn('id', 'bigint', (c) => c.primaryKey().generatedAlwaysAsIdentity())
    .addColumn('received_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('ip', 'text', (c) => c.notNull())
    .addColumn('document_uri', 'text')
    .addColumn('blocked_uri', 'text')
    .addColumn('directive', 'text')
    .addColumn('disposition', 'text')
    .addColumn('report', 'jsonb', (c) => c.notNull())
    .execute();
  await db.schema.createIndex('csp_reports_received_at').on('csp_reports').column('received_at').execute();
  await db.schema.createIndex('csp_reports_ip_received_at').on('csp_reports').columns(['ip', 'received_at']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('csp_reports').execute();
}
