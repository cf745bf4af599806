// Every API route and every page, called as a signed-out visitor, a user of another project, and
// each role of the demo project, through the production server: once with API tokens and once with
// browser sessions (the session cookie, from the app's own origin). A route or page file without an
// entry here fails the test. Then, for every state-changing route: the same request with the session
// cookie from another origin (403), with no word of its origin (403), as text/plain or as
// application/x-www-form-urlencoded (415), and with a read-only API token (403); and every decision
// on a check (return, sign, approve, return from approval). (The app has no server actions: every
// write goes through these route handlers, so this matrix covers every way to change something.
// Users holding several roles are in tests/e2e/authorization-multirole.test.ts.)
// Sources: OWASP Cross-Site Request Forgery Prevention Cheat Sheet (verifying the origin with
// standard headers; the content types an HTML form can send); Fetch Standard (Origin on every
// request whose method is not GET or HEAD).
import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import type { Actor } from '../../lib/auth/actor';
import { addComment } from '../../lib/checks/threads';
import { decide } from '../../lib/checks/decide';
import { saveCheckWork } from '../../lib/checks/work';
import { submitForCheck } from '../../lib/checks/submit';
import { requestIssue } from '../../lib/issue/request';
import { processIssueJob } from '../../lib/issue/job';
import { uploadAttachment } from '../../lib/attachments/attachments';
import { createApiToken } from '../../lib/auth/api-tokens';
import { getVersion, saveVersion } from '../../lib/sheets/sheets';
import { getObjectStore } from '../../lib/storage/object-store';
import { checkAndApprove, makeSheet, type SheetRef } from '../support/approved-sheet';
import { resetDatabase, testDb } from '../support/database';
import { waitForMail } from '../support/mailbox';
import { actorByEmail, makeProject, makeUser, PASSWORD } from '../support/people';
import { startApp, type RunningApp } from './harness';

type Who = 'anonymous' | 'outsider' | 'originator' | 'checker' | 'approver' | 'controller' | 'viewer' | 'admin';
const WHO: Who[] = ['anonymous', 'outsider', 'originator', 'checker', 'approver', 'controller', 'viewer', 'admin'];
const SIGNED_IN = WHO.filter((w) => w !== 'anonymous');
type Variant = 'token' | 'cookie';
type Decision = 'return' | 'sign' | 'approve' | 'reject';

interface World {
  variant: Variant;
  /** '' for the token pass, 'C' for the cookie pass: what each pass creates is named apart. */
  tag: string;
  projectId: string;
  spareUserId: string;
  outsiderId: string;
  /** A copy of demo sheet 1, and its latest version's number and content. */
  sheetId: string;
  latestNumber: number;
  sheetContent: unknown;
  /** SHA-256 of a CSV attachment uploaded to the sheet. */
  attachmentSha256: string;
  /** The demo checker, and an open check (of a copy of sheet 2) naming them, with one open comment thread. */
  checkerId: string;
  checkId: string;
  threadId: string;
  checkedCellId: string;
  /** An issued revision (a copy of sheet 3), its issue job, and a sheet whose version 1 is approved, not issued. */
  revisionId: string;
  issueJobId: string;
  approvedSheetId: string;
  /** For each decision, a check in the state where it may be taken. */
  decisions: Record<Decision, string>;
}

interface Entry {
  /** What the request does, built from the world. */
  request: (w: World) => { path: string; body?: unknown; file?: { name: string; type: string; text: string } };
  /** Expected status for each caller, or one status for all (with API tokens, and with sessions unless `cookie` says otherwise). */
  expect: Partial<Record<Who, number>> & { default?: number };
  cookie?: Partial<Record<Who, number>> & { default?: number };
}

const signedIn = (status: number, extra: Partial<Record<Who, number>> = {}) => ({
  anonymous: 401,
  default: status,
  ...extra,
});
const memberOnly = (status: number) => ({ anonymous: 401, outsider: 404, admin: 404, default: status });
const adminOnly = (status: number) => ({ anonymous: 401, admin: status, default: 403 });
const originatorOnly = (status: number) => ({
  anonymous: 401,
  outsider: 404,
  admin: 404,
  originator: status,
  default: 403,
});
const controllerOnly = (status: number) => ({
  anonymous: 401,
  outsider: 404,
  admin: 404,
  controller: status,
  default: 403,
});
const checkerOnly = (status: number) => ({ anonymous: 401, outsider: 404, admin: 404, checker: status, default: 403 });
const approverOnly = (status: number) => ({
  anonymous: 401,
  outsider: 404,
  admin: 404,
  approver: status,
  default: 403,
});
const reason = 'matrix test';

