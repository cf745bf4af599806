// A re-check after a return: the check detail carries the comparison since the returned version (by
// the checker or by the approver), beside the comparison since the last approved version; a check
// after an approval, or a sheet's first check, carries none.
import { beforeEach, expect, it } from 'vitest';
import type { Actor } from '../../lib/auth/actor';
import { decide } from '../../lib/checks/decide';
import { getCheckDetail } from '../../lib/checks/queries';
import { saveCheckWork } from '../../lib/checks/work';
import { submitForCheck } from '../../lib/checks/submit';
import { createSheet, getVersion, saveVersion } from '../../lib/sheets/sheets';
import { testDb } from '../support/database';
import { makeProject, makeUser, PASSWORD } from '../support/people';

let author: Actor;
let checker: Actor;
let approver: Actor;
let sheet: { id: string; project_id: string; number: number; title: string };

async function edit(source: string, conclusions = '') {
  const latest = (await getVersion(testDb(), sheet.id))!;
  return saveVersion(testDb(), author, sheet, {
    parentNumber: latest.number,
    message: 'edit',
    content: {
      ...latest.content,
      record: { ...latest.content.record, conclusions },
      cells: [{ id: 'c1', kind: 'calc', source }],
    },
  });
}

beforeEach(async () => {
  const db = testDb();
  author = await makeUser(db, 'author@example.test');
  checker = await makeUser(db, 'checker@example.test');
  approver = await makeUser(db, 'approver@example.test');
  const projectId = await makeProject(db, 'BEAM', [
    [author, 'originator'],
    [checker, 'checker'],
    [approver, 'approver'],
  ]);
  const created = await createSheet(
    db,
    author,
    { id: projectId, code: 'BEAM' },
    { title: 'Dipole field', safetyRelated: false, objective: '' },
  );
  sheet = { id: created.id, project_id: projectId, number: created.number, title: 'Dipole field' };
  await edit('rho = 1.5 m');
});

it('compares a resubmission with the version the checker returned, and the first check with nothing', async () => {
  const db = testDb();
  const first = await submitForCheck(db, author, sheet, {
    versionNumber: 2,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  expect((await getCheckDetail(db, checker, first.id)).sinceReturn).toBeNull();
  await decide(db, checker, first.id, { action: 'return', reason: 'State the conclusion.' });
  await edit('rho = 1.5 m', 'The radius is as drawn.');
  await edit('rho = 1.50 m', 'The radius is as drawn.');
  const again = await submitForCheck(db, author, sheet, {
    versionNumber: 4,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  const detail = await getCheckDetail(db, checker, again.id);
  // No approved version: the main comparison is the whole sheet; the re-check's is since version 2.
  expect(detail.comparison.firstCheck).toBe(true);
  expect(detail.sinceReturn).toMatchObject({
    checkId: first.id,
    state: 'returned',
    versionNumber: 2,
    returnedById: checker.userId,
    returnedBy: checker.name,
    returnReason: 'State the conclusion.',
  });
  const since = detail.sinceReturn!.comparison;
  expect(since.firstCheck).toBe(false);
  expect(since.cells.map((c) => c.status)).toEqual(['changed']);
  expect(since.record.fields.map((f) => [f.field, f.old, f.new])).toEqual([
    ['conclusions', '', 'The radius is as drawn.'],
  ]);
});

it('compares with the version the approver returned, and carries nothing after an approval', async () => {
  const db = testDb();
  const first = await submitForCheck(db, author, sheet, {
    versionNumber: 2,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  await saveCheckWork(db, checker, first.id, { verificationMethod: 'design_review' });
  await decide(db, checker, first.id, { action: 'sign', password: PASSWORD });
  await decide(db, approver, first.id, { action: 'reject', reason: 'Cite the drawing.' });
  await edit('rho = 1.5 m  # drawing D-12');
  const again = await submitForCheck(db, author, sheet, {
    versionNumber: 3,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  const detail = await getCheckDetail(db, checker, again.id);
  expect(detail.sinceReturn).toMatchObject({
    state: 'approval_returned',
    versionNumber: 2,
    returnedById: approver.userId,
  });
  expect(detail.sinceReturn!.comparison.cells[0].sourceDiff).toEqual([
    { text: 'rho = 1.5 m' },
    { text: '  # drawing D-12', added: true },
  ]);

  await saveCheckWork(db, checker, again.id, { verificationMethod: 'design_review' });
  // The work carried over from the returned check waits for the checker's confirmation.
  if ((await getCheckDetail(db, checker, again.id)).carriedOver)
    await saveCheckWork(db, checker, again.id, { confirmCarriedOver: true });
  await decide(db, checker, again.id, { action: 'sign', password: PASSWORD });
  await decide(db, approver, again.id, { action: 'approve', password: PASSWORD });
  await edit('rho = 1.6 m');
  const after = await submitForCheck(db, author, sheet, {
    versionNumber: 4,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  const next = await getCheckDetail(db, checker, after.id);
  expect(next.base?.number).toBe(3);
  expect(next.sinceReturn).toBeNull();
});
