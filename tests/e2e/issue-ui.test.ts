// Issuing as document control does it, and verification by a signed-out visitor: the controller
// issues an approved version from the sheet page and follows its progress, downloads the signed PDF
// (its pages rendered with pdftoppm and saved beside the screenshots), sees it in the register; a
// visitor with no account uploads it on the verification page, looks up its code, and is told that
// a copy with one byte changed is not authentic; once withdrawn, the stamped copy document control
// hands out is recognised as an authentic stamped copy (both its signatures valid in pdfsig).
import { execFileSync } from 'node:child_process';
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { withdrawRevision } from '../../lib/issue/withdraw';
import { checkAndApprove } from '../support/approved-sheet';
import { resetDatabase, testDb } from '../support/database';
import { actorByEmail } from '../support/people';
import {
  closeBrowser,
  openBrowser,
  SCREENSHOT_DIR,
  startApp,
  submitSignIn,
  type BrowserSession,
  type RunningApp,
} from './harness';

let app: RunningApp;
let controller: BrowserSession;
let pdfFile: string;
const artifacts = SCREENSHOT_DIR;

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  // Sheet 1 of the demo project through check and approval (the browser test of that is check-approval-ui).
  const project = await testDb()
    .selectFrom('projects')
    .select('id')
    .where('code', '=', 'TPT2')
    .executeTakeFirstOrThrow();
  const sheet = await testDb()
    .selectFrom('sheets')
    .select(['id', 'project_id', 'number', 'title'])
    .where('project_id', '=', project.id)
    .where('number', '=', 1)
    .executeTakeFirstOrThrow();
  const [originator, checker, approver] = await Promise.all(
    ['originator', 'checker', 'approver'].map((r) => actorByEmail(testDb(), `${r}@demo.test`)),
  );
  // Version 2 holds the demo content (version 1 is the new sheet).
  await checkAndApprove(testDb(), { author: originator, checker, approver }, sheet, {
    versionNumber: 2,
    password: DEMO_PASSWORD,
    verificationMethod: 'alternate_calculation',
  });
  app = await startApp();
  controller = await openBrowser();
  await submitSignIn(controller.page, app.baseUrl, 'controller@demo.test', DEMO_PASSWORD);
  await controller.page.waitForURL(`${app.baseUrl}/projects`);
});

afterAll(async () => {
  await controller?.close();
  await closeBrowser();
  await app?.stop();
});

