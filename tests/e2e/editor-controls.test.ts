// The sheet editor's own controls (issue 21): Ctrl+S (⌘S) saves as the Save button does; a draft
// kept in the browser is offered back only when it differs from the saved version, and can be
// discarded; deleting a cell asks nothing and can be undone in place; "Insert below…" and each cell's
// actions menu (arrows, Escape) keep the focus on the cell inserted or moved; a cell's errors describe
// its editor and are announced once, politely. Screenshots at a laptop's width and a phone's. Each
// test may take long on a shared machine (the first evaluation warms the server's workers).
import { afterAll, beforeAll, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { resetDatabase, testDb } from '../support/database';
import { closeBrowser, openSignedIn, startApp, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;
let originator: BrowserSession;

// Sheet 3 of the demo: a note (cell 1) then a calculation of four lines (cell 2); version 2 is its latest.
const EDIT = '/projects/TPT2/sheets/3/edit';
const NOTE = 'At 60 kV the classical formula is already a few per cent off; the relativistic one is used.';

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
  await session.page.setViewportSize({ width: 1280, height: 860 });
  await session.screenshot(`${name}-laptop`);
}

/** Opens the editor and waits until it shows the sheet's results (the kept draft, if any, is read by then). */
async function openEditor(page: Page): Promise<void> {
  await page.goto(`${app.baseUrl}${EDIT}`);
  await page.getByRole('heading', { level: 1, name: /^Edit:/ }).waitFor();
  await page.getByRole('article', { name: 'Cell 2 (calculation)' }).locator('.katex').first().waitFor();
}

/** Opens the editor with no draft kept from an earlier test. */
async function openEditorAfresh(page: Page): Promise<void> {
  await page.goto(`${app.baseUrl}${EDIT}`);
  await page.evaluate(() => {
    for (const key of Object.keys(localStorage)) if (key.startsWith('worldsheet:draft:')) localStorage.removeItem(key);
  });
  await openEditor(page);
}

const versionNumbers = async () => {
  const project = await testDb()
    .selectFrom('projects')
    .select('id')
    .where('code', '=', 'TPT2')
    .executeTakeFirstOrThrow();
  const sheet = await testDb()
    .selectFrom('sheets')
    .select('id')
    .where('project_id', '=', project.id)
    .where('number', '=', 3)
    .executeTakeFirstOrThrow();
  const rows = await testDb()
    .selectFrom('versions')
    .select('number')
    .where('sheet_id', '=', sheet.id)
    .orderBy('number')
    .execute();
  return rows.map((r) => r.number);
};

const keptDrafts = (page: Page) =>
  page.evaluate(() => Object.keys(localStorage).filter((k) => k.startsWith('worldsheet:draft:')));

/** The accessible name of the cell (article) holding the focus, or null. */
const focusedCell = (page: Page) =>
  page.evaluate(() => document.activeElement?.closest('article')?.getAttribute('aria-label') ?? null);

it('saves with Ctrl+S, asks for a summary first with ⌘S, and restores nothing after a clean save', async () => {
  const { page } = originator;
  await openEditor(page);
  expect(await page.getByText('Unsaved edits from this browser were restored').count()).toBe(0);
  // Whether the browser's own "save page" was prevented, as seen after the editor's handler.
  await page.evaluate(() =>
    window.addEventListener('keydown', (e) => {
      if (e.key.toLowerCase() === 's') document.body.dataset.savePrevented = String(e.defaultPrevented);
    }),
  );
  const source = page.getByLabel('Cell 2 (calculation) source');
  await source.click();
  await page.keyboard.press('Control+End');
  await page.keyboard.press('Enter');
  await page.keyboard.type('T_e = 60 keV');

  // ⌘S without a summary of the change: nothing is saved; the summary field is asked for.
  await page.keyboard.press('Meta+s');
  await page.getByRole('alert').filter({ hasText: 'Say what changed, then save.' }).waitFor();
  expect(await page.evaluate(() => document.activeElement?.id)).toBe('ed-message');
  expect(await page.evaluate(() => document.body.dataset.savePrevented)).toBe('true');
  expect(await versionNumbers()).toEqual([1, 2]);

  await page.getByLabel('What changed').fill('Kinetic energy named');
  await source.click();
  await page.keyboard.press('Control+s');
  await page.getByRole('status').filter({ hasText: 'Saved as version 3.' }).waitFor();
  expect(await page.evaluate(() => document.body.dataset.savePrevented)).toBe('true');
  expect(await versionNumbers()).toEqual([1, 2, 3]);
  expect(await keptDrafts(page)).toEqual([]);

  // A reload after the clean save: the editor opens on version 3 with nothing to restore.
  await openEditor(page);
  await page.getByText('Based on version 3.').waitFor();
  expect(await page.getByText('Unsaved edits from this browser were restored').count()).toBe(0);
  expect(await keptDrafts(page)).toEqual([]);
  expect(originator.problems).toEqual([]);
}, 120_000);

it('offers an unsaved edit back after a reload, and "Discard my edits" brings back the saved text', async () => {
  const { page } = originator;
  await openEditor(page);
  const note = page.getByLabel('Cell 1 (note) source');
  expect(await note.inputValue()).toBe(NOTE);
  await note.fill('A note edited but never saved.');
  await expect.poll(() => keptDrafts(page)).toHaveLength(1);

  await openEditor(page);
  const notice = page.getByRole('status').filter({ hasText: 'Unsaved edits from this browser were restored' });
  await notice.getByText('(based on version 3)').waitFor();
  expect(await note.inputValue()).toBe('A note edited but never saved.');
  await bothWidths(originator, 'editor-draft-restored');

  await notice.getByRole('button', { name: 'Discard my edits' }).click();
  expect(await note.inputValue()).toBe(NOTE);
  const discarded = page
    .getByRole('status')
    .filter({ hasText: 'Your edits were discarded: this is version 3 as saved.' });
  await discarded.waitFor();
  expect(await discarded.evaluate((el) => el === document.activeElement)).toBe(true);
  expect(await keptDrafts(page)).toEqual([]);

  await openEditor(page);
  expect(await page.getByText('Unsaved edits from this browser were restored').count()).toBe(0);
  expect(await note.inputValue()).toBe(NOTE);
  expect(originator.problems).toEqual([]);
}, 120_000);

it('deletes a cell from its actions menu without asking, and Undo puts it back in its place with its text', async () => {
  const { page } = originator;
  const dialogs: string[] = [];
  page.on('dialog', (d) => {
    dialogs.push(d.message());
    void d.dismiss();
  });
  await openEditorAfresh(page);
  const actions = page.getByRole('button', { name: 'Cell 1 actions' });
  // The menu by keyboard: Enter opens it on its first item, the arrows move, Escape closes it and
  // gives the focus back to its button.
  await actions.focus();
  await page.keyboard.press('Enter');
  const menu = page.getByRole('menu', { name: 'Cell 1 actions' });
  await menu.waitFor();
  expect(await actions.getAttribute('aria-expanded')).toBe('true');
  expect(await menu.getByRole('menuitem').allInnerTexts()).toEqual(['Move up', 'Move down', 'Delete']);
  const focusedItem = () => page.evaluate(() => document.activeElement?.textContent);
  expect(await focusedItem()).toBe('Move up');
  await page.keyboard.press('ArrowUp');
  expect(await focusedItem()).toBe('Delete');
  await page.keyboard.press('Escape');
  expect(await menu.count()).toBe(0);
  expect(await actions.evaluate((el) => el === document.activeElement)).toBe(true);
  expect(await actions.getAttribute('aria-expanded')).toBe('false');

  await page.keyboard.press('ArrowDown');
  await menu.waitFor();
  await page.keyboard.press('End');
  expect(await focusedItem()).toBe('Delete');
  await bothWidths(originator, 'editor-cell-menu');
  await page.keyboard.press('Enter');

  // Deleted at once; the cell below moves up; the Undo button stands in its place and has the focus.
  await page.getByRole('article', { name: 'Cell 1 (calculation)' }).waitFor();
  expect(await page.getByRole('article', { name: 'Cell 1 (note)' }).count()).toBe(0);
  const undo = page.getByRole('button', { name: 'Undo' });
  expect(await undo.evaluate((el) => el === document.activeElement)).toBe(true);
  expect(await undo.evaluate((el) => el.parentElement?.textContent)).toBe('Cell 1 deleted.Undo');
  await bothWidths(originator, 'editor-cell-deleted');
  await page.keyboard.press('Enter');

  await page.getByRole('article', { name: 'Cell 1 (note)' }).waitFor();
  expect(await page.getByLabel('Cell 1 (note) source').inputValue()).toBe(NOTE);
  await page.getByRole('article', { name: 'Cell 2 (calculation)' }).waitFor();
  expect(await page.getByRole('button', { name: 'Undo' }).count()).toBe(0);
  expect(await focusedCell(page)).toBe('Cell 1 (note)');
  expect(dialogs).toEqual([]);
  // Back as it was: nothing left to keep as a draft.
  expect(await keptDrafts(page)).toEqual([]);
  expect(originator.problems).toEqual([]);
}, 120_000);

it('inserts a calculation step below a cell with the focus in it, and keeps the focus on a moved cell', async () => {
  const { page } = originator;
  await openEditorAfresh(page);
  await page.getByRole('button', { name: 'Insert below cell 1' }).click();
  const kinds = page.getByRole('menu', { name: 'Insert below cell 1' }).getByRole('menuitem');
  expect(await kinds.allInnerTexts()).toEqual(['Calculation step', 'Note']);
  await kinds.filter({ hasText: 'Calculation step' }).click();

  // The new step is cell 2, empty, with the focus in its editor: typing goes into it.
  await page.getByRole('article', { name: 'Cell 3 (calculation)' }).waitFor();
  expect(await focusedCell(page)).toBe('Cell 2 (calculation)');
  await page.keyboard.type('L_new = 2.5 m');
  expect(await page.getByLabel('Cell 2 (calculation) source').innerText()).toContain('L_new = 2.5 m');

  // Moved up with the keyboard: it becomes cell 1 and keeps the focus (on its actions button).
  const actions = page.getByRole('button', { name: 'Cell 2 actions' });
  await actions.focus();
  await page.keyboard.press('Enter');
  expect(await page.evaluate(() => document.activeElement?.textContent)).toBe('Move up');
  await page.keyboard.press('Enter');
  await expect.poll(() => page.getByLabel('Cell 1 (calculation) source').innerText()).toContain('L_new = 2.5 m');
  expect(await focusedCell(page)).toBe('Cell 1 (calculation)');
  expect(await page.evaluate(() => document.activeElement?.getAttribute('aria-label'))).toBe('Cell 1 actions');
  expect(await page.getByLabel('Cell 2 (note) source').inputValue()).toBe(NOTE);

  // And down again, with the mouse: the focus follows it to cell 2.
  await page.getByRole('button', { name: 'Cell 1 actions' }).click();
  await page.getByRole('menu', { name: 'Cell 1 actions' }).getByRole('menuitem', { name: 'Move down' }).click();
  await expect.poll(() => page.getByLabel('Cell 2 (calculation) source').innerText()).toContain('L_new = 2.5 m');
  expect(await focusedCell(page)).toBe('Cell 2 (calculation)');
  await bothWidths(originator, 'editor-cell-inserted');
  expect(originator.problems).toEqual([]);
}, 120_000);

it("describes a cell's error on its editor and announces it once, politely, when typing pauses", async () => {
  const { page } = originator;
  await openEditorAfresh(page);
  const region = page.getByRole('status', { name: 'Errors in the cells' });
  expect(await region.getAttribute('role')).toBe('status'); // a polite live region
  expect((await region.innerText()).trim()).toBe('');
  // Every text the region takes while a faulty line is typed key by key.
  await region.evaluate((el) => {
    const seen: string[] = [];
    (window as unknown as { announced: string[] }).announced = seen;
    new MutationObserver(() => seen.push(el.textContent ?? '')).observe(el, {
      childList: true,
      characterData: true,
      subtree: true,
    });
  });
  const source = page.getByLabel(/^Cell \d \(calculation\) source$/).last();
  const cellName = await source.evaluate((el) => el.closest('article')?.getAttribute('aria-label'));
  const n = /^Cell (\d)/.exec(cellName ?? '')![1];
  await source.click();
  await page.keyboard.press('Control+End');
  await page.keyboard.press('Enter');
  await page.keyboard.type('x_bad = 2 m + 1 s', { delay: 40 });
  const message = new RegExp(`^Error: Cell ${n}, line \\d+: cannot add .*\\(a time\\)`);
  await expect.poll(() => region.innerText(), { timeout: 15_000 }).toMatch(message);
  const announced = await page.evaluate(() => (window as unknown as { announced: string[] }).announced);
  expect(new Set(announced.filter((t) => t !== '')).size).toBe(1);

  // The editor is described by the error in words; the error under the statement is not an alert.
  const describedBy = await source.getAttribute('aria-describedby');
  expect(describedBy).toBeTruthy();
  expect(await page.locator(`[id="${describedBy}"]`).textContent()).toMatch(/line \d+: cannot add .*\(a time\)/);
  const cell = page.getByRole('article', { name: cellName! });
  await cell
    .getByText(/cannot add/)
    .first()
    .waitFor();
  expect(await cell.getByRole('alert').count()).toBe(0);
  await bothWidths(originator, 'editor-cell-error');

  // Put right: the region says so, and the description goes.
  await page.keyboard.press('Shift+Home');
  await page.keyboard.press('Backspace');
  await page.keyboard.press('Backspace');
  await expect.poll(() => region.innerText(), { timeout: 15_000 }).toBe('No errors left in the cells.');
  expect(await source.getAttribute('aria-describedby')).toBeNull();
  expect(originator.problems).toEqual([]);
}, 120_000);
