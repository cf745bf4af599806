import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.
//
// A version's content and results are large JSON documents (the results of a 500-cell sheet are
// about half a megabyte). PostgreSQL's default TOAST compression, pglz, spends more CPU on them
// than parsing them does; LZ4 compresses them as well at a fraction of the CPU, which shortens
// every save. Only how values stored from now on are compressed on disk changes: what is read back
// is identical, rows already stored are not rewritten, and no row trigger fires. A server built
// without LZ4 keeps pglz.

export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    do $$
    begin
      alter table versions alter column content set compression lz4, alter column results set compression lz4;
    exception when feature_not_supported then
      raise notice 'this PostgreSQL server has no LZ4 support; versions keep the default compression';
    end
    $$`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`alter table versions alter column content set compression default, alter column results set compression default`.execute(
    db,
  );
}
