// The register and the sheet page as an originator uses them: create a sheet, find it in the
// register, read a demo sheet's recorded results and history.
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { resetDatabase, testDb } from '../support/database';
import { closeBrowser, openBrowser, startApp, submitSignIn, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;
let session: BrowserSession;

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  app = await startApp();
  session = await openBrowser();
  await submitSignIn(session.page, app.baseUrl, 'originator@demo.test', DEMO_PASSWORD);
  await session.page.waitForURL(`${app.baseUrl}/projects`);
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
  await rows.filter({ hasText: 'TPT2-CALC-0003' }).waitFor();
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
  await page.getByLabel('Title', { exact: true }).fill('Shielding wall transmission at 250 MeV');
  await page.getByLabel('Objective').fill('Dose rate behind the gantry wall (demo).');
  await page.getByLabel(/Safety-related/).check();
  await page.getByRole('button', { name: 'Create the sheet' }).click();
  await page.waitForURL(`${app.baseUrl}/projects/TPT2/sheets/4`);
  await page.getByRole('heading', { level: 1, name: 'Shielding wall transmission at 250 MeV' }).waitFor();
  await page.getByRole('note').filter({ hasText: 'Safety-related calculation' }).waitFor();
  expect(await page.getByText(/\/ TPT2-CALC-0004$/).count()).toBe(1);
  expect(session.problems).toEqual([]);
});

it('shows a demo sheet with its record, recorded results, criterion and history', async () => {
  const { page } = session;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/1`);
  await page.getByRole('heading', { level: 2, name: 'Calculation record' }).waitFor();
  await page.locator('.katex').first().waitFor();
  expect(await page.getByText('Pass', { exact: true }).count()).toBe(1);
  expect(await page.getByText(/2\.432\s?13 T·m/).count()).toBeGreaterThan(0);
  await page.getByRole('link', { name: 'Version 1', exact: true }).waitFor();
  await session.screenshot('sheet-view');
  expect(session.problems).toEqual([]);
});

it('edits a sheet, sees typeset results as it types, saves two versions and compares them', async () => {
  const { page } = session;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/2/edit`);
  await page.getByRole('heading', { level: 1, name: /Edit: Time of flight/ }).waitFor();
  await page.getByRole('button', { name: 'Insert below cell 1' }).click();
  await page.getByRole('menuitem', { name: 'Calculation step' }).click();
  const source = page.getByLabel('Cell 2 (calculation) source');
  await source.fill('gamma_b = lorentzFactor(v_beam)\nt_proper = t_flight / gamma_b to ns\nt_proper < 100 ns');
  await page.getByRole('article', { name: 'Cell 2 (calculation)' }).getByText('Pass').waitFor();
  await page.getByRole('button', { name: 'Add an assumption' }).click();
  await page
    .getByLabel('Assumption 1', { exact: true })
    .fill('The bunch travels on the design orbit between the monitors.');
  // Neither answer is preset for a new assumption: the originator chooses.
  await page.getByRole('group', { name: 'Assumption 1: verified?' }).getByLabel('verified', { exact: true }).check();
  await page.getByRole('button', { name: 'Add a design input' }).click();
  await page.getByLabel('Input 2 name').fill('Beam kinetic energy');
  await page.getByLabel('Input 2 value').fill('150 MeV');
  await page.getByLabel('Input 2 source', { exact: true }).fill('TPT2 beam requirements specification (demo)');
  await page.getByLabel('Input 2 source revision').fill('C');
  await page.getByLabel('What changed').fill('Proper time of flight of the bunch');
  await page.getByRole('button', { name: 'Save version' }).click();
  await page.getByRole('status').filter({ hasText: 'Saved as version 3.' }).waitFor();
  await session.screenshot('sheet-editor');

  await source.fill('gamma_b = lorentzFactor(v_beam)\nt_proper = t_flight / gamma_b to ns\nt_proper < 60 ns');
  await page.getByLabel('What changed').fill('Tighter timing limit');
  await page.getByRole('button', { name: 'Save version' }).click();
  await page.getByRole('status').filter({ hasText: 'Saved as version 4.' }).waitFor();

  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/2?version=3`);
  await page.getByText('The bunch travels on the design orbit between the monitors.').waitFor();
  await page
    .getByText(/Beam kinetic energy: 150 MeV — TPT2 beam requirements specification \(demo\), revision C/)
    .waitFor();
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/2/compare?base=3&target=4`);
  await page.getByRole('heading', { level: 1, name: 'Version 3 → version 4' }).waitFor();
  expect(
    await page
      .getByRole('article', { name: /changed/ })
      .locator('del')
      .innerText(),
  ).toContain('100');
  expect(
    await page
      .getByRole('article', { name: /changed/ })
      .locator('ins')
      .innerText(),
  ).toContain('60');
  await session.screenshot('version-comparison');
  expect(session.problems).toEqual([]);
});

