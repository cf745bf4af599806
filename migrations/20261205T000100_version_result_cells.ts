import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.
//
// A version's results are stored one cell at a time, each cell once in the installation. Results are
// several times larger than the content (about 450 KiB for a 500-cell sheet), and a save usually
// changes a cell or two: storing the whole document again at every save was most of a save's cost
// in the database. From now on a version keeps:
//   - result_head: the results without their cells (engine version, constants edition, ok, …);
//   - result_cells: the SHA-256 digests (32 bytes each, in cell order) of its cells' results;
// and each cell's result is a row of result_cells, keyed by the SHA-256 of its exact JSON text. The
// text is stored as `json` (kept verbatim), and a check constraint recomputes the digest on insert,
// so a row can never hold a text other than the one its key names; rows are never changed or
// removed (the same triggers as the versions'). version_results(v) gives a version's results as one
// document, whichever way they were stored: versions saved before keep their `results` unchanged
// (nothing is rewritten), and read exactly as saved.

export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create table result_cells (
      hash bytea primary key,
      result json not null,
      constraint result_cells_hash check (hash = sha256(convert_to(result::text, 'UTF8')))
    )`.execute(db);
  await sql`create trigger result_cells_refuse_update_delete before update or delete on result_cells
            for each row execute function worldsheet_refuse_change()`.execute(db);
  await sql`create trigger result_cells_refuse_truncate before truncate on result_cells
            for each statement execute function worldsheet_refuse_change()`.execute(db);

  await sql`alter table versions add column result_head jsonb, add column result_cells bytea`.execute(db);
  await sql`
    alter table versions add constraint versions_results_one_form check (
      (result_head is null) = (result_cells is null)
      and (result_head is null or results is null)
      and (result_cells is null or length(result_cells) % 32 = 0)
    )`.execute(db);

  // A digest with no row gives a null cell, never a shorter list: a missing cell shows as missing.
  await sql`
    create function version_results(v versions) returns jsonb language sql stable as $$
      select case
        when v.result_head is null then v.results
        else v.result_head || jsonb_build_object('cells', coalesce((
          select jsonb_agg(rc.result::jsonb order by i)
          from generate_series(0, length(v.result_cells) / 32 - 1) as i
          left join result_cells rc on rc.hash = substring(v.result_cells from i * 32 + 1 for 32)
        ), '[]'::jsonb))
      end
    $$`.execute(db);

  // What the installation's integrity check asks: the cells a version names that are not stored.
  await sql`
    create function version_result_cells_missing() returns table (version_id uuid, cell_index int) language sql stable as $$
      select v.id, i
      from versions v
      cross join lateral generate_series(0, length(v.result_cells) / 32 - 1) as i
      where v.result_cells is not null
        and not exists (select 1 from result_cells rc where rc.hash = substring(v.result_cells from i * 32 + 1 for 32))
      order by v.id, i
    $$`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  // Versions are never rewritten: results stored by cell cannot be folded back, so going down is refused.
  await sql`
    do $$
    begin
      if exists (select 1 from versions where result_head is not null) then
        raise exception 'versions hold results stored by cell; this migration cannot be undone without losing them';
      end if;
    end
    $$`.execute(db);
  await sql`drop function version_result_cells_missing()`.execute(db);
  await sql`drop function version_results(versions)`.execute(db);
  await sql`alter table versions drop constraint versions_results_one_form`.execute(db);
  await sql`alter table versions drop column result_cells, drop column result_head`.execute(db);
  await sql`drop table result_cells`.execute(db);
}
