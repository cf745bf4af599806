// Independent check and approval against the real database: the state machine with every role,
// the independence rules (ASME NQA-1 Requirement 3 §500; ISO 9001 §8.3.4), electronic signatures
// (21 CFR Part 11 §11.50 name/time/meaning, §11.70 binding to the record, §11.200 password at
// signing), concurrency, and the e-mails each event sends.
import { sql } from 'kysely';
import { beforeEach, describe, expect, it } from 'vitest';
import type { Actor } from '../../lib/auth/actor';
import { addComment, resolveThread } from '../../lib/checks/threads';
import { decide } from '../../lib/checks/decide';
import { getCheckDetail, listQueue, sheetWorkflow } from '../../lib/checks/queries';
import { saveCheckWork } from '../../lib/checks/work';
import { submitForCheck } from '../../lib/checks/submit';
import { createSheet, getVersion, saveVersion } from '../../lib/sheets/sheets';
import { testDb } from '../support/database';
import { drainMailQueue, waitForMail } from '../support/mailbox';
import { makeProject, makeUser, PASSWORD } from '../support/people';
import { refusal } from '../support/refusal';

interface World {
  author: Actor;
  coAuthor: Actor;
  checker: Actor;
  checker2: Actor;
  approver: Actor;
  approver2: Actor;
  viewer: Actor;
  sheet: { id: string; project_id: string; number: number; title: string };
}

async function world(safetyRelated = false): Promise<World> {
  const db = testDb();
  const [author, coAuthor, checker, checker2, approver, approver2, viewer] = await Promise.all(
    ['author', 'coauthor', 'checker', 'checker2', 'approver', 'approver2', 'viewer'].map((n) =>
      makeUser(db, `${n}@example.test`),
    ),
  );
  const projectId = await makeProject(db, 'BEAM', [
    [author, 'originator'],
    [coAuthor, 'originator'],
    [checker, 'checker'],
    [checker2, 'checker'],
    [checker2, 'approver'],
    [coAuthor, 'checker'],
    [approver, 'approver'],
    [approver2, 'approver'],
    [viewer, 'viewer'],
  ]);
  const created = await createSheet(
    db,
    author,
    { id: projectId, code: 'BEAM' },
    { title: 'Dipole rigidity', safetyRelated, objective: '' },
  );
  const sheet = { id: created.id, project_id: projectId, number: created.number, title: 'Dipole rigidity' };
  await edit(author, sheet, 'T_kin = 250 MeV\nBrho = magneticRigidity(momentumFromKinetic(T_kin, m_p), 1) to T*m');
  return { author, coAuthor, checker, checker2, approver, approver2, viewer, sheet };
}

async function edit(actor: Actor, sheet: World['sheet'], source: string) {
  const latest = (await getVersion(testDb(), sheet.id))!;
  return saveVersion(testDb(), actor, sheet, {
    parentNumber: latest.number,
    message: 'edit',
    content: { ...latest.content, cells: [{ id: 'c1', kind: 'calc', source }] },
  });
}

