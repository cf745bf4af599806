import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.

// Starting a sheet from another: a starter sheet (a worked sheet offered to start from) is marked
// as such, and a sheet started from another records the exact version it copied (its id; the
// version's content hash identifies it for ever). Where a sheet came from is set when it is created
// and never changes afterwards.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`alter table sheets
    add column starter boolean not null default false,
    add column started_from_version_id uuid references versions (id)`.execute(db);
  await sql`
    create function sheets_origin_guard() returns trigger language plpgsql as $$
    begin
      if new.started_from_version_id is distinct from old.started_from_version_id then
        raise exception 'where a sheet was started from never changes' using errcode = 'WS001';
      end if;
      return new;
    end
    $$`.execute(db);
  await sql`create trigger sheets_origin_guard before update on sheets for each row execute function sheets_origin_guard()`.execute(
    db,
  );
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop trigger sheets_origin_guard on sheets`.execute(db);
  await sql`drop function sheets_origin_guard()`.execute(db);
  await sql`alter table sheets drop column started_from_version_id, drop column starter`.execute(db);
}
