// The engine through the built app: the API as the server bundles it (worker threads included),
// the scratch pad typeset by KaTeX, and the function reference.
import { afterAll, beforeAll, expect, it } from 'vitest';
import { closeBrowser, openBrowser, startApp, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;
let session: BrowserSession;

beforeAll(async () => {
  app = await startApp();
  session = await openBrowser();
});

afterAll(async () => {
  await session?.close();
  await closeBrowser();
  await app?.stop();
});

it('evaluates through POST /api/evaluate in the production server', async () => {
  const response = await fetch(`${app.baseUrl}/api/evaluate`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ cells: [{ id: 'a', kind: 'calc', source: 'T_kin = 250 MeV\nBrho = magneticRigidity(momentumFromKinetic(T_kin, m_p), q_e) to T*m' }] }),
  });
  expect(response.status).toBe(200);
  const body = await response.json();
  // PDG Review of Particle Physics, kinematics: p [GeV/c] = 0.299 79 B [T] ρ [m] for unit charge; for
  // 250 MeV protons pc = √(T(T + 2 m_p c²)) = 729.13 MeV (CODATA 2022 m_p c²), so Bρ = 2.4321 T m.
  expect(body.cells[0].statements[1].value.number).toBeCloseTo(2.4321, 3);
  const bad = await fetch(`${app.baseUrl}/api/evaluate`, { method: 'POST', body: '{' });
  expect(bad.status).toBe(400);
});

it('typesets the scratch pad results as the user types', async () => {
  const { page } = session;
  await page.goto(`${app.baseUrl}/scratch`);
  await page.getByRole('status').or(page.locator('.katex').first()).first().waitFor();
  await page.locator('.katex').first().waitFor();
  expect(await page.getByText('Pass').count()).toBeGreaterThan(0);
  const box = page.getByLabel('Calculation cell');
  await box.fill('x_1 = 2 m\ny_1 = x_1 + 1 s');
  await page.getByRole('alert').filter({ hasText: 'Units do not match' }).waitFor();
  await session.screenshot('scratch-pad-error');
  await box.fill('T_kin = 250 MeV\nv_1 = speedFromKinetic(T_kin, m_p)\nbeta_1 = v_1 / c\nbeta_1 < 0.7');
  await page.getByText('Pass').waitFor();
  await session.screenshot('scratch-pad');
  expect(session.problems).toEqual([]);
});

it('lists every library function with its formula typeset', async () => {
  const { page } = session;
  await page.goto(`${app.baseUrl}/reference`);
  for (const name of ['lorentzFactor', 'gammaMinusOne', 'momentumFromKinetic', 'clockRateOffset', 'rocketDeltaV']) {
    await expect(page.locator(`article#${name} .katex`).count()).resolves.toBeGreaterThan(0);
  }
  await expect(page.getByRole('cell', { name: 'CODATA 2022' }).count()).resolves.toBe(5);
  await session.screenshot('function-reference');
  expect(session.problems).toEqual([]);
});
