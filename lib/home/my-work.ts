// A signed-in person's work, for the home page and the counts in the navigation: for an originator
// the sheets they created that were returned to them, and their drafts; for a checker the checks
// assigned to them; for an approver the checked versions waiting for approval in their projects (the
// independence rules say in the approval queue whether they may approve each); for a document
// controller the approved versions not yet issued. Void sheets are no one's work. A section is
// present (possibly empty) only when the person holds the role in some project.
import { sql, type Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { listQueue } from '@/lib/checks/queries';
import { sheetStatuses } from '@/lib/checks/status';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';

export interface WorkSheet {
  id: string;
  number: number;
  code: string;
  title: string;
  projectCode: string;
  latestVersion: number;
}

export interface MyWork {
  returned: WorkSheet[] | null;
  drafts: WorkSheet[] | null;
  toCheck: Awaited<ReturnType<typeof listQueue>> | null;
  toApprove: Awaited<ReturnType<typeof listQueue>> | null;
  toIssue: Array<WorkSheet & { versionNumber: number; checkId: string }> | null;
}

export async function myWork(db: Kysely<Database>, actor: Actor): Promise<MyWork> {
  const roles = new Set(
    (await db.selectFrom('project_members').select('role').where('user_id', '=', actor.userId).execute()).map(
      (r) => r.role,
    ),
  );
  const [own, toCheck, toApprove, toIssue] = await Promise.all([
    roles.has('originator') ? ownSheets(db, actor) : null,
    roles.has('checker') ? listQueue(db, actor, 'check') : null,
    roles.has('approver') ? listQueue(db, actor, 'approval') : null,
    roles.has('controller') ? awaitingIssue(db, actor) : null,
  ]);
  return { returned: own?.returned ?? null, drafts: own?.drafts ?? null, toCheck, toApprove, toIssue };
}

/** The number in the navigation: everything waiting on this person. */
export function workCount(work: MyWork): number {
  return (
    (work.returned?.length ?? 0) +
    (work.toCheck?.length ?? 0) +
    (work.toApprove?.filter((c) => c.eligible).length ?? 0) +
    (work.toIssue?.length ?? 0)
  );
}

/** What the navigation shows beside its links: all of it on "My work", and each queue on its own link. */
export interface NavigationCounts {
  work: number;
  checks: number;
  approvals: number;
  issue: number;
}

export function navigationCounts(work: MyWork): NavigationCounts {
  return {
    work: workCount(work),
    checks: work.toCheck?.length ?? 0,
    approvals: work.toApprove?.filter((c) => c.eligible).length ?? 0,
    issue: work.toIssue?.length ?? 0,
  };
}

async function ownSheets(db: Kysely<Database>, actor: Actor) {
  const rows = await db
    .selectFrom('sheets as s')
    .innerJoin('projects as p', 'p.id', 's.project_id')
    .innerJoin('project_members as m', (j) =>
      j.onRef('m.project_id', '=', 's.project_id').on('m.user_id', '=', actor.userId).on('m.role', '=', 'originator'),
    )
    .innerJoin(
      (eb) =>
        eb
          .selectFrom('versions')
          .select(['sheet_id', sql<number>`max(number)`.as('latest')])
          .groupBy('sheet_id')
          .as('v'),
      (j) => j.onRef('v.sheet_id', '=', 's.id'),
    )
    .select(['s.id', 's.number', 's.title', 'p.code', 'v.latest'])
    .where('s.created_by', '=', actor.userId)
    .where('s.voided_at', 'is', null)
    // Starter sheets are worked examples to start from, not work waiting (lib/sheets/start-from.ts).
    .where('s.starter', '=', false)
    .orderBy('p.code')
    .orderBy('s.number')
    .execute();
  const statuses = await sheetStatuses(
    db,
    rows.map((r) => ({ id: r.id, latestVersion: Number(r.latest) })),
  );
  const sheet = (r: (typeof rows)[number]): WorkSheet => ({
    id: r.id,
    number: r.number,
    code: formatSheetNumber(r.code, r.number),
    title: r.title,
    projectCode: r.code,
    latestVersion: Number(r.latest),
  });
  return {
    returned: rows.filter((r) => statuses.get(r.id) === 'returned').map(sheet),
    drafts: rows.filter((r) => statuses.get(r.id) === 'draft').map(sheet),
  };
}

/** Approved versions of sheets in the person's controller projects with no revision issued from them. */
async function awaitingIssue(db: Kysely<Database>, actor: Actor) {
  const rows = await db
    .selectFrom('checks as c')
    .innerJoin('sheets as s', 's.id', 'c.sheet_id')
    .innerJoin('projects as p', 'p.id', 'c.project_id')
    .innerJoin('project_members as m', (j) =>
      j.onRef('m.project_id', '=', 'c.project_id').on('m.user_id', '=', actor.userId).on('m.role', '=', 'controller'),
    )
    .innerJoin(
      (eb) =>
        eb
          .selectFrom('versions')
          .select(['sheet_id', sql<number>`max(number)`.as('latest')])
          .groupBy('sheet_id')
          .as('v'),
      (j) => j.onRef('v.sheet_id', '=', 's.id'),
    )
    .select(['c.id', 'c.version_number', 's.id as sheet_id', 's.number', 's.title', 'p.code', 'v.latest'])
    .where('c.state', '=', 'approved')
    .where('s.voided_at', 'is', null)
    .where((eb) =>
      eb.not(
        eb.exists(
          eb
            .selectFrom('revisions as r')
            .select('r.id')
            .whereRef('r.sheet_id', '=', 'c.sheet_id')
            .whereRef('r.version_number', '=', 'c.version_number'),
        ),
      ),
    )
    // Only the newest approved version of a sheet waits: an older approved version is not issued after a newer one.
    .where((eb) =>
      eb.not(
        eb.exists(
          eb
            .selectFrom('checks as n')
            .select('n.id')
            .whereRef('n.sheet_id', '=', 'c.sheet_id')
            .where('n.state', '=', 'approved')
            .whereRef('n.version_number', '>', 'c.version_number'),
        ),
      ),
    )
    .orderBy('c.updated_at')
    .execute();
  return rows.map((r) => ({
    id: r.sheet_id,
    number: r.number,
    code: formatSheetNumber(r.code, r.number),
    title: r.title,
    projectCode: r.code,
    latestVersion: Number(r.latest),
    versionNumber: r.version_number,
    checkId: r.id,
  }));
}
