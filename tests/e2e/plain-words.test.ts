// The words on the screens, as a practitioner reads them: the audit trail as sentences linking to
// their sheets (the stored event behind a disclosure); a comparison naming what happened to results;
// a verification page without a real-looking code; design inputs that keep their labels once filled;
// a new assumption with neither answer preset; sheet codes on one line; a member told what a page
// needs. Screenshots at a laptop's width and a phone's.
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { resetDatabase, testDb } from '../support/database';
import { closeBrowser, openSignedIn, startApp, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;
let originator: BrowserSession;

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  app = await startApp();
  originator = await openSignedIn(app.baseUrl, 'originator@demo.test', DEMO_PASSWORD);
}, 600_000);

afterAll(async () => {
  await originator?.close();
  await closeBrowser();
  await app?.stop();
});

/** A screenshot at 1280 px and at 390 px wide. */
async function bothWidths(session: BrowserSession, name: string): Promise<void> {
  await session.page.setViewportSize({ width: 390, height: 844 });
  await session.screenshot(`${name}-phone`);
  expect(
    await session.page.evaluate(() => document.documentElement.scrollWidth),
    `${name} on a phone`,
  ).toBeLessThanOrEqual(390);
  await session.page.setViewportSize({ width: 1280, height: 860 });
  await session.screenshot(`${name}-laptop`);
}

it('reads the audit trail as sentences that link to their sheets, with the stored event behind a disclosure', async () => {
  const { page } = originator;
  await page.goto(`${app.baseUrl}/projects/TPT2/audit`);
  const created = page.getByRole('row').filter({ hasText: /created TPT2-CALC-0001 “Dipole field/ });
  await created.first().waitFor();
  await created.first().getByRole('link', { name: 'Open TPT2-CALC-0001' }).waitFor();
  // The stored event: hidden until asked for, then its action and values as recorded.
  const disclosure = created.first().locator('details');
  expect(await disclosure.locator('pre').first().isVisible()).toBe(false);
  await disclosure.locator('summary').click();
  expect(await disclosure.innerText()).toContain('sheet.create');
  expect(await disclosure.innerText()).toContain('"number": "TPT2-CALC-0001"');
  expect(
    await page
      .getByRole('row')
      .filter({ hasText: /gave Demo Checker the checker role/ })
      .count(),
  ).toBe(1);
  await bothWidths(originator, 'words-audit-trail');
  expect(originator.problems).toEqual([]);
});

it('names what happened to results in a comparison, and keeps sheet codes on one line', async () => {
  const { page } = originator;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/2/compare?base=1&target=2`);
  const summary = page.locator('header p').filter({ hasText: 'Cells:' });
  await summary.waitFor();
  const text = await summary.innerText();
  expect(text).not.toMatch(/Results changed: 0/);
  expect(text).toMatch(/Results: \d+ (changed|added|removed)|No result changed/);
  await page.goto(`${app.baseUrl}/projects/TPT2`);
  const code = page.getByRole('link', { name: 'TPT2-CALC-0001' });
  await page.setViewportSize({ width: 390, height: 844 });
  const box = await code.boundingBox();
  const line = await code.evaluate((el) => parseFloat(getComputedStyle(el).lineHeight));
  expect(box!.height).toBeLessThan(line * 1.5);
  await page.setViewportSize({ width: 1280, height: 860 });
  await bothWidths(originator, 'words-sheet-list');
});

it('keeps the labels of design inputs once filled, and presets neither answer for a new assumption', async () => {
  const { page } = originator;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/3/edit`);
  await page.getByRole('heading', { level: 1, name: /^Edit:/ }).waitFor();
  await page.getByRole('button', { name: 'Add a design input' }).click();
  const inputs = page.getByRole('group', { name: 'Design inputs' });
  const name = inputs.getByLabel(/^Input \d+ name$/).last();
  await name.fill('Gun voltage');
  // The label is text on the screen, not a placeholder that goes once the field is filled.
  const row = name.locator('xpath=ancestor::div[contains(@class, "grid")][1]');
  for (const label of ['Name', 'Value (with unit)', 'Source', 'Source revision'])
    expect(await row.getByText(label, { exact: true }).isVisible()).toBe(true);
  expect(await name.getAttribute('placeholder')).toBeNull();
  await page.getByRole('button', { name: 'Add an assumption' }).click();
  const choice = page.getByRole('group', { name: /^Assumption \d+: verified\?$/ }).last();
  expect(await choice.getByRole('radio', { checked: true }).count()).toBe(0);
  await choice.getByText('choose one before saving').waitFor();
  await bothWidths(originator, 'words-record-lists');
});

it('verifies without a real-looking example code, and tells a viewer what a page needs', async () => {
  const { page } = originator;
  await page.goto(`${app.baseUrl}/verify`);
  const field = page.getByLabel(/^Verification code/);
  expect(await field.getAttribute('placeholder')).toBeNull();
  await page.getByText(/Three groups of four letters and digits/).waitFor();
  await bothWidths(originator, 'words-verify');
  const viewer = await openSignedIn(app.baseUrl, 'viewer@demo.test', DEMO_PASSWORD);
  try {
    await viewer.page.goto(`${app.baseUrl}/projects/TPT2/sheets/1/edit`);
    await viewer.page.waitForURL(`${app.baseUrl}/projects/TPT2?notAllowed=edit`);
    const notice = viewer.page.getByRole('status').filter({ hasText: 'Editing a sheet needs the originator role.' });
    await notice.waitFor();
    expect(await notice.innerText()).toContain('Your roles in TPT2: Viewer.');
    await bothWidths(viewer, 'words-not-allowed');
  } finally {
    await viewer.close();
  }
});
