// The submit form says who may check the version chosen, with the same rules as the server
// (NQA-1 Requirement 3 §500: not the originator of a change under check; and not the person who
// prepares it): the submitter is never eligible; a checker who saved version 3 cannot check version
// 1 either (every version since the last approved one counts, those after the one chosen too); a
// checker who submitted version 2 before (signed it prepared) cannot check it, but may check version 3.
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { decide } from '../../lib/checks/decide';
import { submitForCheck } from '../../lib/checks/submit';
import { getVersion, saveVersion } from '../../lib/sheets/sheets';
import { resetDatabase, testDb } from '../support/database';
import { actorByEmail, makeUser, PASSWORD } from '../support/people';
import { closeBrowser, openBrowser, startApp, submitSignIn, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;
let originator: BrowserSession;

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  const project = await testDb()
    .selectFrom('projects')
    .select('id')
    .where('code', '=', 'TPT2')
    .executeTakeFirstOrThrow();
  const sheet = await testDb()
    .selectFrom('sheets')
    .select(['id', 'project_id', 'number', 'title'])
    .where('project_id', '=', project.id)
    .where('number', '=', 2)
    .executeTakeFirstOrThrow();
  const grant = (userId: string, role: 'originator' | 'checker') =>
    testDb()
      .insertInto('project_members')
      .values({ project_id: project.id, user_id: userId, role, granted_by: null })
      .execute();
  // The demo originator (who saved version 2) also holds the checker role: as the submitter and an originator, never eligible.
  const me = await actorByEmail(testDb(), 'originator@demo.test');
  await grant(me.userId, 'checker');
  // Another originator and checker submitted version 2 once (signed it prepared); the demo checker returned it.
  const preparer = await makeUser(testDb(), 'second.checker@example.test');
  await grant(preparer.userId, 'originator');
  await grant(preparer.userId, 'checker');
  const checker = await actorByEmail(testDb(), 'checker@demo.test');
  const first = await submitForCheck(testDb(), preparer, sheet, {
    versionNumber: 2,
    checkerId: checker.userId,
    password: PASSWORD,
  });
  await decide(testDb(), checker, first.id, { action: 'return', reason: 'Cite the survey.' });
  // The demo checker, also an originator here, then saves version 3.
  await grant(checker.userId, 'originator');
  const v1 = (await getVersion(testDb(), sheet.id))!; // version 2, the demo content
  await saveVersion(testDb(), checker, sheet, {
    parentNumber: v1.number,
    message: 'Spacing from the new survey',
    content: {
      ...v1.content,
      cells: v1.content.cells.map((c) => ({ ...c, source: c.source.replace('12.5 m', '12.52 m') })),
    },
  });
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
  expect(await form.getByLabel('Version').inputValue()).toBe('3');
  const option = (name: string) => form.getByRole('option', { name, exact: true });
  // Version 3: the submitter and the checker who saved it are not eligible; the earlier preparer of version 2 is.
  expect(await option('Demo Originator (not eligible)').isDisabled()).toBe(true);
  await form.getByText(/Demo Originator is not eligible: /).waitFor();
  expect(await option('Demo Checker (not eligible)').isDisabled()).toBe(true);
  await form.getByText(/Demo Checker is not eligible: .*saved a version of it since the last approved one/).waitFor();
  expect(await option('Person second.checker').isDisabled()).toBe(false);

  // Version 2: the checker who saved version 3 still is not; the person who submitted version 2 before is not.
  await form.getByLabel('Version').selectOption('2');
  await option('Person second.checker (not eligible)').waitFor({ state: 'attached' });
  expect(await option('Person second.checker (not eligible)').isDisabled()).toBe(true);
  await form.getByText(/Person second\.checker is not eligible: .*they are its preparer/).waitFor();
  expect(await option('Demo Checker (not eligible)').isDisabled()).toBe(true);
  expect(await option('Demo Originator (not eligible)').isDisabled()).toBe(true);
  await originator.screenshot('submit-eligibility-version-1');
  expect(originator.problems).toEqual([]);
});
