// Every API route, called as a signed-out visitor, a user of another project, and each role of the
// demo project, through the production server. A route file without an entry here fails the test.
// (The app has no server actions: every write goes through these route handlers, the same ones API
// tokens use, so this matrix covers every way to change something.)
import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { addComment, submitForCheck } from '../../lib/checks/workflow';
import { processIssueJob, requestIssue } from '../../lib/issue/issue';
import { uploadAttachment } from '../../lib/attachments/attachments';
import { createApiToken } from '../../lib/auth/api-tokens';
import { getObjectStore } from '../../lib/storage/object-store';
import { checkAndApprove, makeSheet } from '../support/approved-sheet';
import { resetDatabase, testDb } from '../support/database';
import { actorByEmail, makeProject, makeUser } from '../support/people';
import { startApp, type RunningApp } from './harness';

type Who = 'anonymous' | 'outsider' | 'originator' | 'checker' | 'approver' | 'controller' | 'viewer' | 'admin';
const WHO: Who[] = ['anonymous', 'outsider', 'originator', 'checker', 'approver', 'controller', 'viewer', 'admin'];

interface World {
  projectId: string;
  spareUserId: string;
  outsiderId: string;
  sheetId: string;
  sheetContent: unknown;
  /** SHA-256 of a CSV attachment uploaded to the sheet. */
  attachmentSha256: string;
  /** The demo checker, and an open check (of sheet 2) naming them, with one open comment thread. */
  checkerId: string;
  checkId: string;
  threadId: string;
  checkedCellId: string;
  /** Revision A of sheet 3 (issued), its issue job, and a sheet whose version 1 is approved, not issued. */
  revisionId: string;
  issueJobId: string;
  approvedSheetId: string;
}

interface Entry {
  /** What the request does, built from the world. */
  request: (w: World) => { path: string; body?: unknown; file?: { name: string; type: string; text: string } };
  /** Expected status for each caller, or one status for all. */
  expect: Partial<Record<Who, number>> & { default?: number };
}

const signedIn = (status: number, extra: Partial<Record<Who, number>> = {}) => ({ anonymous: 401, default: status, ...extra });
const memberOnly = (status: number) => ({ anonymous: 401, outsider: 404, admin: 404, default: status });
const adminOnly = (status: number) => ({ anonymous: 401, admin: status, default: 403 });
const originatorOnly = (status: number) => ({ anonymous: 401, outsider: 404, admin: 404, originator: status, default: 403 });
const controllerOnly = (status: number) => ({ anonymous: 401, outsider: 404, admin: 404, controller: status, default: 403 });
const checkerOnly = (status: number) => ({ anonymous: 401, outsider: 404, admin: 404, checker: status, default: 403 });
const reason = 'matrix test';

