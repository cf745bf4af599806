// The register and the sheet page as an originator uses them: create a sheet, find it in the
// register, read a demo sheet's recorded results and history.
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { resetDatabase, testDb } from '../support/database';
import { closeBrowser, openBrowser, startApp, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;
let session: BrowserSession;

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  app = await startApp();
  session = await openBrowser();
  const { page } = session;
  await page.goto(`${app.baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill('originator@demo.test');
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.waitForURL(`${app.baseUrl}/projects`);
});

afterAll(async () => {
  await session?.close();
  await closeBrowser();
  await app?.stop();
});

it('lists the sheets in a sortable, filterable register', async () => {
  const { page } = session;
  await page.goto(`${app.baseUrl}/projects/TPT2`);
  const rows = page.getByRole('table', { name: 'Calculation sheets of TPT2' }).getByRole('row');
  await expect(rows.count()).resolves.toBe(4);
  await page.getByLabel('Filter').fill('electron');
  await expect(rows.count()).resolves.toBe(2);
  await page.getByLabel('Filter').fill('');
  await page.getByRole('button', { name: 'Title' }).click();
  expect(await rows.nth(1).innerText()).toContain('Dipole field');
  await session.screenshot('sheet-register');
  expect(session.problems).toEqual([]);
});

it('creates a sheet numbered by the server and opens it', async () => {
  const { page } = session;
  await page.goto(`${app.baseUrl}/projects/TPT2`);
  await page.getByText('New sheet').click();
  await page.getByLabel('Title').fill('Shielding wall transmission at 250 MeV');
  await page.getByLabel('Objective').fill('Dose rate behind the gantry wall (demo).');
  await page.getByLabel(/Safety-related/).check();
  await page.getByRole('button', { name: 'Create the sheet' }).click();
  await page.waitForURL(`${app.baseUrl}/projects/TPT2/sheets/4`);
  await page.getByRole('heading', { level: 1, name: 'Shielding wall transmission at 250 MeV' }).waitFor();
  await page.getByRole('note').filter({ hasText: 'Safety-related calculation' }).waitFor();
  expect(await page.getByText('TPT2-CALC-0004').count()).toBe(1);
  expect(session.problems).toEqual([]);
});

it('shows a demo sheet with its record, recorded results, criterion and history', async () => {
  const { page } = session;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/1`);
  await page.getByRole('heading', { level: 2, name: 'Calculation record' }).waitFor();
  await page.locator('.katex').first().waitFor();
  expect(await page.getByText('Pass', { exact: true }).count()).toBe(1);
  expect(await page.getByText(/2\.432\s?13 T·m/).count()).toBeGreaterThan(0);
  await page.getByRole('link', { name: 'Version 1' }).waitFor();
  await session.screenshot('sheet-view');
  expect(session.problems).toEqual([]);
});
