// The tolerance of the alternate comparison is stored with the check (validated, audited), the
// comparison reaches the check view, and the checker's work carries over a return: offered to the
// new check marked "from the check of version N" until the checker edits or confirms it; signing
// waits for the confirmation; audited.
import { beforeEach, expect, it } from 'vitest';
import type { Actor } from '../../lib/auth/actor';
import { checkWorkSchema } from '../../lib/checks/workflow';
import { decide } from '../../lib/checks/decide';
import { getCheckDetail } from '../../lib/checks/queries';
import { saveCheckWork } from '../../lib/checks/work';
import { submitForCheck } from '../../lib/checks/submit';
import { createSheet, getVersion, saveVersion } from '../../lib/sheets/sheets';
import { testDb } from '../support/database';
import { makeProject, makeUser, PASSWORD } from '../support/people';
import { refusal } from '../support/refusal';

let author: Actor;
let checker: Actor;
let approver: Actor;
let sheet: { id: string; project_id: string; number: number; title: string };

async function edit(source: string) {
  const latest = (await getVersion(testDb(), sheet.id))!;
  return saveVersion(testDb(), author, sheet, {
    parentNumber: latest.number,
    message: 'edit',
    content: { ...latest.content, cells: [{ id: 'c1', kind: 'calc', source }] },
  });
}

const audits = (checkId: string, action: string) =>
  testDb()
    .selectFrom('audit_events')
    .select(['old_value', 'new_value'])
    .where('object_id', '=', checkId)
    .where('action', '=', action)
    .orderBy('id')
    .execute();

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
  await edit('Brho = 2.43213 T*m\nrho = 1.5 m\nB = Brho / rho to T');
});

