// Comment threads on a check: the checker opens one on a cell (or one of its statement lines), the
// check's people reply, and the checker resolves it; signing as checked waits for every open one.
// After a return the open threads are answered on the returned check until the sheet is submitted
// again, and the next check carries them (threadRoots in context.ts). Who may do which: policy.ts.
import { sql, type Kysely } from 'kysely';
import type { z } from 'zod';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors/app-error';
import type { Cell } from '@/lib/sheets/content';
import { getVersion } from '@/lib/sheets/sheets';
import { enforce, policyFor, requireCheck, threadRoots } from './context';
import type { commentSchema } from './workflow';

export async function addComment(
  db: Kysely<Database>,
  actor: Actor,
  checkId: string,
  input: z.infer<typeof commentSchema>,
) {
  const { check, roles } = await requireCheck(db, actor, checkId);
  const { policy } = await policyFor(db, check, actor, roles);
  await enforce(db, actor, check, input.threadId ? policy.reply : policy.openThread, 'comment');
  let cellId = input.cellId;
  let line = input.statementLine;
  if (input.threadId) {
    const thread = await threadRoots(db, check)
      .select(['t.id', 't.cell_id', 't.statement_line', 't.thread_id', 't.resolved_at'])
      .where('t.id', '=', input.threadId)
      .executeTakeFirst();
    if (!thread || thread.thread_id !== null) throw new AppError('not_found', 'No such comment thread on this check.');
    if (thread.resolved_at) throw new AppError('conflict', 'This thread is resolved.');
    cellId = thread.cell_id;
    line = thread.statement_line;
  } else {
    const version = await getVersion(db, check.sheet_id, check.version_number);
    const base = check.base_version_number ? await getVersion(db, check.sheet_id, check.base_version_number) : null;
    const known = new Set(
      [
        ...(version?.content.cells ?? []),
        ...(base?.content.cells ?? []),
        ...((check.alternate_cells as Cell[]) ?? []),
      ].map((c) => c.id),
    );
    if (!known.has(cellId)) throw new AppError('bad_request', `cellId: the version under check has no cell ${cellId}`);
  }
  return db.transaction().execute(async (trx) => {
    const row = await trx
      .insertInto('check_comments')
      .values({
        check_id: check.id,
        thread_id: input.threadId ?? null,
        cell_id: cellId,
        statement_line: line,
        author_id: actor.userId,
        body: input.body,
      })
      .returning(['id', 'created_at'])
      .executeTakeFirstOrThrow();
    await recordAudit(trx, actor, {
      action: input.threadId ? 'comment.reply' : 'comment.open',
      objectType: 'check',
      objectId: check.id,
      projectId: check.project_id,
      newValue: { commentId: row.id, cellId, line },
    });
    return { id: row.id };
  });
}

export async function resolveThread(db: Kysely<Database>, actor: Actor, checkId: string, commentId: string) {
  const { check, roles } = await requireCheck(db, actor, checkId);
  const { policy } = await policyFor(db, check, actor, roles);
  await enforce(db, actor, check, policy.resolveThread, 'resolve');
  // Not a uuid: no such thread (rather than PostgreSQL's error about the uuid's syntax).
  if (!/^[0-9a-f-]{36}$/.test(commentId)) throw new AppError('conflict', 'No open thread with this id on this check.');
  return db.transaction().execute(async (trx) => {
    const row = await trx
      .updateTable('check_comments')
      .set({ resolved_at: sql`now()`, resolved_by: actor.userId })
      .where('id', '=', commentId)
      .where('id', 'in', threadRoots(trx, check).select('t.id'))
      .where('resolved_at', 'is', null)
      .returning('id')
      .executeTakeFirst();
    if (!row) throw new AppError('conflict', 'No open thread with this id on this check.');
    await recordAudit(trx, actor, {
      action: 'comment.resolve',
      objectType: 'check',
      objectId: check.id,
      projectId: check.project_id,
      newValue: { commentId },
    });
    return { ok: true };
  });
}
