import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.

export async function up(db: Kysely<any>): Promise<void> {
  // The relative tolerance the checker states for comparing the alternate calculation with the
  // sheet (as a fraction, and as written: "0.1 %"), and the work carried over from the returned
  // check of an earlier version: { fromCheckId, fromVersion, fields, confirmedAt, confirmedBy }.
  // `fields` lists what is still as carried over (an edit removes the field).
  await db.schema
    .alterTable('checks')
    .addColumn('tolerance', 'double precision', (c) => c.check(sql`tolerance > 0 and tolerance <= 0.1`))
    .addColumn('tolerance_text', 'text', (c) => c.check(sql`length(tolerance_text) <= 40`))
    .addColumn('carried_over', 'jsonb')
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable('checks')
    .dropColumn('carried_over')
    .dropColumn('tolerance_text')
    .dropColumn('tolerance')
    .execute();
}
