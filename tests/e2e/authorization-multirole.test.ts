// The decision routes over HTTP, through the production server, with people who hold several roles
// (issue 14, item 2): one person with the originator, checker and approver roles tries to sign one
// version as two of preparer, checker and approver, by every route that signs; a newer version
// marked not safety-related does not lift the safety rule of the version under check; a checker
// who saves a later version cannot sign; only the people of a check answer its threads; the
// checker's work is audited. Each refusal is 403 naming its rule, and audited.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Actor } from '../../lib/auth/actor';
import { createApiToken } from '../../lib/auth/api-tokens';
import { makeSheet, type SheetRef } from '../support/approved-sheet';
import { resetDatabase, testDb } from '../support/database';
import { makeProject, makeUser, PASSWORD } from '../support/people';
import { startApp, type RunningApp } from './harness';

type Who = 'author' | 'multi' | 'checkApprove' | 'checker' | 'approver' | 'bystander';

let app: RunningApp;
const people = {} as Record<Who, Actor>;
const tokens = {} as Record<Who, string>;
let projectId: string;

interface Answer {
  status: number;
  body: { error?: { code: string; message: string; details: { rule?: string } | null } } & Record<string, unknown>;
}

async function call(who: Who, method: string, path: string, body?: unknown): Promise<Answer> {
  const headers: Record<string, string> = { authorization: `Bearer ${tokens[who]}` };
  if (body !== undefined) headers['content-type'] = 'application/json';
  const response = await fetch(`${app.baseUrl}${path}`, {
    method,
    headers,
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  return { status: response.status, body: await response.json() };
}

/** A new version on top of the latest, saved over HTTP, optionally changing the safety flag it records. */
async function save(who: Who, sheet: SheetRef, source: string, safetyRelated?: boolean): Promise<number> {
  const { body } = await call(who, 'GET', `/api/sheets/${sheet.id}`);
  const version = body.version as { number: number; content: Record<string, unknown> };
  const content = {
    ...version.content,
    cells: [{ id: 'c1', kind: 'calc', source }],
    ...(safetyRelated === undefined ? {} : { safetyRelated }),
  };
  const saved = await call(who, 'POST', `/api/sheets/${sheet.id}/versions`, {
    parentNumber: version.number,
    message: 'edit',
    content,
  });
  expect(saved.status).toBe(201);
  return saved.body.number as number;
}

const submit = (who: Who, sheet: SheetRef, checker: Who, versionNumber: number) =>
  call(who, 'POST', `/api/sheets/${sheet.id}/checks`, {
    versionNumber,
    checkerId: people[checker].userId,
    password: PASSWORD,
  });
const decide = (who: Who, checkId: string, decision: Record<string, unknown>) =>
  call(who, 'POST', `/api/checks/${checkId}/decision`, decision);

async function signChecked(who: Who, checkId: string) {
  expect((await call(who, 'PATCH', `/api/checks/${checkId}`, { verificationMethod: 'design_review' })).status).toBe(
    200,
  );
  expect((await decide(who, checkId, { action: 'sign', password: PASSWORD })).status).toBe(200);
}

function refused(answer: Answer, rule: string) {
  expect({ status: answer.status, rule: answer.body.error?.details?.rule }).toEqual({ status: 403, rule });
}

async function newSheet(title: string, safetyRelated: boolean): Promise<SheetRef> {
  const sheet = await makeSheet(testDb(), people.author, { id: projectId, code: 'MRL' }, { title, safetyRelated });
  expect(await save('author', sheet, 'I_max = 2 nA')).toBe(2);
  return sheet;
}

beforeAll(async () => {
  await resetDatabase();
  const db = testDb();
  for (const [who, email] of [
    ['author', 'author'],
    ['multi', 'multi'],
    ['checkApprove', 'check.approve'],
    ['checker', 'checker'],
    ['approver', 'approver'],
    ['bystander', 'bystander'],
  ] as const) {
    people[who] = await makeUser(db, `${email}@example.test`);
    tokens[who] = (await createApiToken(db, people[who], 'multirole')).token;
  }
  projectId = await makeProject(db, 'MRL', [
    [people.author, 'originator'],
    [people.bystander, 'originator'],
    [people.multi, 'originator'],
    [people.multi, 'checker'],
    [people.multi, 'approver'],
    [people.checkApprove, 'checker'],
    [people.checkApprove, 'approver'],
    [people.checker, 'checker'],
    [people.approver, 'approver'],
  ]);
  app = await startApp();
  // The first evaluation starts the sandbox workers (slow on a busy machine): done here, not in a test.
  expect(
    (await call('author', 'POST', '/api/evaluate', { cells: [{ id: 'w', kind: 'calc', source: 'x = 2 m' }] })).status,
  ).toBe(200);
});

/** Each test makes a dozen requests, some of which evaluate or sign (password hashing). */
const SLOW = 120_000;

afterAll(async () => {
  await app?.stop();
});

describe('a person with originator, checker and approver roles, over HTTP', () => {
  it(
    'cannot submit someone else\u2019s version naming himself checker, and the form data says so',
    async () => {
      const sheet = await newSheet('Submit and check', false);
      const answer = await submit('multi', sheet, 'multi', 2);
      refused(answer, 'checker-not-preparer');
      expect(answer.body.error!.message).toMatch(/^Person multi cannot check this version: they are its preparer/);
      const { body } = await call('multi', 'GET', `/api/sheets/${sheet.id}/checks`);
      const checkers = body.checkers as Array<{ userId: string; eligible: boolean }>;
      expect(checkers.find((c) => c.userId === people.multi.userId)?.eligible).toBe(false);
      expect(checkers.find((c) => c.userId === people.checker.userId)?.eligible).toBe(true);
      const audit = await testDb()
        .selectFrom('audit_events')
        .select(['actor_id', 'new_value'])
        .where('action', '=', 'workflow.refused')
        .where('object_id', '=', sheet.id)
        .execute();
      expect(audit).toEqual([
        { actor_id: people.multi.userId, new_value: { attempted: 'submit', rule: 'checker-not-preparer' } },
      ]);
    },
    SLOW,
  );

  it(
    'cannot approve, nor return as approver, a version he submitted',
    async () => {
      const sheet = await newSheet('Submit and approve', false);
      const submitted = await submit('multi', sheet, 'checker', 2);
      expect(submitted.status).toBe(201);
      const checkId = submitted.body.id as string;
      await signChecked('checker', checkId);
      refused(await decide('multi', checkId, { action: 'approve', password: PASSWORD }), 'approver-not-preparer');
      refused(await decide('multi', checkId, { action: 'reject', reason: 'my own' }), 'approver-not-preparer');
      expect((await decide('approver', checkId, { action: 'approve', password: PASSWORD })).status).toBe(200);
    },
    SLOW,
  );

  it(
    'cannot approve a safety-related version he checked after a newer version is marked not safety-related',
    async () => {
      const sheet = await newSheet('Check and approve', true);
      const submitted = await submit('author', sheet, 'multi', 2);
      expect(submitted.status).toBe(201);
      const checkId = submitted.body.id as string;
      await signChecked('multi', checkId);
      expect(await save('author', sheet, 'I_max = 2.5 nA', false)).toBe(3);
      const answer = await decide('multi', checkId, { action: 'approve', password: PASSWORD });
      refused(answer, 'safety-approver-not-checker');
      expect((await call('multi', 'GET', `/api/checks/${checkId}`)).body).toMatchObject({
        sheet: { safetyRelated: true },
        you: { actions: [] },
      });
      // The approval queue says why, and a third person approves.
      const queue = await call('multi', 'GET', '/api/checks?queue=approval');
      expect(
        (queue.body.checks as Array<{ id: string; eligible: boolean }>).find((c) => c.id === checkId)?.eligible,
      ).toBe(false);
      expect((await decide('approver', checkId, { action: 'approve', password: PASSWORD })).status).toBe(200);
      const signers = await testDb()
        .selectFrom('signatures')
        .select(['meaning', 'user_id'])
        .where('sheet_id', '=', sheet.id)
        .orderBy('signed_at')
        .execute();
      expect(signers).toEqual([
        { meaning: 'prepared', user_id: people.author.userId },
        { meaning: 'checked', user_id: people.multi.userId },
        { meaning: 'approved', user_id: people.approver.userId },
      ]);
    },
    SLOW,
  );

  it(
    'cannot sign a version as checked after saving a later version himself',
    async () => {
      const sheet = await newSheet('Check and edit', false);
      const checkId = (await submit('author', sheet, 'multi', 2)).body.id as string;
      expect(
        (await call('multi', 'PATCH', `/api/checks/${checkId}`, { verificationMethod: 'design_review' })).status,
      ).toBe(200);
      await save('multi', sheet, 'I_max = 2.5 nA');
      refused(await decide('multi', checkId, { action: 'sign', password: PASSWORD }), 'checker-not-originator');
      refused(await decide('multi', checkId, { action: 'return', reason: 'x' }), 'checker-not-originator');
    },
    SLOW,
  );
});

describe('a person with checker and approver roles, over HTTP', () => {
  it(
    'checks and approves a version that is not safety-related, but not one that is',
    async () => {
      const plain = await newSheet('Plain', false);
      const plainCheck = (await submit('author', plain, 'checkApprove', 2)).body.id as string;
      await signChecked('checkApprove', plainCheck);
      expect((await decide('checkApprove', plainCheck, { action: 'approve', password: PASSWORD })).status).toBe(200);

      const safety = await newSheet('Safety', true);
      const safetyCheck = (await submit('author', safety, 'checkApprove', 2)).body.id as string;
      await signChecked('checkApprove', safetyCheck);
      refused(
        await decide('checkApprove', safetyCheck, { action: 'approve', password: PASSWORD }),
        'safety-approver-not-checker',
      );
    },
    SLOW,
  );
});

describe('comment threads and the checker\u2019s work, over HTTP', () => {
  it(
    'lets only the people of the check answer, and audits the checker\u2019s work with old and new values',
    async () => {
      const sheet = await newSheet('Threads', false);
      const checkId = (await submit('author', sheet, 'checker', 2)).body.id as string;
      const opened = await call('checker', 'POST', `/api/checks/${checkId}/comments`, {
        cellId: 'c1',
        statementLine: 1,
        body: 'Source of the limit?',
      });
      expect(opened.status).toBe(201);
      const reply = { cellId: 'c1', body: 'An answer.', threadId: opened.body.id };
      expect((await call('author', 'POST', `/api/checks/${checkId}/comments`, reply)).status).toBe(201);
      for (const other of ['bystander', 'multi'] as const)
        expect((await call(other, 'POST', `/api/checks/${checkId}/comments`, reply)).status).toBe(403);

      expect(
        (
          await call('checker', 'PATCH', `/api/checks/${checkId}`, {
            verificationMethod: 'design_review',
            checkerNotes: 'Reviewed.',
          })
        ).status,
      ).toBe(200);
      const work = await testDb()
        .selectFrom('audit_events')
        .select(['actor_id', 'old_value', 'new_value'])
        .where('action', '=', 'check.work')
        .where('object_id', '=', checkId)
        .execute();
      expect(work).toEqual([
        {
          actor_id: people.checker.userId,
          old_value: { verificationMethod: null, checkerNotes: '' },
          new_value: { verificationMethod: 'design_review', checkerNotes: 'Reviewed.' },
        },
      ]);
    },
    SLOW,
  );
});
