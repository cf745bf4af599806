// The engine through the built app: the API as the server bundles it (worker threads included),
// the scratch pad typeset by KaTeX, and the function reference.
import { afterAll, beforeAll, expect, it } from 'vitest';
import { createApiToken } from '../../lib/auth/api-tokens';
import { resetDatabase, testDb } from '../support/database';
import { makeUser, PASSWORD } from '../support/people';
import { closeBrowser, openBrowser, startApp, submitSignIn, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;
let session: BrowserSession;
let token: string;

beforeAll(async () => {
  await resetDatabase();
  const user = await makeUser(testDb(), 'engineer@example.test');
  token = (await createApiToken(testDb(), user, 'calc e2e')).token;
  app = await startApp();
  session = await openBrowser();
  await submitSignIn(session.page, app.baseUrl, 'engineer@example.test', PASSWORD, '/sign-in?callbackUrl=%2Fscratch');
  await session.page.waitForURL(`${app.baseUrl}/scratch`);
});

afterAll(async () => {
  await session?.close();
  await closeBrowser();
  await app?.stop();
});

it('evaluates through POST /api/evaluate in the production server', async () => {
  const response = await fetch(`${app.baseUrl}/api/evaluate`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
    body: JSON.stringify({
      cells: [
        {
          id: 'a',
          kind: 'calc',
          source: 'T_kin = 250 MeV\nBrho = magneticRigidity(momentumFromKinetic(T_kin, m_p), q_e) to T*m',
        },
      ],
    }),
  });
  expect(response.status).toBe(200);
  const body = await response.json();
  // PDG Review of Particle Physics, kinematics: p [GeV/c] = 0.299 79 B [T] ρ [m] for unit charge; for
  // 250 MeV protons pc = √(T(T + 2 m_p c²)) = 729.13 MeV (CODATA 2022 m_p c²), so Bρ = 2.4321 T m.
  expect(body.cells[0].statements[1].value.number).toBeCloseTo(2.4321, 3);
  const bad = await fetch(`${app.baseUrl}/api/evaluate`, {
    method: 'POST',
    body: '{',
    headers: { authorization: `Bearer ${token}` },
  });
  expect(bad.status).toBe(400);
  const oversized = await fetch(`${app.baseUrl}/api/evaluate`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
    body: JSON.stringify({ cells: [{ id: 'a', kind: 'calc', source: 'x'.repeat(3 * 1024 * 1024) }] }),
  });
  expect(oversized.status).toBe(413);
  const wrongShape = await fetch(`${app.baseUrl}/api/evaluate`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
    body: JSON.stringify({ cells: [{ id: 'A B', kind: 'calc', source: '1' }] }),
  });
  expect(wrongShape.status).toBe(400);
  expect((await wrongShape.json()).error.message).toBe('cells.0.id: cell ids are short lowercase tokens');
});

it('typesets the scratch pad results as the user types', async () => {
  const { page } = session;
  await page.goto(`${app.baseUrl}/scratch`);
  await page.getByRole('status').or(page.locator('.katex').first()).first().waitFor();
  await page.locator('.katex').first().waitFor();
  expect(await page.getByText('Pass').count()).toBeGreaterThan(0);
  const box = page.getByLabel('Calculation cell');
  await box.fill('x_1 = 2 m\ny_1 = x_1 + 1 s');
  await page.getByRole('alert').filter({ hasText: 'cannot add x_1 (a length, 2 m) and 1 s (a time)' }).waitFor();
  // The error also marks its line in the editor's gutter: a button named by the line and the message
  // (reachable by keyboard, read by a screen reader); activating it puts the cursor on that line.
  const marker = page.getByRole('button', {
    name: /^Line 2 error: cannot add x_1 \(a length, 2 m\) and 1 s \(a time\)/,
  });
  await marker.waitFor();
  expect(await page.locator('.cm-calc-error-marker[aria-label^="Line 1 "]').count()).toBe(0);
  await marker.focus();
  await page.keyboard.press('Enter');
  expect(await page.evaluate(() => document.activeElement?.getAttribute('aria-label'))).toBe('Calculation cell');
  await session.screenshot('scratch-pad-error');
  await box.fill('T_kin = 250 MeV\nv_1 = speedFromKinetic(T_kin, m_p)\nbeta_1 = v_1 / c\nbeta_1 < 0.7');
  await page.getByText('Pass').waitFor();
  // No error, no marker (the gutter's hidden spacer has no name).
  await page.locator('.cm-calc-error-marker[aria-label]').first().waitFor({ state: 'detached' });
  await session.screenshot('scratch-pad');
  expect(session.problems).toEqual([]);
});

it('lists every library function with its formula typeset', async () => {
  const { page } = session;
  await page.goto(`${app.baseUrl}/reference`);
  // The page streams (the root layout renders per request, for the CSP nonce): wait until React has
  // moved the streamed content out of its hidden holder before counting by role.
  await page.getByRole('table', { name: 'Built-in constants with their provenance' }).waitFor();
  for (const name of ['lorentzFactor', 'gammaMinusOne', 'momentumFromKinetic', 'clockRateOffset', 'rocketDeltaV']) {
    await expect(page.locator(`article#${name} .katex`).count()).resolves.toBeGreaterThan(0);
  }
  // m_e, m_p, m_n, m_u, m_mu, m_tau; the light nuclei name their relative atomic mass beside it.
  await expect(page.getByRole('cell', { name: 'CODATA 2022', exact: true }).count()).resolves.toBe(6);
  await expect(page.getByRole('cell', { name: /^PDG, Review of Particle Physics 2024/ }).count()).resolves.toBe(5);
  await expect(page.getByRole('cell', { name: /^AME 2020/ }).count()).resolves.toBe(4);
  await page.getByLabel('Search the functions').fill('rigidity');
  await page
    .getByRole('status')
    .filter({ hasText: /^4 of \d+ functions$/ })
    .waitFor();
  await expect(page.locator('article#magneticRigidity').count()).resolves.toBe(1);
  await expect(page.locator('article#kineticFromRigidity').count()).resolves.toBe(1);
  await expect(page.locator('article#rigidityFromKineticPerNucleon .katex').count()).resolves.toBeGreaterThan(0);
  await expect(page.locator('article#kineticPerNucleonFromRigidity').count()).resolves.toBe(1);
  await expect(page.locator('article#lorentzFactor').count()).resolves.toBe(0);
  await page.getByLabel('Search the functions').fill('');
  await session.screenshot('function-reference');
  expect(session.problems).toEqual([]);
});