// Keys are "METHOD /api/path" with the route file's own [segments].
const MATRIX: Record<string, Entry> = {
  'GET /api/health': { request: () => ({ path: '/api/health' }), expect: { default: 200 } },
  'GET /api/health/live': { request: () => ({ path: '/api/health/live' }), expect: { default: 200 } },
  'GET /api/openapi.json': { request: () => ({ path: '/api/openapi.json' }), expect: { default: 200 } },
  'GET /api/auth/[...nextauth]': { request: () => ({ path: '/api/auth/providers' }), expect: { default: 200 } },
  'POST /api/auth/[...nextauth]': {
    request: () => ({ path: '/api/auth/callback/password', body: {} }),
    expect: { default: 302 },
  },
  'POST /api/auth/password-reset': {
    request: () => ({ path: '/api/auth/password-reset', body: { email: 'nobody@example.test' } }),
    expect: { default: 202 },
  },
  'POST /api/auth/password-reset/confirm': {
    request: () => ({
      path: '/api/auth/password-reset/confirm',
      body: { token: 'not-a-real-token-at-all', newPassword: 'a long enough password' },
    }),
    expect: { default: 400 },
  },
  'POST /api/auth/sign-in-link': {
    request: () => ({ path: '/api/auth/sign-in-link', body: { email: 'nobody@example.test' } }),
    expect: { default: 202 },
  },
  'POST /api/auth/unlock': {
    request: () => ({ path: '/api/auth/unlock', body: { token: 'not-a-real-unlock-token' } }),
    expect: { default: 400 },
  },
  // Browsers post their own violation reports here, with no session; outside the request guard. A
  // well-formed Reporting API batch whose only report is not a CSP violation is accepted and stores nothing.
  'POST /api/csp-report': {
    request: () => ({ path: '/api/csp-report', body: [{ type: 'deprecation', url: 'http://127.0.0.1/', body: {} }] }),
    expect: { default: 204 },
  },
  'POST /api/evaluate': {
    request: () => ({ path: '/api/evaluate', body: { cells: [{ id: 'a', kind: 'calc', source: 'x_1 = 2 m' }] } }),
    expect: signedIn(200),
  },
  'GET /api/account': { request: () => ({ path: '/api/account' }), expect: signedIn(200) },
  'POST /api/account/password': {
    request: () => ({
      path: '/api/account/password',
      body: { currentPassword: 'not the password', newPassword: 'another long password' },
    }),
    // A token may not change the password (403); a session gives the wrong current password (400).
    expect: signedIn(403),
    cookie: signedIn(400),
  },
  'GET /api/account/tokens': { request: () => ({ path: '/api/account/tokens' }), expect: signedIn(200) },
  // A token cannot create tokens; a session can.
  'POST /api/account/tokens': {
    request: () => ({ path: '/api/account/tokens', body: { name: 'from the matrix' } }),
    expect: signedIn(403),
    cookie: signedIn(201),
  },
  'DELETE /api/account/tokens/[tokenId]': {
    request: () => ({ path: '/api/account/tokens/00000000-0000-4000-8000-000000000000' }),
    expect: signedIn(404),
  },
  'GET /api/projects': { request: () => ({ path: '/api/projects' }), expect: signedIn(200) },
  'POST /api/projects': {
    request: (w) => ({
      path: '/api/projects',
      body: { code: `MTX${w.tag}`, name: 'Matrix project', legalOwner: 'Fixture Ltd', revisionScheme: 'letters' },
    }),
    expect: adminOnly(201),
  },
  'GET /api/projects/[projectId]': {
    request: (w) => ({ path: `/api/projects/${w.projectId}` }),
    expect: memberOnly(200),
  },
  'GET /api/projects/[projectId]/members': {
    request: (w) => ({ path: `/api/projects/${w.projectId}/members` }),
    expect: { ...memberOnly(200), admin: 200 },
  },
  'POST /api/projects/[projectId]/members': {
    request: (w) => ({
      path: `/api/projects/${w.projectId}/members`,
      body: { userId: w.spareUserId, role: 'viewer', reason },
    }),
    expect: adminOnly(201),
  },
  'DELETE /api/projects/[projectId]/members': {
    request: (w) => ({
      path: `/api/projects/${w.projectId}/members`,
      body: { userId: w.spareUserId, role: 'viewer', reason },
    }),
    expect: adminOnly(200),
  },
  'GET /api/projects/[projectId]/audit': {
    request: (w) => ({ path: `/api/projects/${w.projectId}/audit` }),
    expect: { ...memberOnly(200), viewer: 403 },
  },
  'GET /api/projects/[projectId]/sheets': {
    request: (w) => ({ path: `/api/projects/${w.projectId}/sheets` }),
    expect: memberOnly(200),
  },
  'POST /api/projects/[projectId]/sheets': {
    request: (w) => ({
      path: `/api/projects/${w.projectId}/sheets`,
      body: { title: 'Matrix sheet', safetyRelated: false, objective: 'check the matrix' },
    }),
    expect: originatorOnly(201),
  },
  'POST /api/projects/[projectId]/sheets/import': {
    request: (w) => ({
      path: `/api/projects/${w.projectId}/sheets/import`,
      body: { title: 'Imported in the matrix', cells: [{ kind: 'calc', source: 'x_1 = 1 m' }] },
    }),
    expect: originatorOnly(201),
  },
  'GET /api/projects/[projectId]/sheets/start-from': {
    request: (w) => ({ path: `/api/projects/${w.projectId}/sheets/start-from` }),
    expect: originatorOnly(200),
  },
  'POST /api/projects/[projectId]/sheets/start-from': {
    request: (w) => ({
      path: `/api/projects/${w.projectId}/sheets/start-from`,
      body: { sheetId: w.approvedSheetId, version: 1, title: 'Started in the matrix' },
    }),
    expect: originatorOnly(201),
  },
  'POST /api/projects/[projectId]/sheets/import/preview': {
    request: (w) => ({
      path: `/api/projects/${w.projectId}/sheets/import/preview`,
      body: { title: 'Previewed in the matrix', cells: [{ kind: 'calc', source: 'x_1 = 1 m' }] },
    }),
    expect: originatorOnly(200),
  },
  'GET /api/sheets/[sheetId]/export': {
    request: (w) => ({ path: `/api/sheets/${w.sheetId}/export` }),
    expect: memberOnly(200),
  },
  'GET /api/sheets/[sheetId]': { request: (w) => ({ path: `/api/sheets/${w.sheetId}` }), expect: memberOnly(200) },
  'GET /api/sheets/[sheetId]/versions': {
    request: (w) => ({ path: `/api/sheets/${w.sheetId}/versions` }),
    expect: memberOnly(200),
  },
  'POST /api/sheets/[sheetId]/versions': {
    request: (w) => ({
      path: `/api/sheets/${w.sheetId}/versions`,
      body: { parentNumber: w.latestNumber, message: 'matrix save', content: w.sheetContent },
    }),
    expect: originatorOnly(201),
  },
  // An empty reason: the roles allowed past authorization get 400, so the matrix's sheet is not voided.
  'POST /api/sheets/[sheetId]/void': {
    request: (w) => ({ path: `/api/sheets/${w.sheetId}/void`, body: { reason: '' } }),
    expect: { anonymous: 401, outsider: 404, admin: 404, originator: 400, controller: 400, default: 403 },
  },
  'GET /api/sheets/[sheetId]/compare': {
    request: (w) => ({ path: `/api/sheets/${w.sheetId}/compare?target=1` }),
    expect: memberOnly(200),
  },
  'GET /api/sheets/[sheetId]/impact': {
    request: (w) => ({ path: `/api/sheets/${w.sheetId}/impact` }),
    expect: memberOnly(200),
  },
  'GET /api/software-impact': {
    request: () => ({ path: '/api/software-impact?function=lorentzFactor&format=csv' }),
    expect: signedIn(200),
  },
  'GET /api/sheets/[sheetId]/versions/[number]': {
    request: (w) => ({ path: `/api/sheets/${w.sheetId}/versions/1` }),
    expect: memberOnly(200),
  },
  // The demo sheet has no sweep: members get 404 for a statement without a table, others as usual.
  'GET /api/sheets/[sheetId]/versions/[number]/studies/[cellIndex]/[line]': {
    request: (w) => ({ path: `/api/sheets/${w.sheetId}/versions/1/studies/0/1` }),
    expect: memberOnly(404),
  },
  'GET /api/sheets/[sheetId]/attachments': {
    request: (w) => ({ path: `/api/sheets/${w.sheetId}/attachments` }),
    expect: memberOnly(200),
  },
  'POST /api/sheets/[sheetId]/attachments': {
    request: (w) => ({
      path: `/api/sheets/${w.sheetId}/attachments`,
      file: { name: 'matrix-probe.csv', type: 'text/csv', text: 'x [m]\n1\n' },
    }),
    expect: originatorOnly(201),
  },
  'GET /api/sheets/[sheetId]/attachments/[sha256]': {
    request: (w) => ({ path: `/api/sheets/${w.sheetId}/attachments/${w.attachmentSha256}` }),
    expect: memberOnly(200),
  },
  'GET /api/sheets/[sheetId]/checks': {
    request: (w) => ({ path: `/api/sheets/${w.sheetId}/checks` }),
    expect: memberOnly(200),
  },
  'POST /api/sheets/[sheetId]/checks': {
    request: (w) => ({
      path: `/api/sheets/${w.sheetId}/checks`,
      body: { versionNumber: w.latestNumber, checkerId: w.checkerId, password: DEMO_PASSWORD },
    }),
    expect: originatorOnly(201),
  },
  'GET /api/checks': { request: () => ({ path: '/api/checks?queue=approval' }), expect: signedIn(200) },
  'GET /api/checks/[checkId]': { request: (w) => ({ path: `/api/checks/${w.checkId}` }), expect: memberOnly(200) },
  'PATCH /api/checks/[checkId]': {
    request: (w) => ({ path: `/api/checks/${w.checkId}`, body: { verificationMethod: 'design_review' } }),
    expect: checkerOnly(200),
  },
  'POST /api/checks/[checkId]/comments': {
    request: (w) => ({
      path: `/api/checks/${w.checkId}/comments`,
      body: { cellId: w.checkedCellId, body: 'Matrix comment' },
    }),
    expect: checkerOnly(201),
  },
  'PATCH /api/checks/[checkId]/comments/[commentId]': {
    request: (w) => ({ path: `/api/checks/${w.checkId}/comments/${w.threadId}`, body: { resolved: true } }),
    expect: checkerOnly(200),
  },
  // Last of the check entries: returning the check closes it.
  'POST /api/checks/[checkId]/decision': {
    request: (w) => ({ path: `/api/checks/${w.checkId}/decision`, body: { action: 'return', reason: 'matrix test' } }),
    expect: checkerOnly(200),
  },
  'GET /api/sheets/[sheetId]/revisions': {
    request: (w) => ({ path: `/api/sheets/${w.sheetId}/revisions` }),
    expect: memberOnly(200),
  },
  'POST /api/sheets/[sheetId]/revisions': {
    request: (w) => ({
      path: `/api/sheets/${w.approvedSheetId}/revisions`,
      body: { versionNumber: 1, password: DEMO_PASSWORD },
    }),
    expect: controllerOnly(202),
  },
  'GET /api/issuing/[jobId]': { request: (w) => ({ path: `/api/issuing/${w.issueJobId}` }), expect: memberOnly(200) },
  'GET /api/projects/[projectId]/register': {
    request: (w) => ({ path: `/api/projects/${w.projectId}/register?format=csv` }),
    expect: memberOnly(200),
  },
  'GET /api/revisions/[revisionId]/pdf': {
    request: (w) => ({ path: `/api/revisions/${w.revisionId}/pdf` }),
    expect: memberOnly(200),
  },
  'POST /api/revisions/[revisionId]/withdraw': {
    request: (w) => ({ path: `/api/revisions/${w.revisionId}/withdraw`, body: { reason: 'matrix test' } }),
    expect: controllerOnly(200),
  },
  'POST /api/verify': {
    request: () => ({ path: '/api/verify', body: { code: 'ZZZZ-ZZZZ-ZZZZ' } }),
    expect: { default: 200 },
  },
  'GET /api/admin/users': { request: () => ({ path: '/api/admin/users' }), expect: adminOnly(200) },
  'POST /api/admin/users': {
    request: (w) => ({
      path: '/api/admin/users',
      body: { email: `invited${w.tag.toLowerCase()}@example.test`, name: 'Invited Person' },
    }),
    expect: adminOnly(201),
  },
  'PATCH /api/admin/users/[userId]': {
    request: (w) => ({ path: `/api/admin/users/${w.spareUserId}`, body: { action: 'disable', reason } }),
    expect: adminOnly(200),
  },
};

