import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration imports nothing from the application.
//
// The audit trail is append-only and hash-chained inside the database: a BEFORE INSERT trigger takes
// a transaction lock, numbers the event, and sets prev_hash to the hash of the event before it and
// hash to SHA-256(prev_hash | canonical payload). Editing or removing any event breaks the chain at
// that point, which audit_chain_breaks() reports.

export async function up(db: Kysely<any>): Promise<void> {
  await sql`create sequence audit_events_id_seq as bigint`.execute(db);
  await db.schema
    .createTable('audit_events')
    .addColumn('id', 'bigint', (c) => c.primaryKey())
    .addColumn('occurred_at', 'timestamptz', (c) => c.notNull())
    .addColumn('actor_id', 'uuid', (c) => c.references('users.id'))
    .addColumn('project_id', 'uuid', (c) => c.references('projects.id'))
    .addColumn('action', 'text', (c) => c.notNull().check(sql`action ~ '^[a-z][a-z0-9_.-]*$'`))
    .addColumn('object_type', 'text', (c) => c.notNull())
    .addColumn('object_id', 'text')
    .addColumn('old_value', 'jsonb')
    .addColumn('new_value', 'jsonb')
    .addColumn('reason', 'text')
    .addColumn('prev_hash', 'text', (c) => c.notNull())
    .addColumn('hash', 'text', (c) => c.notNull().unique())
    .execute();
  await db.schema
    .createIndex('audit_events_object_idx')
    .on('audit_events')
    .columns(['object_type', 'object_id'])
    .execute();
  await db.schema.createIndex('audit_events_project_idx').on('audit_events').column('project_id').execute();

  await sql`
    create function audit_event_payload(e audit_events) returns text language sql stable as $$
      select jsonb_build_object(
        'id', e.id,
        'at_us', (extract(epoch from e.occurred_at) * 1000000)::bigint,
        'actor', e.actor_id,
        'project', e.project_id,
        'action', e.action,
        'object_type', e.object_type,
        'object_id', e.object_id,
        'old', e.old_value,
        'new', e.new_value,
        'reason', e.reason
      )::text
    $$`.execute(db);

  await sql`
    create function audit_events_chain() returns trigger language plpgsql as $$
    declare
      last_hash text;
    begin
      perform pg_advisory_xact_lock(hashtext('worldsheet.audit_events'));
      new.id := nextval('audit_events_id_seq');
      new.occurred_at := clock_timestamp();
      select hash into last_hash from audit_events order by id desc limit 1;
      new.prev_hash := coalesce(last_hash, repeat('0', 64));
      new.hash := encode(sha256(convert_to(new.prev_hash || '|' || audit_event_payload(new), 'UTF8')), 'hex');
      return new;
    end
    $$`.execute(db);
  await sql`create trigger audit_events_chain before insert on audit_events
            for each row execute function audit_events_chain()`.execute(db);
  await sql`create trigger audit_events_refuse_update_delete before update or delete on audit_events
            for each row execute function worldsheet_refuse_change()`.execute(db);
  await sql`create trigger audit_events_refuse_truncate before truncate on audit_events
            for each statement execute function worldsheet_refuse_change()`.execute(db);

  await sql`
    create function audit_chain_breaks() returns table (id bigint, problem text) language sql stable as $$
      select checked.id, checked.problem
      from (
        select e.id,
               case
                 when e.prev_hash is distinct from coalesce(lag(e.hash) over (order by e.id), repeat('0', 64))
                   then 'prev_hash does not match the hash of the event before'
                 when e.hash <> encode(sha256(convert_to(e.prev_hash || '|' || audit_event_payload(e), 'UTF8')), 'hex')
                   then 'hash does not match the recorded content'
               end as problem
        from audit_events e
      ) checked
      where checked.problem is not null
      order by checked.id
    $$`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop function audit_chain_breaks()`.execute(db);
  await sql`drop trigger audit_events_chain on audit_events`.execute(db);
  await sql`drop function audit_events_chain()`.execute(db);
  await sql`drop function audit_event_payload(audit_events)`.execute(db);
  await db.schema.dropTable('audit_events').execute();
  await sql`drop sequence audit_events_id_seq`.execute(db);
}
