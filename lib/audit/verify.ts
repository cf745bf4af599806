// Walks the audit chain: each event's hash must be SHA-256(previous hash | its canonical payload)
// and its prev_hash the hash of the event before. The database renders the canonical payload
// (audit_event_payload); the hashing and the walk happen here, independently of the database's
// own check.
import { createHash } from 'node:crypto';
import { sql, type Kysely } from 'kysely';
import type { Database } from '@/db/schema';

export interface ChainReport {
  ok: boolean;
  events: number;
  firstBroken: { id: string; problem: string } | null;
}

export async function verifyAuditChain(db: Kysely<Database>, batch = 5000): Promise<ChainReport> {
  let previous = '0'.repeat(64);
  let lastId = 0n;
  let count = 0;
  for (;;) {
    const rows = await sql<{ id: string; prev_hash: string; hash: string; payload: string }>`
      select e.id, e.prev_hash, e.hash, audit_event_payload(e) as payload
      from audit_events e where e.id > ${lastId.toString()} order by e.id limit ${batch}`.execute(db);
    for (const r of rows.rows) {
      count++;
      if (r.prev_hash !== previous)
        return {
          ok: false,
          events: count,
          firstBroken: { id: r.id, problem: 'it does not follow the event before it (prev_hash differs)' },
        };
      const expected = createHash('sha256').update(`${r.prev_hash}|${r.payload}`, 'utf8').digest('hex');
      if (expected !== r.hash)
        return {
          ok: false,
          events: count,
          firstBroken: { id: r.id, problem: 'its content no longer matches its hash' },
        };
      previous = r.hash;
      lastId = BigInt(r.id);
    }
    if (rows.rows.length < batch) break;
  }
  return { ok: true, events: count, firstBroken: null };
}