// Keys are "METHOD /api/path" with the route file's own [segments].
const MATRIX: Record<string, Entry> = {
  'GET /api/health': { request: () => ({ path: '/api/health' }), expect: { default: 200 } },
  'GET /api/openapi.json': { request: () => ({ path: '/api/openapi.json' }), expect: { default: 200 } },
  'GET /api/auth/[...nextauth]': { request: () => ({ path: '/api/auth/providers' }), expect: { default: 200 } },
  'POST /api/auth/[...nextauth]': { request: () => ({ path: '/api/auth/callback/password', body: {} }), expect: { default: 302 } },
  'POST /api/auth/password-reset': { request: () => ({ path: '/api/auth/password-reset', body: { email: 'nobody@example.test' } }), expect: { default: 202 } },
  'POST /api/auth/password-reset/confirm': {
    request: () => ({ path: '/api/auth/password-reset/confirm', body: { token: 'not-a-real-token-at-all', newPassword: 'a long enough password' } }),
    expect: { default: 400 },
  },
  'POST /api/auth/sign-in-link': { request: () => ({ path: '/api/auth/sign-in-link', body: { email: 'nobody@example.test' } }), expect: { default: 202 } },
  'POST /api/auth/unlock': { request: () => ({ path: '/api/auth/unlock', body: { token: 'not-a-real-unlock-token' } }), expect: { default: 400 } },
  'POST /api/evaluate': { request: () => ({ path: '/api/evaluate', body: { cells: [{ id: 'a', kind: 'calc', source: 'x_1 = 2 m' }] } }), expect: signedIn(200) },
  'GET /api/account': { request: () => ({ path: '/api/account' }), expect: signedIn(200) },
  'POST /api/account/password': {
    request: () => ({ path: '/api/account/password', body: { currentPassword: 'not the password', newPassword: 'another long password' } }),
    expect: signedIn(403),
  },
  'GET /api/account/tokens': { request: () => ({ path: '/api/account/tokens' }), expect: signedIn(200) },
  'POST /api/account/tokens': { request: () => ({ path: '/api/account/tokens', body: { name: 'from a token' } }), expect: signedIn(403) },
  'DELETE /api/account/tokens/[tokenId]': { request: () => ({ path: '/api/account/tokens/00000000-0000-4000-8000-000000000000' }), expect: signedIn(404) },
  'GET /api/projects': { request: () => ({ path: '/api/projects' }), expect: signedIn(200) },
  'POST /api/projects': {
    request: () => ({ path: '/api/projects', body: { code: 'MTX', name: 'Matrix project', legalOwner: 'Fixture Ltd', revisionScheme: 'letters' } }),
    expect: adminOnly(201),
  },
  'GET /api/projects/[projectId]': { request: (w) => ({ path: `/api/projects/${w.projectId}` }), expect: memberOnly(200) },
  'GET /api/projects/[projectId]/members': { request: (w) => ({ path: `/api/projects/${w.projectId}/members` }), expect: { ...memberOnly(200), admin: 200 } },
  'POST /api/projects/[projectId]/members': {
    request: (w) => ({ path: `/api/projects/${w.projectId}/members`, body: { userId: w.spareUserId, role: 'viewer', reason } }),
    expect: adminOnly(201),
  },
  'DELETE /api/projects/[projectId]/members': {
    request: (w) => ({ path: `/api/projects/${w.projectId}/members`, body: { userId: w.spareUserId, role: 'viewer', reason } }),
    expect: adminOnly(200),
  },
  'GET /api/projects/[projectId]/audit': { request: (w) => ({ path: `/api/projects/${w.projectId}/audit` }), expect: { ...memberOnly(200), viewer: 403 } },
  'GET /api/projects/[projectId]/sheets': { request: (w) => ({ path: `/api/projects/${w.projectId}/sheets` }), expect: memberOnly(200) },
  'POST /api/projects/[projectId]/sheets': {
    request: (w) => ({ path: `/api/projects/${w.projectId}/sheets`, body: { title: 'Matrix sheet', safetyRelated: false, objective: 'check the matrix' } }),
    expect: originatorOnly(201),
  },
  'POST /api/projects/[projectId]/sheets/import': {
    request: (w) => ({ path: `/api/projects/${w.projectId}/sheets/import`, body: { title: 'Imported in the matrix', cells: [{ kind: 'calc', source: 'x_1 = 1 m' }] } }),
    expect: originatorOnly(201),
  },
  'GET /api/sheets/[sheetId]/export': { request: (w) => ({ path: `/api/sheets/${w.sheetId}/export` }), expect: memberOnly(200) },
  'GET /api/sheets/[sheetId]': { request: (w) => ({ path: `/api/sheets/${w.sheetId}` }), expect: memberOnly(200) },
  'GET /api/sheets/[sheetId]/versions': { request: (w) => ({ path: `/api/sheets/${w.sheetId}/versions` }), expect: memberOnly(200) },
  'POST /api/sheets/[sheetId]/versions': {
    request: (w) => ({ path: `/api/sheets/${w.sheetId}/versions`, body: { parentNumber: 1, message: 'matrix save', content: w.sheetContent } }),
    expect: originatorOnly(201),
  },
  'GET /api/sheets/[sheetId]/compare': { request: (w) => ({ path: `/api/sheets/${w.sheetId}/compare?target=1` }), expect: memberOnly(200) },
  'GET /api/sheets/[sheetId]/impact': { request: (w) => ({ path: `/api/sheets/${w.sheetId}/impact` }), expect: memberOnly(200) },
  'GET /api/software-impact': { request: () => ({ path: '/api/software-impact?function=lorentzFactor&format=csv' }), expect: signedIn(200) },
  'GET /api/sheets/[sheetId]/versions/[number]': { request: (w) => ({ path: `/api/sheets/${w.sheetId}/versions/1` }), expect: memberOnly(200) },
  // The demo sheet has no sweep: members get 404 for a statement without a table, others as usual.
  'GET /api/sheets/[sheetId]/versions/[number]/studies/[cellIndex]/[line]': { request: (w) => ({ path: `/api/sheets/${w.sheetId}/versions/1/studies/0/1` }), expect: memberOnly(404) },
  'GET /api/sheets/[sheetId]/attachments': { request: (w) => ({ path: `/api/sheets/${w.sheetId}/attachments` }), expect: memberOnly(200) },
  'POST /api/sheets/[sheetId]/attachments': {
    request: (w) => ({ path: `/api/sheets/${w.sheetId}/attachments`, file: { name: 'matrix-probe.csv', type: 'text/csv', text: 'x [m]\n1\n' } }),
    expect: originatorOnly(201),
  },
  'GET /api/sheets/[sheetId]/attachments/[sha256]': { request: (w) => ({ path: `/api/sheets/${w.sheetId}/attachments/${w.attachmentSha256}` }), expect: memberOnly(200) },
  'GET /api/sheets/[sheetId]/checks': { request: (w) => ({ path: `/api/sheets/${w.sheetId}/checks` }), expect: memberOnly(200) },
  'POST /api/sheets/[sheetId]/checks': {
    request: (w) => ({ path: `/api/sheets/${w.sheetId}/checks`, body: { versionNumber: 1, checkerId: w.checkerId, password: DEMO_PASSWORD } }),
    expect: originatorOnly(201),
  },
  'GET /api/checks': { request: () => ({ path: '/api/checks?queue=approval' }), expect: signedIn(200) },
  'GET /api/checks/[checkId]': { request: (w) => ({ path: `/api/checks/${w.checkId}` }), expect: memberOnly(200) },
  'PATCH /api/checks/[checkId]': { request: (w) => ({ path: `/api/checks/${w.checkId}`, body: { verificationMethod: 'design_review' } }), expect: checkerOnly(200) },
  'POST /api/checks/[checkId]/comments': {
    request: (w) => ({ path: `/api/checks/${w.checkId}/comments`, body: { cellId: w.checkedCellId, body: 'Matrix comment' } }),
    expect: checkerOnly(201),
  },
  'PATCH /api/checks/[checkId]/comments/[commentId]': { request: (w) => ({ path: `/api/checks/${w.checkId}/comments/${w.threadId}`, body: { resolved: true } }), expect: checkerOnly(200) },
  // Last of the check entries: returning the check closes it.
  'POST /api/checks/[checkId]/decision': { request: (w) => ({ path: `/api/checks/${w.checkId}/decision`, body: { action: 'return', reason: 'matrix test' } }), expect: checkerOnly(200) },
  'GET /api/sheets/[sheetId]/revisions': { request: (w) => ({ path: `/api/sheets/${w.sheetId}/revisions` }), expect: memberOnly(200) },
  'POST /api/sheets/[sheetId]/revisions': {
    request: (w) => ({ path: `/api/sheets/${w.approvedSheetId}/revisions`, body: { versionNumber: 1, password: DEMO_PASSWORD } }),
    expect: controllerOnly(202),
  },
  'GET /api/issuing/[jobId]': { request: (w) => ({ path: `/api/issuing/${w.issueJobId}` }), expect: memberOnly(200) },
  'GET /api/projects/[projectId]/register': { request: (w) => ({ path: `/api/projects/${w.projectId}/register?format=csv` }), expect: memberOnly(200) },
  'GET /api/revisions/[revisionId]/pdf': { request: (w) => ({ path: `/api/revisions/${w.revisionId}/pdf` }), expect: memberOnly(200) },
  'POST /api/revisions/[revisionId]/withdraw': { request: (w) => ({ path: `/api/revisions/${w.revisionId}/withdraw`, body: { reason: 'matrix test' } }), expect: controllerOnly(200) },
  'POST /api/verify': { request: () => ({ path: '/api/verify', body: { code: 'ZZZZ-ZZZZ-ZZZZ' } }), expect: { default: 200 } },
  'GET /api/admin/users': { request: () => ({ path: '/api/admin/users' }), expect: adminOnly(200) },
  'POST /api/admin/users': { request: () => ({ path: '/api/admin/users', body: { email: 'invited@example.test', name: 'Invited Person' } }), expect: adminOnly(201) },
  'PATCH /api/admin/users/[userId]': { request: (w) => ({ path: `/api/admin/users/${w.spareUserId}`, body: { action: 'disable', reason } }), expect: adminOnly(200) },
};

