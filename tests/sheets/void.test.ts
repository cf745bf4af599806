// Voiding a sheet started by mistake (lib/sheets/void.ts, migration 20261204T032000_sheet_void):
// it stays in the register with its versions, takes nothing new, is audited with the reason, and is
// refused once the sheet was issued or while a check is open. The database refuses new versions,
// checks and revisions of a void sheet even when the application's own checks are bypassed.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { sql } from 'kysely';
import { beforeEach, describe, expect, it } from 'vitest';
import { decide } from '../../lib/checks/decide';
import { submitForCheck } from '../../lib/checks/submit';
import { errorResponse } from '../../lib/errors/app-error';
import { requestIssue } from '../../lib/issue/request';
import { processIssueJob } from '../../lib/issue/job';
import { getVersion, listSheets, listVersions, saveVersion } from '../../lib/sheets/sheets';
import { voidSheet } from '../../lib/sheets/void';
import { storageConfig } from '../../lib/storage/config';
import { createObjectStore } from '../../lib/storage/object-store';
import { approveNewVersion, makeSheet, makeTeam, type SheetRef, type Team } from '../support/approved-sheet';
import { testDb } from '../support/database';
import { makeUser, PASSWORD } from '../support/people';
import { refusal } from '../support/refusal';

process.env.WORLDSHEET_KEY_FOLDER ??= path.join(mkdtempSync(path.join(tmpdir(), 'ws-void-')), 'keys');

type World = Team & { sheet: SheetRef; projectId: string };
let w: World;
beforeEach(async () => {
  const team = await makeTeam(testDb(), { code: 'VOID' });
  const sheet = await makeSheet(
    testDb(),
    team.author,
    { id: team.projectId, code: 'VOID' },
    { title: 'Started by mistake' },
  );
  w = { ...team, sheet };
});

async function saveOne(message: string) {
  const latest = (await getVersion(testDb(), w.sheet.id))!;
  return saveVersion(testDb(), w.author, w.sheet, {
    parentNumber: latest.number,
    message,
    content: { ...latest.content, cells: [{ id: 'c1', kind: 'calc', source: 'x = 3 m' }] },
  });
}

