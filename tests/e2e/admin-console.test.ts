// The administration console and the account page as an administrator drives them in Chromium: unlocking
// a locked account and sending a password-reset link, each with its reason in the audit trail (the mail
// read back from the local capture, its link followed); a disable that is cancelled leaves the account
// as it was; revoking an API token asks first, and Cancel leaves the token working. The console does not
// scroll sideways at phone width (390 px). Screenshots at 1280 and 390 px.
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { resetDatabase, testDb } from '../support/database';
import { clearMailbox, waitForMail } from '../support/mailbox';
import { closeBrowser, openBrowser, startApp, submitSignIn, type BrowserSession, type RunningApp } from './harness';

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

async function signedIn(email: string, password = DEMO_PASSWORD): Promise<BrowserSession> {
  const session = await openBrowser();
  await submitSignIn(session.page, app.baseUrl, email, password);
  await session.page.waitForURL(`${app.baseUrl}/projects`);
  return session;
}

/** The accounts table (the members table below it names the same people). */
const accounts = (page: Page) => page.getByRole('table', { name: 'Accounts' });

async function openConsole(page: Page): Promise<void> {
  await page.goto(`${app.baseUrl}/admin`);
  await accounts(page)
    .getByRole('row', { name: /viewer@demo\.test/ })
    .waitFor();
}

const userId = async (email: string) =>
  (await testDb().selectFrom('users').select('id').where('email', '=', email).executeTakeFirstOrThrow()).id;

const auditOf = (action: string, objectId: string) =>
  testDb()
    .selectFrom('audit_events')
    .innerJoin('users', 'users.id', 'audit_events.actor_id')
    .select(['users.email as actor', 'audit_events.reason', 'audit_events.new_value'])
    .where('action', '=', action)
    .where('object_id', '=', objectId)
    .orderBy('audit_events.id')
    .execute();

/** The element that has the focus: its tag and accessible text, enough to tell which control it is. */
const focused = (page: Page) =>
  page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    const label = el?.id ? document.querySelector(`label[for="${el.id}"]`)?.textContent : null;
    return { tag: el?.tagName.toLowerCase(), text: (label ?? el?.textContent ?? '').trim() };
  });

/** How wide the document is at the current viewport (more than the viewport: it scrolls sideways). */
const documentWidth = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth);

/** The elements reaching past the viewport's right edge outside any box that scrolls, for a failure message. */
const overflowing = (page: Page) =>
  page.evaluate(() =>
    [...document.querySelectorAll('body *')]
      .filter((el) => el.getBoundingClientRect().right > window.innerWidth + 0.5)
      .filter((el) => {
        for (let up = el.parentElement; up && up !== document.body; up = up.parentElement)
          if (getComputedStyle(up).overflowX !== 'visible') return false;
        return true;
      })
      .slice(0, 8)
      .map(
        (el) =>
          `${el.tagName.toLowerCase()}.${String(el.className).slice(0, 60)} → ${el.getBoundingClientRect().right}`,
      ),
  );