function routeFiles(dir: string, out: string[] = []): string[] {
  for (const name of readdirSync(dir)) {
    const p = path.join(dir, name);
    if (statSync(p).isDirectory()) routeFiles(p, out);
    else if (name === 'route.ts') out.push(p);
  }
  return out;
}

function discoveredRoutes(): string[] {
  const appDir = path.join(process.cwd(), 'app');
  const keys: string[] = [];
  for (const file of routeFiles(path.join(appDir, 'api'))) {
    const route = `/${path.relative(appDir, path.dirname(file)).split(path.sep).filter((s) => !/^\(.*\)$/.test(s)).join('/')}`;
    const source = readFileSync(file, 'utf8');
    const methods = new Set<string>();
    for (const m of source.matchAll(/export\s+(?:async\s+)?function\s+(GET|POST|PUT|PATCH|DELETE)\b/g)) methods.add(m[1]);
    for (const m of source.matchAll(/\bas\s+(GET|POST|PUT|PATCH|DELETE)\b/g)) methods.add(m[1]);
    for (const method of methods) keys.push(`${method} ${route}`);
  }
  return keys.sort();
}

let app: RunningApp;
let world: World;
const tokens = new Map<Who, string>();

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  const projectId = (await testDb().selectFrom('projects').select('id').where('code', '=', 'TPT2').executeTakeFirstOrThrow()).id;
  const outsider = await makeUser(testDb(), 'outsider@example.test');
  await makeProject(testDb(), 'OTH', [[outsider, 'originator']]);
  const spare = await makeUser(testDb(), 'spare@example.test');
  const sheet = await testDb().selectFrom('sheets').select('id').where('project_id', '=', projectId).where('number', '=', 1).executeTakeFirstOrThrow();
  const version = await testDb().selectFrom('versions').select('content').where('sheet_id', '=', sheet.id).where('number', '=', 1).executeTakeFirstOrThrow();
  const originator = await actorByEmail(testDb(), 'originator@demo.test');
  const attachment = await uploadAttachment(
    testDb(),
    getObjectStore(),
    originator,
    { id: sheet.id, project_id: projectId },
    { name: 'scan.csv', type: 'text/csv', bytes: new TextEncoder().encode('energy [MeV]\n70\n250\n') },
  );
  const checker = await actorByEmail(testDb(), 'checker@demo.test');
  const second = await testDb().selectFrom('sheets').select(['id', 'project_id', 'number', 'title']).where('project_id', '=', projectId).where('number', '=', 2).executeTakeFirstOrThrow();
  const secondContent = (await testDb().selectFrom('versions').select('content').where('sheet_id', '=', second.id).where('number', '=', 1).executeTakeFirstOrThrow()).content as { cells: Array<{ id: string }> };
  const check = await submitForCheck(testDb(), originator, second, { versionNumber: 1, checkerId: checker.userId, password: DEMO_PASSWORD });
  const thread = await addComment(testDb(), checker, check.id, { cellId: secondContent.cells[0].id, statementLine: null, body: 'Source of the flight path length?' });
  // Sheet 3 through check and approval to revision A; a new sheet approved but not issued.
  const approver = await actorByEmail(testDb(), 'approver@demo.test');
  const controller = await actorByEmail(testDb(), 'controller@demo.test');
  const people = { author: originator, checker, approver };
  const third = await testDb().selectFrom('sheets').select(['id', 'project_id', 'number', 'title']).where('project_id', '=', projectId).where('number', '=', 3).executeTakeFirstOrThrow();
  await checkAndApprove(testDb(), people, third, { versionNumber: 1, password: DEMO_PASSWORD });
  const issued = await requestIssue(testDb(), controller, third, { versionNumber: 1, password: DEMO_PASSWORD });
  const revisionId = (await processIssueJob(testDb(), getObjectStore(), issued.jobId))!;
  const fresh = await makeSheet(testDb(), originator, { id: projectId, code: 'TPT2' }, { title: 'Matrix sheet to issue' });
  await checkAndApprove(testDb(), people, fresh, { versionNumber: 1, password: DEMO_PASSWORD });
  world = {
    revisionId,
    issueJobId: issued.jobId,
    approvedSheetId: fresh.id,
    projectId,
    spareUserId: spare.userId,
    outsiderId: outsider.userId,
    sheetId: sheet.id,
    sheetContent: version.content,
    attachmentSha256: attachment.sha256,
    checkerId: checker.userId,
    checkId: check.id,
    threadId: thread.id,
    checkedCellId: secondContent.cells[0].id,
  };
  for (const who of WHO) {
    if (who === 'anonymous') continue;
    const actor = await actorByEmail(testDb(), who === 'outsider' ? 'outsider@example.test' : `${who}@demo.test`);
    tokens.set(who, (await createApiToken(testDb(), actor, 'matrix')).token);
  }
  app = await startApp();
});

