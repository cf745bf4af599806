// The demo mailbox and the unlock link through the real server in demo mode: signed out the mailbox
// shows no mail; a person sees only their own; five wrong passwords lock an account, whose holder
// reads the unlock link in their mailbox and unlocks it with one press.
import nodemailer from 'nodemailer';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { AUTH_SETTINGS } from '../../lib/auth/settings';
import { resetDatabase, testDb } from '../support/database';
import { clearMailbox, testSmtpUrl, waitForMail } from '../support/mailbox';
import { closeBrowser, openBrowser, startApp, submitSignIn, type RunningApp } from './harness';

let app: RunningApp;

beforeAll(async () => {
  await resetDatabase();
  await clearMailbox();
  await seedDemo(testDb());
  app = await startApp({ WORLDSHEET_DEMO: '1' });
});

afterAll(async () => {
  await closeBrowser();
  await app?.stop();
});

describe('demo mailbox', () => {
  it('shows nothing signed out, and a signed-in person only the mail addressed to them', async () => {
    const transport = nodemailer.createTransport(testSmtpUrl());
    await transport.sendMail({
      from: 'Worldsheet <no-reply@worldsheet.test>',
      to: 'admin@demo.test',
      subject: 'Your Worldsheet sign-in link',
      text: 'http://127.0.0.1/sign-in/link?token=admins-secret',
    });
    await transport.sendMail({
      from: 'Worldsheet <no-reply@worldsheet.test>',
      to: 'checker@demo.test',
      subject: 'For the checker',
      text: 'Hello checker.',
    });
    transport.close();
    await waitForMail({ to: 'checker@demo.test', subject: 'For the checker' });

    const anonymous = await (await fetch(`${app.baseUrl}/mailbox`)).text();
    expect(anonymous).toContain('Sign in to read your mail');
    expect(anonymous).not.toMatch(/admins-secret|For the checker|Your Worldsheet sign-in link/);

    const session = await openBrowser();
    const { page } = session;
    try {
      await submitSignIn(page, app.baseUrl, 'checker@demo.test', DEMO_PASSWORD);
      await page.waitForURL(`${app.baseUrl}/projects`);
      await page.goto(`${app.baseUrl}/mailbox`);
      await page.getByRole('heading', { name: 'Your e-mails' }).waitFor();
      await page.getByRole('heading', { name: 'For the checker' }).waitFor();
      expect(await page.content()).not.toMatch(/admins-secret|Your Worldsheet sign-in link/);
      expect(session.problems).toEqual([]);
    } finally {
      await session.close();
    }
  });
});

describe('unlock link', () => {
  it(`locks after ${AUTH_SETTINGS.lockAfterFailures} wrong passwords, and the holder unlocks with the e-mailed link`, async () => {
    const session = await openBrowser();
    const { page } = session;
    try {
      for (let i = 1; i <= AUTH_SETTINGS.lockAfterFailures; i++) {
        await submitSignIn(page, app.baseUrl, 'viewer@demo.test', `wrong password ${i}`);
        const expected =
          i < AUTH_SETTINGS.lockAfterFailures
            ? 'The e-mail address or the password is not right.'
            : /locked after 5 failed sign-in attempts, until .* UTC/;
        await page.getByRole('alert').filter({ hasText: expected }).waitFor();
      }
      const mail = await waitForMail({ to: 'viewer@demo.test', subject: 'Your Worldsheet account is locked' }, 20_000);
      const link = mail.links.find((l) => l.includes('/unlock?token='))!;
      await page.goto(link);
      await page.getByRole('heading', { name: 'Unlock your account' }).waitFor();
      await session.screenshot('unlock-page');
      await page.getByRole('button', { name: 'Unlock my account' }).click();
      await page.getByRole('status').filter({ hasText: 'Your account is unlocked.' }).waitFor();
      await submitSignIn(page, app.baseUrl, 'viewer@demo.test', DEMO_PASSWORD);
      await page.waitForURL(`${app.baseUrl}/projects`);
      // next-auth answers a refused credentials sign-in with 401; nothing else may fail.
      expect(session.problems.filter((p) => !/401/.test(p))).toEqual([]);
    } finally {
      await session.close();
    }
  });
});
