// The signed-in home page is the person's work: each demo role sees the sections of its roles, with
// the counts lib/home/my-work.ts gives for the same database; signed out, the landing page stays.
import path from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { myWork, navigationCounts } from '../../lib/home/my-work';
import { resetDatabase, testDb } from '../support/database';
import { actorByEmail } from '../support/people';
import { closeBrowser, openBrowser, SCREENSHOT_DIR, startApp, submitSignIn, type RunningApp } from './harness';

let app: RunningApp;
beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  app = await startApp();
});
afterAll(async () => {
  await closeBrowser();
  await app?.stop();
});

const SECTIONS = [
  ['returned', 'Returned to you'],
  ['drafts', 'Your drafts'],
  ['toCheck', 'To check'],
  ['toApprove', 'To approve'],
  ['toIssue', 'Approved, waiting for issue'],
] as const;

for (const who of ['originator', 'checker', 'approver', 'controller']) {
  it(`${who}: the home page shows the work of that role, with its counts`, async () => {
    const actor = await actorByEmail(testDb(), `${who}@demo.test`);
    const work = await myWork(testDb(), actor);
    const session = await openBrowser();
    await submitSignIn(session.page, app.baseUrl, `${who}@demo.test`, DEMO_PASSWORD);
    await session.page.waitForURL(`${app.baseUrl}/projects`);
    await session.page.goto(`${app.baseUrl}/`);
    await session.page.screenshot({ path: path.join(SCREENSHOT_DIR, `home-work-${who}.png`), fullPage: true });
    await session.page.getByRole('heading', { level: 1, name: /^Your work/ }).waitFor({ timeout: 20_000 });
    const headings = await session.page.locator('main h2').allInnerTexts();
    const expected = SECTIONS.filter(([key]) => work[key] !== null).map(
      ([key, title]) => `${title} (${work[key]!.length})`,
    );
    expect(expected.length).toBeGreaterThan(0);
    expect(headings).toEqual(expected);
    // The navigation carries the same counts: all of it on "My work", each queue on its link (a
    // link shows no figure when nothing waits).
    const counts = navigationCounts(work);
    const nav = session.page.getByRole('navigation', { name: 'Main' });
    const shown = async (name: string) => {
      const text = (await nav.getByRole('link', { name, exact: false }).innerText()).replace(name, '');
      return Number(/\d+/.exec(text)?.[0] ?? 0);
    };
    expect(await shown('My work')).toBe(counts.work);
    expect(await shown('My checks')).toBe(counts.checks);
    expect(await shown('My approvals')).toBe(counts.approvals);
    expect(await shown('Register')).toBe(counts.issue);
    expect(counts.work).toBe(counts.checks + counts.approvals + counts.issue + (work.returned?.length ?? 0));
    await session.page.screenshot({ path: path.join(SCREENSHOT_DIR, `home-work-${who}.png`), fullPage: true });
    expect(session.problems).toEqual([]);
  }, 90_000);
}
