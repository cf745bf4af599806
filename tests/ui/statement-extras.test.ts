// @vitest-environment jsdom
// A statement with a plot, a sweep table, an uncertainty budget and a citation, as the app renders
// it: the markup a screen reader and a keyboard get (WCAG 2.2: 1.1.1 text alternatives, 1.3.1
// tables with captions and header cells, 1.4.1 not by colour alone, 4.1.3 status messages), and the
// plot drawn into the page by the client component.
import { act, createElement } from 'react';
import { createRoot } from 'react-dom/client';
import { renderToStaticMarkup } from 'react-dom/server';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PlotView } from '../../components/calc/plot-view';
import { StatementView } from '../../components/calc/statement-view';
import type { PlotData, StatementResult, StudyTable, UncertaintyResult } from '../../lib/calc/types';
import { SERIES_COLORS } from '../../lib/plots/plot-figure';

/** WCAG 2.2 contrast ratio of two sRGB colours (glossary: "relative luminance", "contrast ratio"). */
function contrast(a: string, b: string): number {
  const lum = (hex: string) => {
    const [r, g, bl] = [1, 3, 5]
      .map((i) => parseInt(hex.slice(i, i + 2), 16) / 255)
      .map((c) => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4));
    return 0.2126 * r + 0.7152 * g + 0.0722 * bl;
  };
  const [hi, lo] = [lum(a), lum(b)].sort((x, y) => y - x);
  return (hi + 0.05) / (lo + 0.05);
}

// Invented figures in the shape the engine gives (common practice, no published source).
const table: StudyTable = {
  columns: [
    { name: 'T_kin', unit: 'MeV', tex: 'T' },
    { name: 'Brho', unit: 'T m', tex: 'B\\rho' },
  ],
  rows: [
    [70, 1.2296],
    [-10, null],
    [250, 2.42968123],
  ],
  errors: [null, 'the kinetic energy must not be negative', null],
};

const plot: PlotData = {
  kind: 'curve',
  x: { label: 'T_kin', unit: 'MeV' },
  y: { label: 'Brho', unit: 'T m' },
  series: [
    {
      name: 'protons',
      points: [
        [70, 1.2296],
        [250, 2.4297],
      ],
    },
  ],
};

const uncertainty: UncertaintyResult = {
  kind: 'propagated',
  u: 0.00061,
  U: 0.0012,
  k: 2,
  unit: 'T m',
  text: '2.4297 ± 0.0012 T·m (k = 2)',
  tex: '',
  budget: [
    {
      name: 'T_u',
      valueText: '250 MeV',
      uText: '0.5 MeV',
      sensitivity: 0.00122,
      sensitivityText: '0.001 22 T·m/MeV',
      contribution: 0.00061,
      contributionText: '0.000 61 T·m',
      share: 1,
    },
  ],
  nonLinear: false,
  monteCarlo: null,
  warning: 'the Monte Carlo interval and the first-order one disagree',
};

const base: StatementResult = {
  line: 3,
  source: 'x',
  kind: 'definition',
  name: 'Brho_u',
  tex: 'B',
  substitutedTex: null,
  value: { kind: 'quantity', text: '2.429 68 T·m', tex: '', number: 2.42968, unit: 'T m', raw: null },
  criterion: null,
  error: null,
};

function dom(html: string): Document {
  return new DOMParser().parseFromString(`<!DOCTYPE html><body>${html}</body>`, 'text/html');
}