describe('voiding a sheet', () => {
  it('keeps the sheet and its versions, records who and why, and refuses later saves', async () => {
    await saveOne('second');
    const result = await voidSheet(testDb(), w.author, ['originator'], w.sheet.id, {
      reason: '  duplicate of VOID-0002  ',
    });
    expect(result.reason).toBe('duplicate of VOID-0002');

    const row = await testDb()
      .selectFrom('sheets')
      .select(['voided_at', 'voided_by', 'void_reason'])
      .where('id', '=', w.sheet.id)
      .executeTakeFirstOrThrow();
    expect(row.voided_by).toBe(w.author.userId);
    expect(row.void_reason).toBe('duplicate of VOID-0002');
    expect(row.voided_at).toBeInstanceOf(Date);
    expect((await listVersions(testDb(), w.sheet.id)).map((v) => v.number)).toEqual([2, 1]);

    const audit = await testDb()
      .selectFrom('audit_events')
      .select(['action', 'reason', 'actor_id', 'object_id', 'new_value'])
      .where('action', '=', 'sheet.void')
      .execute();
    expect(audit).toEqual([
      {
        action: 'sheet.void',
        reason: 'duplicate of VOID-0002',
        actor_id: w.author.userId,
        object_id: w.sheet.id,
        new_value: { status: 'void' },
      },
    ]);

    const refused = await refusal(saveOne('after void'));
    expect(refused.code).toBe('conflict');
    expect(refused.message).toMatch(/void/);
    expect(
      await refusal(
        submitForCheck(testDb(), w.author, w.sheet, {
          versionNumber: 2,
          checkerId: w.checker.userId,
          password: PASSWORD,
        }),
        Error,
      ),
    ).toBeTruthy();
    expect(
      await refusal(voidSheet(testDb(), w.controller, ['controller'], w.sheet.id, { reason: 'again' })),
    ).toMatchObject({ code: 'conflict' });
    expect((await listVersions(testDb(), w.sheet.id)).length).toBe(2);
    const register = await listSheets(testDb(), w.projectId, 'VOID');
    expect(register.map((r) => [r.id, r.status, r.latestVersion])).toEqual([[w.sheet.id, 'void', 2]]);
  });

  it('the database refuses a new version, a check, un-voiding, and a void without a reason', async () => {
    await voidSheet(testDb(), w.controller, ['controller'], w.sheet.id, { reason: 'wrong project' });
    const v1 = (await getVersion(testDb(), w.sheet.id, 1))!;
    const insertVersion = sql`insert into versions (sheet_id, number, parent_number, content, content_hash, author_id)
      values (${w.sheet.id}, 2, 1, '{}'::jsonb, ${v1.sha256}, ${w.author.userId})`;
    await expect(insertVersion.execute(testDb())).rejects.toThrow(/the sheet is void: no new versions/);
    // Reaching the database's refusal (a race the application's own check lost) answers 409 with its words, not 500.
    const answer = errorResponse(await refusal(insertVersion.execute(testDb()), Error));
    expect(answer.status).toBe(409);
    expect(await answer.json()).toMatchObject({
      error: {
        code: 'conflict',
        message: expect.stringMatching(
          /^The record refuses this change \(.*the sheet is void: no new versions.*\); nothing was saved\./,
        ),
        details: { rule: 'WS003' },
      },
    });
    const insertCheck = sql`insert into checks (sheet_id, project_id, version_number, version_sha256, submitted_by, checker_id)
      values (${w.sheet.id}, ${w.projectId}, 1, ${v1.sha256}, ${w.author.userId}, ${w.checker.userId})`;
    await expect(insertCheck.execute(testDb())).rejects.toThrow(/the sheet is void: no new checks/);
    await expect(
      sql`update sheets set voided_at = null, voided_by = null, void_reason = null where id = ${w.sheet.id}`.execute(
        testDb(),
      ),
    ).rejects.toThrow(/a voided sheet stays void/);

    const other = await makeSheet(testDb(), w.author, { id: w.projectId, code: 'VOID' }, { title: 'Another' });
    await expect(
      sql`update sheets set voided_at = now(), voided_by = ${w.author.userId}, void_reason = '   ' where id = ${other.id}`.execute(
        testDb(),
      ),
    ).rejects.toThrow(/sheets_void_complete_check/);
  });

  it('only the creator (as originator) or a document controller may void', async () => {
    const colleague = await makeUser(testDb(), 'colleague@example.test');
    expect(
      await refusal(voidSheet(testDb(), colleague, ['originator'], w.sheet.id, { reason: 'not mine' })),
    ).toMatchObject({ code: 'forbidden' });
    expect(
      await refusal(voidSheet(testDb(), w.checker, ['checker'], w.sheet.id, { reason: 'not mine' })),
    ).toMatchObject({ code: 'forbidden' });
    expect(
      await refusal(voidSheet(testDb(), w.author, ['viewer'], w.sheet.id, { reason: 'no longer originator' })),
    ).toMatchObject({ code: 'forbidden' });
    const row = await testDb()
      .selectFrom('sheets')
      .select('voided_at')
      .where('id', '=', w.sheet.id)
      .executeTakeFirstOrThrow();
    expect(row.voided_at).toBeNull();
  });

  it('is refused while a check is open, and allowed once the check is returned', async () => {
    const { id } = await submitForCheck(testDb(), w.author, w.sheet, {
      versionNumber: 1,
      checkerId: w.checker.userId,
      password: PASSWORD,
    });
    const refused = await refusal(voidSheet(testDb(), w.author, ['originator'], w.sheet.id, { reason: 'mistake' }));
    expect(refused.code).toBe('conflict');
    expect(refused.message).toMatch(/in check/);
    // The backstop: the database refuses it too.
    await expect(
      sql`update sheets set voided_at = now(), voided_by = ${w.author.userId}, void_reason = 'bypass' where id = ${w.sheet.id}`.execute(
        testDb(),
      ),
    ).rejects.toThrow(/open check/);
    await decide(testDb(), w.checker, id, { action: 'return', reason: 'started by mistake' });
    await voidSheet(testDb(), w.author, ['originator'], w.sheet.id, { reason: 'mistake' });
  });

  it('is refused once the sheet has an issued revision, and a void sheet cannot be issued', async () => {
    const store = createObjectStore(storageConfig());
    const versionNumber = await approveNewVersion(testDb(), w, w.sheet, {
      message: 'for issue',
      cells: [{ id: 'c1', kind: 'calc', source: 'x = 4 m' }],
    });
    const { jobId } = await requestIssue(testDb(), w.controller, w.sheet, { versionNumber, password: PASSWORD });
    expect(await processIssueJob(testDb(), store, jobId)).toBeTruthy();
    const refused = await refusal(voidSheet(testDb(), w.controller, ['controller'], w.sheet.id, { reason: 'mistake' }));
    expect(refused.code).toBe('conflict');
    expect(refused.message).toMatch(/was issued \(revision /);
    await expect(
      sql`update sheets set voided_at = now(), voided_by = ${w.controller.userId}, void_reason = 'bypass' where id = ${w.sheet.id}`.execute(
        testDb(),
      ),
    ).rejects.toThrow(/issued revision/);

    // An approved version never issued: voiding is allowed, and issuing it afterwards is refused.
    const second = await makeSheet(
      testDb(),
      w.author,
      { id: w.projectId, code: 'VOID' },
      { title: 'Approved, never issued' },
    );
    const approved = await approveNewVersion(testDb(), w, second, {
      message: 'approved',
      cells: [{ id: 'c1', kind: 'calc', source: 'y = 1 s' }],
    });
    await voidSheet(testDb(), w.controller, ['controller'], second.id, {
      reason: 'superseded by a new sheet before issue',
    });
    await expect(
      requestIssue(testDb(), w.controller, second, { versionNumber: approved, password: PASSWORD }).then((r) =>
        processIssueJob(testDb(), store, r.jobId),
      ),
    ).rejects.toThrow();
    expect(await testDb().selectFrom('revisions').select('id').where('sheet_id', '=', second.id).execute()).toEqual([]);
  });
});
