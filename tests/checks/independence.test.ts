// The independence of check and approval with people who hold several roles (ASME NQA-1
// Requirement 3 §500; ISO 9001 §8.3.4): the rules count everyone who authored or signed anything on
// the version under check (the authors of every version since the last approved one, including
// versions saved after it, the person who submitted it and signed it "prepared", its checker), the
// safety rule reads the flag recorded in the version under check, and the server checks them again
// at every transition. Also: only the people of a check answer its comment threads, and the
// checker's work is audited with its old and new values.
import { beforeEach, describe, expect, it } from 'vitest';
import type { Actor } from '../../lib/auth/actor';
import { mayAnswerThreads } from '../../lib/checks/rules';
import { addComment, resolveThread } from '../../lib/checks/threads';
import { decide } from '../../lib/checks/decide';
import { eligibleCheckers, submitForCheck } from '../../lib/checks/submit';
import { getCheckDetail, listQueue } from '../../lib/checks/queries';
import { saveCheckWork } from '../../lib/checks/work';
import { createSheet, getSheet, getVersion, saveVersion } from '../../lib/sheets/sheets';
import { testDb } from '../support/database';
import { makeProject, makeUser, PASSWORD } from '../support/people';
import { refusal } from '../support/refusal';

type SheetRef = { id: string; project_id: string; number: number; title: string };

interface World {
  /** Originator: saves the versions under check. */
  author: Actor;
  /** Another originator of the project, with no part in the checks below. */
  bystander: Actor;
  /** Holds originator, checker and approver: the person of the probe. */
  multi: Actor;
  /** Holds checker and approver. */
  checkApprove: Actor;
  checker: Actor;
  approver: Actor;
  projectId: string;
}

async function world(): Promise<World> {
  const db = testDb();
  const [author, bystander, multi, checkApprove, checker, approver] = await Promise.all(
    ['author', 'bystander', 'multi', 'check.approve', 'checker', 'approver'].map((n) =>
      makeUser(db, `${n}@example.test`),
    ),
  );
  const projectId = await makeProject(db, 'BEAM', [
    [author, 'originator'],
    [bystander, 'originator'],
    [multi, 'originator'],
    [multi, 'checker'],
    [multi, 'approver'],
    [checkApprove, 'checker'],
    [checkApprove, 'approver'],
    [checker, 'checker'],
    [approver, 'approver'],
  ]);
  return { author, bystander, multi, checkApprove, checker, approver, projectId };
}

async function sheetOf(w: World, safetyRelated: boolean): Promise<SheetRef> {
  const created = await createSheet(
    testDb(),
    w.author,
    { id: w.projectId, code: 'BEAM' },
    { title: 'Interlock set-point', safetyRelated, objective: '' },
  );
  const sheet = { id: created.id, project_id: w.projectId, number: created.number, title: 'Interlock set-point' };
  await edit(w.author, sheet, 'I_max = 2 nA');
  return sheet;
}

/** A new version on top of the latest, optionally changing the safety flag it records. */
async function edit(actor: Actor, sheet: SheetRef, source: string, safetyRelated?: boolean) {
  const latest = (await getVersion(testDb(), sheet.id))!;
  const content = {
    ...latest.content,
    cells: [{ id: 'c1', kind: 'calc' as const, source }],
    ...(safetyRelated === undefined ? {} : { safetyRelated }),
  };
  return saveVersion(testDb(), actor, sheet, { parentNumber: latest.number, message: 'edit', content });
}

async function submit(by: Actor, sheet: SheetRef, checker: Actor, versionNumber = 2) {
  return submitForCheck(testDb(), by, sheet, { versionNumber, checkerId: checker.userId, password: PASSWORD });
}

async function signChecked(checker: Actor, checkId: string) {
  await saveCheckWork(testDb(), checker, checkId, { verificationMethod: 'design_review' });
  // Work carried over from a returned check of the sheet is confirmed before signing (lib/checks/carry-over.ts).
  if ((await getCheckDetail(testDb(), checker, checkId)).carriedOver)
    await saveCheckWork(testDb(), checker, checkId, { confirmCarriedOver: true });
  return decide(testDb(), checker, checkId, { action: 'sign', password: PASSWORD });
}