// Every decision on a check, each on a check in the state where it may be taken.
const DECISIONS: Record<Decision, Entry> = {
  return: {
    request: (w) => ({ path: `/api/checks/${w.decisions.return}/decision`, body: { action: 'return', reason } }),
    expect: checkerOnly(200),
  },
  sign: {
    request: (w) => ({
      path: `/api/checks/${w.decisions.sign}/decision`,
      body: { action: 'sign', password: DEMO_PASSWORD },
    }),
    expect: checkerOnly(200),
  },
  approve: {
    request: (w) => ({
      path: `/api/checks/${w.decisions.approve}/decision`,
      body: { action: 'approve', password: DEMO_PASSWORD },
    }),
    expect: approverOnly(200),
  },
  reject: {
    request: (w) => ({ path: `/api/checks/${w.decisions.reject}/decision`, body: { action: 'reject', reason } }),
    expect: approverOnly(200),
  },
};

type Seen = 'sign-in' | 'not found' | 'content' | `status ${number}` | `redirect ${string}`;
interface PageEntry {
  url: (w: World) => string;
  expect: Partial<Record<Who, Seen>> & { default?: Seen };
}
const publicPage = { default: 'content' } as const;
const signedInPage = { anonymous: 'sign-in', default: 'content' } as const;
const memberPage = { anonymous: 'sign-in', outsider: 'not found', admin: 'not found', default: 'content' } as const;

