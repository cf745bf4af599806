import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.

// A sheet started by mistake and never issued can be voided with a reason. It stays in the register
// with its versions (sheets and versions are never deleted); once void it stays void, and the
// database refuses any new version, check or revision on it. Voiding is refused while the sheet has
// an issued revision (of any status) or an open check (in check, or checked and awaiting approval).
export async function up(db: Kysely<any>): Promise<void> {
  await sql`alter table sheets
    add column voided_at timestamptz,
    add column voided_by uuid references users (id),
    add column void_reason text,
    add constraint sheets_void_complete_check check (
      (voided_at is null and voided_by is null and void_reason is null)
      or (voided_at is not null and voided_by is not null and void_reason is not null and length(btrim(void_reason)) > 0))`.execute(
    db,
  );

  await sql`
    create function sheets_void_guard() returns trigger language plpgsql as $$
    begin
      if old.voided_at is not null then
        if new.voided_at is distinct from old.voided_at or new.voided_by is distinct from old.voided_by
           or new.void_reason is distinct from old.void_reason then
          raise exception 'a voided sheet stays void' using errcode = 'WS003';
        end if;
        return new;
      end if;
      if new.voided_at is not null then
        if exists (select 1 from revisions where sheet_id = new.id) then
          raise exception 'a sheet with an issued revision cannot be voided' using errcode = 'WS003';
        end if;
        if exists (select 1 from checks where sheet_id = new.id and state in ('in_check', 'checked')) then
          raise exception 'a sheet with an open check cannot be voided' using errcode = 'WS003';
        end if;
      end if;
      return new;
    end
    $$`.execute(db);
  await sql`create trigger sheets_void_guard before update on sheets for each row execute function sheets_void_guard()`.execute(
    db,
  );

  // New versions, checks and revisions of a void sheet are refused. FOR SHARE waits for a voiding
  // in progress on the same sheet, so the two cannot both succeed.
  await sql`
    create function refuse_on_void_sheet() returns trigger language plpgsql as $$
    declare
      voided timestamptz;
    begin
      select voided_at into voided from sheets where id = new.sheet_id for share;
      if voided is not null then
        raise exception 'the sheet is void: no new % on it', tg_table_name using errcode = 'WS003';
      end if;
      return new;
    end
    $$`.execute(db);
  for (const table of ['versions', 'checks', 'revisions']) {
    await sql`create trigger ${sql.raw(`${table}_refuse_on_void_sheet`)} before insert on ${sql.table(table)} for each row execute function refuse_on_void_sheet()`.execute(
      db,
    );
  }
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of ['versions', 'checks', 'revisions']) {
    await sql`drop trigger ${sql.raw(`${table}_refuse_on_void_sheet`)} on ${sql.table(table)}`.execute(db);
  }
  await sql`drop function refuse_on_void_sheet()`.execute(db);
  await sql`drop trigger sheets_void_guard on sheets`.execute(db);
  await sql`drop function sheets_void_guard()`.execute(db);
  await sql`alter table sheets drop constraint sheets_void_complete_check, drop column void_reason, drop column voided_by, drop column voided_at`.execute(
    db,
  );
}