const refusals = () =>
  testDb()
    .selectFrom('audit_events')
    .select(['actor_id', 'new_value', 'reason'])
    .where('action', '=', 'workflow.refused')
    .orderBy('id')
    .execute();

let w: World;
beforeEach(async () => {
  w = await world();
});

describe('the person who submits (signs "prepared") counts', () => {
  it('refuses at submission a checker who is the submitter, on someone else\u2019s version, and audits the rule and the person', async () => {
    const sheet = await sheetOf(w, false);
    const e = await refusal(submit(w.multi, sheet, w.multi));
    expect(e).toMatchObject({ status: 403, details: { rule: 'checker-not-preparer' } });
    expect(e.message).toMatch(/^Person multi cannot check this version: they are its preparer/);
    expect(await refusals()).toEqual([
      { actor_id: w.multi.userId, new_value: { attempted: 'submit', rule: 'checker-not-preparer' }, reason: e.message },
    ]);
    expect(await testDb().selectFrom('checks').select('id').execute()).toEqual([]);
    expect(await testDb().selectFrom('signatures').select('id').execute()).toEqual([]);
  });

  it('shows the submitter as not eligible on the submit form, and other checkers as eligible', async () => {
    const sheet = await sheetOf(w, false);
    const list = await eligibleCheckers(testDb(), sheet, 2, w.multi.userId);
    expect(list.find((c) => c.userId === w.multi.userId)).toMatchObject({
      eligible: false,
      reason: expect.stringMatching(/its preparer/),
    });
    expect(list.find((c) => c.userId === w.checker.userId)).toMatchObject({ eligible: true, reason: null });
    // Seen by another submitter, the same person may check.
    expect(
      (await eligibleCheckers(testDb(), sheet, 2, w.author.userId)).find((c) => c.userId === w.multi.userId),
    ).toMatchObject({ eligible: true });
  });

  it('refuses the submitter as approver, on any sheet', async () => {
    const sheet = await sheetOf(w, false);
    const { id } = await submit(w.multi, sheet, w.checker);
    await signChecked(w.checker, id);
    const e = await refusal(decide(testDb(), w.multi, id, { action: 'approve', password: PASSWORD }));
    expect(e).toMatchObject({ status: 403, details: { rule: 'approver-not-preparer' } });
    expect(e.message).toMatch(/^Person multi cannot approve this version: they are its preparer/);
    expect((await refusal(decide(testDb(), w.multi, id, { action: 'reject', reason: 'mine' }))).details).toEqual({
      rule: 'approver-not-preparer',
    });
    expect((await refusals()).map((r) => r.new_value)).toEqual([
      { attempted: 'approve', rule: 'approver-not-preparer' },
      { attempted: 'reject', rule: 'approver-not-preparer' },
    ]);
    expect(await listQueue(testDb(), w.multi, 'approval')).toEqual([
      expect.objectContaining({ id, eligible: false, reason: expect.stringMatching(/its preparer/) }),
    ]);
    const detail = await getCheckDetail(testDb(), w.multi, id);
    expect(detail.you.actions).toEqual([]);
    expect(detail.you.approverRefusal).toMatch(/its preparer/);
    // One rule: the queue, the check view and the refused decision give the same words.
    expect((await listQueue(testDb(), w.multi, 'approval'))[0].reason).toBe(detail.you.approverRefusal);
    expect(detail.you.approverRefusal).toBe(e.message);
    expect(
      await testDb().selectFrom('signatures').select('meaning').where('user_id', '=', w.multi.userId).execute(),
    ).toEqual([{ meaning: 'prepared' }]);
    // Someone else approves it: three people signed.
    expect((await decide(testDb(), w.approver, id, { action: 'approve', password: PASSWORD })).state).toBe('approved');
  });

  it('checks again at signing: a check whose checker is its submitter cannot be signed or returned by them', async () => {
    // A check recorded before the rule (or by any other path) naming its own submitter as checker.
    const sheet = await sheetOf(w, false);
    const v2 = (await getVersion(testDb(), sheet.id, 2))!;
    const row = await testDb()
      .insertInto('checks')
      .values({
        sheet_id: sheet.id,
        project_id: sheet.project_id,
        version_number: 2,
        version_sha256: v2.sha256,
        base_version_number: null,
        submitted_by: w.multi.userId,
        checker_id: w.multi.userId,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    await saveCheckWork(testDb(), w.multi, row.id, { verificationMethod: 'design_review' });
    const e = await refusal(decide(testDb(), w.multi, row.id, { action: 'sign', password: PASSWORD }));
    expect(e).toMatchObject({ status: 403, details: { rule: 'checker-not-preparer' } });
    expect((await refusal(decide(testDb(), w.multi, row.id, { action: 'return', reason: 'x' }))).details).toEqual({
      rule: 'checker-not-preparer',
    });
    const detail = await getCheckDetail(testDb(), w.multi, row.id);
    expect(detail.you.actions).toEqual([]);
    expect(detail.you.checkerRefusal).toMatch(/its preparer/);
  });

  it('counts whoever signed the same version "prepared" in an earlier check', async () => {
    const sheet = await sheetOf(w, false);
    const first = await submit(w.multi, sheet, w.checker);
    await decide(testDb(), w.checker, first.id, { action: 'return', reason: 'Cite the source.' });
    // Submitted again by the author, naming the person who prepared it the first time.
    const e = await refusal(submit(w.author, sheet, w.multi));
    expect(e).toMatchObject({ status: 403, details: { rule: 'checker-not-preparer' } });
  });
});

describe('one person with originator, checker and approver roles', () => {
  it('can never hold two signatures of one version: submit, sign and approve are each refused in turn', async () => {
    const sheet = await sheetOf(w, true);
    // As checker of another's submission, then as approver of the same check.
    const { id } = await submit(w.author, sheet, w.multi);
    await signChecked(w.multi, id);
    const e = await refusal(decide(testDb(), w.multi, id, { action: 'approve', password: PASSWORD }));
    expect(e).toMatchObject({ status: 403, details: { rule: 'safety-approver-not-checker' } });
    expect((await decide(testDb(), w.approver, id, { action: 'approve', password: PASSWORD })).state).toBe('approved');
    const signers = await testDb()
      .selectFrom('signatures')
      .select(['meaning', 'user_id'])
      .where('sheet_id', '=', sheet.id)
      .orderBy('signed_at')
      .execute();
    expect(signers).toEqual([
      { meaning: 'prepared', user_id: w.author.userId },
      { meaning: 'checked', user_id: w.multi.userId },
      { meaning: 'approved', user_id: w.approver.userId },
    ]);
  });

  it('the safety rule reads the version under check: a newer version marked not safety-related changes nothing', async () => {
    const sheet = await sheetOf(w, true);
    const { id } = await submit(w.author, sheet, w.multi);
    await signChecked(w.multi, id);
    // The author saves version 3 marked not safety-related: the sheet's current flag is now false.
    await edit(w.author, sheet, 'I_max = 2.5 nA', false);
    expect((await getSheet(testDb(), sheet.id))!.safety_related).toBe(false);
    const e = await refusal(decide(testDb(), w.multi, id, { action: 'approve', password: PASSWORD }));
    expect(e).toMatchObject({ status: 403, details: { rule: 'safety-approver-not-checker' } });
    expect(e.message).toMatch(/^Person multi checked this version/);
    const detail = await getCheckDetail(testDb(), w.multi, id);
    expect(detail.sheet.safetyRelated).toBe(true);
    expect(detail.you.actions).toEqual([]);
    expect(await listQueue(testDb(), w.multi, 'approval')).toEqual([expect.objectContaining({ id, eligible: false })]);
  });

  it('a newer version the checker saves himself counts too: he is an originator since the last approved version', async () => {
    const sheet = await sheetOf(w, true);
    const { id } = await submit(w.author, sheet, w.multi);
    await signChecked(w.multi, id);
    await edit(w.multi, sheet, 'I_max = 2.5 nA', false);
    const e = await refusal(decide(testDb(), w.multi, id, { action: 'approve', password: PASSWORD }));
    expect(e).toMatchObject({ status: 403, details: { rule: 'approver-not-originator' } });
  });

  it('a checker who saves a version after the one under check cannot sign it', async () => {
    const sheet = await sheetOf(w, false);
    const { id } = await submit(w.author, sheet, w.multi);
    await saveCheckWork(testDb(), w.multi, id, { verificationMethod: 'design_review' });
    await edit(w.multi, sheet, 'I_max = 2.5 nA');
    const e = await refusal(decide(testDb(), w.multi, id, { action: 'sign', password: PASSWORD }));
    expect(e).toMatchObject({ status: 403, details: { rule: 'checker-not-originator' } });
    expect((await getCheckDetail(testDb(), w.multi, id)).you.actions).toEqual([]);
  });

  it('a checker who saved a later version cannot be named for an earlier one', async () => {
    const sheet = await sheetOf(w, false);
    await edit(w.multi, sheet, 'I_max = 2.5 nA'); // version 3
    const e = await refusal(submit(w.author, sheet, w.multi, 2));
    expect(e).toMatchObject({ status: 403, details: { rule: 'checker-not-originator' } });
    expect(
      (await eligibleCheckers(testDb(), sheet, 2, w.author.userId)).find((c) => c.userId === w.multi.userId),
    ).toMatchObject({ eligible: false });
  });

  it('an approver who saved a version after the one under check cannot approve it', async () => {
    const sheet = await sheetOf(w, false);
    const { id } = await submit(w.author, sheet, w.checker);
    await signChecked(w.checker, id);
    await edit(w.multi, sheet, 'I_max = 2.5 nA');
    const e = await refusal(decide(testDb(), w.multi, id, { action: 'approve', password: PASSWORD }));
    expect(e).toMatchObject({ status: 403, details: { rule: 'approver-not-originator' } });
  });
});

describe('a person with checker and approver roles', () => {
  it('checks and approves a version that is not safety-related (two people sign)', async () => {
    const sheet = await sheetOf(w, false);
    const { id } = await submit(w.author, sheet, w.checkApprove);
    await signChecked(w.checkApprove, id);
    expect((await decide(testDb(), w.checkApprove, id, { action: 'approve', password: PASSWORD })).state).toBe(
      'approved',
    );
  });

  it('cannot approve a safety-related version they checked, even when it was checked in an earlier check of the same version', async () => {
    const sheet = await sheetOf(w, true);
    const first = await submit(w.author, sheet, w.checkApprove);
    await signChecked(w.checkApprove, first.id);
    await decide(testDb(), w.approver, first.id, { action: 'reject', reason: 'Ask a second checker.' });
    const second = await submit(w.author, sheet, w.checker);
    await signChecked(w.checker, second.id);
    const e = await refusal(decide(testDb(), w.checkApprove, second.id, { action: 'approve', password: PASSWORD }));
    expect(e).toMatchObject({ status: 403, details: { rule: 'safety-approver-not-checker' } });
  });
});

describe('answering comment threads: the people of the check only', () => {
  it('lets the submitter and the checker answer, and refuses any other originator of the project', async () => {
    const sheet = await sheetOf(w, false);
    const { id } = await submit(w.author, sheet, w.checker);
    const thread = await addComment(testDb(), w.checker, id, {
      cellId: 'c1',
      statementLine: 1,
      body: 'Source of the limit?',
    });
    await addComment(testDb(), w.author, id, {
      cellId: 'c1',
      statementLine: null,
      body: 'The interlock specification.',
      threadId: thread.id,
    });
    await addComment(testDb(), w.checker, id, {
      cellId: 'c1',
      statementLine: null,
      body: 'Which revision?',
      threadId: thread.id,
    });
    for (const other of [w.bystander, w.multi]) {
      const e = await refusal(
        addComment(testDb(), other, id, {
          cellId: 'c1',
          statementLine: null,
          body: 'I can answer too.',
          threadId: thread.id,
        }),
      );
      expect(e.status).toBe(403);
      expect((await getCheckDetail(testDb(), other, id)).you.canComment).toBe(false);
    }
    expect((await getCheckDetail(testDb(), w.author, id)).you.canComment).toBe(true);
    expect((await getCheckDetail(testDb(), w.checker, id)).you.canComment).toBe(true);
    // After a return, the same: the submitter answers, a bystander does not.
    await decide(testDb(), w.checker, id, { action: 'return', reason: 'Answer the thread.' });
    await addComment(testDb(), w.author, id, {
      cellId: 'c1',
      statementLine: null,
      body: 'Revision C.',
      threadId: thread.id,
    });
    expect(
      (
        await refusal(
          addComment(testDb(), w.bystander, id, { cellId: 'c1', statementLine: null, body: 'x', threadId: thread.id }),
        )
      ).status,
    ).toBe(403);
    await resolveThread(testDb(), w.checker, id, thread.id).catch(() => undefined);
  });

  it('decides in one function: preparer, checker, and the approver of the check', () => {
    const check = { submitted_by: 'p', checker_id: 'c', decided_by: 'a', state: 'approval_returned' as const };
    expect(['p', 'c', 'a', 'x'].map((u) => mayAnswerThreads(check, u))).toEqual([true, true, true, false]);
    // Before an approver has acted, the one who decided is the checker: nobody else is added.
    expect(['p', 'c', 'a'].map((u) => mayAnswerThreads({ ...check, state: 'returned', decided_by: 'c' }, u))).toEqual([
      true,
      true,
      false,
    ]);
  });
});

describe('the checker\u2019s work is audited', () => {
  it('records the verification method, notes and alternate calculation with old and new values', async () => {
    const sheet = await sheetOf(w, false);
    const { id } = await submit(w.author, sheet, w.checker);
    await saveCheckWork(testDb(), w.checker, id, { verificationMethod: 'design_review', checkerNotes: 'First look.' });
    await saveCheckWork(testDb(), w.checker, id, {
      verificationMethod: 'alternate_calculation',
      alternateCells: [{ id: 'a1', kind: 'calc', source: 'I_alt = 2 nA' }],
    });
    await saveCheckWork(testDb(), w.checker, id, { checkerNotes: 'Agrees with the alternate calculation.' });
    const events = await testDb()
      .selectFrom('audit_events')
      .select(['action', 'actor_id', 'object_id', 'old_value', 'new_value'])
      .where('action', '=', 'check.work')
      .orderBy('id')
      .execute();
    expect(events).toEqual([
      {
        action: 'check.work',
        actor_id: w.checker.userId,
        object_id: id,
        old_value: { verificationMethod: null, checkerNotes: '' },
        new_value: { verificationMethod: 'design_review', checkerNotes: 'First look.' },
      },
      {
        action: 'check.work',
        actor_id: w.checker.userId,
        object_id: id,
        old_value: { verificationMethod: 'design_review', alternateCells: [] },
        new_value: {
          verificationMethod: 'alternate_calculation',
          alternateCells: [{ id: 'a1', kind: 'calc', source: 'I_alt = 2 nA' }],
        },
      },
      {
        action: 'check.work',
        actor_id: w.checker.userId,
        object_id: id,
        old_value: { checkerNotes: 'First look.' },
        new_value: { checkerNotes: 'Agrees with the alternate calculation.' },
      },
    ]);
    // A refused change records nothing.
    await refusal(saveCheckWork(testDb(), w.author, id, { checkerNotes: 'not mine' }));
    expect(
      await testDb().selectFrom('audit_events').select('id').where('action', '=', 'check.work').execute(),
    ).toHaveLength(3);
  });
});
