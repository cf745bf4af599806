// The whole job with the keyboard alone: each person reaches every control with Tab (never a click),
// operates it with Enter, Space, the arrow keys or by typing, and sees where the focus is (the focus
// ring); after each action on a page, the focus stays somewhere sensible (never dropped on the page's
// body). The originator edits and saves a version and submits it; the checker records the method and
// signs; the approver approves; document control issues revision A; a visitor verifies its code.
import { afterAll, beforeAll, expect, it } from 'vitest';
import type { Locator, Page } from 'playwright-core';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { resetDatabase, testDb } from '../support/database';
import { closeBrowser, openBrowser, startApp, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;
const sessions: BrowserSession[] = [];

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  app = await startApp();
}, 600_000);

afterAll(async () => {
  for (const s of sessions) await s.close();
  await closeBrowser();
  await app?.stop();
});

/**
 * Whether the focused element shows a focus ring, or (the editor's text, a radio in its group) the box
 * around it does, up to three levels out (a `focus-within` ring).
 */
async function focusVisible(page: Page): Promise<boolean> {
  return page.evaluate(() => {
    const ring = (el: Element | null) => {
      if (!el) return false;
      const s = getComputedStyle(el);
      return (s.outlineStyle !== 'none' && parseFloat(s.outlineWidth) > 0) || s.boxShadow !== 'none';
    };
    let el: Element | null = document.activeElement;
    for (let level = 0; el && level < 4; level++, el = el.parentElement) if (ring(el)) return true;
    return false;
  });
}

/** Presses Tab until `target` (or something inside it) has the focus, and checks the focus ring there. */
async function tabTo(page: Page, target: Locator, what: string, max = 200): Promise<void> {
  await target.waitFor();
  for (let i = 0; i < max; i++) {
    await page.keyboard.press('Tab');
    if (await target.evaluate((el) => el === document.activeElement || el.contains(document.activeElement))) {
      expect(await focusVisible(page), `a visible focus on ${what}`).toBe(true);
      return;
    }
  }
  throw new Error(`${what} was not reached with Tab in ${max} presses`);
}

/** After an action on a page: the focus is on something, not dropped on the body. */
async function focusKept(page: Page, what: string): Promise<void> {
  const where = await page.evaluate(() => {
    const a = document.activeElement;
    return !a || a === document.body ? null : `${a.tagName.toLowerCase()} ${a.textContent?.slice(0, 40) ?? ''}`;
  });
  expect(where, `the focus after ${what}`).not.toBeNull();
}

async function signIn(email: string): Promise<BrowserSession> {
  const session = await openBrowser();
  sessions.push(session);
  const { page } = session;
  await page.goto(`${app.baseUrl}/sign-in`);
  await tabTo(page, page.getByLabel('E-mail'), 'the e-mail field');
  await page.keyboard.type(email);
  await tabTo(page, page.getByLabel('Password'), 'the password field');
  await page.keyboard.type(DEMO_PASSWORD);
  await page.keyboard.press('Enter');
  await page.waitForURL(`${app.baseUrl}/projects`);
  return session;
}

/** Follows a link reached with Tab, with Enter. */
async function follow(page: Page, link: Locator, what: string): Promise<void> {
  await tabTo(page, link, what);
  await page.keyboard.press('Enter');
}

