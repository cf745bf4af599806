// Each demo role signs in through the sign-in page and sees only what that role may see.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { AUTH_SETTINGS } from '../../lib/auth/settings';
import { resetDatabase, testDb } from '../support/database';
import { makeUser } from '../support/people';
import { closeBrowser, openBrowser, startApp, submitSignIn, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  await makeUser(testDb(), 'locky@example.test');
  app = await startApp();
});

afterAll(async () => {
  await closeBrowser();
  await app?.stop();
});

async function signIn(email: string, password = DEMO_PASSWORD): Promise<BrowserSession> {
  const session = await openBrowser();
  await submitSignIn(session.page, app.baseUrl, email, password);
  return session;
}

const MEMBER_ROLES = [
  { email: 'originator@demo.test', name: 'Demo Originator', role: 'Originator', audit: true },
  { email: 'checker@demo.test', name: 'Demo Checker', role: 'Checker', audit: true },
  { email: 'approver@demo.test', name: 'Demo Approver', role: 'Approver', audit: true },
  { email: 'controller@demo.test', name: 'Demo Document Controller', role: 'Document controller', audit: true },
  { email: 'viewer@demo.test', name: 'Demo Viewer', role: 'Viewer', audit: false },
];

describe('demo roles in the browser', () => {
  for (const who of MEMBER_ROLES) {
    it(`${who.role}: sees project TPT2 with that role${who.audit ? ' and its audit trail' : ', but not the audit trail'}, and no administration`, async () => {
      const session = await signIn(who.email);
      const { page } = session;
      try {
        await page.waitForURL(`${app.baseUrl}/projects`);
        await expect(page.getByRole('link', { name: new RegExp(`Signed in as ${who.name}`) }).count()).resolves.toBe(1);
        expect(await page.getByRole('row', { name: /TPT2/ }).innerText()).toContain(who.role);
        expect(await page.getByRole('link', { name: 'Administration' }).count()).toBe(0);
        await page.getByRole('link', { name: 'TPT2' }).click();
        await page.getByRole('heading', { level: 1, name: /Tarnmoor Proton Therapy Centre/ }).waitFor();
        expect(await page.getByRole('link', { name: 'Audit trail' }).count()).toBe(who.audit ? 1 : 0);
        await session.screenshot(`role-${who.role.toLowerCase().replace(/\s+/g, '-')}-project`);
        // A page that is not the user's to see renders the not-found page (its HTTP status is 200
        // once the root loading boundary has started streaming; the API answers 404 — see the matrix).
        await page.goto(`${app.baseUrl}/projects/TPT2/audit`);
        if (who.audit) {
          await page
            .getByRole('cell', { name: /gave Demo Checker the checker role/ })
            .first()
            .waitFor();
          await session.screenshot('audit-trail');
        } else {
          // A member is told what the page needs and what their roles are, not that it does not exist.
          await page.waitForURL(`${app.baseUrl}/projects/TPT2?notAllowed=audit`);
          await page.getByRole('status').filter({ hasText: 'The audit trail is for' }).waitFor();
          expect(
            await page
              .getByRole('status')
              .filter({ hasText: `Your roles in TPT2: ${who.role}.` })
              .count(),
          ).toBe(1);
        }
        await page.goto(`${app.baseUrl}/admin`);
        await page.getByRole('heading', { level: 1, name: 'Not found' }).waitFor();
        await page.goto(`${app.baseUrl}/projects`);
        await page.getByRole('button', { name: 'Sign out' }).click();
        await page.getByRole('link', { name: 'Sign in' }).waitFor();
        await page.goto(`${app.baseUrl}/account`);
        await page.waitForURL(/\/sign-in\?callbackUrl=%2Faccount$/);
        // The only HTTP errors are the 404s this test asked for.
        expect(session.problems.filter((p) => !/404/.test(p))).toEqual([]);
      } finally {
        await session.close();
      }
    });
  }

  it('Administrator: manages people, projects and roles, but does not see project content', async () => {
    const session = await signIn('admin@demo.test');
    const { page } = session;
    try {
      await page.waitForURL(`${app.baseUrl}/projects`);
      expect(await page.getByRole('row', { name: /TPT2/ }).innerText()).toContain('administration only');
      await page.getByRole('link', { name: 'Administration' }).click();
      await page.getByRole('heading', { level: 1, name: 'Administration' }).waitFor();
      await page.getByRole('cell', { name: 'checker@demo.test', exact: true }).waitFor();
      await page
        .getByRole('cell', { name: /Demo Checker/ })
        .first()
        .waitFor();
      await session.screenshot('administration');
      await page.goto(`${app.baseUrl}/projects/TPT2`);
      await page.getByRole('heading', { level: 1, name: 'Not found' }).waitFor();
      expect(session.problems.filter((p) => !/404/.test(p))).toEqual([]);
    } finally {
      await session.close();
    }
  });

  it('says why a sign-in failed, and locks the account after repeated failures', async () => {
    const session = await openBrowser();
    const { page } = session;
    try {
      await page.goto(`${app.baseUrl}/sign-in`);
      for (let i = 1; i <= AUTH_SETTINGS.lockAfterFailures; i++) {
        await page.getByLabel('E-mail').fill('locky@example.test');
        await page.getByLabel('Password').fill(`wrong password ${i}`);
        await page.getByRole('button', { name: 'Sign in', exact: true }).click();
        const expected =
          i < AUTH_SETTINGS.lockAfterFailures
            ? 'The e-mail address or the password is not right.'
            : /locked after 5 failed sign-in attempts/;
        await page.getByRole('alert').filter({ hasText: expected }).waitFor();
      }
      await session.screenshot('sign-in-locked');
      // next-auth answers a refused credentials sign-in with 401; nothing else may fail.
      expect(session.problems.filter((p) => !/401/.test(p))).toEqual([]);
    } finally {
      await session.close();
    }
  });
});