// Keys are the page's path with the folder's own [segments] (route groups left out).
const PAGES: Record<string, PageEntry> = {
  '/': { url: () => '/', expect: publicPage },
  '/sign-in': { url: () => '/sign-in', expect: publicPage },
  '/sign-in/link': { url: () => '/sign-in/link?token=not-a-real-token', expect: publicPage },
  '/reset-password': { url: () => '/reset-password?token=not-a-real-token', expect: publicPage },
  '/unlock': { url: () => '/unlock?token=not-a-real-token', expect: publicPage },
  '/verify': { url: () => '/verify', expect: publicPage },
  '/reference': { url: () => '/reference', expect: publicPage },
  // Signed out it shows no mail at all (asserted with the captured links below); signed in, one's own.
  '/mailbox': { url: () => '/mailbox', expect: publicPage },
  '/account': { url: () => '/account', expect: signedInPage },
  '/admin': { url: () => '/admin', expect: { anonymous: 'sign-in', admin: 'content', default: 'not found' } },
  '/approvals': { url: () => '/approvals', expect: signedInPage },
  '/checks': { url: () => '/checks', expect: signedInPage },
  '/checks/[checkId]': { url: (w) => `/checks/${w.checkId}`, expect: memberPage },
  '/projects': { url: () => '/projects', expect: signedInPage },
  '/register': { url: () => '/register', expect: signedInPage },
  '/scratch': { url: () => '/scratch', expect: signedInPage },
  '/software-impact': { url: () => '/software-impact', expect: signedInPage },
  '/projects/[projectCode]': { url: () => '/projects/TPT2', expect: memberPage },
  '/projects/[projectCode]/audit': {
    url: () => '/projects/TPT2/audit',
    // A member without the role is told what the page needs, on the project's page.
    expect: { ...memberPage, viewer: 'redirect /projects/TPT2?notAllowed=audit' },
  },
  '/projects/[projectCode]/register': { url: () => '/projects/TPT2/register', expect: memberPage },
  '/projects/[projectCode]/sheets/[sheetNumber]': { url: () => '/projects/TPT2/sheets/1', expect: memberPage },
  '/projects/[projectCode]/sheets/[sheetNumber]/compare': {
    url: () => '/projects/TPT2/sheets/1/compare?target=1',
    expect: memberPage,
  },
  '/projects/[projectCode]/sheets/[sheetNumber]/edit': {
    url: () => '/projects/TPT2/sheets/1/edit',
    expect: {
      anonymous: 'sign-in',
      originator: 'content',
      outsider: 'not found',
      admin: 'not found',
      default: 'redirect /projects/TPT2?notAllowed=edit',
    },
  },
  '/projects/[projectCode]/sheets/[sheetNumber]/impact': {
    url: () => '/projects/TPT2/sheets/1/impact',
    expect: memberPage,
  },
};

function filesNamed(dir: string, file: string, out: string[] = []): string[] {
  for (const name of readdirSync(dir)) {
    const p = path.join(dir, name);
    if (statSync(p).isDirectory()) filesNamed(p, file, out);
    else if (name === file) out.push(p);
  }
  return out;
}

const appDir = path.join(process.cwd(), 'app');
const routeOf = (file: string) =>
  `/${path
    .relative(appDir, path.dirname(file))
    .split(path.sep)
    .filter((s) => s && !/^\(.*\)$/.test(s))
    .join('/')}`;

function discoveredRoutes(): string[] {
  const keys: string[] = [];
  for (const file of filesNamed(path.join(appDir, 'api'), 'route.ts')) {
    const source = readFileSync(file, 'utf8');
    const methods = new Set<string>();
    for (const m of source.matchAll(/export\s+(?:async\s+)?function\s+(GET|POST|PUT|PATCH|DELETE)\b/g))
      methods.add(m[1]);
    for (const m of source.matchAll(/\bas\s+(GET|POST|PUT|PATCH|DELETE)\b/g)) methods.add(m[1]);
    for (const method of methods) keys.push(`${method} ${routeOf(file)}`);
  }
  return keys.sort();
}

const discoveredPages = () => filesNamed(appDir, 'page.tsx').map(routeOf).sort();

// next-auth checks its own CSRF token (tested in tests/auth); CSP reports are posted by browsers themselves and change nothing of anyone's.
const OUTSIDE_GUARD = new Set(['POST /api/auth/[...nextauth]', 'POST /api/csp-report']);
const STATE_CHANGING = Object.keys(MATRIX).filter((k) => !k.startsWith('GET ') && !OUTSIDE_GUARD.has(k));

let app: RunningApp;
const worlds = {} as Record<Variant, World>;
const tokens = new Map<Who, string>();
const readTokens = new Map<Who, string>();
const cookies = new Map<Who, string>();

