// The submit form says who may check the version chosen, not only the latest: a checker who saved
// version 2 cannot check it (NQA-1 Requirement 3 §500: not the originator of a change under check),
// but may check version 1, which they had no part in.
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { getVersion, saveVersion } from '../../lib/sheets/sheets';
import { resetDatabase, testDb } from '../support/database';
import { actorByEmail } from '../support/people';
import { closeBrowser, openBrowser, startApp, submitSignIn, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;
let originator: BrowserSession;

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  const project = await testDb().selectFrom('projects').select('id').where('code', '=', 'TPT2').executeTakeFirstOrThrow();
  const sheet = await testDb().selectFrom('sheets').select(['id', 'project_id']).where('project_id', '=', project.id).where('number', '=', 2).executeTakeFirstOrThrow();
  // The demo checker also holds the originator role here, and saves version 2 of sheet 2.
  const checker = await actorByEmail(testDb(), 'checker@demo.test');
  await testDb().insertInto('project_members').values({ project_id: project.id, user_id: checker.userId, role: 'originator', granted_by: null }).execute();
  const v1 = (await getVersion(testDb(), sheet.id))!;
  await saveVersion(testDb(), checker, sheet, { parentNumber: v1.number, message: 'Spacing from the new survey', content: { ...v1.content, cells: v1.content.cells.map((c) => ({ ...c, source: c.source.replace('12.5 m', '12.52 m') })) } });
  app = await startApp();
  originator = await openBrowser();
  await submitSignIn(originator.page, app.baseUrl, 'originator@demo.test', DEMO_PASSWORD);
  await originator.page.waitForURL(`${app.baseUrl}/projects`);
});

afterAll(async () => {
  await originator?.close();
  await closeBrowser();
  await app?.stop();
});

it('shows the eligibility of each checker for the version chosen', async () => {
  const { page } = originator;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/2`);
  const form = page.getByRole('region', { name: 'Submit for check' });
  await form.getByLabel('Version').waitFor();
  expect(await form.getByLabel('Version').inputValue()).toBe('2');
  expect(await form.getByRole('option', { name: 'Demo Checker (not eligible)' }).isDisabled()).toBe(true);
  await form.getByText(/Demo Checker is not eligible/).waitFor();
  await form.getByLabel('Version').selectOption('1');
  await form.getByRole('option', { name: 'Demo Checker', exact: true }).waitFor({ state: 'attached' });
  expect(await form.getByRole('option', { name: 'Demo Checker', exact: true }).isDisabled()).toBe(false);
  expect(await form.getByText(/Demo Checker is not eligible/).count()).toBe(0);
  await originator.screenshot('submit-eligibility-version-1');
  expect(originator.problems).toEqual([]);
});
