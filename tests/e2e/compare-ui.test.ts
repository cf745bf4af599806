// The comparison shows everything, as the originator and the checker use it: any two versions picked
// on the sheet's history and on the compare page (a GET form with two labelled selects), the
// calculation record (conclusions, a design input's source revision, the significant figures) and the
// attachments (an added CSV with its size and SHA-256; a replaced one with its row/column diff) beside
// the cells; and a re-check after a return opens with the changes since the version the checker returned.
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { uploadAttachment } from '../../lib/attachments/attachments';
import { decide } from '../../lib/checks/decide';
import { submitForCheck } from '../../lib/checks/submit';
import { getVersion, saveVersion } from '../../lib/sheets/sheets';
import type { VersionContent } from '../../lib/sheets/content';
import { getObjectStore } from '../../lib/storage/object-store';
import { resetDatabase, testDb } from '../support/database';
import { actorByEmail } from '../support/people';
import { type BrowserSession, closeBrowser, openSignedIn, type RunningApp, startApp } from './harness';

let app: RunningApp;
let originator: BrowserSession;
let checker: BrowserSession;
let recheckId: string;
// Invented demo data: a field scan, then re-measured (the 250 MeV point corrected, a 300 MeV point added).
const scan1 = 'energy [MeV], field [T]\n70, 0.51\n250, 1.21\n';
const scan2 = 'energy [MeV], field [T]\n70, 0.51\n250, 1.23\n300, 1.36\n';
const sha = (t: string) => createHash('sha256').update(t).digest('hex');

const signedIn = (email: string): Promise<BrowserSession> => openSignedIn(app.baseUrl, email, DEMO_PASSWORD);

beforeAll(async () => {
  await resetDatabase();
  const db = testDb();
  await seedDemo(db);
  const project = await db.selectFrom('projects').select('id').where('code', '=', 'TPT2').executeTakeFirstOrThrow();
  const sheet = await db
    .selectFrom('sheets')
    .select(['id', 'project_id', 'number', 'title'])
    .where('project_id', '=', project.id)
    .where('number', '=', 1)
    .executeTakeFirstOrThrow();
  const author = await actorByEmail(db, 'originator@demo.test');
  const checkerActor = await actorByEmail(db, 'checker@demo.test');
  // The demo content is version 2 (version 1 is the new sheet).
  const v1 = (await getVersion(db, sheet.id))!;
  expect(v1.number).toBe(2);
  const store = getObjectStore();
  const file = (name: string, text: string) => ({ name, type: 'text/csv', bytes: new TextEncoder().encode(text) });
  const ref = (text: string) => ({
    name: 'field scan.csv',
    mediaType: 'text/csv',
    size: text.length,
    sha256: sha(text),
  });
  await uploadAttachment(db, store, author, sheet, file('field scan.csv', scan1));
  // Version 3: conclusions written, the rated field's datasheet now at revision B, the scan attached, 4 significant figures.
  const c2: VersionContent = {
    ...v1.content,
    significantFigures: 4,
    record: {
      ...v1.content.record,
      conclusions: 'The dipole reaches the field of the highest treatment energy with margin.',
      inputs: v1.content.record.inputs.map((i) =>
        i.name === 'Dipole rated field' ? { ...i, sourceRevision: 'B' } : i,
      ),
    },
    attachments: [ref(scan1)],
  };
  await saveVersion(db, author, sheet, {
    parentNumber: 2,
    message: 'Conclusions, datasheet revision B, field scan',
    content: c2,
  });
  // Version 4: a cell edited only.
  const c3: VersionContent = {
    ...c2,
    cells: c2.cells.map((c) =>
      c.id === 'rigidity'
        ? { ...c, source: c.source.replace('# dipole bending radius', '# dipole bending radius, magnet drawing D-12') }
        : c,
    ),
  };
  await saveVersion(db, author, sheet, { parentNumber: 3, message: 'Radius source cited', content: c3 });
  // The checker returns version 4; version 5 replaces the scan and is submitted again.
  const first = await submitForCheck(db, author, sheet, {
    versionNumber: 4,
    checkerId: checkerActor.userId,
    password: DEMO_PASSWORD,
  });
  await decide(db, checkerActor, first.id, {
    action: 'return',
    reason: 'The 250 MeV point of the scan looks low; re-measure it.',
  });
  await uploadAttachment(db, store, author, sheet, file('field scan.csv', scan2));
  await saveVersion(db, author, sheet, {
    parentNumber: 4,
    message: 'Scan re-measured',
    content: { ...c3, attachments: [ref(scan2)] },
  });
  recheckId = (
    await submitForCheck(db, author, sheet, {
      versionNumber: 5,
      checkerId: checkerActor.userId,
      password: DEMO_PASSWORD,
    })
  ).id;
  app = await startApp();
  originator = await signedIn('originator@demo.test');
  checker = await signedIn('checker@demo.test');
}, 600_000);