/** A copy of demo sheet `n` of TPT2 (its version 2, as the demo sheet's, holds the demo content), made by the originator. */
async function copyOfDemoSheet(
  originator: Actor,
  project: { id: string; code: string },
  n: number,
  title: string,
): Promise<{ sheet: SheetRef; latest: number; content: { cells: Array<{ id: string }> } }> {
  const demo = await testDb()
    .selectFrom('sheets')
    .select('id')
    .where('project_id', '=', project.id)
    .where('number', '=', n)
    .executeTakeFirstOrThrow();
  const content = (await getVersion(testDb(), demo.id, 2))!.content;
  const sheet = await makeSheet(testDb(), originator, project, { title, safetyRelated: content.safetyRelated });
  const saved = await saveVersion(testDb(), originator, sheet, {
    parentNumber: 1,
    message: 'copy of the demo sheet',
    content: { ...content, title },
  });
  return { sheet, latest: saved.number, content: content as unknown as { cells: Array<{ id: string }> } };
}

async function buildWorld(
  variant: Variant,
  people: Record<'originator' | 'checker' | 'approver' | 'controller', Actor>,
  project: { id: string; code: string },
  outsiderId: string,
): Promise<World> {
  const tag = variant === 'token' ? '' : 'C';
  const { originator, checker, approver, controller } = people;
  const team = { author: originator, checker, approver };
  const spare = await makeUser(testDb(), `spare${tag.toLowerCase()}@example.test`);
  const first = await copyOfDemoSheet(originator, project, 1, `Matrix ${variant} sheet`);
  const attachment = await uploadAttachment(testDb(), getObjectStore(), originator, first.sheet, {
    name: 'scan.csv',
    type: 'text/csv',
    bytes: new TextEncoder().encode('energy [MeV]\n70\n250\n'),
  });
  const second = await copyOfDemoSheet(originator, project, 2, `Matrix ${variant} check`);
  const check = await submitForCheck(testDb(), originator, second.sheet, {
    versionNumber: second.latest,
    checkerId: checker.userId,
    password: DEMO_PASSWORD,
  });
  const thread = await addComment(testDb(), checker, check.id, {
    cellId: second.content.cells[0].id,
    statementLine: null,
    body: 'Source of the flight path length?',
  });
  // A copy of sheet 3 through check and approval to its first revision; a new sheet approved but not issued.
  const third = await copyOfDemoSheet(originator, project, 3, `Matrix ${variant} issued`);
  await checkAndApprove(testDb(), team, third.sheet, { versionNumber: third.latest, password: DEMO_PASSWORD });
  const issued = await requestIssue(testDb(), controller, third.sheet, {
    versionNumber: third.latest,
    password: DEMO_PASSWORD,
  });
  const revisionId = (await processIssueJob(testDb(), getObjectStore(), issued.jobId))!;
  const fresh = await makeSheet(testDb(), originator, project, { title: `Matrix ${variant} sheet to issue` });
  await checkAndApprove(testDb(), team, fresh, { versionNumber: 1, password: DEMO_PASSWORD });
  // One check per decision, in the state it is taken from: in check (return, sign), checked (approve, reject).
  const decisions = {} as Record<Decision, string>;
  for (const d of ['return', 'sign', 'approve', 'reject'] as const) {
    const copy = await copyOfDemoSheet(originator, project, 3, `Matrix ${variant} ${d}`);
    const { id } = await submitForCheck(testDb(), originator, copy.sheet, {
      versionNumber: copy.latest,
      checkerId: checker.userId,
      password: DEMO_PASSWORD,
    });
    if (d !== 'return') await saveCheckWork(testDb(), checker, id, { verificationMethod: 'design_review' });
    if (d === 'approve' || d === 'reject')
      await decide(testDb(), checker, id, { action: 'sign', password: DEMO_PASSWORD });
    decisions[d] = id;
  }
  return {
    variant,
    tag,
    projectId: project.id,
    spareUserId: spare.userId,
    outsiderId,
    sheetId: first.sheet.id,
    latestNumber: first.latest,
    sheetContent: (await getVersion(testDb(), first.sheet.id))!.content,
    attachmentSha256: attachment.sha256,
    checkerId: checker.userId,
    checkId: check.id,
    threadId: thread.id,
    checkedCellId: second.content.cells[0].id,
    revisionId,
    issueJobId: issued.jobId,
    approvedSheetId: fresh.id,
    decisions,
  };
}

/** Signs in through next-auth's password form, as the sign-in page does; returns the Cookie header of the session. */
async function signIn(email: string, password: string): Promise<string> {
  const jar = new Map<string, string>();
  const keep = (r: Response) => {
    for (const c of r.headers.getSetCookie()) {
      const [pair] = c.split(';');
      const at = pair.indexOf('=');
      jar.set(pair.slice(0, at), pair.slice(at + 1));
    }
  };
  const header = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
  const csrf = await fetch(`${app.baseUrl}/api/auth/csrf`);
  keep(csrf);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const response = await fetch(`${app.baseUrl}/api/auth/callback/password`, {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded', cookie: header(), origin: app.baseUrl },
    body: new URLSearchParams({ csrfToken, email, password, callbackUrl: '/projects', json: 'true' }),
    redirect: 'manual',
  });
  keep(response);
  const session = [...jar.keys()].find((k) => k.includes('session-token'));
  if (!session) throw new Error(`signing in ${email} gave no session cookie (status ${response.status})`);
  return header();
}

interface Call {
  method: string;
  who: Who;
  via: Variant | 'read-token';
  request: ReturnType<Entry['request']>;
  /** Overrides for the cookie probes: the Origin header (null: none), the body's content type. */
  origin?: string | null;
  contentType?: string;
}

async function call(c: Call): Promise<Response> {
  const headers: Record<string, string> = {};
  if (c.who !== 'anonymous') {
    if (c.via === 'token') headers.authorization = `Bearer ${tokens.get(c.who)}`;
    else if (c.via === 'read-token') headers.authorization = `Bearer ${readTokens.get(c.who)}`;
    else {
      headers.cookie = cookies.get(c.who)!;
      const origin = c.origin === undefined ? app.baseUrl : c.origin;
      if (origin !== null) headers.origin = origin;
    }
  }
  const { body, file } = c.request;
  let payload: string | FormData | undefined = body === undefined ? undefined : JSON.stringify(body);
  if (body !== undefined) headers['content-type'] = c.contentType ?? 'application/json';
  if (file && c.contentType) {
    payload = `file=${encodeURIComponent(file.text)}`;
    headers['content-type'] = c.contentType;
  } else if (file) {
    payload = new FormData();
    payload.append('file', new Blob([file.text], { type: file.type }), file.name);
  }
  return fetch(`${app.baseUrl}${c.request.path}`, { method: c.method, headers, body: payload, redirect: 'manual' });
}

