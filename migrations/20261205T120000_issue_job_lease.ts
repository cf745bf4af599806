import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.
//
// An issue request worked by one of several job workers carries a lease: which worker holds it and
// until when (renewed while it works). Another worker takes over a pending request whose lease has
// lapsed (its worker died), instead of waiting for the queue to expire the job.

export async function up(db: Kysely<any>): Promise<void> {
  await sql`alter table issue_jobs add column lease_owner text, add column lease_expires_at timestamptz`.execute(db);
  await sql`create index issue_jobs_pending_lease_idx on issue_jobs (lease_expires_at) where state = 'pending'`.execute(
    db,
  );
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop index issue_jobs_pending_lease_idx`.execute(db);
  await sql`alter table issue_jobs drop column lease_expires_at, drop column lease_owner`.execute(db);
}
