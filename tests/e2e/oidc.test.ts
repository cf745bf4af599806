// Single sign-on through a real OpenID Connect provider (oidc-provider, tests/support/
// identity-provider.ts) on loopback: Chromium signs in from the app's sign-in page, through the
// provider's login and consent pages, and back; the group claim gives the mapped project role at
// each sign-in, a changed group changes the role at the next one (audited), and an account whose
// e-mail address the provider has not verified is refused.
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../db/seed';
import { resetDatabase, testDb } from '../support/database';
import { startIdentityProvider, type IdentityProvider } from '../support/identity-provider';
import { closeBrowser, openBrowser, startApp, type BrowserSession, type RunningApp } from './harness';

const APP_PORT = Number(process.env.WORLDSHEET_TEST_APP_PORT ?? 3199);
const BUTTON = 'Sign in with Fictional Org account';
const REFUSED = 'Your organisation account has no verified e-mail address, so it cannot sign in here.';

// Fictional people of a fictional organisation.
const AUTHOR = {
  login: 'ada.quill',
  name: 'Ada Quill',
  email: 'ada.quill@fictional-org.test',
  emailVerified: true,
  groups: ['calc-authors', 'canteen-committee'],
};
const UNVERIFIED = {
  login: 'ben.sorrel',
  name: 'Ben Sorrel',
  email: 'ben.sorrel@fictional-org.test',
  emailVerified: false,
  groups: ['calc-authors'],
};

let idp: IdentityProvider;
let app: RunningApp;
let session: BrowserSession;
const opened: BrowserSession[] = [];

/**
 * A browser session for this file. oidc-provider's development pages load a web font from
 * fonts.googleapis.com; the test never reaches the internet, so that one request is answered here
 * with an empty stylesheet (it is not filtered out of `problems`: it simply does not fail).
 */
async function browserSession(): Promise<BrowserSession> {
  const s = await openBrowser();
  await s.context.route('https://fonts.googleapis.com/**', (route) =>
    route.fulfill({ status: 200, contentType: 'text/css', body: '' }),
  );
  opened.push(s);
  return s;
}

/** Back in the app: on the projects page (signed in) or on the sign-in page with an error. */
function backInApp(url: URL): boolean {
  return (
    url.origin === app.baseUrl &&
    (url.pathname === '/projects' || (url.pathname === '/sign-in' && url.searchParams.has('error')))
  );
}

function atProvider(url: URL): boolean {
  return url.origin === idp.issuer && url.pathname.startsWith('/interaction/');
}

/**
 * From a click on the sign-in button to the return to the app: logs in at the provider and
 * consents when it asks. Returns the provider's pages that were shown, in order.
 */
async function throughProvider(s: BrowserSession, login: string, shotPrefix: string): Promise<string[]> {
  const { page } = s;
  const shown: string[] = [];
  await page.waitForURL((u) => backInApp(u) || atProvider(u));
  for (let step = 0; step < 4; step++) {
    const here = page.url();
    if (backInApp(new URL(here))) return shown;
    if (await page.locator('input[name="login"]').count()) {
      shown.push('login');
      expect(await page.locator('h1').innerText()).toBe('Sign-in');
      await s.screenshot(`${shotPrefix}-provider-login`);
      await page.locator('input[name="login"]').fill(login);
      // The development login form takes any password.
      await page.locator('input[name="password"]').fill('fictional password');
      await page.getByRole('button', { name: 'Sign-in' }).click();
    } else {
      shown.push('consent');
      expect(await page.locator('h1').innerText()).toBe('Authorize');
      await s.screenshot(`${shotPrefix}-provider-consent`);
      await page.getByRole('button', { name: 'Continue' }).click();
    }
    await page.waitForURL((u) => u.href !== here && (backInApp(u) || atProvider(u)));
  }
  throw new Error(`still at the identity provider after four pages: ${page.url()}`);
}

async function startSignIn(page: Page): Promise<void> {
  await page.goto(`${app.baseUrl}/sign-in`);
  await page.getByRole('button', { name: BUTTON }).click();
}

async function headerName(page: Page): Promise<string> {
  return page.getByRole('link', { name: /^Signed in as/ }).innerText();
}

async function tpt2Roles(page: Page): Promise<string> {
  const row = page.getByRole('row').filter({ has: page.getByRole('cell', { name: 'TPT2', exact: true }) });
  return row.getByRole('cell').last().innerText();
}

async function heldRoles(email: string): Promise<string[]> {
  const rows = await testDb()
    .selectFrom('project_members as m')
    .innerJoin('projects as p', 'p.id', 'm.project_id')
    .innerJoin('users as u', 'u.id', 'm.user_id')
    .select(['p.code', 'm.role'])
    .where('u.email', '=', email)
    .execute();
  return rows.map((r) => `${r.code}:${r.role}`).sort();
}

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  idp = await startIdentityProvider({
    redirectUri: `http://127.0.0.1:${APP_PORT}/api/auth/callback/oidc`,
    accounts: [AUTHOR, UNVERIFIED],
  });
  app = await startApp({
    WORLDSHEET_OIDC_ISSUER: idp.issuer,
    WORLDSHEET_OIDC_CLIENT_ID: idp.clientId,
    WORLDSHEET_OIDC_CLIENT_SECRET: idp.clientSecret,
    WORLDSHEET_OIDC_NAME: 'Fictional Org account',
    WORLDSHEET_OIDC_ROLE_MAP: 'calc-authors=TPT2:originator;calc-checkers=TPT2:checker',
  });
  expect(app.baseUrl).toBe(`http://127.0.0.1:${APP_PORT}`);
  session = await browserSession();
});

