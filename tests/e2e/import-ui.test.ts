// Importing a sheet file, as an originator does it: choosing the file creates nothing; the page shows
// what the file holds (cells, where it came from, each attachment with whether its bytes matched
// their SHA-256) and asks for the title; confirming creates the sheet with its attachment. A file
// whose carried bytes were altered is refused with the attachment named, and nothing is created.
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { resetDatabase, testDb } from '../support/database';
import { closeBrowser, openBrowser, startApp, submitSignIn, type RunningApp } from './harness';

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

const CSV = 'energy [MeV], field [T]\n70, 0.4\n150, 0.9\n250, 1.3\n';
const sheetFile = (csvBytes: string) => ({
  title: 'Rigidity over the energy scan',
  cells: [{ id: 'c1', kind: 'calc', source: 'E_top = max(energy_scan.energy)' }],
  attachments: [
    {
      name: 'energy-scan.csv',
      mediaType: 'text/csv',
      size: CSV.length,
      sha256: createHash('sha256').update(CSV).digest('hex'),
      contentBase64: Buffer.from(csvBytes).toString('base64'),
    },
  ],
});

it('asks for confirmation and a title before creating anything, and brings the carried attachment back', async () => {
  const session = await openBrowser();
  const { page } = session;
  page.setDefaultTimeout(15_000);
  await submitSignIn(page, app.baseUrl, 'originator@demo.test', DEMO_PASSWORD);
  await page.waitForURL(`${app.baseUrl}/projects`);
  const sheetsBefore = (await testDb().selectFrom('sheets').select('id').execute()).length;

  await page.goto(`${app.baseUrl}/projects/TPT2`);
  await page.getByText('New sheet', { exact: true }).click();
  // An altered file: refused at once, the attachment named.
  await page.getByLabel('Import a sheet file (JSON)').setInputFiles({
    name: 'altered.json',
    mimeType: 'application/json',
    buffer: Buffer.from(JSON.stringify(sheetFile(CSV.replace('250', '260')))),
  });
  await page
    .getByRole('alert')
    .getByText(/energy-scan\.csv in the file does not match its record/)
    .waitFor();
  await session.screenshot('import-refused');

  await page.getByLabel('Import a sheet file (JSON)').setInputFiles({
    name: 'scan.json',
    mimeType: 'application/json',
    buffer: Buffer.from(JSON.stringify(sheetFile(CSV))),
  });
  const confirm = page.getByRole('form', { name: 'Confirm the import' });
  await confirm.waitFor();
  await confirm.getByText('1 calculation cell and 0 text cells', { exact: false }).waitFor();
  await confirm.getByText('The file does not say which sheet it was exported from.').waitFor();
  const row = confirm
    .getByRole('table', { name: 'Attachments in the file' })
    .getByRole('row')
    .filter({ hasText: 'energy-scan.csv' });
  expect(await row.innerText()).toMatch(/yes: bytes match the SHA-256/);
  // Nothing is created until the originator confirms.
  expect((await testDb().selectFrom('sheets').select('id').execute()).length).toBe(sheetsBefore);
  const title = confirm.getByLabel('Title of the new sheet');
  expect(await title.inputValue()).toBe('Rigidity over the energy scan');
  await title.fill('Rigidity over the energy scan, beam line 2');
  await session.screenshot('import-confirm');
  await confirm.getByRole('button', { name: 'Create the sheet from this file' }).click();

  await page.getByRole('heading', { level: 1, name: 'Rigidity over the energy scan, beam line 2' }).waitFor();
  await page
    .getByRole('table', { name: 'Attachments cited by this version' })
    .getByRole('link', { name: 'energy-scan.csv' })
    .waitFor();
  await session.screenshot('import-created');
  expect((await testDb().selectFrom('sheets').select('id').execute()).length).toBe(sheetsBefore + 1);
  // The one refused preview (400) is the only problem the page saw.
  expect(session.problems).toEqual([
    expect.stringMatching(/^HTTP 400: .*\/sheets\/import\/preview$/),
    expect.stringMatching(/status of 400 \(Bad Request\)/),
  ]);
}, 120_000);
