import { existsSync, statSync } from 'node:fs';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { CAUTIONS } from '../../lib/safety/cautions';
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

it('serves the landing page with what Worldsheet does and the cautions', async () => {
  const { page } = session;
  const response = await page.goto(app.baseUrl);
  expect(response?.status()).toBe(200);
  await expect(page.title()).resolves.toBe('Worldsheet');
  const heading = await page.getByRole('heading', { level: 1 }).innerText();
  expect(heading).toMatch(/^Worldsheet is where engineers write unit-aware relativistic calculations/);
  const caution = page.getByRole('complementary', { name: 'Caution' });
  for (const text of CAUTIONS) expect(await caution.innerText()).toContain(text);
  const nav = page.getByRole('navigation', { name: 'Main' });
  // A visitor is shown only what a visitor can use: Verify (and Sign in beside the navigation).
  expect(await nav.getByRole('link').allInnerTexts()).toEqual(['Verify']);
  await page.getByRole('banner').getByRole('link', { name: 'Sign in' }).waitFor();
  const file = await session.screenshot('landing');
  expect(existsSync(file) && statSync(file).size > 10_000).toBe(true);
  expect(session.problems).toEqual([]);
});

it('lets a keyboard user skip to the content and reach the navigation', async () => {
  const { page } = session;
  await page.goto(app.baseUrl);
  await page.keyboard.press('Tab');
  expect(await page.evaluate(() => document.activeElement?.textContent)).toBe('Skip to content');
  await page.keyboard.press('Tab');
  expect(await page.evaluate(() => document.activeElement?.getAttribute('aria-label'))).toBe('Worldsheet, home');
  await page.keyboard.press('Tab');
  expect(await page.evaluate(() => document.activeElement?.textContent)).toBe('Verify');
  expect(session.problems).toEqual([]);
});

it('shows its own not-found page and reports health over HTTP', async () => {
  const { page } = session;
  const response = await page.goto(`${app.baseUrl}/no/such/page`);
  expect(response?.status()).toBe(404);
  expect(await page.getByRole('heading', { level: 1 }).innerText()).toBe('Not found');
  await session.screenshot('not-found');
  const health = await fetch(`${app.baseUrl}/api/health`);
  expect(health.status).toBe(200);
  expect(await health.json()).toMatchObject({ status: 'ok', database: { status: 'up' } });
  // The 404 of the document itself (and the browser's console line about it) is expected; nothing else.
  expect(session.problems).toHaveLength(2);
  expect(session.problems).toEqual(
    expect.arrayContaining([
      expect.stringMatching(/^console error: Failed to load resource: the server responded with a status of 404/),
      `HTTP 404: ${app.baseUrl}/no/such/page`,
    ]),
  );
});
