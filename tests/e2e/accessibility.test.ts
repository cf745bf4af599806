// Every page of each role's journey, signed out and signed in, at a laptop's width (1280 px) and a
// phone's (390 px): axe-core (WCAG 2.2 A and AA rules and axe's best practices) finds no serious or
// critical violation; no page scrolls sideways on the phone; the header takes one line there (its
// navigation folded behind one "Menu" button). Screenshots of each page at both widths are saved.
import axe from 'axe-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { resetDatabase, testDb } from '../support/database';
import { closeBrowser, openBrowser, startApp, submitSignIn, type BrowserSession, type RunningApp } from './harness';

let app: RunningApp;
let checkId = '';

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  const check = await testDb().selectFrom('checks').select('id').orderBy('created_at').executeTakeFirst();
  checkId = check?.id ?? '';
  app = await startApp();
}, 600_000);

afterAll(async () => {
  await closeBrowser();
  await app?.stop();
});

const WIDTHS = [
  { name: 'laptop', width: 1280, height: 860 },
  { name: 'phone', width: 390, height: 844 },
] as const;

/** The pages of each role's journey (the check page is the seeded check's). */
const JOURNEYS: Array<{ who: string; email: string | null; pages: () => string[] }> = [
  { who: 'visitor', email: null, pages: () => ['/', '/sign-in', '/verify', '/reference'] },
  {
    who: 'originator',
    email: 'originator@demo.test',
    pages: () => [
      '/',
      '/projects',
      '/projects/TPT2',
      '/projects/TPT2/sheets/1',
      '/projects/TPT2/sheets/1/edit',
      '/projects/TPT2/sheets/2/compare?base=1&target=2',
      '/projects/TPT2/audit',
      '/scratch',
      '/account',
      '/software-impact',
    ],
  },
  {
    who: 'checker',
    email: 'checker@demo.test',
    pages: () => ['/checks', ...(checkId ? [`/checks/${checkId}`] : []), '/projects/TPT2/register'],
  },
  { who: 'approver', email: 'approver@demo.test', pages: () => ['/approvals', '/projects/TPT2/sheets/11'] },
  { who: 'controller', email: 'controller@demo.test', pages: () => ['/register', '/projects/TPT2/register'] },
  { who: 'viewer', email: 'viewer@demo.test', pages: () => ['/projects/TPT2', '/projects/TPT2/audit'] },
  { who: 'administrator', email: 'admin@demo.test', pages: () => ['/admin'] },
];

interface Finding {
  id: string;
  impact: string | null;
  help: string;
  targets: string[];
}

/** axe-core on the page as it stands; the serious and critical violations. */
async function seriousViolations(session: BrowserSession): Promise<Finding[]> {
  const { page } = session;
  // Evaluated through the DevTools protocol, which the page's Content-Security-Policy does not govern.
  if (!(await page.evaluate(() => 'axe' in window))) await page.evaluate(axe.source);
  const result = await page.evaluate(async () => {
    const run = (window as unknown as { axe: typeof axe }).axe.run;
    const r = await run(document, {
      runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa', 'best-practice'] },
      resultTypes: ['violations'],
    });
    return r.violations.map((v) => ({
      id: v.id,
      impact: v.impact ?? null,
      help: v.help,
      targets: v.nodes.slice(0, 5).map((n) => n.target.join(' ')),
    }));
  });
  return result.filter((v) => v.impact === 'serious' || v.impact === 'critical');
}

describe.each(JOURNEYS)('the $who journey', ({ who, email, pages }) => {
  it('has no serious or critical accessibility violation and fits a phone', async () => {
    const session = await openBrowser();
    const { page } = session;
    try {
      if (email) {
        await submitSignIn(page, app.baseUrl, email, DEMO_PASSWORD);
        await page.waitForURL(`${app.baseUrl}/projects`);
      }
      const found: Record<string, Finding[]> = {};
      const wide: Record<string, string> = {};
      const tallHeader: Record<string, number> = {};
      for (const size of WIDTHS) {
        await page.setViewportSize({ width: size.width, height: size.height });
        for (const url of pages()) {
          await page.goto(`${app.baseUrl}${url}`);
          await page.waitForLoadState('networkidle');
          await page.locator('main').first().waitFor();
          const violations = await seriousViolations(session);
          if (violations.length) found[`${url} at ${size.width} px`] = violations;
          if (size.name === 'phone') {
            const width = await page.evaluate(() => document.documentElement.scrollWidth);
            if (width > size.width) {
              // Named by the outermost elements reaching past the edge, to say what to fix.
              const past = await page.evaluate((edge) => {
                const out: string[] = [];
                for (const el of Array.from(document.querySelectorAll('main *'))) {
                  if (el.getBoundingClientRect().right <= edge + 1) continue;
                  if (el.parentElement && el.parentElement.getBoundingClientRect().right > edge + 1) continue;
                  out.push(`${el.tagName.toLowerCase()}.${String((el as HTMLElement).className).slice(0, 60)}`);
                }
                return out.slice(0, 3).join(' | ');
              }, size.width);
              wide[url] = `${width} px: ${past}`;
            }
            // One line of header: the brand and the menu button (or a visitor's two links).
            const header = await page.locator('body > header, header').first().boundingBox();
            if (header && header.height > 72) tallHeader[url] = Math.round(header.height);
          }
          const slug = url.replace(/^\//, '').replace(/[^a-zA-Z0-9]+/g, '-') || 'home';
          await session.screenshot(`a11y-${who}-${slug}-${size.name}`);
        }
      }
      expect(found).toEqual({});
      expect(wide).toEqual({});
      expect(tallHeader).toEqual({});
      // The only HTTP errors are none: every page of the journey is the person's to see.
      expect(session.problems).toEqual([]);
    } finally {
      await session.close();
    }
  }, 300_000);
});

it('folds the navigation behind a menu button on a phone, which opens, closes with Escape and keeps the focus', async () => {
  const session = await openBrowser();
  const { page } = session;
  try {
    await submitSignIn(page, app.baseUrl, 'checker@demo.test', DEMO_PASSWORD);
    await page.waitForURL(`${app.baseUrl}/projects`);
    await page.setViewportSize({ width: 390, height: 844 });
    const menu = page.getByRole('button', { name: /^Menu/ });
    await menu.waitFor();
    expect(await page.getByRole('link', { name: /^My checks/ }).isVisible()).toBe(false);
    await menu.focus();
    await page.keyboard.press('Enter');
    expect(await menu.getAttribute('aria-expanded')).toBe('true');
    await page.getByRole('link', { name: /^My checks/ }).waitFor({ state: 'visible' });
    await session.screenshot('a11y-phone-menu-open');
    await page.keyboard.press('Tab');
    await page.keyboard.press('Escape');
    expect(await menu.getAttribute('aria-expanded')).toBe('false');
    expect(await page.evaluate(() => document.activeElement?.textContent?.trim().startsWith('Menu'))).toBe(true);
    // Signed out there is nothing to fold: Verify and Sign in only.
    await page.setViewportSize({ width: 1280, height: 860 });
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.getByRole('link', { name: 'Sign in' }).waitFor();
    const nav = page.getByRole('navigation', { name: 'Main' });
    expect(await nav.getByRole('link').allInnerTexts()).toEqual(['Verify']);
    expect(session.problems).toEqual([]);
  } finally {
    await session.close();
  }
}, 120_000);