afterAll(async () => {
  for (const s of opened) await s.close();
  await closeBrowser();
  await app?.stop();
  await idp?.stop();
});

describe('single sign-on through an OpenID Connect provider', () => {
  it('signs in through the organisation account and gives the role mapped to its group', async () => {
    const { page } = session;
    await page.goto(`${app.baseUrl}/sign-in`);
    await expect(page.getByRole('button', { name: BUTTON }).isVisible()).resolves.toBe(true);
    await session.screenshot('oidc-sign-in-page');

    await page.getByRole('button', { name: BUTTON }).click();
    // A new browser: the provider asks who it is, then whether Worldsheet may have the profile.
    expect(await throughProvider(session, AUTHOR.login, 'oidc-first')).toEqual(['login', 'consent']);
    expect(new URL(page.url()).pathname).toBe('/projects');
    expect(await headerName(page)).toBe(`Signed in as ${AUTHOR.name}`);
    expect(await tpt2Roles(page)).toBe('Originator');
    await session.screenshot('oidc-projects-as-originator');

    // The user was created from the claims, and the group outside the map changed nothing.
    const user = await testDb()
      .selectFrom('users')
      .select(['display_name', 'password_hash'])
      .where('email', '=', AUTHOR.email)
      .executeTakeFirstOrThrow();
    expect(user).toEqual({ display_name: AUTHOR.name, password_hash: null });
    expect(await heldRoles(AUTHOR.email)).toEqual(['TPT2:originator']);
    expect(idp.errors).toEqual([]);
    expect(session.problems).toEqual([]);
  }, 60_000);

  it('follows a change of the account’s groups at the next sign-in, and audits it', async () => {
    const { page } = session;
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(`${app.baseUrl}/`);
    await expect(page.getByRole('link', { name: 'Sign in', exact: true }).isVisible()).resolves.toBe(true);

    // The organisation moves Ada from the authors to the checkers.
    idp.setGroups(AUTHOR.login, ['calc-checkers']);
    await startSignIn(page);
    // The provider still has Ada's session and her consent, so it sends her straight back (single
    // sign-on), and the new groups come with the new tokens all the same.
    expect(await throughProvider(session, AUTHOR.login, 'oidc-second')).toEqual([]);
    expect(new URL(page.url()).pathname).toBe('/projects');
    expect(await headerName(page)).toBe(`Signed in as ${AUTHOR.name}`);
    expect(await tpt2Roles(page)).toBe('Checker');
    await session.screenshot('oidc-projects-as-checker');
    expect(await heldRoles(AUTHOR.email)).toEqual(['TPT2:checker']);

    const user = await testDb()
      .selectFrom('users')
      .select('id')
      .where('email', '=', AUTHOR.email)
      .executeTakeFirstOrThrow();
    const events = await testDb()
      .selectFrom('audit_events')
      .select(['action', 'old_value', 'new_value', 'reason'])
      .where('object_id', '=', user.id)
      .where('action', 'in', ['membership.grant', 'membership.revoke'])
      .orderBy('id')
      .execute();
    expect(events.map((e) => [e.action, e.old_value ?? e.new_value])).toEqual([
      ['membership.grant', { role: 'originator' }],
      ['membership.revoke', { role: 'originator' }],
      ['membership.grant', { role: 'checker' }],
    ]);
    for (const e of events) expect(e.reason).toMatch(/single sign-on/);

    // Two single sign-on sessions: the first ended by the sign-out, the second live.
    const sessions = await testDb()
      .selectFrom('sessions as s')
      .innerJoin('users as u', 'u.id', 's.user_id')
      .select(['s.method', 's.ended_reason'])
      .where('u.email', '=', AUTHOR.email)
      .orderBy('s.created_at')
      .execute();
    expect(sessions).toEqual([
      { method: 'oidc', ended_reason: 'signed out' },
      { method: 'oidc', ended_reason: null },
    ]);

    // A checker may read the project's audit trail: the same events, with their reasons.
    await page.goto(`${app.baseUrl}/projects/TPT2/audit?action=membership.revoke`);
    const revoked = page.getByRole('row').filter({ hasText: 'membership.revoke' }).filter({ hasText: '"originator"' });
    // The page streams: wait for the row before counting.
    await revoked.first().waitFor();
    expect(await revoked.count()).toBe(1);
    expect(await revoked.innerText()).toContain('no longer in the organisation group (single sign-on)');
    await session.screenshot('oidc-audit-trail-revoke');
    expect(idp.errors).toEqual([]);
    expect(session.problems).toEqual([]);
  }, 60_000);

  it('refuses an account whose e-mail address the provider has not verified, with a readable message', async () => {
    const other = await browserSession();
    const { page } = other;
    await startSignIn(page);
    expect(await throughProvider(other, UNVERIFIED.login, 'oidc-unverified')).toEqual(['login', 'consent']);
    const url = new URL(page.url());
    expect(url.pathname).toBe('/sign-in');
    // The address carries a code only; the page shows the fixed message for it.
    expect(url.searchParams.get('error')).toBe('OidcEmailUnverified');
    await expect(page.getByRole('alert').filter({ hasText: REFUSED }).isVisible()).resolves.toBe(true);
    await expect(page.getByRole('link', { name: 'Sign in', exact: true }).isVisible()).resolves.toBe(true);
    await other.screenshot('oidc-unverified-refused');

    expect(await testDb().selectFrom('users').select('id').where('email', '=', UNVERIFIED.email).execute()).toEqual([]);
    expect(idp.errors).toEqual([]);
    expect(other.problems).toEqual([]);
  }, 60_000);
});