describe('the administration console', () => {
  it('unlocks a locked account with a reason: the holder signs in, and the audit trail has the reason', async () => {
    const viewer = await userId('viewer@demo.test');
    // Locked by failed passwords for a quarter of an hour, as lib/auth/lockout.ts locks.
    await testDb()
      .updateTable('users')
      .set({ failed_sign_ins: 5, locked_at: new Date(), lock_expires_at: new Date(Date.now() + 15 * 60_000) })
      .where('id', '=', viewer)
      .execute();
    const admin = await signedIn('admin@demo.test');
    const { page } = admin;
    try {
      await openConsole(page);
      const row = accounts(page).getByRole('row', { name: /viewer@demo\.test/ });
      await row.getByRole('cell', { name: /locked until .* UTC \(failed passwords\)/ }).waitFor();
      await row.getByRole('button', { name: 'Unlock Demo Viewer' }).click();
      expect(await focused(page)).toEqual({ tag: 'input', text: 'Reason to unlock Demo Viewer' });
      await session1280and390(admin, 'administration-unlock-form');
      await page.keyboard.type('Called the help desk from the control room');
      await row.getByRole('button', { name: 'Unlock', exact: true }).click();
      await page.getByRole('status').filter({ hasText: 'Demo Viewer is unlocked.' }).waitFor();
      await row.getByRole('cell', { name: 'active', exact: true }).waitFor();
      expect(await focused(page)).toEqual({ tag: 'p', text: 'Demo Viewer is unlocked.' });
      expect(await auditOf('user.unlock', viewer)).toEqual([
        { actor: 'admin@demo.test', reason: 'Called the help desk from the control room', new_value: null },
      ]);
      expect(admin.problems).toEqual([]);
    } finally {
      await admin.close();
    }
    const holder = await signedIn('viewer@demo.test');
    expect(holder.problems).toEqual([]);
    await holder.close();
  });

  it('sends a password-reset link with a reason: it arrives in the mailbox, works once, and is audited', async () => {
    const approver = await userId('approver@demo.test');
    const admin = await signedIn('admin@demo.test');
    const { page } = admin;
    const answers: string[] = [];
    page.on('response', (r) => {
      if (r.url().includes('/api/admin/users/')) void r.text().then((t) => answers.push(t));
    });
    try {
      await openConsole(page);
      const row = accounts(page).getByRole('row', { name: /approver@demo\.test/ });
      await row.getByRole('button', { name: 'Send Demo Approver a reset link' }).click();
      await row.getByLabel('Reason to send Demo Approver a reset link').fill('Forgot the password while on leave');
      await row.getByRole('button', { name: 'Send the link' }).click();
      await page
        .getByRole('status')
        .filter({ hasText: 'A password-reset link is on its way to approver@demo.test.' })
        .waitFor();
      await admin.screenshot('administration-reset-link-sent');

      const mail = await waitForMail({ to: 'approver@demo.test', subject: 'Reset your Worldsheet password' }, 20_000);
      expect(mail.text).toContain('Demo Administrator, an administrator of Worldsheet, sent you this link.');
      const link = mail.links.find((l) => l.includes('/reset-password?token='))!;
      const token = new URL(link).searchParams.get('token')!;
      // The link reaches the holder only: the administrator's page never saw it.
      expect(answers.length).toBeGreaterThan(0);
      for (const answer of answers) expect(answer).not.toContain(token);
      expect(await auditOf('user.send-password-reset', approver)).toEqual([
        {
          actor: 'admin@demo.test',
          reason: 'Forgot the password while on leave',
          new_value: { mailedTo: 'approver@demo.test' },
        },
      ]);

      // An administrator may send one to their own account: audited like any other.
      const self = await userId('admin@demo.test');
      const own = accounts(page).getByRole('row', { name: /admin@demo\.test/ });
      await own.getByRole('button', { name: 'Send Demo Administrator a reset link' }).click();
      await own.getByLabel('Reason to send Demo Administrator a reset link').fill('Testing my own reset');
      await own.getByRole('button', { name: 'Send the link' }).click();
      await page.getByRole('status').filter({ hasText: 'on its way to admin@demo.test' }).waitFor();
      expect(await auditOf('user.send-password-reset', self)).toEqual([
        { actor: 'admin@demo.test', reason: 'Testing my own reset', new_value: { mailedTo: 'admin@demo.test' } },
      ]);
      expect(admin.problems).toEqual([]);
    } finally {
      await admin.close();
    }

    const holder = await openBrowser();
    try {
      const mail = await waitForMail({ to: 'approver@demo.test', subject: 'Reset your Worldsheet password' });
      const link = mail.links.find((l) => l.includes('/reset-password?token='))!;
      await holder.page.goto(link);
      await holder.page.getByLabel('New password').fill('approver chose this one');
      await holder.page.getByRole('button', { name: 'Set the password' }).click();
      await holder.page.getByRole('status').filter({ hasText: 'Your password is set.' }).waitFor();
      expect(holder.problems).toEqual([]);
    } finally {
      await holder.close();
    }
    const again = await signedIn('approver@demo.test', 'approver chose this one');
    expect(again.problems).toEqual([]);
    await again.close();
  });

  it('leaves an account enabled when the disable is cancelled, by the button or by Escape, and the focus goes back', async () => {
    const checker = await userId('checker@demo.test');
    const admin = await signedIn('admin@demo.test');
    const { page } = admin;
    try {
      await openConsole(page);
      const row = accounts(page).getByRole('row', { name: /checker@demo\.test/ });
      const disable = row.getByRole('button', { name: 'Disable Demo Checker' });
      await disable.click();
      await row.getByLabel('Reason to disable Demo Checker').fill('Not sure yet');
      await session1280and390(admin, 'administration-disable-form');
      await row.getByRole('button', { name: 'Cancel' }).click();
      await disable.waitFor();
      expect(await focused(page)).toEqual({ tag: 'button', text: 'Disable Demo Checker' });
      expect(await row.getByLabel('Reason to disable Demo Checker').count()).toBe(0);

      // By keyboard alone: Enter opens, the reason field has the focus, Escape backs out.
      await page.keyboard.press('Enter');
      expect(await focused(page)).toEqual({ tag: 'input', text: 'Reason to disable Demo Checker' });
      await page.keyboard.type('Changed my mind');
      await page.keyboard.press('Escape');
      await disable.waitFor();
      expect(await focused(page)).toEqual({ tag: 'button', text: 'Disable Demo Checker' });

      await page.reload();
      await accounts(page)
        .getByRole('row', { name: /checker@demo\.test/ })
        .getByRole('cell', { name: 'active', exact: true })
        .waitFor();
      const stored = await testDb()
        .selectFrom('users')
        .select('disabled_at')
        .where('id', '=', checker)
        .executeTakeFirstOrThrow();
      expect(stored.disabled_at).toBeNull();
      expect(await auditOf('user.disable', checker)).toEqual([]);
      expect(admin.problems).toEqual([]);
    } finally {
      await admin.close();
    }
  });

  it('does not scroll sideways at 390 px, with an action form open', async () => {
    const admin = await signedIn('admin@demo.test');
    const { page } = admin;
    try {
      await page.setViewportSize({ width: 390, height: 844 });
      await openConsole(page);
      await page.getByRole('option', { name: /TPT2/ }).first().waitFor({ state: 'attached' });
      expect(await documentWidth(page), (await overflowing(page)).join('\n')).toBeLessThanOrEqual(390);
      // The accounts reflow: e-mail and state under the name, the actions beside it, nothing to scroll to.
      const box = await accounts(page).evaluate((t) => [t.parentElement!.scrollWidth, t.parentElement!.clientWidth]);
      expect(box[0]).toBeLessThanOrEqual(box[1] + 1);
      await admin.screenshot('administration-390');
      const row = accounts(page).getByRole('row', { name: /originator@demo\.test/ });
      expect(await row.innerText()).toContain('active');
      await row.getByRole('button', { name: 'Send Demo Originator a reset link' }).click();
      await row.getByLabel('Reason to send Demo Originator a reset link').waitFor();
      expect(await documentWidth(page), (await overflowing(page)).join('\n')).toBeLessThanOrEqual(390);
      await page.setViewportSize({ width: 1280, height: 860 });
      await admin.screenshot('administration-1280');
      expect(admin.problems).toEqual([]);
    } finally {
      await admin.close();
    }
  });
});

