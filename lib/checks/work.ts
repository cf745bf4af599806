// The checker's own work on a check: the verification method, notes, alternate calculation cells
// (evaluated and stored with the check) and the tolerance of the comparison, and the confirmation of
// work carried over from a returned check. Audited as `check.work` with old and new values.
import { sql, type Kysely } from 'kysely';
import type { z } from 'zod';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { recordAudit } from '@/lib/audit/record';
import type { SheetResult } from '@/lib/calc/types';
import { evaluateInContext } from '@/lib/sheets/evaluate-in-context';
import { parseTolerance } from './alternate-comparison';
import { readCarriedOver, type CarriedField } from './carried-over';
import { enforce, policyFor, requireCheck } from './context';
import { checkPolicy } from './policy';
import type { checkWorkSchema } from './workflow';

const canonicalJson = (v: unknown): string =>
  JSON.stringify(v, (_k, x) =>
    x && typeof x === 'object' && !Array.isArray(x)
      ? Object.fromEntries(Object.entries(x).sort(([a], [b]) => (a < b ? -1 : 1)))
      : x,
  );

export async function saveCheckWork(
  db: Kysely<Database>,
  actor: Actor,
  checkId: string,
  input: z.infer<typeof checkWorkSchema>,
) {
  const { check, roles } = await requireCheck(db, actor, checkId);
  const { policy, facts } = await policyFor(db, check, actor, roles);
  await enforce(db, actor, check, policy.recordWork, 'work');
  let results: SheetResult | null | undefined;
  if (input.alternateCells) {
    // Evaluated as a save (stored with the check), with the checked version's settings and the sheet's citations.
    results = input.alternateCells.length
      ? (
          await evaluateInContext(db, {
            cells: input.alternateCells,
            settings: { ofVersion: check.version_number },
            sheet: { id: check.sheet_id, projectId: check.project_id },
            run: { kind: 'save', userId: actor.userId, affinity: `check:${check.id}` },
          })
        ).results
      : null;
  }
  const given = {
    method: input.verificationMethod !== undefined,
    notes: input.checkerNotes !== undefined,
    cells: input.alternateCells !== undefined,
    tolerance: input.tolerance !== undefined,
    confirm: input.confirmCarriedOver === true,
  };
  if (!given.method && !given.notes && !given.cells && !given.tolerance && !given.confirm)
    return { ok: true, alternateResults: null };
  return db.transaction().execute(async (trx) => {
    // The values before the change, read under a row lock, so that the audit event records them exactly.
    const before = await trx
      .selectFrom('checks')
      .select(['state', 'verification_method', 'checker_notes', 'alternate_cells', 'tolerance_text', 'carried_over'])
      .where('id', '=', check.id)
      .forUpdate()
      .executeTakeFirstOrThrow();
    // The policy read again on the locked row: the check may have been decided since.
    const now = checkPolicy({ ...check, ...before }, actor, roles, {
      ...facts,
      carriedOver: readCarriedOver(before.carried_over),
    });
    await enforce(db, actor, check, given.confirm ? now.confirmCarriedOver : now.recordWork, 'work');
    const tolerance = input.tolerance ? parseTolerance(input.tolerance) : null;
    // A carried-over field the checker changes is their own work from now on; one saved unchanged stays marked.
    const edited = new Set<CarriedField>();
    if (given.method && input.verificationMethod !== before.verification_method) edited.add('verificationMethod');
    if (given.notes && input.checkerNotes !== before.checker_notes) edited.add('checkerNotes');
    if (given.cells && canonicalJson(input.alternateCells) !== canonicalJson(before.alternate_cells))
      edited.add('alternateCells');
    if (given.tolerance && (input.tolerance ?? null) !== before.tolerance_text) edited.add('tolerance');
    const carriedBefore = readCarriedOver(before.carried_over);
    const carried = carriedBefore
      ? {
          ...carriedBefore,
          fields: carriedBefore.fields.filter((f) => !edited.has(f)),
          ...(given.confirm && !carriedBefore.confirmedAt
            ? { confirmedAt: new Date().toISOString(), confirmedBy: actor.name }
            : {}),
        }
      : null;
    await trx
      .updateTable('checks')
      .set({
        ...(given.method ? { verification_method: input.verificationMethod } : {}),
        ...(given.notes ? { checker_notes: input.checkerNotes } : {}),
        ...(input.alternateCells
          ? {
              alternate_cells: JSON.stringify(input.alternateCells),
              alternate_results: results ? JSON.stringify(results) : null,
            }
          : {}),
        ...(given.tolerance
          ? { tolerance: tolerance?.ok ? tolerance.value : null, tolerance_text: input.tolerance || null }
          : {}),
        ...(carried ? { carried_over: JSON.stringify(carried) } : {}),
        updated_at: sql`now()`,
      })
      .where('id', '=', check.id)
      .execute();
    const oldValue: Record<string, unknown> = {};
    const newValue: Record<string, unknown> = {};
    if (given.method)
      [oldValue.verificationMethod, newValue.verificationMethod] = [
        before.verification_method,
        input.verificationMethod,
      ];
    if (given.notes) [oldValue.checkerNotes, newValue.checkerNotes] = [before.checker_notes, input.checkerNotes];
    if (given.cells)
      [oldValue.alternateCells, newValue.alternateCells] = [before.alternate_cells, input.alternateCells];
    if (given.tolerance) [oldValue.tolerance, newValue.tolerance] = [before.tolerance_text, input.tolerance || null];
    if (carried && JSON.stringify(carried) !== JSON.stringify(carriedBefore))
      [oldValue.carriedOver, newValue.carriedOver] = [carriedBefore, carried];
    await recordAudit(trx, actor, {
      action: 'check.work',
      objectType: 'check',
      objectId: check.id,
      projectId: check.project_id,
      oldValue,
      newValue,
    });
    return { ok: true, alternateResults: results ?? null };
  });
}
