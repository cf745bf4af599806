// Starting a sheet from a starter, as an originator does it: the project page offers the starter
// sheets and approved versions; choosing one fills the title; the new sheet opens as a draft that
// says where it came from, with the starter's cells evaluated and its criterion met.
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { resetDatabase, testDb } from '../support/database';
import { closeBrowser, openBrowser, startApp, submitSignIn, type RunningApp } from './harness';

let app: RunningApp;

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb(), { starters: true });
  app = await startApp();
});
afterAll(async () => {
  await closeBrowser();
  await app?.stop();
});

it('starts a new sheet from the satellite-timing starter, which records where it came from', async () => {
  const session = await openBrowser();
  const { page } = session;
  page.setDefaultTimeout(15_000);
  await submitSignIn(page, app.baseUrl, 'originator@demo.test', DEMO_PASSWORD);
  await page.waitForURL(`${app.baseUrl}/projects`);
  await page.goto(`${app.baseUrl}/projects/TPT2`);
  await page.getByText('New sheet', { exact: true }).click();
  const form = page.getByRole('form', { name: 'Start from a starter or an approved sheet' });
  const source = form.getByLabel('Start from');
  const starters = await source.locator('optgroup[label="Starter sheets"] option').allInnerTexts();
  expect(starters).toHaveLength(5);
  const timing = starters.find((t) => t.includes('satellite timing'))!;
  await source.selectOption({ label: timing });
  expect(await form.getByLabel('Title of the new sheet').inputValue()).toMatch(/^Starter — satellite timing/);
  await form.getByLabel('Title of the new sheet').fill('Clock rate offset of the Corvid spare orbit');
  await session.screenshot('start-from-form');
  await form.getByRole('button', { name: 'Start the new sheet' }).click();

  await page.getByRole('heading', { level: 1, name: 'Clock rate offset of the Corvid spare orbit' }).waitFor();
  await page.getByRole('link', { name: 'TPT2-CALC-0009 version 2' }).waitFor();
  await page.getByText(/Started from TPT2-CALC-0009 version 2 \(SHA-256 [0-9a-f]{12}…\)/).waitFor();
  await session.screenshot('start-from-created');
  const created = await testDb()
    .selectFrom('sheets')
    .select(['number', 'started_from_version_id'])
    .orderBy('number', 'desc')
    .limit(1)
    .executeTakeFirstOrThrow();
  expect(created.number).toBe(11);
  expect(created.started_from_version_id).not.toBeNull();
  expect(session.problems).toEqual([]);
}, 120_000);