function wanted(entry: Entry, variant: Variant, who: Who): number {
  const table = variant === 'cookie' && entry.cookie ? entry.cookie : entry.expect;
  return table[who] ?? table.default!;
}

/** The caller for whom the request succeeds (with `variant`), so that a refusal can only be the guard's. */
function allowedCaller(entry: Entry, variant: Variant): Who {
  return SIGNED_IN.find((who) => wanted(entry, variant, who) < 300) ?? 'originator';
}

async function runEntry(key: string, entry: Entry, variant: Variant) {
  const method = key.split(' ')[0];
  const seen: Record<string, number> = {};
  const expected: Record<string, number> = {};
  // The callers refused first: a request that succeeds may change the state the others are refused in
  // (after an approval, a check is no longer waiting for one: 409 rather than 403).
  const order = [
    ...WHO.filter((who) => wanted(entry, variant, who) >= 300),
    ...WHO.filter((who) => wanted(entry, variant, who) < 300),
  ];
  for (const who of order) {
    const response = await call({ method, who, via: variant, request: entry.request(worlds[variant]) });
    seen[who] = response.status;
    expected[who] = wanted(entry, variant, who);
  }
  expect(seen).toEqual(expected);
}

/** What a visitor sees of a page: the sign-in page (redirected), the not-found page, or the page's content. */
async function visit(url: string, who: Who): Promise<{ seen: Seen; html: string }> {
  const response = await fetch(`${app.baseUrl}${url}`, {
    headers: who === 'anonymous' ? {} : { cookie: cookies.get(who)! },
    redirect: 'manual',
  });
  const html = response.status < 300 || response.status >= 400 ? await response.text() : '';
  if (response.status >= 300 && response.status < 400) {
    const location = response.headers.get('location') ?? '';
    return { seen: /^(https?:\/\/[^/]+)?\/sign-in(\?|$)/.test(location) ? 'sign-in' : `redirect ${location}`, html };
  }
  // Under app/loading.tsx every page streams, so a redirect or notFound() after the first bytes is
  // written into the page (a refresh tag and the NEXT_REDIRECT / not-found markers) with status 200.
  if (
    /<meta id="__next-page-redirect"[^>]*url=\/sign-in/.test(html) ||
    /NEXT_REDIRECT;(replace|push);\/sign-in/.test(html)
  )
    return { seen: 'sign-in', html };
  // Another redirect after the first bytes (a member without the page's role is sent to the project's
  // page, which says what the page needs).
  const other = /NEXT_REDIRECT;(?:replace|push);([^;"\\]+);/.exec(html);
  if (other) return { seen: `redirect ${other[1]}`, html };
  // notFound() after the first bytes travels as its error digest, which the browser turns into the
  // not-found page (whose text every page's payload carries anyway, for navigation).
  if (response.status === 404 || html.includes('NEXT_HTTP_ERROR_FALLBACK;404')) return { seen: 'not found', html };
  return { seen: response.status === 200 ? 'content' : `status ${response.status}`, html };
}

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  const project = await testDb()
    .selectFrom('projects')
    .select(['id', 'code'])
    .where('code', '=', 'TPT2')
    .executeTakeFirstOrThrow();
  const outsider = await makeUser(testDb(), 'outsider@example.test');
  await makeProject(testDb(), 'OTH', [[outsider, 'originator']]);
  const people = {
    originator: await actorByEmail(testDb(), 'originator@demo.test'),
    checker: await actorByEmail(testDb(), 'checker@demo.test'),
    approver: await actorByEmail(testDb(), 'approver@demo.test'),
    controller: await actorByEmail(testDb(), 'controller@demo.test'),
  };
  worlds.token = await buildWorld('token', people, project, outsider.userId);
  worlds.cookie = await buildWorld('cookie', people, project, outsider.userId);
  for (const who of SIGNED_IN) {
    const actor = await actorByEmail(testDb(), who === 'outsider' ? 'outsider@example.test' : `${who}@demo.test`);
    tokens.set(who, (await createApiToken(testDb(), actor, 'matrix')).token);
    const read = await createApiToken(testDb(), actor, 'matrix, read only');
    await testDb().updateTable('api_tokens').set({ scope: 'read' }).where('id', '=', read.id).execute();
    readTokens.set(who, read.token);
  }
  // The demo installation, as `npm start` runs it: the mailbox page exists.
  app = await startApp({ WORLDSHEET_DEMO: '1' });
  for (const who of SIGNED_IN) {
    cookies.set(
      who,
      await signIn(
        who === 'outsider' ? 'outsider@example.test' : `${who}@demo.test`,
        who === 'outsider' ? PASSWORD : DEMO_PASSWORD,
      ),
    );
  }
});

afterAll(async () => {
  await app?.stop();
});