afterAll(async () => {
  await app?.stop();
});

describe('authorization matrix', () => {
  it('has an entry for every route handler, and no entry for a route that does not exist', () => {
    expect(discoveredRoutes()).toEqual(Object.keys(MATRIX).sort());
  });

  for (const [key, entry] of Object.entries(MATRIX)) {
    it(`${key}`, async () => {
      const method = key.split(' ')[0];
      const { path: url, body, file } = entry.request(world);
      const seen: Record<string, number> = {};
      const wanted: Record<string, number> = {};
      for (const who of WHO) {
        const headers: Record<string, string> = {};
        if (who !== 'anonymous') headers.authorization = `Bearer ${tokens.get(who)}`;
        if (body !== undefined) headers['content-type'] = 'application/json';
        let payload: string | FormData | undefined = body === undefined ? undefined : JSON.stringify(body);
        if (file) {
          payload = new FormData();
          payload.append('file', new Blob([file.text], { type: file.type }), file.name);
        }
        const response = await fetch(`${app.baseUrl}${url}`, { method, headers, body: payload, redirect: 'manual' });
        seen[who] = response.status;
        wanted[who] = entry.expect[who] ?? entry.expect.default!;
      }
      expect(seen).toEqual(wanted);
    });
  }

  it('answers 401 for a revoked or made-up token', async () => {
    const response = await fetch(`${app.baseUrl}/api/account`, { headers: { authorization: 'Bearer wst_made-up-token' } });
    expect(response.status).toBe(401);
  });

  it('records writes made with a token under the owner and the token', async () => {
    const events = await testDb()
      .selectFrom('audit_events')
      .select(['action', 'token_id', 'actor_id'])
      .where('action', 'in', ['project.create', 'membership.grant', 'membership.revoke', 'user.invite', 'user.disable'])
      .where('token_id', 'is not', null)
      .execute();
    expect(events.map((e) => e.action).sort()).toEqual(['membership.grant', 'membership.revoke', 'project.create', 'user.disable', 'user.invite']);
    const sheetWrites = await testDb().selectFrom('audit_events').select('action').where('action', 'in', ['sheet.create', 'version.save', 'attachment.upload']).where('token_id', 'is not', null).execute();
    expect(new Set(sheetWrites.map((e) => e.action))).toEqual(new Set(['sheet.create', 'version.save', 'attachment.upload']));
  });
});
