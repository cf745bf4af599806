// The home page's work for each role (lib/home/my-work.ts): returned sheets and drafts for their
// originator, the checker's and approver's queues, approved versions waiting for issue for document
// control; void sheets are no one's work, and a person without a role has no section for it.
import { sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import { decide } from '../../lib/checks/decide';
import { saveCheckWork } from '../../lib/checks/work';
import { submitForCheck } from '../../lib/checks/submit';
import { myWork, workCount } from '../../lib/home/my-work';
import { voidSheet } from '../../lib/sheets/void';
import { approveNewVersion, makeSheet, makeTeam } from '../support/approved-sheet';
import { testDb } from '../support/database';
import { PASSWORD } from '../support/people';

describe('my work', () => {
  it('gives each role its section, and counts what waits', async () => {
    const db = testDb();
    const t = await makeTeam(db, { code: 'HOME' });
    const project = { id: t.projectId, code: 'HOME' };
    const draft = await makeSheet(db, t.author, project, { title: 'Draft only' });
    const returned = await makeSheet(db, t.author, project, { title: 'Returned by the checker' });
    const inCheck = await makeSheet(db, t.author, project, { title: 'In check' });
    const awaitingApproval = await makeSheet(db, t.author, project, { title: 'Checked, awaiting approval' });
    const approved = await makeSheet(db, t.author, project, { title: 'Approved, not issued' });
    const voided = await makeSheet(db, t.author, project, { title: 'Started by mistake' });

    const r = await submitForCheck(db, t.author, returned, {
      versionNumber: 1,
      checkerId: t.checker.userId,
      password: PASSWORD,
    });
    await decide(db, t.checker, r.id, { action: 'return', reason: 'objective missing' });
    await submitForCheck(db, t.author, inCheck, { versionNumber: 1, checkerId: t.checker.userId, password: PASSWORD });
    const a = await submitForCheck(db, t.author, awaitingApproval, {
      versionNumber: 1,
      checkerId: t.checker.userId,
      password: PASSWORD,
    });
    await saveCheckWork(db, t.checker, a.id, { verificationMethod: 'design_review' });
    await decide(db, t.checker, a.id, { action: 'sign', password: PASSWORD });
    await approveNewVersion(db, t, approved, {
      message: 'for issue',
      cells: [{ id: 'c1', kind: 'calc', source: 'x = 1 m' }],
    });
    await voidSheet(db, t.author, ['originator'], voided.id, { reason: 'duplicate' });

    const author = await myWork(db, t.author);
    expect(author.returned?.map((s) => s.id)).toEqual([returned.id]);
    expect(author.drafts?.map((s) => s.id)).toEqual([draft.id]);
    expect([author.toCheck, author.toApprove, author.toIssue]).toEqual([null, null, null]);
    expect(workCount(author)).toBe(1);

    const checker = await myWork(db, t.checker);
    expect(checker.toCheck?.map((c) => c.sheet.title)).toEqual(['In check']);
    expect([checker.returned, checker.drafts, checker.toApprove, checker.toIssue]).toEqual([null, null, null, null]);
    expect(workCount(checker)).toBe(1);

    const approver = await myWork(db, t.approver);
    expect(approver.toApprove?.map((c) => [c.sheet.title, c.eligible])).toEqual([['Checked, awaiting approval', true]]);
    expect(workCount(approver)).toBe(1);

    const controller = await myWork(db, t.controller);
    expect(controller.toIssue?.map((s) => [s.id, s.versionNumber])).toEqual([[approved.id, 2]]);
    expect(workCount(controller)).toBe(1);
  });
});

it('does not list starter sheets among the drafts: they are worked examples to start from, not work waiting', async () => {
  const db = testDb();
  const team = await makeTeam(db, { code: 'STRT' });
  const mine = await makeSheet(db, team.author, { id: team.projectId, code: 'STRT' }, { title: 'My draft' });
  const starter = await makeSheet(
    db,
    team.author,
    { id: team.projectId, code: 'STRT' },
    { title: 'Starter — worked example' },
  );
  await sql`update sheets set starter = true where id = ${starter.id}`.execute(db);
  const work = await myWork(db, team.author);
  expect(work.drafts?.map((s) => s.id)).toEqual([mine.id]);
});