describe('authorization matrix', () => {
  it('has an entry for every route handler and every page, and none for a route or page that does not exist', () => {
    expect(discoveredRoutes()).toEqual(Object.keys(MATRIX).sort());
    expect(discoveredPages()).toEqual(Object.keys(PAGES).sort());
  });

  for (const variant of ['token', 'cookie'] as const) {
    describe(
      variant === 'token' ? 'with API tokens' : 'with browser sessions (the session cookie, from the app’s own origin)',
      () => {
        // Eight callers each, some evaluating or signing: more than the default 30 s on a busy machine.
        for (const [key, entry] of Object.entries(MATRIX))
          it(key, { timeout: 120_000 }, () => runEntry(key, entry, variant));
        for (const [action, entry] of Object.entries(DECISIONS))
          it(`POST /api/checks/[checkId]/decision: ${action}`, { timeout: 120_000 }, () =>
            runEntry('POST decision', entry, variant),
          );
      },
    );
  }

  describe('pages, signed out and in each role', () => {
    for (const [key, entry] of Object.entries(PAGES)) {
      it(key, { timeout: 120_000 }, async () => {
        const seen: Record<string, Seen> = {};
        const expected: Record<string, Seen> = {};
        for (const who of WHO) {
          seen[who] = (await visit(entry.url(worlds.token), who)).seen;
          expected[who] = entry.expect[who] ?? entry.expect.default!;
        }
        expect(seen).toEqual(expected);
      });
    }

    it('/mailbox shows a signed-out visitor no captured link, and a signed-in person not another person’s mail', async () => {
      // Mail that must not leak: a password reset for the administrator, an invitation.
      expect(
        (
          await fetch(`${app.baseUrl}/api/auth/password-reset`, {
            method: 'POST',
            headers: { 'content-type': 'application/json' },
            body: JSON.stringify({ email: 'admin@demo.test' }),
          })
        ).status,
      ).toBe(202);
      const reset = await waitForMail({ to: 'admin@demo.test' });
      const adminLink = /https?:\/\/\S+token=[\w-]+/.exec(reset.text)![0];
      const anonymous = (await visit('/mailbox', 'anonymous')).html;
      expect(anonymous).not.toMatch(/token=/);
      expect(anonymous).not.toContain('admin@demo.test');
      for (const who of ['originator', 'viewer', 'outsider'] as const)
        expect((await visit('/mailbox', who)).html, who).not.toContain(adminLink);
    });
  });

  describe('state changes with a session cookie that do not come from the app’s own pages', () => {
    // The job worker may still be issuing the revision requested above (revision.issue): not counted.
    const countEvents = async () =>
      Number(
        (
          await testDb()
            .selectFrom('audit_events')
            .select((eb) => eb.fn.countAll().as('n'))
            .where('action', '!=', 'revision.issue')
            .executeTakeFirstOrThrow()
        ).n,
      );
    let eventsBefore: number;
    beforeAll(async () => {
      eventsBefore = await countEvents();
    });

    for (const key of STATE_CHANGING) {
      it(`${key}: another origin or none 403, a form's content types 415`, { timeout: 120_000 }, async () => {
        const entry = MATRIX[key];
        const method = key.split(' ')[0];
        const who = allowedCaller(entry, 'cookie');
        const request = entry.request(worlds.cookie);
        const statuses: Record<string, number> = {};
        for (const [name, probe] of Object.entries({
          'Origin: http://evil.example': { origin: 'http://evil.example' },
          'Origin: another port of the same host': {
            origin: `http://127.0.0.1:${Number(new URL(app.baseUrl).port) + 1}`,
          },
          'no Origin, no Sec-Fetch-Site': { origin: null },
          'text/plain': { contentType: 'text/plain' },
          'application/x-www-form-urlencoded': { contentType: 'application/x-www-form-urlencoded' },
        } as Record<string, Partial<Call>>)) {
          // A body of the form's type even where the route takes none (DELETE of a token).
          const withBody =
            probe.contentType && request.body === undefined && !request.file ? { ...request, body: {} } : request;
          const response = await call({ method, who, via: 'cookie', request: withBody, ...probe });
          statuses[name] = response.status;
          if (response.status === 403)
            expect(((await response.json()) as { error: { message: string } }).error.message, name).toMatch(
              /another site|own pages/,
            );
        }
        expect(statuses).toEqual({
          'Origin: http://evil.example': 403,
          'Origin: another port of the same host': 403,
          'no Origin, no Sec-Fetch-Site': 403,
          'text/plain': 415,
          'application/x-www-form-urlencoded': 415,
        });
      });
    }

    it('changed nothing: no audit event was written by any of those requests', async () => {
      expect(await countEvents()).toBe(eventsBefore);
    });
  });

  describe('read-only API tokens', () => {
    it('read', async () => {
      for (const who of SIGNED_IN)
        expect(
          (await call({ method: 'GET', who, via: 'read-token', request: { path: '/api/account' } })).status,
          who,
        ).toBe(200);
      expect(
        (
          await call({
            method: 'GET',
            who: 'originator',
            via: 'read-token',
            request: { path: `/api/sheets/${worlds.token.sheetId}` },
          })
        ).status,
      ).toBe(200);
    });

    for (const key of STATE_CHANGING) {
      it(`${key}: refused (403)`, { timeout: 120_000 }, async () => {
        const entry = MATRIX[key];
        const who = allowedCaller(entry, 'token');
        const response = await call({
          method: key.split(' ')[0],
          who,
          via: 'read-token',
          request: entry.request(worlds.token),
        });
        expect(response.status).toBe(403);
        expect(((await response.json()) as { error: { message: string } }).error.message).toMatch(/read-only/);
      });
    }
  });

  describe('ids that are not UUIDs and numbers beyond int4: 404 or 400, never 500', () => {
    const BAD: Record<string, string[]> = {
      uuid: [
        '-'.repeat(36),
        '0'.repeat(36),
        '00000000-0000-0000-0000-00000000000g',
        '{00000000-0000-4000-8000-000000000000}',
        '%00',
      ],
      int: ['2147483648', '99999999999999999999', '1e3', '-1', '0x10'],
      project: ['-'.repeat(36), 'tpt2', '%00'],
      sha256: ['0'.repeat(63), 'g'.repeat(64)],
    };
    const KIND: Record<string, string> = {
      number: 'int',
      sheetNumber: 'int',
      cellIndex: 'int',
      line: 'int',
      projectId: 'project',
      sha256: 'sha256',
    };
    for (const key of Object.keys(MATRIX).filter((k) => k.includes('[') && !k.includes('[...'))) {
      it(key, { timeout: 120_000 }, async () => {
        const entry = MATRIX[key];
        const [method, pattern] = key.split(' ');
        const request = entry.request(worlds.token);
        const [pathname, query] = request.path.split('?');
        const names = [...pattern.matchAll(/\[(\w+)\]/g)].map((m) => m[1]);
        const values = new RegExp(`^${pattern.replace(/\[\w+\]/g, '([^/]+)')}$`).exec(pathname)!.slice(1);
        const who = allowedCaller(entry, 'token');
        const seen: Record<string, number> = {};
        for (const [i, name] of names.entries()) {
          for (const bad of BAD[KIND[name] ?? 'uuid']) {
            const path =
              pattern.replace(/\[(\w+)\]/g, (_, n: string) => (n === name ? bad : values[names.indexOf(n)])) +
              (query ? `?${query}` : '');
            seen[`${name}=${bad}`] = (await call({ method, who, via: 'token', request: { ...request, path } })).status;
            void i;
          }
        }
        expect(Object.entries(seen).filter(([, status]) => status !== 404)).toEqual([]);
      });
    }

    it('numbers beyond int4 in a body or a query: 400', async () => {
      const w = worlds.token;
      const big = 2 ** 31;
      const statuses = {
        compare: (
          await call({
            method: 'GET',
            who: 'originator',
            via: 'token',
            request: { path: `/api/sheets/${w.sheetId}/compare?target=${big}` },
          })
        ).status,
        export: (
          await call({
            method: 'GET',
            who: 'originator',
            via: 'token',
            request: { path: `/api/sheets/${w.sheetId}/export?version=${big}` },
          })
        ).status,
        save: (
          await call({
            method: 'POST',
            who: 'originator',
            via: 'token',
            request: {
              path: `/api/sheets/${w.sheetId}/versions`,
              body: { parentNumber: big, message: 'x', content: w.sheetContent },
            },
          })
        ).status,
        submit: (
          await call({
            method: 'POST',
            who: 'originator',
            via: 'token',
            request: {
              path: `/api/sheets/${w.sheetId}/checks`,
              body: { versionNumber: big, checkerId: w.checkerId, password: DEMO_PASSWORD },
            },
          })
        ).status,
        issue: (
          await call({
            method: 'POST',
            who: 'controller',
            via: 'token',
            request: {
              path: `/api/sheets/${w.approvedSheetId}/revisions`,
              body: { versionNumber: big, password: DEMO_PASSWORD },
            },
          })
        ).status,
      };
      expect(statuses).toEqual({ compare: 400, export: 400, save: 400, submit: 400, issue: 400 });
    });

    it('pages: the not-found page', async () => {
      const urls = [
        '/checks/' + '-'.repeat(36),
        '/checks/' + '0'.repeat(36),
        '/projects/TPT2/sheets/2147483648',
        '/projects/TPT2/sheets/1e3/edit',
        '/projects/TPT2/sheets/1?version=2147483648',
        '/projects/TPT2/sheets/1/compare?target=99999999999',
        '/projects/tpt2',
        '/projects/%00/register',
      ];
      const seen = Object.fromEntries(
        await Promise.all(urls.map(async (url) => [url, (await visit(url, 'originator')).seen] as const)),
      );
      expect(seen).toEqual(Object.fromEntries(urls.map((url) => [url, 'not found'])));
    });
  });

  it('next-auth’s own CSRF token: a sign-in or a sign-out posted without it changes nothing', async () => {
    const signInForm = await fetch(`${app.baseUrl}/api/auth/callback/password`, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded', origin: 'http://evil.example' },
      body: new URLSearchParams({ email: 'originator@demo.test', password: DEMO_PASSWORD, json: 'true' }),
      redirect: 'manual',
    });
    expect(signInForm.headers.getSetCookie().filter((c) => c.includes('session-token'))).toEqual([]);
    expect(`${signInForm.headers.get('location') ?? ''}${await signInForm.text()}`).toContain('csrf=true');
    const signOut = await fetch(`${app.baseUrl}/api/auth/signout`, {
      method: 'POST',
      headers: {
        'content-type': 'application/x-www-form-urlencoded',
        origin: 'http://evil.example',
        cookie: cookies.get('viewer')!,
      },
      body: new URLSearchParams({ json: 'true' }),
      redirect: 'manual',
    });
    expect(`${signOut.headers.get('location') ?? ''}${await signOut.text()}`).toContain('csrf=true');
    expect((await fetch(`${app.baseUrl}/api/account`, { headers: { cookie: cookies.get('viewer')! } })).status).toBe(
      200,
    );
  });

  it('answers 401 for a revoked or made-up token', async () => {
    const response = await fetch(`${app.baseUrl}/api/account`, {
      headers: { authorization: 'Bearer wst_made-up-token' },
    });
    expect(response.status).toBe(401);
  });

  it('records writes made with a token under the owner and the token, and those made in a session without a token', async () => {
    const events = await testDb()
      .selectFrom('audit_events')
      .select(['action', 'token_id', 'actor_id'])
      .where('action', 'in', ['project.create', 'membership.grant', 'membership.revoke', 'user.invite', 'user.disable'])
      .where('token_id', 'is not', null)
      .execute();
    expect(events.map((e) => e.action).sort()).toEqual([
      'membership.grant',
      'membership.revoke',
      'project.create',
      'user.disable',
      'user.invite',
    ]);
    const sheetWrites = await testDb()
      .selectFrom('audit_events')
      .select('action')
      .where('action', 'in', ['sheet.create', 'version.save', 'attachment.upload'])
      .where('token_id', 'is not', null)
      .execute();
    expect(new Set(sheetWrites.map((e) => e.action))).toEqual(
      new Set(['sheet.create', 'version.save', 'attachment.upload']),
    );
    const sessionWrites = await testDb()
      .selectFrom('audit_events')
      .select('action')
      .where('action', 'in', ['project.create', 'sheet.create', 'version.save', 'attachment.upload', 'token.create'])
      .where('token_id', 'is', null)
      .where('actor_id', 'is not', null)
      .where('session_id', 'is not', null)
      .execute();
    expect(new Set(sessionWrites.map((e) => e.action))).toEqual(
      new Set(['project.create', 'sheet.create', 'version.save', 'attachment.upload', 'token.create']),
    );
  });
});
