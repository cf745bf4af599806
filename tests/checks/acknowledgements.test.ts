// Nothing is signed on a broken sheet without the originator's written word: a version with
// evaluation errors, a failed criterion or a mismatched design input is refused at submission
// (400 listing each item) until each is acknowledged; the acknowledgements are stored with the
// check, audited, immutable, and the checker reads them in the check detail.
import { beforeEach, expect, it } from 'vitest';
import type { Actor } from '../../lib/auth/actor';
import { AppError } from '../../lib/errors/app-error';
import { getCheckDetail } from '../../lib/checks/queries';
import { submitForCheck } from '../../lib/checks/submit';
import type { SubmissionFinding } from '../../lib/checks/submission-findings';
import { createSheet, getVersion, saveVersion } from '../../lib/sheets/sheets';
import { testDb } from '../support/database';
import { makeProject, makeUser, PASSWORD } from '../support/people';

let author: Actor;
let checker: Actor;
let sheet: { id: string; project_id: string; number: number; title: string };

beforeEach(async () => {
  const db = testDb();
  author = await makeUser(db, 'author@example.test');
  checker = await makeUser(db, 'checker@example.test');
  const projectId = await makeProject(db, 'BEAM', [
    [author, 'originator'],
    [checker, 'checker'],
  ]);
  const created = await createSheet(
    db,
    author,
    { id: projectId, code: 'BEAM' },
    { title: 'Proton beam', safetyRelated: false, objective: '' },
  );
  sheet = { id: created.id, project_id: projectId, number: created.number, title: 'Proton beam' };
  const latest = (await getVersion(db, sheet.id))!;
  // Two evaluation errors (a length plus a time; an undefined name) and a design input whose record
  // value (150 MeV, the beam specification) differs from the cell's 160 MeV.
  await saveVersion(db, author, sheet, {
    parentNumber: latest.number,
    message: 'broken',
    content: {
      ...latest.content,
      record: {
        ...latest.content.record,
        inputs: [
          {
            name: 'Proton kinetic energy',
            value: '150 MeV',
            source: 'Beam specification',
            sourceRevision: 'A',
            cell: 'T',
          },
        ],
      },
      cells: [{ id: 'c1', kind: 'calc', source: 'T = 160 MeV\nL = 2 m + 3 s\nq = missingName * 2' }],
    },
  });
});

async function refusal(p: Promise<unknown>): Promise<AppError> {
  try {
    await p;
  } catch (error) {
    return error as AppError;
  }
  throw new Error('expected a refusal');
}

it('refuses the submission until each item is acknowledged, then stores and shows them', async () => {
  const db = testDb();
  const refused = await refusal(
    submitForCheck(db, author, sheet, { versionNumber: 2, checkerId: checker.userId, password: PASSWORD }),
  );
  expect(refused).toBeInstanceOf(AppError);
  expect(refused.code).toBe('bad_request');
  expect(refused.message).toMatch(/3 items to acknowledge in writing/);
  const items = (refused.details as { acknowledgementsNeeded: SubmissionFinding[] }).acknowledgementsNeeded;
  expect(items.map((i) => i.kind)).toEqual(['cell-error', 'cell-error', 'design-input']);
  expect(items[2].message).toMatch(/record gives 150 MeV, the sheet uses 160 MeV/);
  // Nothing was signed or opened.
  expect(await db.selectFrom('signatures').select('id').where('sheet_id', '=', sheet.id).execute()).toEqual([]);
  expect(await db.selectFrom('checks').select('id').where('sheet_id', '=', sheet.id).execute()).toEqual([]);

  // One acknowledgement blank: still refused, naming only that item.
  const acks = items.map((i, n) => ({
    key: i.key,
    text: n === 1 ? '  ' : `Acknowledged ${n + 1}: known and accepted for this draft check.`,
  }));
  const partial = await refusal(
    submitForCheck(db, author, sheet, {
      versionNumber: 2,
      checkerId: checker.userId,
      password: PASSWORD,
      acknowledgements: acks,
    }),
  );
  expect(partial.message).toMatch(/an item to acknowledge/);
  expect(partial.message).toContain(items[1].message);
  // An acknowledgement of something the version does not have is refused.
  const unknown = await refusal(
    submitForCheck(db, author, sheet, {
      versionNumber: 2,
      checkerId: checker.userId,
      password: PASSWORD,
      acknowledgements: [...acks, { key: 'error:zz:9', text: 'x' }],
    }),
  );
  expect(unknown.message).toMatch(/error:zz:9/);

  acks[1].text = 'The undefined name is the next step of the calculation.';
  const check = await submitForCheck(db, author, sheet, {
    versionNumber: 2,
    checkerId: checker.userId,
    password: PASSWORD,
    acknowledgements: acks,
  });
  const detail = await getCheckDetail(db, checker, check.id);
  expect(detail.acknowledgements.map((a) => [a.key, a.kind, a.text])).toEqual(
    items.map((i, n) => [i.key, i.kind, acks[n].text]),
  );
  expect(detail.designInputs).toMatchObject([{ cell: 'T', recordValue: '150 MeV', status: 'mismatch' }]);
  const audit = await db
    .selectFrom('audit_events')
    .select('new_value')
    .where('action', '=', 'check.submit')
    .where('object_id', '=', check.id)
    .executeTakeFirstOrThrow();
  expect(JSON.stringify(audit.new_value)).toContain('The undefined name is the next step of the calculation.');
  // Immutable once submitted.
  await expect(
    db
      .updateTable('checks')
      .set({ acknowledgements: '[]' } as never)
      .where('id', '=', check.id)
      .execute(),
  ).rejects.toThrow(/cannot be changed/);
});

it('submits a clean version without acknowledgements', async () => {
  const db = testDb();
  const latest = (await getVersion(db, sheet.id))!;
  await saveVersion(db, author, sheet, {
    parentNumber: latest.number,
    message: 'fixed',
    content: {
      ...latest.content,
      record: {
        ...latest.content.record,
        inputs: [
          {
            name: 'Proton kinetic energy',
            value: '0.15 GeV',
            source: 'Beam specification',
            sourceRevision: 'A',
            cell: 'T',
          },
        ],
      },
      cells: [{ id: 'c1', kind: 'calc', source: 'T = 150 MeV' }],
    },
  });
  const check = await submitForCheck(db, author, sheet, {
    versionNumber: 3,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  const detail = await getCheckDetail(db, checker, check.id);
  expect(detail.acknowledgements).toEqual([]);
  expect(detail.designInputs).toMatchObject([{ cell: 'T', status: 'match' }]);
});
