import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.

// A revision's stamped copy was made once; a revision superseded and later withdrawn kept serving
// the copy stamped "superseded". Now it is made once for each status: the guard lets a copy whose
// key names another status be replaced by one for the revision's present status, and nothing else.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create or replace function revisions_guard() returns trigger language plpgsql as $$
    begin
      if tg_op = 'DELETE' then
        raise exception 'DELETE on revisions is refused: revisions are records' using errcode = 'WS001';
      end if;
      if new.id <> old.id or new.sheet_id <> old.sheet_id or new.version_number <> old.version_number or new.version_sha256 <> old.version_sha256
         or new.code <> old.code or new.sequence <> old.sequence or new.issued_by <> old.issued_by or new.issued_at <> old.issued_at
         or new.pdf_key <> old.pdf_key or new.pdf_sha256 <> old.pdf_sha256 or new.pdf_size <> old.pdf_size
         or new.verification_code <> old.verification_code or new.check_id <> old.check_id or new.issue_job_id <> old.issue_job_id then
        raise exception 'an issued revision and its PDF never change' using errcode = 'WS001';
      end if;
      -- Made once per status: a copy stamped "superseded" is replaced once the revision is withdrawn
      -- (its key names the status it was stamped with: revisions/stamped-<id>-<status>-<sha256>.pdf).
      if old.stamped_sha256 is not null and (new.stamped_sha256 is distinct from old.stamped_sha256 or new.stamped_key is distinct from old.stamped_key)
         and (old.stamped_key like ('revisions/stamped-' || old.id || '-' || new.status || '-%') or new.stamped_key is null or new.stamped_sha256 is null
              or new.stamped_key not like ('revisions/stamped-' || old.id || '-' || new.status || '-%')) then
        raise exception 'the stamped copy of a revision is made once for each status' using errcode = 'WS001';
      end if;
      if new.status <> old.status and not (
           (old.status = 'current' and new.status in ('superseded', 'withdrawn'))
        or (old.status = 'superseded' and new.status = 'withdrawn')) then
        raise exception 'a revision cannot go from % to %', old.status, new.status using errcode = 'WS003';
      end if;
      if new.status = 'withdrawn' and (new.withdrawn_reason is null or length(btrim(new.withdrawn_reason)) = 0) then
        raise exception 'withdrawing a revision needs a reason' using errcode = 'WS003';
      end if;
      return new;
    end
    $$`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`
    create or replace function revisions_guard() returns trigger language plpgsql as $$
    begin
      if tg_op = 'DELETE' then
        raise exception 'DELETE on revisions is refused: revisions are records' using errcode = 'WS001';
      end if;
      if new.id <> old.id or new.sheet_id <> old.sheet_id or new.version_number <> old.version_number or new.version_sha256 <> old.version_sha256
         or new.code <> old.code or new.sequence <> old.sequence or new.issued_by <> old.issued_by or new.issued_at <> old.issued_at
         or new.pdf_key <> old.pdf_key or new.pdf_sha256 <> old.pdf_sha256 or new.pdf_size <> old.pdf_size
         or new.verification_code <> old.verification_code or new.check_id <> old.check_id or new.issue_job_id <> old.issue_job_id then
        raise exception 'an issued revision and its PDF never change' using errcode = 'WS001';
      end if;
      if old.stamped_sha256 is not null and (new.stamped_sha256 is distinct from old.stamped_sha256 or new.stamped_key is distinct from old.stamped_key) then
        raise exception 'the stamped copy of a revision is made once' using errcode = 'WS001';
      end if;
      if new.status <> old.status and not (
           (old.status = 'current' and new.status in ('superseded', 'withdrawn'))
        or (old.status = 'superseded' and new.status = 'withdrawn')) then
        raise exception 'a revision cannot go from % to %', old.status, new.status using errcode = 'WS003';
      end if;
      if new.status = 'withdrawn' and (new.withdrawn_reason is null or length(btrim(new.withdrawn_reason)) = 0) then
        raise exception 'withdrawing a revision needs a reason' using errcode = 'WS003';
      end if;
      return new;
    end
    $$`.execute(db);
}
