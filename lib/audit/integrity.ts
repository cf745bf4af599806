// The installation's integrity: whether the records still hold what they promise. Every version's
// content hashes to its content_hash; every signature, check and revision cites its version's hash;
// every revision's PDF (and stamped copy) and every attachment in the object store hashes to the
// SHA-256 its row records; the audit chain is intact (walked by lib/audit/verify.ts and asked of the
// database's own audit_chain_breaks()). Run after a restore (lib/ops/backup.ts) and by the `backup`
// and `restore` commands (lib/ops/commands.ts).
import { createHash } from 'node:crypto';
import { sql, type Kysely } from 'kysely';
import { createDb } from '../../db/index';
import type { Database } from '../../db/schema';
import type { VersionContent } from '../sheets/content';
import { contentHash } from '../sheets/content-hash';
import type { ObjectStore } from '../storage/object-store';
import { verifyAuditChain } from './verify';

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

export interface InstallationReport {
  ok: boolean;
  counts: { versions: number; revisions: number; stampedCopies: number; attachments: number; auditEvents: number };
  /** One line per problem, naming the record and what does not match. */
  problems: string[];
}

/**
 * Checks what the records promise: every version's content hashes to its content_hash, every
 * signature and revision cites its version's hash, every revision's PDF (and stamped copy) and every
 * attachment in the object store hashes to the SHA-256 its row records, and the audit chain is
 * intact (walked here and by the database's own audit_chain_breaks()).
 */
export async function verifyInstallation(
  db: Kysely<Database>,
  store: ObjectStore,
  options: { batch?: number } = {},
): Promise<InstallationReport> {
  const batch = options.batch ?? 200;
  const problems: string[] = [];
  const counts = { versions: 0, revisions: 0, stampedCopies: 0, attachments: 0, auditEvents: 0 };
  // A backup made before a migration restores at that migration's level: tables that came later are
  // absent, not broken, and have nothing to verify.
  const present = new Set(
    (
      await sql<{ tablename: string }>`select tablename from pg_tables where schemaname = 'public'`.execute(db)
    ).rows.map((r) => r.tablename),
  );

  let lastId: string | null = null;
  while (present.has('versions')) {
    let q = db
      .selectFrom('versions')
      .innerJoin('sheets', 'sheets.id', 'versions.sheet_id')
      .innerJoin('projects', 'projects.id', 'sheets.project_id')
      .select([
        'versions.id',
        'versions.number',
        'versions.content',
        'versions.content_hash',
        'sheets.number as sheet_number',
        'projects.code',
      ])
      .orderBy('versions.id')
      .limit(batch);
    if (lastId) q = q.where('versions.id', '>', lastId);
    const rows = await q.execute();
    for (const v of rows) {
      counts.versions++;
      if (contentHash(v.content as VersionContent) !== v.content_hash) {
        problems.push(
          `version ${v.number} of sheet ${v.code} #${v.sheet_number} (${v.id}): its content no longer hashes to ${v.content_hash}`,
        );
      }
    }
    if (rows.length < batch) break;
    lastId = rows[rows.length - 1].id;
  }

  // Results stored by cell (migration 20261205T000100): every cell a version lists is stored, and
  // every stored cell still hashes to its key.
  if (present.has('result_cells')) {
    const missing = await sql<{ version_id: string; cell_index: number }>`
      select version_id, cell_index from version_result_cells_missing()`.execute(db);
    for (const m of missing.rows.slice(0, 20))
      problems.push(`version ${m.version_id}: the result of its cell at position ${m.cell_index + 1} is missing`);
    if (missing.rows.length > 20) problems.push(`… and ${missing.rows.length - 20} more missing cell results`);
    const altered = await sql<{ hash: string }>`
      select encode(hash, 'hex') as hash from result_cells
      where hash <> sha256(convert_to(result::text, 'UTF8'))`.execute(db);
    for (const a of altered.rows) problems.push(`cell result ${a.hash}: its stored text no longer hashes to its key`);
  }

  for (const table of ['signatures', 'revisions', 'checks'] as const) {
    if (!present.has(table)) continue;
    const r = await sql<{ id: string }>`
      select t.id from ${sql.table(table)} t
      left join versions v on v.sheet_id = t.sheet_id and v.number = t.version_number
      where v.content_hash is distinct from t.version_sha256`.execute(db);
    for (const row of r.rows)
      problems.push(`${table.replace(/s$/, '')} ${row.id}: cites a version hash that its version does not have`);
  }

  const checkObject = async (what: string, key: string, expected: string, size?: string) => {
    const bytes = await store.get(key);
    if (!bytes) return problems.push(`${what}: the object ${key} is missing from the store`);
    if (sha256(bytes) !== expected)
      return problems.push(`${what}: the object ${key} does not hash to the recorded ${expected}`);
    if (size !== undefined && String(bytes.length) !== String(size))
      problems.push(`${what}: the object ${key} is ${bytes.length} bytes, the record says ${size}`);
  };

  const revisions = !present.has('revisions')
    ? []
    : await db
        .selectFrom('revisions')
        .select(['id', 'code', 'pdf_key', 'pdf_sha256', 'pdf_size', 'stamped_key', 'stamped_sha256'])
        .orderBy('id')
        .execute();
  for (const r of revisions) {
    counts.revisions++;
    await checkObject(`revision ${r.code} (${r.id}) PDF`, r.pdf_key, r.pdf_sha256, r.pdf_size);
    if (r.stamped_key || r.stamped_sha256) {
      counts.stampedCopies++;
      if (!r.stamped_key || !r.stamped_sha256)
        problems.push(`revision ${r.code} (${r.id}): a stamped copy is recorded without both its key and its SHA-256`);
      else await checkObject(`revision ${r.code} (${r.id}) stamped copy`, r.stamped_key, r.stamped_sha256);
    }
  }

  const attachments = !present.has('attachments')
    ? []
    : await db
        .selectFrom('attachments')
        .select(['id', 'name', 'storage_key', 'sha256', 'size'])
        .orderBy('id')
        .execute();
  for (const a of attachments) {
    counts.attachments++;
    await checkObject(`attachment ${a.name} (${a.id})`, a.storage_key, a.sha256, a.size);
  }

  if (!present.has('audit_events')) return { ok: problems.length === 0, counts, problems };
  const chain = await verifyAuditChain(db);
  counts.auditEvents = chain.events;
  if (!chain.ok && chain.firstBroken)
    problems.push(`audit event ${chain.firstBroken.id}: ${chain.firstBroken.problem}`);
  const breaks = await sql<{ id: string; problem: string }>`select id, problem from audit_chain_breaks()`.execute(db);
  for (const b of breaks.rows.slice(0, 20)) problems.push(`audit event ${b.id} (database check): ${b.problem}`);
  if (breaks.rows.length > 20) problems.push(`… and ${breaks.rows.length - 20} more audit events the database reports`);
  if (!chain.ok) {
    const total = await db
      .selectFrom('audit_events')
      .select((eb) => eb.fn.countAll<string>().as('n'))
      .executeTakeFirstOrThrow();
    counts.auditEvents = Number(total.n);
  }

  return { ok: problems.length === 0, counts, problems };
}

/** verifyInstallation on a connection string (for the commands). */
export async function verifyInstallationAt(databaseUrl: string, store: ObjectStore): Promise<InstallationReport> {
  const db = createDb(databaseUrl, { max: 2 });
  try {
    return await verifyInstallation(db, store);
  } finally {
    await db.destroy();
  }
}