describe('revoking an API token', () => {
  it('asks first: Cancel leaves the token working, confirming revokes it', async () => {
    const session = await signedIn('admin@demo.test');
    const { page } = session;
    try {
      await page.goto(`${app.baseUrl}/account`);
      await page.getByLabel('Token name').fill('report script');
      await page.getByRole('button', { name: 'Create a token' }).click();
      const secret = (await page.locator('code', { hasText: /^wst_/ }).innerText()).trim();
      const works = async () =>
        (await fetch(`${app.baseUrl}/api/account`, { headers: { authorization: `Bearer ${secret}` } })).status;
      expect(await works()).toBe(200);

      const row = page.getByRole('row', { name: /report script/ });
      const revoke = row.getByRole('button', { name: 'Revoke report script' });
      await revoke.click();
      const question = row.getByRole('group', { name: /Revoke report script\?/ });
      await question.waitFor();
      expect(await focused(page)).toEqual({ tag: 'button', text: 'Revoke the token' });
      await session1280and390(session, 'account-token-revoke-question');
      await question.getByRole('button', { name: 'Cancel' }).click();
      await revoke.waitFor();
      expect(await focused(page)).toEqual({ tag: 'button', text: 'Revoke report script' });
      expect(await works()).toBe(200);
      const revokedAt = async () =>
        (
          await testDb()
            .selectFrom('api_tokens')
            .select('revoked_at')
            .where('name', '=', 'report script')
            .executeTakeFirstOrThrow()
        ).revoked_at;
      expect(await revokedAt()).toBeNull();

      // By keyboard: Enter asks, Escape backs out, Enter asks again and Enter on the focused button revokes.
      await page.keyboard.press('Enter');
      await question.waitFor();
      await page.keyboard.press('Escape');
      await revoke.waitFor();
      expect(await works()).toBe(200);
      await page.keyboard.press('Enter');
      await question.waitFor();
      await page.keyboard.press('Enter');
      await row.getByText('revoked').waitFor();
      expect(await revokedAt()).not.toBeNull();
      expect(await works()).toBe(401);
      expect(session.problems).toEqual([]);
    } finally {
      await session.close();
    }
  });
});

/** Screenshots of the page as it is, at 1280 px and at 390 px wide, ending back at 1280. */
async function session1280and390(session: BrowserSession, name: string): Promise<void> {
  await session.screenshot(`${name}-1280`);
  await session.page.setViewportSize({ width: 390, height: 844 });
  await session.screenshot(`${name}-390`);
  await session.page.setViewportSize({ width: 1280, height: 860 });
}