describe('a statement with a sweep, a plot, an uncertainty and a citation', () => {
  const page = dom(
    renderToStaticMarkup(
      createElement(StatementView, {
        statement: {
          ...base,
          uncertainty,
          table,
          plot,
          references: [
            {
              sheet: 'TPT2-CALC-0003',
              revision: 'B',
              name: 'Brho',
              value: null,
              error: null,
              status: 'withdrawn',
              supersededBy: null,
              title: 'Rigidity',
              versionSha256: null,
            },
          ],
        },
        significantFigures: 4,
      }),
    ),
  );

  it("shows the sweep as a real table with a caption, column headers with units, and the failed step's error", () => {
    const t = [...page.querySelectorAll('table')].find((x) =>
      x.querySelector('caption')?.textContent?.startsWith('Sweep'),
    )!;
    expect(t.querySelector('caption')!.textContent).toBe('Sweep, line 3: 3 steps, 1 failed');
    const headers = [...t.querySelectorAll('thead th[scope="col"]')].map((th) => th.textContent);
    expect(headers).toEqual(['T_kinMeV', 'BrhoT·m']);
    const rows = [...t.querySelectorAll('tbody tr')].map((tr) =>
      [...tr.querySelectorAll('td')].map((td) => td.textContent),
    );
    // Four significant figures, as the sheet asks, trailing zeros kept (lib/calc/format.ts; common practice).
    expect(rows[0]).toEqual(['70', '1.230']);
    expect(rows[1]).toEqual(['−10', 'Step failed: the kinetic energy must not be negative']);
    expect(rows[2]).toEqual(['250', '2.430']);
  });

  it('offers the table as CSV at full precision', () => {
    const link = [...page.querySelectorAll('a')].find((a) => a.textContent?.startsWith('Download CSV'))!;
    expect(link.getAttribute('download')).toBe('sweep-line3.csv');
    const csv = decodeURIComponent(link.getAttribute('href')!.replace(/^data:text\/csv;charset=utf-8,/, ''));
    expect(csv.split('\r\n')[3]).toBe('250,2.42968123,');
  });

  it('writes y ± U under the value and puts the budget behind a disclosure, with the caution as a status message in words', () => {
    expect(page.body.textContent).toContain('2.4297 ± 0.0012 T·m (k = 2)');
    const status = page.querySelector('[role="status"]')!;
    expect(status.textContent).toBe('Caution: the Monte Carlo interval and the first-order one disagree');
    const budget = [...page.querySelectorAll('details')].find((d) =>
      d.querySelector('summary')!.textContent!.startsWith('Uncertainty budget'),
    )!;
    expect([...budget.querySelectorAll('thead th')].map((th) => th.textContent)).toEqual([
      'Input',
      'Value',
      'Standard uncertainty',
      'Sensitivity coefficient',
      'Contribution',
      'Share',
    ]);
    expect([...budget.querySelectorAll('tbody tr')][0].textContent).toBe(
      'T_u250 MeV0.5 MeV0.001 22 T·m/MeV0.000 61 T·m100.0 %',
    );
    expect(budget.textContent).toContain('combined standard uncertainty u_c = 6.1 × 10⁻⁴ T·m');
  });

  it('names the cited revision, with its status in words', () => {
    const item = [...page.querySelectorAll('li')].find((li) =>
      li.textContent?.includes('from TPT2-CALC-0003 rev. B, Brho'),
    )!;
    expect(item.textContent).toBe('from TPT2-CALC-0003 rev. B, Brhowithdrawn');
  });

  it('gives the plot a caption and its points in a table behind "Show data"', () => {
    const figure = page.querySelector('figure')!;
    expect(figure.querySelector('figcaption')!.textContent).toBe(
      'Figure, line 3: Plot of Brho (T·m) against T_kin (MeV): 1 series (protons).',
    );
    const data = [...figure.querySelectorAll('details')].find(
      (d) => d.querySelector('summary')!.textContent === 'Show data',
    )!;
    expect([...data.querySelectorAll('th')].map((th) => th.textContent)).toEqual(['T_kin (MeV)', 'Brho (T·m)']);
    expect([...data.querySelectorAll('tbody tr')].map((tr) => tr.textContent)).toEqual(['701.230', '2502.430']);
  });
});

describe('the plot in the page', () => {
  const restore: Array<() => void> = [];
  beforeAll(() => {
    // jsdom lays nothing out: give boxes a width, and a ResizeObserver that reports once.
    const width = Object.getOwnPropertyDescriptor(HTMLElement.prototype, 'clientWidth');
    Object.defineProperty(HTMLElement.prototype, 'clientWidth', { configurable: true, get: () => 600 });
    restore.push(() => (width ? Object.defineProperty(HTMLElement.prototype, 'clientWidth', width) : undefined));
    const g = globalThis as unknown as { ResizeObserver?: unknown; IS_REACT_ACT_ENVIRONMENT?: boolean };
    const ro = g.ResizeObserver;
    g.ResizeObserver = class {
      observe() {}
      disconnect() {}
    };
    g.IS_REACT_ACT_ENVIRONMENT = true;
    restore.push(() => (g.ResizeObserver = ro));
  });
  afterAll(() => restore.forEach((f) => f()));

  it('is drawn by the same figure code into the figure, as a labelled image', async () => {
    const host = document.createElement('div');
    document.body.appendChild(host);
    const root = createRoot(host);
    await act(async () => root.render(createElement(PlotView, { plot })));
    const svg = host.querySelector('figure svg')!;
    expect(svg).not.toBeNull();
    expect(svg.getAttribute('role')).toBe('img');
    expect(svg.getAttribute('aria-label')).toContain('Plot of Brho (T·m) against T_kin (MeV)');
    expect(Number(svg.getAttribute('width'))).toBe(600);
    expect(svg.querySelector('path[aria-label="series protons"]')).not.toBeNull();
    await act(async () => root.unmount());
  });

  it('uses series colours with at least 3:1 against the page and the cards (WCAG 2.2 1.4.11)', () => {
    for (const colour of SERIES_COLORS) {
      expect(contrast(colour, '#ffffff'), colour).toBeGreaterThanOrEqual(3);
      expect(contrast(colour, '#f6f5f0'), colour).toBeGreaterThanOrEqual(3);
    }
  });
});
