// A plot with a design limit and the points of an attached data table, and a space-time diagram
// whose horizon has a long name, as the originator reads them on the version page at laptop and
// phone width: the limit line, its label and the table's markers are drawn, and every text of each
// figure (labels, legend, ticks) lies within the figure's own SVG box (getBBox through the text's
// transform, against the viewBox). Fails on any console error or failed request.
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { uploadAttachment } from '../../lib/attachments/attachments';
import type { VersionContent } from '../../lib/sheets/content';
import { getVersion, saveVersion } from '../../lib/sheets/sheets';
import { getObjectStore } from '../../lib/storage/object-store';
import { resetDatabase, testDb } from '../support/database';
import { actorByEmail } from '../support/people';
import { type BrowserSession, closeBrowser, openSignedIn, type RunningApp, startApp } from './harness';

let app: RunningApp;
let originator: BrowserSession;

// A field scan of the dipole (invented demo numbers, no published source).
const scan = 'T [MeV], B [T]\n70, 0.81\n120, 1.07\n180, 1.34\n250, 1.63\n';

const LIMIT_CELL = [
  'T_kin = 250 MeV',
  'p = momentumFromKinetic(T_kin, m_p)',
  'Brho = magneticRigidity(p, q_e) to T*m',
  'rho = 1.5 m # bending radius',
  'B_dip = Brho / rho to T',
  'B_max = 1.5 T # rated field of the dipole',
  'plot(T_kin, points(70 MeV, 250 MeV, 91), B_dip, B_max, dataPoints(field_scan.T, field_scan.B))',
].join('\n');

const HORIZON_CELL = [
  'a0 = 25 m/s^2',
  't = 1 year',
  'x_probe = hyperbolicDistance(a0, t) to ly',
  'd_horizon_of_the_probe_leaving_the_launch_pad = rindlerHorizonDistance(a0)',
  'spacetime(t, points(0 year, 0.2 year, 21), x_probe, d_horizon_of_the_probe_leaving_the_launch_pad)',
].join('\n');

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
  const latest = (await getVersion(db, sheet.id))!;
  const bytes = new TextEncoder().encode(scan);
  await uploadAttachment(db, getObjectStore(), author, sheet, { name: 'field-scan.csv', type: 'text/csv', bytes });
  const content: VersionContent = {
    ...latest.content,
    cells: [
      { id: 'limit', kind: 'calc', source: LIMIT_CELL },
      { id: 'horizon', kind: 'calc', source: HORIZON_CELL },
    ],
    attachments: [
      {
        name: 'field-scan.csv',
        mediaType: 'text/csv',
        size: bytes.length,
        sha256: createHash('sha256').update(scan).digest('hex'),
      },
    ],
  };
  await saveVersion(db, author, sheet, {
    parentNumber: latest.number,
    message: 'Field against energy with the rated field and the scan',
    content,
  });
  app = await startApp();
  originator = await openSignedIn(app.baseUrl, 'originator@demo.test', DEMO_PASSWORD);
}, 600_000);

afterAll(async () => {
  await originator?.close();
  await closeBrowser();
  await app?.stop();
});

/** Texts of a figure's SVG that reach outside its viewBox (corners of getBBox mapped into the SVG's user space). */
async function textsOutside(session: BrowserSession, index: number): Promise<string[]> {
  return session.page.evaluate((i) => {
    const svg = [...document.querySelectorAll('figure svg')][i] as SVGSVGElement;
    const vb = svg.viewBox.baseVal;
    const toSvg = svg.getScreenCTM()!.inverse();
    const out: string[] = [];
    for (const t of svg.querySelectorAll('text')) {
      if (!t.textContent) continue;
      const b = t.getBBox();
      const m = toSvg.multiply(t.getScreenCTM()!);
      for (const [x, y] of [
        [b.x, b.y],
        [b.x + b.width, b.y],
        [b.x, b.y + b.height],
        [b.x + b.width, b.y + b.height],
      ]) {
        const p = new DOMPoint(x, y).matrixTransform(m);
        if (p.x < vb.x - 0.5 || p.x > vb.x + vb.width + 0.5 || p.y < vb.y - 0.5 || p.y > vb.y + vb.height + 0.5) {
          out.push(`${t.textContent} at (${p.x.toFixed(1)}, ${p.y.toFixed(1)}) outside ${vb.width}×${vb.height}`);
          break;
        }
      }
    }
    return out;
  }, index);
}

for (const size of [
  { name: 'laptop', width: 1280, height: 900 },
  { name: 'phone', width: 390, height: 844 },
]) {
  it(`draws the design limit and the table's points with every label inside the figure (${size.width} px)`, async () => {
    const { page } = originator;
    await page.setViewportSize({ width: size.width, height: size.height });
    await page.goto(`${app.baseUrl}/projects/TPT2/sheets/1`);
    const figures = page.locator('figure').filter({ has: page.locator('svg') });
    try {
      await figures.nth(1).waitFor({ timeout: 30_000 });
    } catch (error) {
      await originator.screenshot(`plot-limit-and-data-${size.width}-failed`);
      const shown = (await page.locator('main').innerText()).slice(0, 3000);
      throw new Error(`two figures expected\n${originator.problems.join('\n')}\n${shown}`, { cause: error });
    }
    expect(await figures.count()).toBe(2);

    const plot = figures.nth(0).locator('svg').first();
    await plot.scrollIntoViewIfNeeded();
    // The limit: one line across the frame, its label and the legend saying it is the design limit.
    await plot.locator('line[aria-label="design limit B_max"]').waitFor({ state: 'attached' });
    expect(await plot.locator('text[aria-label="design limit label B_max"]').textContent()).toMatch(
      /^B_max( = 1\.5 T)? limit$/,
    );
    const legend = (await plot.locator('g[aria-label="legend"]').textContent()) ?? '';
    expect(legend).toContain('B_max = 1.5 T (design limit)');
    expect(legend).toContain('field_scan.B (table data)');
    // The curve is drawn over the limit (it crosses 1.5 T near 220 MeV) and the scan's four rows are markers.
    await plot.locator('path[aria-label="series B_dip"]').waitFor({ state: 'attached' });
    expect(await plot.locator('path[aria-label="table data field_scan.B"]').count()).toBe(4);
    // The caption says the same in words.
    const caption = (await figures.nth(0).locator('figcaption').textContent()) ?? '';
    expect(caption).toContain('design limit B_max = 1.5 T');
    expect(caption).toContain('4 points of field_scan.B against field_scan.T (table data)');

    // The horizon named in full in the legend (on a phone its label is broken into lines).
    const horizonLegend = await figures.nth(1).locator('svg g[aria-label="legend"]').first().textContent();
    expect((horizonLegend ?? '').replace(/\s+/g, '')).toContain(
      'horizond_horizon_of_the_probe_leaving_the_launch_pad:x=ct−',
    );

    expect(await textsOutside(originator, 0)).toEqual([]);
    expect(await textsOutside(originator, 1)).toEqual([]);
    await originator.screenshot(`plot-limit-and-data-${size.width}`);
    expect(originator.problems).toEqual([]);
  }, 120_000);
}