it('the controller issues revision A, follows the progress and downloads the signed PDF', async () => {
  const { page } = controller;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/1`);
  await page.getByRole('heading', { level: 2, name: 'Issue a revision' }).waitFor();
  await page.getByLabel('Your password (signs as issued)').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Issue as revision A' }).click();
  await page.getByRole('status').filter({ hasText: 'Issued.' }).waitFor({ timeout: 90_000 });
  await controller.screenshot('issue-done');
  const [download] = await Promise.all([
    page.waitForEvent('download'),
    page.getByRole('link', { name: 'Download the signed PDF' }).click(),
  ]);
  pdfFile = path.join(artifacts, 'issued-TPT2-CALC-0001-rev-A.pdf');
  await download.saveAs(pdfFile);
  expect(download.suggestedFilename()).toBe('TPT2-CALC-0001-rev-A.pdf');
  const sig = execFileSync('pdfsig', [pdfFile], { encoding: 'utf8' });
  expect(sig).toContain('Signature Validation: Signature is Valid.');
  expect(sig).toContain('Total document signed');
  // Every page as a picture, for a person to look at.
  execFileSync('pdftoppm', ['-r', '70', '-png', pdfFile, path.join(artifacts, 'issued-pdf-page')]);
  const pages = readdirSync(artifacts).filter((f) => f.startsWith('issued-pdf-page') && f.endsWith('.png'));
  expect(pages.length).toBeGreaterThanOrEqual(1);

  await page.goto(`${app.baseUrl}/projects/TPT2/register`);
  const row = page
    .getByRole('table', { name: 'Issued revisions of TPT2' })
    .getByRole('row')
    .filter({ hasText: 'TPT2-CALC-0001' });
  await row.getByText('current').waitFor();
  await controller.screenshot('register');
  expect(controller.problems).toEqual([]);
});

it('a signed-out visitor verifies the PDF and its code, and is told a changed copy is not authentic', async () => {
  const visitor = await openBrowser();
  try {
    const { page } = visitor;
    await page.goto(`${app.baseUrl}/verify`);
    await page.getByLabel('The PDF you were given').setInputFiles(pdfFile);
    await page.getByRole('button', { name: 'Check the file' }).click();
    await page.getByRole('heading', { name: 'Authentic and current' }).waitFor();
    await page
      .getByText(/Authentic: this is TPT2-CALC-0001 revision A, issued \d{4}-\d\d-\d\d\. It is the current revision\./)
      .waitFor();
    await visitor.screenshot('verify-authentic');

    const code = /Verification code\s+([0-9A-Z]{4}-[0-9A-Z]{4}-[0-9A-Z]{4})/.exec(
      execFileSync('pdftotext', ['-layout', pdfFile, '-'], { encoding: 'utf8' }),
    )![1];
    await page.getByLabel('Verification code (printed on every issued PDF)').fill(code.toLowerCase());
    await page.getByRole('button', { name: 'Look it up' }).click();
    await page.getByText(`${code} is TPT2-CALC-0001 revision A`).waitFor();

    const changed = Buffer.from(readFileSync(pdfFile));
    changed[Math.floor(changed.length / 4)] ^= 0x01;
    const changedFile = path.join(artifacts, 'issued-changed.pdf');
    writeFileSync(changedFile, changed);
    await page.getByLabel('The PDF you were given').setInputFiles(changedFile);
    await page.getByRole('button', { name: 'Check the file' }).click();
    await page.getByRole('heading', { name: 'Not an authentic issued revision' }).waitFor();
    await visitor.screenshot('verify-changed');
    const sig = execFileSync('pdfsig', [changedFile], { encoding: 'utf8' });
    expect(sig).not.toContain('Signature is Valid.');
    expect(visitor.problems).toEqual([]);
  } finally {
    await visitor.close();
  }
});

it('a withdrawn revision downloads as a stamped copy that pdfsig and the verification page accept as a stamped copy', async () => {
  const revision = await testDb()
    .selectFrom('revisions')
    .select('id')
    .where('code', '=', 'A')
    .orderBy('issued_at', 'desc')
    .executeTakeFirstOrThrow();
  await withdrawRevision(
    testDb(),
    await actorByEmail(testDb(), 'controller@demo.test'),
    revision.id,
    'Field map revised by the magnet supplier.',
  );
  const response = await controller.page.request.get(`${app.baseUrl}/api/revisions/${revision.id}/pdf`);
  expect(response.status()).toBe(200);
  const stampedFile = path.join(artifacts, 'issued-TPT2-CALC-0001-rev-A-withdrawn.pdf');
  const stamped = Buffer.from(await response.body());
  writeFileSync(stampedFile, stamped);
  // The issued file is the copy's exact prefix; pdfsig (poppler-utils) finds two signatures, both valid.
  const original = readFileSync(pdfFile);
  expect(Buffer.compare(stamped.subarray(0, original.length), original)).toBe(0);
  const sig = execFileSync('pdfsig', [stampedFile], { encoding: 'utf8' });
  expect(sig.match(/Signature Validation: Signature is Valid\./g)).toHaveLength(2);
  execFileSync('pdftoppm', [
    '-r',
    '70',
    '-png',
    '-f',
    '1',
    '-l',
    '1',
    stampedFile,
    path.join(artifacts, 'stamped-withdrawn-page'),
  ]);

  const visitor = await openBrowser();
  try {
    const { page } = visitor;
    await page.goto(`${app.baseUrl}/verify`);
    await page.getByLabel('The PDF you were given').setInputFiles(stampedFile);
    await page.getByRole('button', { name: 'Check the file' }).click();
    await page.getByRole('heading', { name: 'Authentic stamped copy of revision A, withdrawn' }).waitFor();
    await page
      .getByText(
        /^Authentic stamped copy: this is TPT2-CALC-0001 revision A .*It is withdrawn \(Field map revised by the magnet supplier\.\): do not use it\.$/,
      )
      .waitFor();
    await page.getByText(/This is a stamped copy made for reading/).waitFor();
    await visitor.screenshot('verify-stamped-copy');
    expect(visitor.problems).toEqual([]);
  } finally {
    await visitor.close();
  }
});
