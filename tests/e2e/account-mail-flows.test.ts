// Sign-in links, password resets and invitations as people use them: asked for on a page, read
// back from the local SMTP capture, followed in the browser. Each link works once.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../db/seed';
import { resetDatabase, testDb } from '../support/database';
import { clearMailbox, waitForMail } from '../support/mailbox';
import { closeBrowser, openBrowser, startApp, submitSignIn, type RunningApp } from './harness';

let app: RunningApp;

beforeAll(async () => {
  await resetDatabase();
  await clearMailbox();
  await seedDemo(testDb());
  app = await startApp();
});

afterAll(async () => {
  await closeBrowser();
  await app?.stop();
});

function linkIn(text: string, path: string): string {
  const m = new RegExp(`https?://[^\\s]+${path.replace(/[/?]/g, (c) => `\\${c}`)}[^\\s]*`).exec(text);
  if (!m) throw new Error(`no ${path} link in:\n${text}`);
  return m[0];
}

describe('e-mailed links', () => {
  it('signs in with a link read from the mail, once', async () => {
    const session = await openBrowser();
    const { page } = session;
    try {
      await page.goto(`${app.baseUrl}/sign-in`);
      await page.getByRole('button', { name: 'Sign in with an e-mailed link' }).click();
      await page.getByLabel('E-mail').fill('checker@demo.test');
      await page.getByRole('button', { name: 'E-mail me a sign-in link' }).click();
      await page.getByRole('status').filter({ hasText: 'a sign-in link is on its way' }).waitFor();
      const mail = await waitForMail({ to: 'checker@demo.test', subject: 'Your Worldsheet sign-in link' }, 20_000);
      const link = linkIn(mail.text, '/sign-in/link?token=');
      await page.goto(link);
      await page.getByRole('button', { name: 'Sign in to Worldsheet' }).click();
      await page.waitForURL(`${app.baseUrl}/projects`);
      await page.getByRole('link', { name: /Signed in as Demo Checker/ }).waitFor();
      await session.screenshot('signed-in-with-link');
      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.getByRole('link', { name: 'Sign in' }).waitFor();
      // The same link a second time.
      await page.goto(link);
      await page.getByRole('button', { name: 'Sign in to Worldsheet' }).click();
      await page.getByRole('alert').filter({ hasText: 'This sign-in link has expired or was already used.' }).waitFor();
      expect(session.problems.filter((p) => !/401/.test(p))).toEqual([]);
    } finally {
      await session.close();
    }
  });

  it('resets a forgotten password through the mailed link, which then stops working', async () => {
    const session = await openBrowser();
    const { page } = session;
    try {
      await page.goto(`${app.baseUrl}/sign-in`);
      await page.getByRole('button', { name: 'Forgot the password?' }).click();
      await page.getByLabel('E-mail').fill('approver@demo.test');
      await page.getByRole('button', { name: 'E-mail me a reset link' }).click();
      const mail = await waitForMail({ to: 'approver@demo.test', subject: 'Reset your Worldsheet password' }, 20_000);
      const link = linkIn(mail.text, '/reset-password?token=');
      await page.goto(link);
      await page.getByLabel('New password').fill('a new approver password');
      await page.getByRole('button', { name: 'Set the password' }).click();
      await page.getByRole('status').filter({ hasText: 'Your password is set.' }).waitFor();
      await page.goto(link);
      await page.getByLabel('New password').fill('yet another password!');
      await page.getByRole('button', { name: 'Set the password' }).click();
      await page.getByRole('alert').filter({ hasText: 'This link has expired or was already used.' }).waitFor();
      await page.goto(`${app.baseUrl}/sign-in`);
      await page.getByLabel('E-mail').fill('approver@demo.test');
      await page.getByLabel('Password').fill('a new approver password');
      await page.getByRole('button', { name: 'Sign in', exact: true }).click();
      await page.waitForURL(`${app.baseUrl}/projects`);
      expect(session.problems.filter((p) => !/400/.test(p))).toEqual([]);
    } finally {
      await session.close();
    }
  });

  it('lets an administrator invite a person, who chooses a password from the mail and signs in', async () => {
    const session = await openBrowser();
    const { page } = session;
    try {
      await submitSignIn(page, app.baseUrl, 'admin@demo.test', 'worldsheet-demo');
      await page.waitForURL(`${app.baseUrl}/projects`);
      await page.goto(`${app.baseUrl}/admin`);
      const invite = page.locator('form').filter({ has: page.getByRole('button', { name: 'Send the invitation' }) });
      await invite.getByLabel('E-mail').fill('new.engineer@example.test');
      await invite.getByLabel('Printed name (as on signatures)').fill('New Engineer');
      await invite.getByRole('button', { name: 'Send the invitation' }).click();
      await invite.getByRole('status').filter({ hasText: 'Invitation sent.' }).waitFor();
      await page.getByRole('cell', { name: 'new.engineer@example.test' }).waitFor();
      await session.screenshot('administration-invited');
      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.getByRole('link', { name: 'Sign in' }).waitFor();

      const mail = await waitForMail(
        { to: 'new.engineer@example.test', subject: 'You are invited to Worldsheet' },
        20_000,
      );
      await page.goto(linkIn(mail.text, '/reset-password?token='));
      await page.getByRole('heading', { name: 'Welcome: choose your password' }).waitFor();
      await page.getByLabel('New password').fill('first password of mine');
      await page.getByRole('button', { name: 'Set the password' }).click();
      await page.getByRole('status').filter({ hasText: 'Your password is set.' }).waitFor();
      await page.goto(`${app.baseUrl}/sign-in`);
      await page.getByLabel('E-mail').fill('new.engineer@example.test');
      await page.getByLabel('Password').fill('first password of mine');
      await page.getByRole('button', { name: 'Sign in', exact: true }).click();
      await page.waitForURL(`${app.baseUrl}/projects`);
      await page.getByText('You are not a member of any project yet.').waitFor();
      expect(session.problems).toEqual([]);
    } finally {
      await session.close();
    }
  });
});
