// An engineering study in the browser: the demo dipole study (inputs with uncertainties, a sweep and
// a plot) and the space-time diagram, as the originator reads them on the version page and edits
// them in the editor, with the sweep downloaded as CSV. Fails on any console error or failed request.
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { resetDatabase, testDb } from '../support/database';
import { closeBrowser, openBrowser, startApp, submitSignIn, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;
let originator: BrowserSession;

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb(), { studies: true });
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

it('shows a study sheet with its uncertainty budget, sweep table, plot and CSV', async () => {
  const { page } = originator;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/4`);
  await page
    .getByRole('heading', { name: /Dipole field study/ })
    .first()
    .waitFor();

  // The field at the highest energy, y ± U (k = 2), with its budget: two inputs, shares adding to 100 %.
  await page.getByText('(1.6214 ± 0.0052) T (k = 2)').first().waitFor();
  const budgetToggle = page.getByText('Uncertainty budget of line 7', { exact: false }).first();
  await budgetToggle.click();
  const budget = page.getByRole('region', { name: 'Uncertainty budget of line 7' });
  await budget.waitFor();
  const budgetText = await budget.innerText();
  expect(budgetText).toMatch(/T_kin/);
  expect(budgetText).toMatch(/rho/);
  await originator.screenshot('study-uncertainty-budget');

  // The sweep: ten steps from 70 MeV to 250 MeV, as a table with its caption.
  const sweep = page.getByRole('region', { name: /Sweep, line 1: 10 steps/ });
  await sweep.waitFor();
  const rows = sweep.getByRole('row');
  expect(await rows.count()).toBe(11);
  expect(await rows.nth(1).innerText()).toMatch(/^70\b/);
  expect(await rows.nth(10).innerText()).toMatch(/^250\b/);

  // The CSV at full precision: header with units, ten rows, the last rigidity equal to the sheet's own value.
  const link = page.getByRole('link', { name: /Download CSV/ }).first();
  const href = await link.getAttribute('href');
  expect(href).toMatch(/\/api\/sheets\/[0-9a-f-]{36}\/versions\/2\/studies\/2\/1$/);
  const csv = await originator.context.request.get(`${app.baseUrl}${href}`);
  expect(csv.status()).toBe(200);
  expect(csv.headers()['content-type']).toMatch(/text\/csv/);
  const lines = (await csv.text()).trim().split(/\r\n/);
  expect(lines[0]).toMatch(/^T_kin \[MeV\],beta,gamma_L,Brho \[T/);
  expect(lines).toHaveLength(11);
  expect(lines[10].split(',')[0]).toBe('250');
  // Bρ of 250 MeV protons: 2.432 13 T·m (PDG, Kinematics: pc = √(T² + 2T·mc²), Bρ = p/e).
  expect(Number(lines[10].split(',')[3])).toBeCloseTo(2.43213, 5);

  // The plot: an SVG figure with its axis labels in units, and the data behind it for those who cannot see it.
  const figure = page
    .locator('figure')
    .filter({ has: page.locator('svg') })
    .first();
  await figure.scrollIntoViewIfNeeded();
  const svgText = await figure.locator('svg').first().textContent();
  expect(svgText).toMatch(/T_kin \(MeV\)/);
  expect(svgText).toMatch(/B_dip \(T\)/);
  // The same figure as a file for a report.
  const [download] = await Promise.all([
    page.waitForEvent('download'),
    figure.getByRole('button', { name: /Download as SVG/ }).click(),
  ]);
  expect(download.suggestedFilename()).toMatch(/\.svg$/);
  const file = readFileSync((await download.path())!, 'utf8');
  expect(file.startsWith('<svg')).toBe(true);
  expect(file).toContain('xmlns="http://www.w3.org/2000/svg"');
  expect(file).toMatch(/B_dip \(T\)/);
  await originator.screenshot('study-sweep-and-plot');
  expect(originator.problems).toEqual([]);
});

it('draws the space-time diagram of hyperbolic motion (an electron in a uniform field) with its light lines and horizon', async () => {
  const { page } = originator;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/5`);
  const figure = page
    .locator('figure')
    .filter({ has: page.locator('svg') })
    .first();
  await figure.waitFor();
  await figure.scrollIntoViewIfNeeded();
  const text = await figure.locator('svg').first().textContent();
  expect(text).toMatch(/ct \(m\)/);
  expect(text).toMatch(/x \(m\)/);
  // Demo sheet 5, an electron in the uniform 1 MV/m field of a 60 kV, 60 mm gap: its horizon
  // c²/a0 = m_e c²/(eE) = 0.5110 m (CODATA 2022: m_e c² = 0.510 998 950 69 MeV), drawn as x = ct − d.
  expect(text).toMatch(/d_h: x = ct − 0\.5110 m/);
  await originator.screenshot('study-spacetime');
  expect(originator.problems).toEqual([]);
});

it('evaluates a sweep and an uncertainty live in the editor', async () => {
  const { page } = originator;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/2/edit`);
  await page.getByRole('heading', { name: /Edit: Time of flight/ }).waitFor();
  const editor = page.locator('.cm-content').first();
  await editor.click();
  await page.keyboard.press('Control+End');
  await page.keyboard.type(
    '\nT_2 = 150 MeV +/- 1 MeV\nt_2 = d_bpm / speedFromKinetic(T_2, m_p) to ns\nsweep(T_2, [70, 150, 250] MeV, t_2)',
  );
  await page.getByRole('region', { name: /Sweep, line 7: 3 steps/ }).waitFor({ timeout: 20_000 });
  // u(t) = |dt/dT|·u(T): printed as y ± U with k = 2.
  await page
    .getByText(/± 0\.\d+\) ns \(k = 2\)/)
    .first()
    .waitFor();
  await originator.screenshot('study-editor-live');
  expect(originator.problems).toEqual([]);
});
