// Comment threads survive a return: the originator answers them on the returned check, the next
// submission of the sheet carries the ones still open, the checker resolves them there, and signing
// as checked waits for them.
import { beforeEach, expect, it } from 'vitest';
import type { Actor } from '../../lib/auth/actor';
import { addComment, resolveThread } from '../../lib/checks/threads';
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
let sheet: { id: string; project_id: string; number: number; title: string };

async function edit(source: string) {
  const latest = (await getVersion(testDb(), sheet.id))!;
  return saveVersion(testDb(), author, sheet, {
    parentNumber: latest.number,
    message: 'edit',
    content: { ...latest.content, cells: [{ id: 'c1', kind: 'calc', source }] },
  });
}

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
    { title: 'Dipole rigidity', safetyRelated: false, objective: '' },
  );
  sheet = { id: created.id, project_id: projectId, number: created.number, title: 'Dipole rigidity' };
  await edit('T_kin = 250 MeV\nBrho = magneticRigidity(momentumFromKinetic(T_kin, m_p), 1) to T*m');
});

it('lets the originator answer a returned check, carries the open thread to the resubmission, and signing waits for it', async () => {
  const db = testDb();
  const first = await submitForCheck(db, author, sheet, {
    versionNumber: 2,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  const open = await addComment(db, checker, first.id, {
    cellId: 'c1',
    statementLine: 2,
    body: 'Which charge state is assumed?',
  });
  const settled = await addComment(db, checker, first.id, {
    cellId: 'c1',
    statementLine: 1,
    body: 'Typo in the comment.',
  });
  await resolveThread(db, checker, first.id, settled.id);
  await decide(db, checker, first.id, { action: 'return', reason: 'One open comment.' });

  // On the returned check: the originator answers; nobody opens a thread or resolves one there.
  expect((await getCheckDetail(db, author, first.id)).you.canComment).toBe(true);
  await addComment(db, author, first.id, {
    cellId: 'c1',
    statementLine: null,
    body: 'Protons, charge 1 e.',
    threadId: open.id,
  });
  expect(
    (await refusal(addComment(db, checker, first.id, { cellId: 'c1', statementLine: null, body: 'a new thread' })))
      .status,
  ).toBe(409);
  expect((await refusal(resolveThread(db, checker, first.id, open.id))).status).toBe(409);

  await edit(
    'T_kin = 250 MeV\nBrho = magneticRigidity(momentumFromKinetic(T_kin, m_p), 1) to T*m # protons, charge 1 e',
  );
  const second = await submitForCheck(db, author, sheet, {
    versionNumber: 3,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  // Once submitted again, the returned check takes no more replies; the new one carries the open thread only.
  expect(
    (
      await refusal(
        addComment(db, author, first.id, { cellId: 'c1', statementLine: null, body: 'late', threadId: open.id }),
      )
    ).status,
  ).toBe(409);
  expect((await getCheckDetail(db, author, first.id)).you.canComment).toBe(false);
  const detail = await getCheckDetail(db, checker, second.id);
  expect(detail.threads).toMatchObject([
    {
      id: open.id,
      cellId: 'c1',
      statementLine: 2,
      resolvedAt: null,
      openedOnVersion: 2,
      comments: [{ body: 'Which charge state is assumed?' }, { body: 'Protons, charge 1 e.' }],
    },
  ]);

  await saveCheckWork(db, checker, second.id, { verificationMethod: 'design_review' });
  expect(await refusal(decide(db, checker, second.id, { action: 'sign', password: PASSWORD }))).toMatchObject({
    status: 409,
    details: { openThreads: 1 },
  });
  await addComment(db, checker, second.id, {
    cellId: 'c1',
    statementLine: null,
    body: 'Thank you, stated now.',
    threadId: open.id,
  });
  await resolveThread(db, checker, second.id, open.id);
  expect((await getCheckDetail(db, author, second.id)).threads[0]).toMatchObject({
    resolvedBy: 'Person checker',
    comments: [{}, {}, { body: 'Thank you, stated now.' }],
  });
  expect(await decide(db, checker, second.id, { action: 'sign', password: PASSWORD })).toMatchObject({
    state: 'checked',
  });
  // The returned check shows the thread as it ended.
  expect((await getCheckDetail(db, author, first.id)).threads.find((t) => t.id === open.id)?.resolvedAt).not.toBeNull();
});

it('refuses to resolve a comment id that is not a uuid with 409, not a server error', async () => {
  const db = testDb();
  const check = await submitForCheck(db, author, sheet, {
    versionNumber: 2,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  expect((await refusal(resolveThread(db, checker, check.id, 'not-a-uuid'))).status).toBe(409);
});

it('answers a return only while a thread is open: with every thread resolved, a reply on the returned check is refused like the screen says', async () => {
  const db = testDb();
  const check = await submitForCheck(db, author, sheet, {
    versionNumber: 2,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  const thread = await addComment(db, checker, check.id, { cellId: 'c1', statementLine: 1, body: 'Units?' });
  await resolveThread(db, checker, check.id, thread.id);
  await decide(db, checker, check.id, { action: 'return', reason: 'Returned without open comments.' });
  // The read model and the mutation say the same: nothing is open to answer.
  expect((await getCheckDetail(db, author, check.id)).you.canComment).toBe(false);
  for (const who of [author, checker]) {
    const e = await refusal(
      addComment(db, who, check.id, { cellId: 'c1', statementLine: null, body: 'late', threadId: thread.id }),
    );
    expect(e.status).toBe(409);
    expect(e.message).toMatch(/It has no open thread to answer\.$/);
  }
});
