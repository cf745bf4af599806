// Voiding a sheet created by mistake, as people see it: the originator who created a sheet that was
// never issued voids it from the sheet page with a reason; the page then says it is void, why and
// since when, and offers no edit, submission or issue; the project's list of sheets keeps it as Void.
// The checker, who did not create the sheet, is not offered a void (tests/sheets/void.test.ts covers
// the refusals: an issued sheet, an open check, another originator).
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { createSheet } from '../../lib/sheets/sheets';
import { resetDatabase, testDb } from '../support/database';
import { actorByEmail } from '../support/people';
import { closeBrowser, openSignedIn, startApp, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;
let sheetNumber: number;

async function signedIn(email: string): Promise<BrowserSession> {
  const session = await openSignedIn(app.baseUrl, email, DEMO_PASSWORD);
  session.page.setDefaultTimeout(15_000);
  return session;
}

beforeAll(async () => {
  await resetDatabase();
  const db = testDb();
  await seedDemo(db);
  const project = await db
    .selectFrom('projects')
    .select(['id', 'code'])
    .where('code', '=', 'TPT2')
    .executeTakeFirstOrThrow();
  const me = await actorByEmail(db, 'originator@demo.test');
  const created = await createSheet(db, me, project, {
    title: 'Duplicate of the dipole rigidity sheet',
    safetyRelated: false,
    objective: 'Started twice by mistake.',
  });
  sheetNumber = created.number;
  app = await startApp();
});
afterAll(async () => {
  await closeBrowser();
  await app?.stop();
});

it('the originator voids a sheet never issued; the page and the list of sheets say Void', async () => {
  const checker = await signedIn('checker@demo.test');
  await checker.page.goto(`${app.baseUrl}/projects/TPT2/sheets/${sheetNumber}`);
  await checker.page.getByRole('heading', { level: 2, name: 'History' }).waitFor();
  expect(await checker.page.getByRole('heading', { name: 'Created by mistake?' }).count()).toBe(0);
  expect(checker.problems).toEqual([]);

  const originator = await signedIn('originator@demo.test');
  const page = originator.page;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/${sheetNumber}`);
  const code = `TPT2-CALC-${String(sheetNumber).padStart(4, '0')}`;
  const section = page.getByRole('region', { name: 'Created by mistake?' });
  await section.locator('summary', { hasText: `Void ${code}` }).click();
  await section.getByLabel(`Why ${code} is void`).fill('Started twice; the work continues on TPT2-CALC-0001.');
  await originator.screenshot('void-sheet-form');
  await section.getByRole('button', { name: `Void ${code}` }).click();
  const banner = page.getByRole('status').filter({ hasText: /^Void since/ });
  await banner.waitFor();
  expect(await banner.innerText()).toMatch(
    /Started twice; the work continues on TPT2-CALC-0001\..*cannot be saved, submitted or issued/,
  );
  expect(await page.getByRole('link', { name: 'Edit the sheet' }).count()).toBe(0);
  expect(await page.getByRole('region', { name: 'Submit for check' }).count()).toBe(0);
  expect(await page.getByRole('heading', { name: 'Created by mistake?' }).count()).toBe(0);
  await originator.screenshot('void-sheet-done');

  await page.goto(`${app.baseUrl}/projects/TPT2`);
  const row = page.getByRole('row').filter({ hasText: code });
  await row.waitFor();
  expect(await row.innerText()).toMatch(/\bVoid\b/);
  expect(originator.problems).toEqual([]);
}, 120_000);