/** Submits the latest version to `checker`, has it checked (design review) and returns the check id. */
async function throughCheck(w: World, checker = w.checker) {
  const latest = (await getVersion(testDb(), w.sheet.id))!;
  const { id } = await submitForCheck(testDb(), w.author, w.sheet, {
    versionNumber: latest.number,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  await saveCheckWork(testDb(), checker, id, { verificationMethod: 'design_review' });
  await decide(testDb(), checker, id, { action: 'sign', password: PASSWORD });
  return id;
}

let w: World;
beforeEach(async () => {
  w = await world();
});

describe('the legal path, with signatures bound to the version', () => {
  it('submit, comment, answer, resolve, record the method, sign as checked, approve', async () => {
    const db = testDb();
    const v2 = (await getVersion(db, w.sheet.id, 2))!;
    const check = await submitForCheck(db, w.author, w.sheet, {
      versionNumber: 2,
      checkerId: w.checker.userId,
      password: PASSWORD,
    });
    expect(check).toMatchObject({ state: 'in_check', versionNumber: 2, sha256: v2.sha256 });
    expect((await sheetWorkflow(db, w.sheet.id)).status).toBe('in_check');
    expect((await listQueue(db, w.checker, 'check')).map((c) => c.id)).toEqual([check.id]);

    const thread = await addComment(db, w.checker, check.id, {
      cellId: 'c1',
      statementLine: 2,
      body: 'Which charge state is assumed?',
    });
    await addComment(db, w.author, check.id, {
      cellId: 'c1',
      statementLine: null,
      body: 'Protons, charge 1 e.',
      threadId: thread.id,
    });
    expect(
      (await refusal(addComment(db, w.author, check.id, { cellId: 'c1', statementLine: null, body: 'a new thread' })))
        .status,
    ).toBe(403);

    // Signing needs every thread resolved, then a verification method, then the password.
    const open = await refusal(decide(db, w.checker, check.id, { action: 'sign', password: PASSWORD }));
    expect(open).toMatchObject({
      status: 409,
      message: '1 comment thread is still open; resolve every thread before signing as checked.',
    });
    await resolveThread(db, w.checker, check.id, thread.id);
    expect((await refusal(decide(db, w.checker, check.id, { action: 'sign', password: PASSWORD }))).message).toMatch(
      /Record the verification method/,
    );
    await saveCheckWork(db, w.checker, check.id, {
      verificationMethod: 'alternate_calculation',
      alternateCells: [
        {
          id: 'a1',
          kind: 'calc',
          source: 'p_alt = sqrt((250 MeV)^2 + 2 * 250 MeV * m_p * c^2) / c\nBrho_alt = p_alt / q_e to T*m',
        },
      ],
    });
    const detail = await getCheckDetail(db, w.checker, check.id);
    // 250 MeV protons: Bρ = 2.432 13 T·m (PDG RPP "Kinematics": p [GeV/c] = 0.299 792 458 B[T] ρ[m]; m_p from CODATA 2022).
    expect(detail.alternateResults!.cells[0].statements[1].value!.number).toBeCloseTo(2.43213, 5);
    expect(detail.you.actions).toEqual(['return', 'sign']);

    const wrong = await refusal(decide(db, w.checker, check.id, { action: 'sign', password: 'not my password' }));
    expect(wrong).toMatchObject({ status: 403, message: 'The password is not correct; nothing was signed.' });
    const refusedAudit = await db
      .selectFrom('audit_events')
      .select(['action', 'actor_id', 'new_value'])
      .where('action', '=', 'signature.refused')
      .execute();
    expect(refusedAudit).toEqual([
      { action: 'signature.refused', actor_id: w.checker.userId, new_value: { meaning: 'checked' } },
    ]);

    expect(await decide(db, w.checker, check.id, { action: 'sign', password: PASSWORD })).toEqual({
      id: check.id,
      state: 'checked',
    });
    expect((await listQueue(db, w.approver, 'approval')).map((c) => [c.id, c.eligible])).toEqual([[check.id, true]]);
    expect(await decide(db, w.approver, check.id, { action: 'approve', password: PASSWORD })).toEqual({
      id: check.id,
      state: 'approved',
    });

    const flow = await sheetWorkflow(db, w.sheet.id);
    expect(flow.status).toBe('approved');
    expect(flow.lastApprovedVersion).toBe(2);
    expect(flow.signatures.map((s) => [s.meaning, s.printedName, s.versionNumber, s.sha256])).toEqual([
      ['prepared', 'Person author', 2, v2.sha256],
      ['checked', 'Person checker', 2, v2.sha256],
      ['approved', 'Person approver', 2, v2.sha256],
    ]);
    for (const s of flow.signatures) expect(s.signedAt).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);
  });

  it('a returned version goes back to draft; the next save and submission start a new check', async () => {
    const db = testDb();
    const first = await submitForCheck(db, w.author, w.sheet, {
      versionNumber: 2,
      checkerId: w.checker.userId,
      password: PASSWORD,
    });
    // Edits while in check make a new draft version and leave the one under check as it was.
    await edit(w.author, w.sheet, 'T_kin = 230 MeV');
    expect((await getCheckDetail(db, w.checker, first.id)).version.number).toBe(2);
    await decide(db, w.checker, first.id, { action: 'return', reason: 'Use the 230 MeV case.' });
    expect((await sheetWorkflow(db, w.sheet.id)).status).toBe('draft');
    const second = await submitForCheck(db, w.author, w.sheet, {
      versionNumber: 3,
      checkerId: w.checker.userId,
      password: PASSWORD,
    });
    expect(second.versionNumber).toBe(3);
    expect((await sheetWorkflow(db, w.sheet.id)).checks.map((c) => c.state)).toEqual(['in_check', 'returned']);
  });
});

describe('illegal transitions are refused with 409 and the current state, by each role', () => {
  it('refuses each out-of-order action', async () => {
    const db = testDb();
    const { id } = await submitForCheck(db, w.author, w.sheet, {
      versionNumber: 2,
      checkerId: w.checker.userId,
      password: PASSWORD,
    });
    const approveEarly = await refusal(decide(db, w.approver, id, { action: 'approve', password: PASSWORD }));
    expect(approveEarly).toMatchObject({ status: 409, details: { state: 'in_check' } });
    expect((await refusal(decide(db, w.approver, id, { action: 'reject', reason: 'x' }))).status).toBe(409);
    // A second submission while one is open.
    const twice = await refusal(
      submitForCheck(db, w.author, w.sheet, { versionNumber: 2, checkerId: w.checker2.userId, password: PASSWORD }),
    );
    expect(twice).toMatchObject({
      status: 409,
      message: 'Version 2 of this sheet is in check; one submission at a time.',
    });

    await saveCheckWork(db, w.checker, id, { verificationMethod: 'design_review' });
    await decide(db, w.checker, id, { action: 'sign', password: PASSWORD });
    expect(await refusal(decide(db, w.checker, id, { action: 'sign', password: PASSWORD }))).toMatchObject({
      status: 409,
      details: { state: 'checked' },
    });
    expect((await refusal(decide(db, w.checker, id, { action: 'return', reason: 'late' }))).status).toBe(409);
    expect(
      (await refusal(addComment(db, w.checker, id, { cellId: 'c1', statementLine: null, body: 'late' }))).status,
    ).toBe(409);
    expect((await refusal(saveCheckWork(db, w.checker, id, { checkerNotes: 'late' }))).status).toBe(409);

    await decide(db, w.approver, id, { action: 'approve', password: PASSWORD });
    for (const action of ['approve', 'reject'] as const) {
      const e = await refusal(
        decide(db, w.approver2, id, action === 'approve' ? { action, password: PASSWORD } : { action, reason: 'x' }),
      );
      expect(e).toMatchObject({ status: 409, details: { state: 'approved' } });
    }
    // An approved version cannot be submitted again.
    expect(
      await refusal(
        submitForCheck(db, w.author, w.sheet, { versionNumber: 2, checkerId: w.checker.userId, password: PASSWORD }),
      ),
    ).toMatchObject({ status: 409, message: 'Version 2 is already approved; submit a later version.' });
  });

  it('refuses each role what it may not do', async () => {
    const db = testDb();
    const { id } = await submitForCheck(db, w.author, w.sheet, {
      versionNumber: 2,
      checkerId: w.checker.userId,
      password: PASSWORD,
    });
    // Only the named checker returns or signs; another checker, the originator, a viewer may not.
    for (const who of [w.checker2, w.author, w.viewer, w.approver]) {
      expect((await refusal(decide(db, who, id, { action: 'return', reason: 'no' }))).status).toBe(403);
      expect((await refusal(saveCheckWork(db, who, id, { verificationMethod: 'design_review' }))).status).toBe(403);
    }
    expect((await refusal(addComment(db, w.viewer, id, { cellId: 'c1', statementLine: null, body: 'x' }))).status).toBe(
      403,
    );
    const thread = await addComment(db, w.checker, id, { cellId: 'c1', statementLine: null, body: 'x' });
    expect((await refusal(resolveThread(db, w.author, id, thread.id))).status).toBe(403);
    await resolveThread(db, w.checker, id, thread.id);
    await saveCheckWork(db, w.checker, id, { verificationMethod: 'design_review' });
    await decide(db, w.checker, id, { action: 'sign', password: PASSWORD });
    // Approving needs the approver role.
    expect(await refusal(decide(db, w.viewer, id, { action: 'approve', password: PASSWORD }))).toMatchObject({
      status: 403,
      details: { rule: 'approver-role' },
    });
    expect(await refusal(decide(db, w.checker, id, { action: 'approve', password: PASSWORD }))).toMatchObject({
      status: 403,
      details: { rule: 'approver-role' },
    });
    // Someone outside the project does not even see the check.
    const outsider = await makeUser(db, 'outsider@example.test');
    expect((await refusal(getCheckDetail(db, outsider, id))).status).toBe(404);
    // Only originators submit (the route asks for the role); a submission naming a non-checker is refused by rule.
    expect(
      await refusal(
        submitForCheck(db, w.author, w.sheet, { versionNumber: 2, checkerId: w.viewer.userId, password: PASSWORD }),
      ),
    ).toMatchObject({ status: 403, details: { rule: 'checker-role' } });
  });
});

describe('independence, enforced by the server and audited when refused', () => {
  it('refuses a checker who saved a version since the last approved one, and says which rule', async () => {
    const db = testDb();
    await edit(w.coAuthor, w.sheet, 'T_kin = 240 MeV');
    const e = await refusal(
      submitForCheck(db, w.author, w.sheet, { versionNumber: 3, checkerId: w.coAuthor.userId, password: PASSWORD }),
    );
    expect(e).toMatchObject({ status: 403, details: { rule: 'checker-not-originator' } });
    expect(e.message).toMatch(
      /^Person coauthor cannot check this version: they saved a version of it since the last approved one\. .*NQA-1 Requirement 3 §500/,
    );
    const audit = await db
      .selectFrom('audit_events')
      .select(['action', 'new_value', 'reason'])
      .where('action', '=', 'workflow.refused')
      .execute();
    expect(audit).toHaveLength(1);
    expect(audit[0].new_value).toEqual({ attempted: 'submit', rule: 'checker-not-originator' });
    expect(await db.selectFrom('checks').select('id').execute()).toEqual([]);
  });

  it('allows a checker who edited the sheet before the last approved version, not after', async () => {
    const db = testDb();
    await edit(w.coAuthor, w.sheet, 'T_kin = 240 MeV'); // version 3, by the co-author
    await throughCheck(w);
    const checkId = (await sheetWorkflow(db, w.sheet.id)).checks[0].id;
    await decide(db, w.approver, checkId, { action: 'approve', password: PASSWORD }); // version 3 approved
    await edit(w.author, w.sheet, 'T_kin = 235 MeV'); // version 4, by the author only
    const ok = await submitForCheck(db, w.author, w.sheet, {
      versionNumber: 4,
      checkerId: w.coAuthor.userId,
      password: PASSWORD,
    });
    expect(ok.state).toBe('in_check');
    expect((await getCheckDetail(db, w.coAuthor, ok.id)).base!.number).toBe(3);
  });

  it('refuses an approver who saved a version since the last approved one', async () => {
    const db = testDb();
    const approverAuthor = await makeUser(db, 'approving.author@example.test');
    await db
      .insertInto('project_members')
      .values([
        { project_id: w.sheet.project_id, user_id: approverAuthor.userId, role: 'originator' },
        { project_id: w.sheet.project_id, user_id: approverAuthor.userId, role: 'approver' },
      ])
      .execute();
    await edit(approverAuthor, w.sheet, 'T_kin = 245 MeV');
    const id = await throughCheck(w);
    const e = await refusal(decide(db, approverAuthor, id, { action: 'approve', password: PASSWORD }));
    expect(e).toMatchObject({ status: 403, details: { rule: 'approver-not-originator' } });
    expect((await listQueue(db, approverAuthor, 'approval'))[0]).toMatchObject({
      eligible: false,
      reason: expect.stringMatching(/saved a version of it/),
    });
  });

  it('on a safety-related sheet the checker cannot approve; on another sheet they may', async () => {
    const db = testDb();
    const idPlain = await throughCheck(w, w.checker2);
    expect((await decide(db, w.checker2, idPlain, { action: 'approve', password: PASSWORD })).state).toBe('approved');

    const safety = await createSheet(
      db,
      w.author,
      { id: w.sheet.project_id, code: 'BEAM' },
      { title: 'Interlock set-point', safetyRelated: true, objective: '' },
    );
    const s = { id: safety.id, project_id: w.sheet.project_id, number: safety.number, title: 'Interlock set-point' };
    await edit(w.author, s, 'I_max = 2 nA');
    const idSafety = await throughCheck({ ...w, sheet: s }, w.checker2);
    const e = await refusal(decide(db, w.checker2, idSafety, { action: 'approve', password: PASSWORD }));
    expect(e).toMatchObject({ status: 403, details: { rule: 'safety-approver-not-checker' } });
    const audit = await db
      .selectFrom('audit_events')
      .select('new_value')
      .where('action', '=', 'workflow.refused')
      .execute();
    expect(audit.map((a) => a.new_value)).toEqual([{ attempted: 'approve', rule: 'safety-approver-not-checker' }]);
    expect((await decide(db, w.approver, idSafety, { action: 'approve', password: PASSWORD })).state).toBe('approved');
  });
});

describe('signatures', () => {
  it('can never apply to other content: the database refuses a signature whose hash is not its version\u2019s, and any change', async () => {
    const db = testDb();
    await throughCheck(w);
    await expect(
      sql`insert into signatures (sheet_id, version_number, version_sha256, user_id, printed_name, meaning) values (${w.sheet.id}, 2, ${'0'.repeat(64)}, ${w.checker.userId}, 'Forger', 'checked')`.execute(
        db,
      ),
    ).rejects.toThrow(/is not that of version 2 of this sheet/);
    const v1 = (await getVersion(db, w.sheet.id, 1))!;
    await expect(
      sql`update signatures set version_number = 1, version_sha256 = ${v1.sha256}`.execute(db),
    ).rejects.toThrow(/UPDATE on signatures is refused/);
    await expect(sql`delete from signatures`.execute(db)).rejects.toThrow(/DELETE on signatures is refused/);
    // Nor can a check be pointed at another version, or walked backwards.
    await expect(sql`update checks set version_number = 1, version_sha256 = ${v1.sha256}`.execute(db)).rejects.toThrow(
      /always names the same version/,
    );
    await expect(sql`update checks set state = 'in_check'`.execute(db)).rejects.toThrow(
      /cannot go from checked to in_check/,
    );
  });

  it('asks the password at each signature; a person without one (single sign-on) cannot sign', async () => {
    const db = testDb();
    const ssoChecker = await makeUser(db, 'sso.checker@example.test', { password: null });
    await db
      .insertInto('project_members')
      .values({ project_id: w.sheet.project_id, user_id: ssoChecker.userId, role: 'checker' })
      .execute();
    const { id } = await submitForCheck(db, w.author, w.sheet, {
      versionNumber: 2,
      checkerId: ssoChecker.userId,
      password: PASSWORD,
    });
    await saveCheckWork(db, ssoChecker, id, { verificationMethod: 'design_review' });
    const e = await refusal(decide(db, ssoChecker, id, { action: 'sign', password: 'anything' }));
    expect(e.message).toMatch(/no password .* set one on your account page/);
    // Submitting signs "prepared": a wrong password is refused before anything else is written.
    const other = await createSheet(
      db,
      w.author,
      { id: w.sheet.project_id, code: 'BEAM' },
      { title: 'Other', safetyRelated: false, objective: '' },
    );
    const wrong = await refusal(
      submitForCheck(
        db,
        w.author,
        { id: other.id, project_id: w.sheet.project_id, number: other.number, title: 'Other' },
        { versionNumber: 1, checkerId: w.checker.userId, password: 'wrong' },
      ),
    );
    expect(wrong).toMatchObject({ status: 403, message: 'The password is not correct; nothing was signed.' });
    expect(await db.selectFrom('checks').select('id').where('sheet_id', '=', other.id).execute()).toEqual([]);
  });
});

describe('two people acting at once', () => {
  it('records exactly one outcome when the checker signs and returns at the same moment', async () => {
    const db = testDb();
    const { id } = await submitForCheck(db, w.author, w.sheet, {
      versionNumber: 2,
      checkerId: w.checker.userId,
      password: PASSWORD,
    });
    await saveCheckWork(db, w.checker, id, { verificationMethod: 'design_review' });
    const outcomes = await Promise.allSettled([
      decide(db, w.checker, id, { action: 'sign', password: PASSWORD }),
      decide(db, w.checker, id, { action: 'return', reason: 'second thoughts' }),
    ]);
    expect(outcomes.filter((o) => o.status === 'fulfilled')).toHaveLength(1);
    const failed = outcomes.find((o) => o.status === 'rejected') as PromiseRejectedResult;
    expect(failed.reason).toMatchObject({ status: 409 });
    const events = await db
      .selectFrom('audit_events')
      .select('action')
      .where('action', 'in', ['check.sign', 'check.return'])
      .execute();
    expect(events).toHaveLength(1);
    const signatures = await db.selectFrom('signatures').select('meaning').where('meaning', '=', 'checked').execute();
    expect(signatures.length).toBe(events[0].action === 'check.sign' ? 1 : 0);
  });

  it('records exactly one approval when two approvers approve at once', async () => {
    const db = testDb();
    const id = await throughCheck(w);
    const outcomes = await Promise.allSettled([
      decide(db, w.approver, id, { action: 'approve', password: PASSWORD }),
      decide(db, w.approver2, id, { action: 'approve', password: PASSWORD }),
    ]);
    expect(outcomes.map((o) => o.status).sort()).toEqual(['fulfilled', 'rejected']);
    expect(
      await db.selectFrom('signatures').select('printed_name').where('meaning', '=', 'approved').execute(),
    ).toHaveLength(1);
  });
});

describe('e-mail notifications', () => {
  it('sends each event to the right people, with a link to the check', async () => {
    const db = testDb();
    const { id } = await submitForCheck(db, w.author, w.sheet, {
      versionNumber: 2,
      checkerId: w.checker.userId,
      password: PASSWORD,
    });
    await drainMailQueue();
    const submitted = await waitForMail({ to: 'checker@example.test', kind: 'check-submitted' });
    expect(submitted.subject).toBe('BEAM-CALC-0001 version 2 is submitted to you for check');
    expect(submitted.links).toContain(`${process.env.NEXTAUTH_URL ?? 'http://127.0.0.1:3000'}/checks/${id}`);

    await decide(db, w.checker, id, { action: 'return', reason: 'Cite the charge state.' });
    await drainMailQueue();
    expect((await waitForMail({ to: 'author@example.test', kind: 'check-returned' })).text).toContain(
      'Reason: Cite the charge state.',
    );

    await edit(w.author, w.sheet, 'T_kin = 250 MeV # protons, charge 1 e');
    const again = await throughCheck(w);
    await drainMailQueue();
    await waitForMail({ to: 'author@example.test', kind: 'check-checked' });
    await waitForMail({ to: 'approver@example.test', kind: 'approval-requested' });
    await waitForMail({ to: 'checker2@example.test', kind: 'approval-requested' });
    await decide(db, w.approver, again, { action: 'approve', password: PASSWORD });
    await drainMailQueue();
    await waitForMail({ to: 'author@example.test', kind: 'check-approved' });
    await waitForMail({ to: 'checker@example.test', kind: 'check-approved' });
  });

  it('keeps a notification while the mail service is down and delivers it when it is back', async () => {
    const db = testDb();
    await submitForCheck(db, w.author, w.sheet, { versionNumber: 2, checkerId: w.checker.userId, password: PASSWORD });
    // Nothing listens on port 9 (discard) here: the delivery fails and the job waits for a retry.
    const down = await drainMailQueue({ smtpUrl: 'smtp://127.0.0.1:9' });
    expect(down).toMatchObject({ delivered: 0, failed: 1, waiting: 1 });
    // Time passes: the retry is due (pg-boss keeps the job; only its start time is brought forward).
    await sql`update pgboss.job set start_after = now() where name = 'mail' and state = 'retry'`.execute(db);
    expect(await drainMailQueue()).toMatchObject({ delivered: 1, failed: 0, waiting: 0 });
    await waitForMail({ to: 'checker@example.test', kind: 'check-submitted' });
  });
});