it('validates the tolerance, stores it as written and as a fraction, audits it, and compares the shared names', async () => {
  const db = testDb();
  expect(checkWorkSchema.safeParse({ tolerance: '0.1 %' }).success).toBe(true);
  expect(checkWorkSchema.safeParse({ tolerance: 'close enough' }).success).toBe(false);
  expect(checkWorkSchema.safeParse({ tolerance: '0' }).success).toBe(false);
  const check = await submitForCheck(db, author, sheet, {
    versionNumber: 2,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  // B = 2.432 13 T·m / 1.5 m = 1.621 42 T (arithmetic); the alternate writes it in gauss-free SI, 1621.42 mT.
  await saveCheckWork(db, checker, check.id, {
    verificationMethod: 'alternate_calculation',
    alternateCells: [{ id: 'alt-1', kind: 'calc', source: 'B = 2.43213 T*m / 1500 mm to mT\nrho = 1.5 s' }],
  });
  // No tolerance yet: the difference is shown, the verdict is not, and signing waits for a tolerance.
  let detail = await getCheckDetail(db, checker, check.id);
  expect(detail.alternateComparison.rows.map((r) => [r.name, r.status])).toEqual([
    ['rho', 'units_differ'],
    ['B', 'no_tolerance'],
  ]);
  expect(await refusal(decide(db, checker, check.id, { action: 'sign', password: PASSWORD }))).toMatchObject({
    status: 400,
    message: expect.stringContaining('tolerance'),
  });

  await saveCheckWork(db, checker, check.id, { tolerance: '0.1 %' });
  const row = await db
    .selectFrom('checks')
    .select(['tolerance', 'tolerance_text'])
    .where('id', '=', check.id)
    .executeTakeFirstOrThrow();
  expect(row).toEqual({ tolerance: 0.001, tolerance_text: '0.1 %' });
  expect((await audits(check.id, 'check.work')).at(-1)).toMatchObject({
    old_value: { tolerance: null },
    new_value: { tolerance: '0.1 %' },
  });
  detail = await getCheckDetail(db, approver, check.id);
  const b = detail.alternateComparison.rows.find((r) => r.name === 'B')!;
  expect(b).toMatchObject({
    status: 'within',
    words: 'within the tolerance of 0.1 %',
    alternateInSheetUnit: expect.stringMatching(/^1\.621\s?42\d*\s?T$/),
  });
  // Same value written two ways: the difference is rounding only, below 10⁻¹² (double precision, common practice).
  expect(b.relativeDifference!).toBeLessThan(1e-12);
  expect(await decide(db, checker, check.id, { action: 'sign', password: PASSWORD })).toMatchObject({
    state: 'checked',
  });
  // The database refuses a tolerance that is not a positive fraction up to 10 %.
  await expect(db.updateTable('checks').set({ tolerance: 2 }).where('id', '=', check.id).execute()).rejects.toThrow();
});

it('carries the work of a returned check to the resubmission, marked until the checker edits or confirms it', async () => {
  const db = testDb();
  const first = await submitForCheck(db, author, sheet, {
    versionNumber: 2,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  const cells = [{ id: 'alt-1', kind: 'calc' as const, source: 'B = 2.43213 T*m / 1.5 m to T' }];
  await saveCheckWork(db, checker, first.id, {
    verificationMethod: 'alternate_calculation',
    checkerNotes: 'Field recomputed.',
    alternateCells: cells,
    tolerance: '1e-6',
  });
  await decide(db, checker, first.id, { action: 'return', reason: 'State the radius source.' });

  await edit('Brho = 2.43213 T*m\nrho = 1.5 m  # magnet drawing D-12\nB = Brho / rho to T');
  const second = await submitForCheck(db, author, sheet, {
    versionNumber: 3,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  let detail = await getCheckDetail(db, approver, second.id);
  expect(detail).toMatchObject({
    verificationMethod: 'alternate_calculation',
    checkerNotes: 'Field recomputed.',
    alternateCells: cells,
    toleranceText: '1e-6',
    tolerance: 1e-6,
  });
  expect(detail.carriedOver).toEqual({
    fromCheckId: first.id,
    fromVersion: 2,
    fields: ['verificationMethod', 'checkerNotes', 'alternateCells', 'tolerance'],
    confirmedAt: null,
    confirmedBy: null,
  });
  expect(detail.alternateComparison.rows).toMatchObject([{ name: 'B', status: 'within' }]);
  expect(await audits(second.id, 'check.carry_over')).toMatchObject([
    {
      new_value: {
        fromCheckId: first.id,
        fromVersion: 2,
        fields: ['verificationMethod', 'checkerNotes', 'alternateCells', 'tolerance'],
      },
    },
  ]);

  // Saved unchanged (the panel sends every field), nothing is the checker's own yet; an edited note is.
  await saveCheckWork(db, checker, second.id, {
    verificationMethod: 'alternate_calculation',
    checkerNotes: 'Field recomputed; radius now cited.',
    alternateCells: cells,
  });
  detail = await getCheckDetail(db, checker, second.id);
  expect(detail.carriedOver?.fields).toEqual(['verificationMethod', 'alternateCells', 'tolerance']);
  // Signing waits for the confirmation of what is still carried over.
  expect(await refusal(decide(db, checker, second.id, { action: 'sign', password: PASSWORD }))).toMatchObject({
    status: 409,
    message:
      'The verification method, alternate calculation and tolerance are still as carried over from the check of version 2; confirm or edit them before signing.',
  });
  await saveCheckWork(db, checker, second.id, { confirmCarriedOver: true });
  detail = await getCheckDetail(db, approver, second.id);
  expect(detail.carriedOver).toMatchObject({
    fields: ['verificationMethod', 'alternateCells', 'tolerance'],
    confirmedBy: 'Person checker',
    confirmedAt: expect.any(String),
  });
  expect((await audits(second.id, 'check.work')).at(-1)).toMatchObject({
    old_value: { carriedOver: { confirmedAt: null } },
    new_value: { carriedOver: { confirmedBy: 'Person checker' } },
  });
  expect(await decide(db, checker, second.id, { action: 'sign', password: PASSWORD })).toMatchObject({
    state: 'checked',
  });
  // A signed check takes no more work.
  expect((await refusal(saveCheckWork(db, checker, second.id, { confirmCarriedOver: true }))).status).toBe(409);
});

it('carries nothing from an approved check, nor from a returned check with no work recorded', async () => {
  const db = testDb();
  const first = await submitForCheck(db, author, sheet, {
    versionNumber: 2,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  await decide(db, checker, first.id, { action: 'return', reason: 'Not yet.' });
  await edit('B = 1.62142 T');
  const second = await submitForCheck(db, author, sheet, {
    versionNumber: 3,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  expect((await getCheckDetail(db, checker, second.id)).carriedOver).toBeNull();
  // Nothing to confirm on a check that carries nothing.
  expect(await refusal(saveCheckWork(db, checker, second.id, { confirmCarriedOver: true }))).toMatchObject({
    status: 409,
    message: 'This check carries over no work from an earlier check.',
  });
  await saveCheckWork(db, checker, second.id, { verificationMethod: 'design_review', checkerNotes: 'Reviewed.' });
  await decide(db, checker, second.id, { action: 'sign', password: PASSWORD });
  await decide(db, approver, second.id, { action: 'approve', password: PASSWORD });
  await edit('B = 1.6 T');
  const third = await submitForCheck(db, author, sheet, {
    versionNumber: 4,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  const detail = await getCheckDetail(db, checker, third.id);
  expect(detail.carriedOver).toBeNull();
  expect(detail.verificationMethod).toBeNull();
});
