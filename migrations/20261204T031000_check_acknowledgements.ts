import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.

export async function up(db: Kysely<any>): Promise<void> {
  // What the originator acknowledged in writing when submitting the version: each cell error,
  // failed design criterion, engine warning and mismatched design input, as
  // [{ key, kind, cellId, message, text }]. Written with the submission and never changed after.
  await db.schema
    .alterTable('checks')
    .addColumn('acknowledgements', 'jsonb', (c) => c.notNull().defaultTo(sql`'[]'::jsonb`))
    .execute();
  await sql`
    create function checks_acknowledgements_immutable() returns trigger language plpgsql as $$
    begin
      if new.acknowledgements is distinct from old.acknowledgements then
        raise exception 'the acknowledgements of a submission cannot be changed' using errcode = 'check_violation';
      end if;
      return new;
    end $$`.execute(db);
  await sql`create trigger checks_acknowledgements_immutable before update on checks for each row execute function checks_acknowledgements_immutable()`.execute(
    db,
  );
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop trigger checks_acknowledgements_immutable on checks`.execute(db);
  await sql`drop function checks_acknowledgements_immutable()`.execute(db);
  await db.schema.alterTable('checks').dropColumn('acknowledgements').execute();
}