it('goes from an edit to a verified revision with the keyboard alone', async () => {
  // ── The originator opens the sheet from the project page, edits a cell, saves and submits.
  const originator = await signIn('originator@demo.test');
  let page = originator.page;
  await follow(page, page.getByRole('link', { name: 'TPT2', exact: true }), 'the project link');
  await page.waitForURL(`${app.baseUrl}/projects/TPT2`);
  await follow(page, page.getByRole('link', { name: 'TPT2-CALC-0001' }), 'the sheet link');
  await page.waitForURL(`${app.baseUrl}/projects/TPT2/sheets/1`);
  await follow(page, page.getByRole('link', { name: 'Edit the sheet' }), 'the edit link');
  await page.waitForURL(`${app.baseUrl}/projects/TPT2/sheets/1/edit`);
  const source = page.getByLabel(/^Cell \d+ \(calculation\) source$/).first();
  await tabTo(page, source, 'the first calculation cell');
  await page.keyboard.press('Control+End');
  await page.keyboard.press('Enter');
  await page.keyboard.type('L_keyboard = 2.5 m');
  // Out of the editor with Tab (the editor does not keep it), to the summary of the change.
  await tabTo(page, page.getByLabel('What changed'), 'the summary of the change');
  await page.keyboard.type('A length typed with the keyboard alone');
  await tabTo(page, page.getByRole('button', { name: 'Save version' }), 'the save button');
  await page.keyboard.press('Enter');
  await page.getByRole('status').filter({ hasText: 'Saved as version 3.' }).waitFor();
  await focusKept(page, 'saving');
  await originator.screenshot('keyboard-saved');

  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/1`);
  const form = page.getByRole('region', { name: 'Submit for check' });
  const checker = form.getByLabel('Checker');
  await tabTo(page, checker, 'the checker list');
  for (
    let i = 0;
    i < 10 && (await checker.evaluate((s: HTMLSelectElement) => s.selectedOptions[0]?.text)) !== 'Demo Checker';
    i++
  )
    await page.keyboard.press('ArrowDown');
  expect(await checker.evaluate((s: HTMLSelectElement) => s.selectedOptions[0]?.text)).toBe('Demo Checker');
  await tabTo(page, form.getByLabel('Your password (signs as prepared)'), 'the password that signs as prepared');
  await page.keyboard.type(DEMO_PASSWORD);
  await page.keyboard.press('Enter');
  await page.getByRole('region', { name: 'Status' }).getByText('Version 3 is in check by Demo Checker.').waitFor();
  await focusKept(page, 'submitting');
  expect(originator.problems).toEqual([]);

  // ── The checker opens the check from the queue, records the method and signs.
  const checkerSession = await signIn('checker@demo.test');
  page = checkerSession.page;
  await follow(page, page.getByRole('link', { name: /^My checks/ }), 'the checks link');
  await page.waitForURL(`${app.baseUrl}/checks`);
  await follow(page, page.getByRole('link', { name: 'Open the check of TPT2-CALC-0001 version 3' }), 'the check');
  await page.waitForURL(/\/checks\/[0-9a-f-]+$/);
  await tabTo(page, page.getByRole('radio', { name: 'Design review' }), 'the verification methods');
  await page.keyboard.press('Space');
  await page.getByRole('status').filter({ hasText: 'Verification method recorded: Design review.' }).waitFor();
  const sign = page.getByRole('form', { name: 'Sign as checked' });
  await tabTo(page, sign.getByLabel('Your password (signs as checked)'), 'the password that signs as checked');
  await page.keyboard.type(DEMO_PASSWORD);
  await page.keyboard.press('Enter');
  await page.getByRole('status').filter({ hasText: 'Signed as checked. The version now awaits approval.' }).waitFor();
  await focusKept(page, 'signing as checked');
  await checkerSession.screenshot('keyboard-checked');
  expect(checkerSession.problems).toEqual([]);

  // ── The approver approves.
  const approver = await signIn('approver@demo.test');
  page = approver.page;
  await follow(page, page.getByRole('link', { name: /^My approvals/ }), 'the approvals link');
  await page.waitForURL(`${app.baseUrl}/approvals`);
  await follow(page, page.getByRole('link', { name: 'Open the check of TPT2-CALC-0001 version 3' }), 'the check');
  await page.waitForURL(/\/checks\/[0-9a-f-]+$/);
  const approve = page.getByRole('form', { name: 'Approve' });
  await tabTo(page, approve.getByLabel('Your password (signs as approved)'), 'the password that signs as approved');
  await page.keyboard.type(DEMO_PASSWORD);
  await page.keyboard.press('Enter');
  await page.getByRole('status').filter({ hasText: 'Approved.' }).waitFor();
  await focusKept(page, 'approving');
  expect(approver.problems).toEqual([]);

  // ── Document control issues revision A.
  const controller = await signIn('controller@demo.test');
  page = controller.page;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/1`);
  await tabTo(page, page.getByLabel('Your password (signs as issued)'), 'the password that signs as issued');
  await page.keyboard.type(DEMO_PASSWORD);
  await tabTo(page, page.getByRole('button', { name: 'Issue as revision A' }), 'the issue button');
  await page.keyboard.press('Enter');
  await page.getByRole('status').filter({ hasText: 'Issued.' }).waitFor({ timeout: 90_000 });
  await focusKept(page, 'issuing');
  await controller.screenshot('keyboard-issued');
  expect(controller.problems).toEqual([]);

  // ── A visitor verifies the revision by its code.
  const { verification_code: code } = await testDb()
    .selectFrom('revisions')
    .select('verification_code')
    .where('code', '=', 'A')
    .orderBy('issued_at', 'desc')
    .executeTakeFirstOrThrow();
  const visitor = await openBrowser();
  sessions.push(visitor);
  page = visitor.page;
  await page.goto(`${app.baseUrl}/verify`);
  await tabTo(page, page.getByLabel(/^Verification code/), 'the verification code field');
  await page.keyboard.type(code!);
  await page.keyboard.press('Enter');
  await page.getByRole('heading', { name: 'Authentic and current' }).waitFor();
  await focusKept(page, 'verifying');
  await visitor.screenshot('keyboard-verified');
  expect(visitor.problems).toEqual([]);
}, 600_000);