afterAll(async () => {
  await Promise.all([originator?.close(), checker?.close()]);
  await closeBrowser();
  await app?.stop();
});

it('picks two versions that are not neighbours and sees the record and the attachments, not only the cells', async () => {
  const page = originator.page;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/1`);
  const history = page.getByRole('form', { name: 'Compare two versions' });
  await history.getByLabel('Base version').selectOption('2');
  await history.getByLabel('Target version').selectOption('4');
  await originator.screenshot('compare-picker-history');
  await history.getByRole('button', { name: 'Compare' }).click();
  await page.waitForURL(/\/compare\?base=2&target=4$/);
  await page.getByRole('heading', { name: 'Version 2 → version 4' }).waitFor();

  const record = page.getByRole('region', { name: 'Calculation record and attachments: changes since version 2' });
  await record.getByText('Conclusions', { exact: true }).waitFor();
  await record.getByText('The dipole reaches the field of the highest treatment energy with margin.').waitFor();
  await record.getByText('Significant figures', { exact: true }).waitFor();
  const inputs = record.getByRole('definition').filter({ hasText: 'Dipole rated field' });
  // Old → new: the datasheet's revision A, then B.
  expect(await inputs.innerText()).toMatch(
    /Dipole rated field: 1\.8 T — Dipole magnet datasheet \(demo\), revision A → Dipole rated field: 1\.8 T — Dipole magnet datasheet \(demo\), revision B/,
  );
  const added = record.getByRole('listitem', { name: 'Attachment field scan.csv, added' });
  await added.getByText(`SHA-256 ${sha(scan1)}`).waitFor();
  await added.getByText(`${scan1.length} bytes`).waitFor();
  await added.getByText('Data table: — → 2 rows.').waitFor();
  // And the cell that changed, as before.
  await page.getByRole('article', { name: 'Cell rigidity, changed' }).waitFor();
  await originator.screenshot('compare-record-1-3');

  // On the compare page, another pair: 3 → 5, the scan replaced.
  const picker = page.getByRole('form', { name: 'Compare two versions' });
  expect(await picker.getByLabel('Base version').inputValue()).toBe('2');
  expect(await picker.getByLabel('Target version').inputValue()).toBe('4');
  await picker.getByLabel('Base version').selectOption('3');
  await picker.getByLabel('Target version').selectOption('5');
  await picker.getByRole('button', { name: 'Compare' }).click();
  await page.waitForURL(/\/compare\?base=3&target=5$/);
  await page.getByRole('heading', { name: 'Version 3 → version 5' }).waitFor();
  const replaced = page.getByRole('listitem', { name: 'Attachment field scan.csv, replaced' });
  await replaced.getByText(`SHA-256 ${sha(scan1)}`).waitFor();
  await replaced.getByText(`SHA-256 ${sha(scan2)}`).waitFor();
  await replaced.getByText('Rows 1 added, 0 removed, 1 changed.').waitFor();
  const rows = replaced.getByRole('table', { name: 'Rows of field scan.csv that changed' });
  const changedRow = rows.getByRole('row').filter({ has: page.getByRole('rowheader', { name: '2 → 2' }) });
  expect(await changedRow.getByRole('deletion').innerText()).toBe('1.21');
  expect(await changedRow.getByRole('insertion').innerText()).toBe('1.23');
  await rows
    .getByRole('row')
    .filter({ has: page.getByRole('rowheader', { name: '— → 3' }) })
    .getByText('added')
    .waitFor();
  await originator.screenshot('compare-attachments-2-4');
  expect(originator.problems).toEqual([]);
}, 300_000);

it('opens a re-check after a return with the changes since the version the checker returned', async () => {
  const page = checker.page;
  await page.goto(`${app.baseUrl}/checks/${recheckId}`);
  const since = page.getByRole('region', { name: 'Changes since version 4, the version you returned' });
  await since.waitFor();
  await since
    .getByRole('listitem', { name: 'Attachment field scan.csv, replaced' })
    .getByText('Rows 1 added, 0 removed, 1 changed.')
    .waitFor();
  await since.getByText('No cell changed since version 4.').waitFor();
  // It comes first; the changes since the last approved version (none yet: the whole sheet) follow.
  const headings = await page.getByRole('main').getByRole('heading', { level: 2 }).allInnerTexts();
  const sinceReturn = headings.indexOf('Changes since version 4, the version you returned');
  expect(sinceReturn).toBeGreaterThanOrEqual(0);
  expect(headings[sinceReturn + 1]).toBe('Since the last approved version: none is approved yet, so every cell is new');
  expect(headings.slice(0, sinceReturn).some((h) => /cell|change|record/i.test(h))).toBe(false);
  expect(headings).not.toContain('Cells (first check: every cell is new)');
  await page.getByText('Version 5, re-check after the return of version 4; no version is approved yet').waitFor();
  await checker.screenshot('compare-recheck-since-return');
  expect(checker.problems).toEqual([]);
}, 300_000);