it('refuses a save based on a stale version, shows it, and carries the edits over', async () => {
  const { page } = session;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/3/edit`);
  await page.getByLabel('Objective').fill('Wavelength and speed of the probe electrons, edited in the browser.');
  // Meanwhile someone else saves version 3 of the same sheet.
  // A change made with the session cookie says where it comes from, as a browser's fetch does.
  const other = await session.context.request.post(`${app.baseUrl}/api/sheets/${await sheetId(3)}/versions`, {
    headers: { origin: app.baseUrl },
    data: { parentNumber: 2, message: 'Saved elsewhere', content: await latestContent(3) },
  });
  expect(other.status()).toBe(201);
  await page.getByLabel('What changed').fill('Objective reworded');
  await page.getByRole('button', { name: 'Save version' }).click();
  await page.getByRole('alert').filter({ hasText: 'Version 3 was saved since version 2' }).waitFor();
  await session.screenshot('save-conflict');
  await page.getByRole('button', { name: 'Keep my edits on top of version 3' }).click();
  await page.getByRole('button', { name: 'Save version' }).click();
  await page.getByRole('status').filter({ hasText: 'Saved as version 4.' }).waitFor();
  // The 409 the test provoked is the only HTTP error.
  expect(session.problems.filter((p) => !/409/.test(p))).toEqual([]);
});

it('uploads a CSV data table, uses its columns with units in a cell, and saves a version citing it', async () => {
  const { page } = session;
  session.problems.length = 0; // the 409 the previous test provoked
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/4/edit`);
  await page.getByRole('heading', { level: 2, name: 'Attachments' }).waitFor();
  const csv = 'energy [MeV], field [T]\n70, 0.4\n150, 0.9\n250, 1.3\n';
  await page
    .getByLabel('File to upload')
    .setInputFiles({ name: 'energy-scan.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
  await page.getByRole('button', { name: 'Upload the file', exact: true }).click();
  await page
    .getByRole('status')
    .filter({ hasText: 'energy-scan.csv uploaded' })
    .filter({ hasText: 'energy_scan.energy [MeV], energy_scan.field [T]' })
    .waitFor();
  await page
    .getByRole('table', { name: 'Attachments cited by this version' })
    .getByRole('link', { name: 'energy-scan.csv' })
    .waitFor();

  // A PNG named .pdf is refused with the reason.
  const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0]);
  await page
    .getByLabel('File to upload')
    .setInputFiles({ name: 'datasheet.pdf', mimeType: 'application/pdf', buffer: png });
  await page.getByRole('button', { name: 'Upload the file', exact: true }).click();
  await page.getByRole('alert').filter({ hasText: 'named as a PDF document but its content is a PNG image' }).waitFor();

  await page.getByRole('button', { name: 'Add to the sheet' }).click();
  await page.getByRole('menuitem', { name: 'Calculation step' }).click();
  await page
    .getByLabel('Cell 1 (calculation) source')
    .fill('p_scan = momentumFromKinetic(energy_scan.energy, m_p)\nBrho_scan = magneticRigidity(p_scan, 1) to T*m');
  // 250 MeV protons: Bρ = 2.432 13 T·m (PDG RPP "Kinematics", m_p from CODATA 2022).
  await page
    .getByRole('article', { name: 'Cell 1 (calculation)' })
    .getByText(/2\.432\s?13\]\s?T·m/)
    .waitFor();
  await session.screenshot('attachments-editor');
  await page.getByLabel('What changed').fill('Rigidity over the energy scan');
  await page.getByRole('button', { name: 'Save version' }).click();
  await page.getByRole('status').filter({ hasText: 'Saved as version 2.' }).waitFor();
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/4`);
  const cited = page.getByRole('table', { name: 'Attachments cited by this version' });
  await cited.getByRole('link', { name: 'energy-scan.csv' }).waitFor();
  const sha = (await import('node:crypto')).createHash('sha256').update(csv).digest('hex');
  await cited.getByText(sha).waitFor();
  await session.screenshot('attachments-version');
  // The refused upload (415) is the only HTTP error.
  expect(session.problems.filter((p) => !/415/.test(p))).toEqual([]);
});

it('shows bidirectional control characters as markers in the sheet and the comparison, and refuses one in a calculation (Trojan Source)', async () => {
  const { page } = session;
  session.problems.length = 0; // the 415 the previous test provoked
  const id = await sheetId(1);
  const versions = await testDb()
    .selectFrom('versions')
    .select('number')
    .where('sheet_id', '=', id)
    .orderBy('number', 'desc')
    .execute();
  const latest = versions[0].number;
  const content = (await latestContent(1)) as {
    title: string;
    cells: Array<{ id: string; kind: string; source: string }>;
  };
  const post = (body: unknown) =>
    session.context.request.post(`${app.baseUrl}/api/sheets/${id}/versions`, {
      headers: { origin: app.baseUrl },
      data: body,
    });
  // A calculation cell holding U+202E is refused by the route with 400, naming the cell and the character.
  const trojan = {
    ...content,
    cells: [...content.cells, { id: 'trojan', kind: 'calc', source: 'limit = 3 T*m # \u202e check' }],
  };
  const refused = await post({ parentNumber: latest, message: 'Trojan', content: trojan });
  expect(refused.status()).toBe(400);
  expect((await refused.json()).error.message).toBe(
    `content.cells.${content.cells.length}.source: cell ${content.cells.length + 1}: holds U+202E (RIGHT-TO-LEFT OVERRIDE) on line 1, which can make the source read differently from what is evaluated`,
  );
  // In a text cell and the title it is stored as typed, and shown as a marker.
  const noted = {
    ...content,
    title: `${content.title} \u202e`,
    cells: [...content.cells, { id: 'note', kind: 'text', source: 'The limit is \u202e3 T·m\u202c.' }],
  };
  expect((await post({ parentNumber: latest, message: 'A note', content: noted })).status()).toBe(201);
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/1`);
  await page.getByRole('heading', { level: 1 }).locator('.ws-bidi-marker').filter({ hasText: '⟦U+202E⟧' }).waitFor();
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/1/compare?base=${latest}&target=${latest + 1}`);
  const added = page.getByRole('article', { name: /note/ });
  await added.locator('.ws-bidi-marker').filter({ hasText: '⟦U+202C⟧' }).waitFor();
  expect(await added.locator('.ws-bidi-marker').allInnerTexts()).toEqual(['⟦U+202E⟧', '⟦U+202C⟧']);
  expect(await page.locator('main').innerText()).not.toMatch(/[\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/);
  await session.screenshot('bidi-markers-comparison');
  // The 400 the test provoked is the only HTTP error.
  expect(session.problems.filter((p) => !/400/.test(p))).toEqual([]);
});

async function sheetId(number: number): Promise<string> {
  const project = await testDb()
    .selectFrom('projects')
    .select('id')
    .where('code', '=', 'TPT2')
    .executeTakeFirstOrThrow();
  return (
    await testDb()
      .selectFrom('sheets')
      .select('id')
      .where('project_id', '=', project.id)
      .where('number', '=', number)
      .executeTakeFirstOrThrow()
  ).id;
}

async function latestContent(number: number): Promise<unknown> {
  const id = await sheetId(number);
  return (
    await testDb()
      .selectFrom('versions')
      .select('content')
      .where('sheet_id', '=', id)
      .orderBy('number', 'desc')
      .limit(1)
      .executeTakeFirstOrThrow()
  ).content;
}
