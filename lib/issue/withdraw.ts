// Withdrawing an issued revision: document control marks it withdrawn with a reason, once, audited;
// it stays in the register and downloads stamped "withdrawn" from then on.
import { sql, type Kysely } from 'kysely';
import { z } from 'zod';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors/app-error';
import { getRevision } from './register';

export const withdrawSchema = z.object({
  reason: z.string().trim().min(1, 'say why the revision is withdrawn').max(5000),
});

export async function withdrawRevision(db: Kysely<Database>, actor: Actor, revisionId: string, reason: string) {
  const r = await getRevision(db, revisionId);
  if (!r) throw new AppError('not_found', 'No such revision.');
  if (r.status === 'withdrawn')
    throw new AppError('conflict', `Revision ${r.code} is withdrawn already.`, { status: r.status });
  return db.transaction().execute(async (trx) => {
    const moved = await trx
      .updateTable('revisions')
      .set({ status: 'withdrawn', withdrawn_at: sql`now()`, withdrawn_by: actor.userId, withdrawn_reason: reason })
      .where('id', '=', r.id)
      .where('status', '=', r.status)
      .returning('id')
      .executeTakeFirst();
    if (!moved) throw new AppError('conflict', 'The revision changed meanwhile; reload and try again.');
    await recordAudit(trx, actor, {
      action: 'revision.withdraw',
      objectType: 'sheet',
      objectId: r.sheet_id,
      projectId: r.project_id,
      oldValue: { revision: r.code, status: r.status },
      newValue: { status: 'withdrawn' },
      reason,
    });
    return { id: r.id, status: 'withdrawn' as const };
  });
}
