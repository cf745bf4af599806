// The issued PDF of a version whose results hold a plot, sweep tables, uncertainties and a citation
// (hand-made results of the engine's types, as lib/calc/types.ts defines them), read back with
// poppler: the words with pdftotext, the figure as pixels with pdftoppm, images with pdfimages.
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { Document, Page, renderToBuffer } from '@react-pdf/renderer';
import { createElement } from 'react';
import { beforeAll, describe, expect, it } from 'vitest';
import type { CellResult, PlotData, StatementResult, StudyTable, UncertaintyResult } from '../../lib/calc/types';
import type { RevisionPdfData } from '../../lib/issue/pdf-data';
import { registerPdfFonts } from '../../lib/issue/pdf/fonts';
import { renderRevisionPdf } from '../../lib/issue/pdf/render';
import { plotPdfGraphic, svgSize } from '../../lib/issue/pdf/svg-to-pdf';
import { serverPlotElement } from '../../lib/plots/plot-svg';
import { buildRevisionPdfData, FIXTURE_CELLS } from './pdf-fixture';

const folder = mkdtempSync(path.join(tmpdir(), 'ws-plot-pdf-'));
const run = (tool: string, args: string[]) =>
  execFileSync(tool, args, { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
const flat = (s: string) => s.replace(/\s+/g, ' ');

// SI Brochure, 9th ed.: c exact; a proper acceleration of 25 m/s² (a test value, no published source);
// IAU light-year = c × 365.25 d.
const c = 299_792_458;
const a = 25;
const year = 365.25 * 86_400;
const ly = c * year;

/** Hyperbolic motion from rest (MTW §6.2), x against ct in light-years. */
const worldline: Array<[number, number]> = Array.from({ length: 41 }, (_, i) => {
  const t = (3 * year * i) / 40;
  return [(((c * c) / a) * (Math.sqrt(1 + ((a * t) / c) ** 2) - 1)) / ly, (c * t) / ly];
});

const plot: PlotData = {
  kind: 'spacetime',
  x: { label: 'x', unit: 'ly' },
  y: { label: 'ct', unit: 'ly' },
  series: [{ name: 'test worldline', points: worldline }],
  horizons: [{ name: 'Rindler horizon', distance: (c * c) / a / ly }],
};

// Invented figures in the shape the engine gives (common practice, no published source).
const sweep: StudyTable = {
  columns: [
    { name: 'T_kin', unit: 'MeV', tex: 'T_{kin}' },
    { name: 'Brho', unit: 'T m', tex: 'B\\rho' },
  ],
  rows: [
    [70, 1.2296],
    [150, 1.8343],
    [-10, null],
    [250, 2.4297],
  ],
  errors: [null, null, 'speedFromKinetic: the kinetic energy must not be negative (got −10 MeV)', null],
};

/** A sweep long enough to run over a page break. */
const longSweep: StudyTable = {
  columns: [
    { name: 'E_step', unit: 'MeV', tex: 'E' },
    { name: 'beta_step', unit: null, tex: '\\beta' },
  ],
  rows: Array.from({ length: 140 }, (_, i) => [70 + i, Math.sqrt(1 - 1 / (1 + (70 + i) / 938.272) ** 2)]),
  errors: Array.from({ length: 140 }, () => null),
};

const inputUncertainty: UncertaintyResult = {
  kind: 'input',
  u: 0.5,
  U: 1,
  k: 2,
  unit: 'MeV',
  text: '250.0 ± 1.0 MeV (k = 2)',
  tex: '250.0 \\pm 1.0\\ \\mathrm{MeV}',
  budget: [],
  nonLinear: false,
  monteCarlo: null,
  warning: null,
};

const propagated: UncertaintyResult = {
  kind: 'propagated',
  u: 0.00061,
  U: 0.0012,
  k: 2,
  unit: 'T m',
  text: '2.4297 ± 0.0012 T·m (k = 2)',
  tex: '2.4297 \\pm 0.0012\\ \\mathrm{T}\\cdot\\mathrm{m}',
  budget: [
    {
      name: 'T_u',
      valueText: '250 MeV',
      uText: '0.5 MeV',
      sensitivity: 7.7e-3,
      sensitivityText: '0.001 22 T·m/MeV',
      contribution: 0.00061,
      contributionText: '0.000 61 T·m',
      share: 0.9991,
    },
    {
      name: 'm_p',
      valueText: '1.672 62 × 10⁻²⁷ kg',
      uText: '5.2 × 10⁻³⁷ kg',
      sensitivity: 1e26,
      sensitivityText: '1.1 × 10²⁶ T·m/kg',
      contribution: 2e-11,
      contributionText: '2 × 10⁻¹¹ T·m',
      share: 0.0009,
    },
  ],
  nonLinear: true,
  monteCarlo: {
    trials: 200_000,
    outOfDomain: 12,
    seed: 20261202,
    mean: 2.42969,
    u: 0.00061,
    low: 2.42848,
    high: 2.43092,
    tolerance: 0.00005,
    dLow: 0.00002,
    dHigh: 0.00003,
    agrees: true,
    text: 'mean 2.429 69 T·m, u = 0.000 61 T·m, 95.45 % interval [2.428 48, 2.430 92] T·m',
  },
  warning: "12 of 200 000 draws fell outside the model's domain",
};

const statement = (line: number, source: string, extra: Partial<StatementResult>): StatementResult => ({
  line,
  source,
  kind: 'definition',
  name: null,
  tex: '',
  substitutedTex: null,
  value: null,
  criterion: null,
  error: null,
  ...extra,
});

const STUDY_SOURCE = [
  'T_u = 250 MeV ± 0.5 MeV',
  'Brho_u = magneticRigidity(momentumFromKinetic(T_u, m_p), q_e) to T*m',
  'B_ref = fromRevision("TPT2-CALC-0003", "B", "Brho")',
  'sweep(T_kin, [70, 150, -10, 250] MeV, Brho)',
  'spacetime(hyperbolicDistance(25 m/s^2, t) to ly, c*t to ly)',
  'sweep(E_step, 70 MeV : 1 MeV : 209 MeV, beta_step)',
];

const studyCell: CellResult = {
  id: 'studies',
  index: FIXTURE_CELLS.length,
  kind: 'calc',
  ok: true,
  error: null,
  defines: ['T_u', 'Brho_u', 'B_ref'],
  uses: [],
  statements: [
    statement(1, STUDY_SOURCE[0], {
      name: 'T_u',
      tex: 'T_u = 250\\ \\mathrm{MeV}',
      value: { kind: 'quantity', text: '250 MeV', tex: '250\\ \\mathrm{MeV}', number: 250, unit: 'MeV', raw: null },
      uncertainty: inputUncertainty,
    }),
    statement(2, STUDY_SOURCE[1], {
      name: 'Brho_u',
      tex: 'B\\rho_u = \\mathrm{magneticRigidity}(p, q_e)',
      value: {
        kind: 'quantity',
        text: '2.429 68 T·m',
        tex: '2.429\\,68\\ \\mathrm{T}\\cdot\\mathrm{m}',
        number: 2.42968,
        unit: 'T m',
        raw: null,
      },
      uncertainty: propagated,
    }),
    statement(3, STUDY_SOURCE[2], {
      name: 'B_ref',
      tex: 'B_{ref} = 2.4297\\ \\mathrm{T}\\cdot\\mathrm{m}',
      value: {
        kind: 'quantity',
        text: '2.4297 T·m',
        tex: '2.4297\\ \\mathrm{T}\\cdot\\mathrm{m}',
        number: 2.4297,
        unit: 'T m',
        raw: null,
      },
      references: [
        {
          sheet: 'TPT2-CALC-0003',
          revision: 'B',
          name: 'Brho',
          value: { number: 2.4297, unit: 'T m', uncertainty: null },
          error: null,
          status: 'superseded',
          supersededBy: 'C',
          title: 'Rigidity of the 250 MeV beam',
          versionSha256: 'ab'.repeat(32),
        },
      ],
    }),
    statement(4, STUDY_SOURCE[3], { kind: 'sweep', table: sweep }),
    statement(5, STUDY_SOURCE[4], { kind: 'plot', plot }),
    statement(6, STUDY_SOURCE[5], { kind: 'sweep', table: longSweep }),
  ],
};

let data: RevisionPdfData;
let file: string;
let pageCount: number;
const pages: string[] = [];
let whole: string;
let plotPage: number;
const screenshots = path.join(process.cwd(), '.data', 'screenshots');

beforeAll(async () => {
  data = buildRevisionPdfData({
    cells: [...FIXTURE_CELLS, { id: 'studies', kind: 'calc', source: STUDY_SOURCE.join('\n') }],
  });
  data.version.results.cells = [...data.version.results.cells.filter((cell) => cell.id !== 'studies'), studyCell];
  const bytes = await renderRevisionPdf(data);
  file = path.join(folder, 'studies.pdf');
  writeFileSync(file, bytes);
  pageCount = Number(/^Pages:\s+(\d+)/m.exec(run('pdfinfo', [file]))?.[1]);
  for (let p = 1; p <= pageCount; p++)
    pages[p] = run('pdftotext', ['-layout', '-f', String(p), '-l', String(p), file, '-']);
  whole = flat(run('pdftotext', [file, '-']));
  plotPage = pages.findIndex((t) => t?.includes('ct (ly)'));
  // A picture of the figure's page for people to look at (.data/ is git-ignored).
  mkdirSync(screenshots, { recursive: true });
  if (plotPage > 0)
    run('pdftoppm', [
      '-png',
      '-r',
      '60',
      '-f',
      String(plotPage),
      '-l',
      String(plotPage),
      '-singlefile',
      file,
      path.join(screenshots, 'pdf-plot-page'),
    ]);
}, 180_000);

/** The page as RGB pixels at `dpi` (pdftoppm's binary PPM). */
function pagePixels(page: number, dpi: number): { width: number; height: number; rgb: Buffer } {
  const out = path.join(folder, `page-${page}`);
  run('pdftoppm', ['-r', String(dpi), '-f', String(page), '-l', String(page), '-singlefile', file, out]);
  const ppm = readFileSync(`${out}.ppm`);
  const m = /^P6\s+(\d+)\s+(\d+)\s+255\s/.exec(ppm.subarray(0, 40).toString('latin1'))!;
  return { width: Number(m[1]), height: Number(m[2]), rgb: ppm.subarray(m[0].length) };
}

describe('a plot in the issued PDF', () => {
  it('is on a page with its axis titles, legend, horizon and caption as text', () => {
    expect(plotPage).toBeGreaterThan(0);
    const text = flat(pages[plotPage]);
    expect(text).toContain('x (ly)');
    expect(text).toContain('ct (ly)');
    expect(text).toContain('test worldline');
    expect(text).toContain('light lines x = ±ct');
    expect(text).toContain('Figure, L5');
    expect(text).toContain('Space-time diagram, ct (ly) against x (ly), equal scales');
    // The horizon's label runs along the line at 45°, so pdftotext may cut it into pieces: the whole
    // words are in the caption, the rotated label's own glyphs are checked in the figure's pixels.
    expect(whole).toContain('horizon Rindler horizon: x = ct − 0.379 994 ly'); // c²/a in light-years, computed above
  });

  it("is drawn as vector graphics: the worldline's blue and the horizon's brown are on the page, and there are no images", () => {
    const { rgb } = pagePixels(plotPage, 60);
    let blue = 0;
    let brown = 0;
    for (let i = 0; i + 2 < rgb.length; i += 3) {
      const [r, g, b] = [rgb[i], rgb[i + 1], rgb[i + 2]];
      if (Math.abs(r - 0x00) < 40 && Math.abs(g - 0x72) < 40 && Math.abs(b - 0xb2) < 40) blue++;
      if (Math.abs(r - 0x6f) < 35 && Math.abs(g - 0x45) < 35 && Math.abs(b - 0x00) < 35) brown++;
    }
    // A 3-year worldline over ~300 pt at 60 dpi is a few hundred pixels of line.
    expect(blue).toBeGreaterThan(150);
    expect(brown).toBeGreaterThan(50);
    const images = run('pdfimages', ['-list', '-f', String(plotPage), '-l', String(plotPage), file])
      .split('\n')
      .slice(2)
      .filter((l) => l.trim());
    expect(images).toEqual([]);
  });

  it('uses only the embedded faces for its text', () => {
    const rows = run('pdffonts', [file])
      .split('\n')
      .slice(2)
      .filter((l) => l.trim());
    for (const row of rows)
      expect(row).toMatch(/^[A-Z]{6}\+(SourceSans3-(Regular|Italic|SemiBold|Bold)|NotoSansMono-(Regular|Bold))\s/);
  });
});

describe('a sweep table in the issued PDF', () => {
  it("has a header of names and readable units, numbers at the sheet's significant figures, and the failed step with its error", () => {
    expect(whole).toContain('Sweep, L4: 4 steps, 1 failed');
    const layout = flat(pages.join('\n'));
    expect(layout).toMatch(/T_kin \(MeV\)\s+Brho \(T·m\)/);
    // Six significant figures, trailing zeros kept (common practice): 1.834 30.
    expect(layout).toContain('150 1.834 30');
    expect(layout).toContain(
      '−10 Step failed: speedFromKinetic: the kinetic energy must not be negative (got −10 MeV)',
    );
  });

  it('repeats its header on each page it runs onto', () => {
    // Rows of the 140-step sweep are "E  β" lines: 70 … 209 MeV, β from 0.366 to 0.576.
    const row = /^\s*(\d{2,3})\s+0\.\d+(?:\s\d+)?\s*$/m;
    const withRows = pages.map((t, p) => ({ p, t: t ?? '' })).filter(({ t }) => row.test(t));
    expect(withRows.length).toBeGreaterThanOrEqual(2);
    for (const { p, t } of withRows) {
      const lines = t.split('\n');
      const header = lines.findIndex((l) => /E_step \(MeV\)\s+beta_step/.test(l));
      const firstRow = lines.findIndex((l) => row.test(l));
      expect(header, `page ${p}: header`).toBeGreaterThanOrEqual(0);
      expect(header, `page ${p}: header above the rows`).toBeLessThan(firstRow);
    }
    // Every step is there once, in order.
    const steps = withRows.flatMap(({ t }) =>
      t
        .split('\n')
        .filter((l) => row.test(l))
        .map((l) => Number(l.trim().split(/\s+/)[0])),
    );
    expect(steps).toEqual(longSweep.rows.map((r) => r[0]));
  });
});

describe('uncertainty and citations in the issued PDF', () => {
  it('shows "y ± U (k = 2)" under a result and an input\'s standard uncertainty', () => {
    expect(whole).toContain('2.4297 ± 0.0012 T·m (k = 2)');
    // Two significant digits, the trailing zero kept (JCGM 100:2008, 7.2.6).
    expect(whole).toContain('standard uncertainty u = 0.50 MeV');
  });

  it("shows the budget: each input's contribution and share, u_c and U, the Monte Carlo check and the caution", () => {
    expect(whole).toContain('Uncertainty budget, L2');
    const layout = flat(pages.join('\n'));
    expect(layout).toMatch(/Input\s+Value\s+Standard uncertainty\s+Sensitivity coefficient\s+Contribution\s+Share/);
    expect(layout).toContain('T_u 250 MeV 0.5 MeV 0.001 22 T·m/MeV 0.000 61 T·m 99.9 %');
    // Two significant digits (GUM 7.2.6), written as the sheet writes numbers below 10⁻³ (lib/calc/format.ts).
    expect(whole).toContain(
      'combined standard uncertainty u_c = 6.1 × 10⁻⁴ T·m; expanded uncertainty U = 0.0012 T·m (k = 2)',
    );
    expect(whole).toContain('Monte Carlo propagation (JCGM 101): 200 000 trials, seed 20261202');
    expect(whole).toContain('Agrees with the first-order result');
    expect(whole).toContain("Caution: 12 of 200 000 draws fell outside the model's domain");
  });

  it('names the cited revision under the statement, with a badge when it is superseded', () => {
    const line = pages
      .join('\n')
      .split('\n')
      .find((l) => l.includes('from TPT2-CALC-0003 rev. B, Brho'));
    expect(line && flat(line).trim()).toBe(
      'from TPT2-CALC-0003 rev. B, Brho (Rigidity of the 250 MeV beam) SUPERSEDED BY REV. C',
    );
  });
});

describe('a design limit, table data and a long horizon label in the PDF figure', () => {
  // Each figure alone on a page with a 40 pt white border, drawn as the issued PDF draws it
  // (plotPdfGraphic: Source Sans 3 at 8.5 pt, one figure pixel per point), read back at 72 dpi
  // (one pixel per point): what lies outside the figure's box would be drawn on the border.
  const M = 40;
  const W = 400;
  const limited: PlotData = {
    kind: 'curve',
    x: { label: 'T_kin', unit: 'MeV' },
    y: { label: 'B_dip', unit: 'T' },
    // Numbers for the picture only (no published source): a rising field, its limit, a scan.
    series: [
      {
        name: 'B_dip',
        points: Array.from({ length: 50 }, (_, i) => [70 + (180 * i) / 49, 0.82 + (0.8 * i) / 49] as [number, number]),
      },
    ],
    limits: [{ name: 'B_max', value: 1.5 }],
    data: [
      {
        name: 'energies.B',
        x: 'energies.T',
        y: 'energies.B',
        points: [
          [70.1, 0.818],
          [120.35, 1.0945],
          [180.7, 1.3592],
          [249.9, 1.6207],
        ],
      },
    ],
  };
  // Events up to ct = 0.1 ly and a horizon 0.38 ly away: its line crosses only the lower left corner.
  const shortHorizon: PlotData = {
    kind: 'spacetime',
    x: { label: 'x', unit: 'ly' },
    y: { label: 'ct', unit: 'ly' },
    series: [{ name: 'probe', points: worldline.filter(([, ct]) => ct <= 0.1) }],
    horizons: [{ name: 'Rindler horizon of the probe leaving the pad', distance: (c * c) / a / ly }],
  };
  const figures: Array<{ data: PlotData; height: number; file: string; w: number; h: number; text: string }> = [];

  beforeAll(async () => {
    registerPdfFonts();
    for (const [k, data] of [limited, shortHorizon].entries()) {
      const height = data.kind === 'spacetime' ? 380 : 280;
      const size = svgSize(serverPlotElement(data, { fontSize: 8.5, width: W, height, fontFamily: 'Source Sans 3' }));
      const h = (W * size.viewBox[3]) / size.viewBox[2];
      const doc = createElement(
        Document,
        null,
        createElement(
          Page,
          { size: [W + 2 * M, h + 2 * M], style: { padding: M } },
          plotPdfGraphic(data, W, { height }),
        ),
      );
      const out = path.join(folder, `figure-${k}.pdf`);
      writeFileSync(out, await renderToBuffer(doc));
      figures.push({ data, height, file: out, w: W, h, text: flat(run('pdftotext', [out, '-'])) });
    }
  }, 120_000);

  /** The page as RGB pixels at 72 dpi. */
  function pixels(file: string) {
    const out = file.replace(/\.pdf$/, '');
    run('pdftoppm', ['-r', '72', '-singlefile', file, out]);
    const ppm = readFileSync(`${out}.ppm`);
    const m = /^P6\s+(\d+)\s+(\d+)\s+255\s/.exec(ppm.subarray(0, 40).toString('latin1'))!;
    const width = Number(m[1]);
    const rgb = ppm.subarray(m[0].length);
    return {
      width,
      height: Number(m[2]),
      /** Pixels near `hex`, as [x, y]. */
      near(hex: string, tolerance: number): Array<[number, number]> {
        const [r0, g0, b0] = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16));
        const found: Array<[number, number]> = [];
        for (let i = 0; i + 2 < rgb.length; i += 3) {
          if (
            Math.abs(rgb[i] - r0) < tolerance &&
            Math.abs(rgb[i + 1] - g0) < tolerance &&
            Math.abs(rgb[i + 2] - b0) < tolerance
          )
            found.push([(i / 3) % width, Math.floor(i / 3 / width)]);
        }
        return found;
      },
    };
  }

  it('draws the limit line across the frame at exactly its value on the y scale, and names it the design limit', () => {
    const { data, height, file, text } = figures[0];
    const sy = (
      serverPlotElement(data, { fontSize: 8.5, width: W, height, fontFamily: 'Source Sans 3' }) as SVGSVGElement & {
        scale(n: 'y'): { apply(v: number): number };
      }
    ).scale('y');
    const red = pixels(file).near('#9b1c31', 40);
    const perRow = new Map<number, number>();
    for (const [, y] of red) perRow.set(y, (perRow.get(y) ?? 0) + 1);
    // The dash-dot covers about 64 % of the frame's width; the densest row is the line.
    const [row, count] = [...perRow.entries()].sort((p, q) => q[1] - p[1])[0];
    expect(count).toBeGreaterThan(150);
    expect(Math.abs(row + 0.5 - (M + sy.apply(1.5)))).toBeLessThan(1.5);
    expect(text).toContain('B_max = 1.5 T (design limit)');
    expect(text).toContain('B_max = 1.5 T limit');
    expect(text).toContain('energies.B (table data)');
  });

  it("draws the table's rows as outlined markers inside the figure", () => {
    const { file, w, h } = figures[0];
    // #d55e00, the second style's colour (the one series is blue).
    const orange = pixels(file).near('#d55e00', 40);
    // Four markers of radius 4 outlined at 1.25 pt and the legend's sample: some tens of pixels.
    expect(orange.length).toBeGreaterThan(40);
    for (const [x, y] of orange) {
      expect(x).toBeGreaterThanOrEqual(M - 1);
      expect(x).toBeLessThanOrEqual(M + w + 1);
      expect(y).toBeGreaterThanOrEqual(M - 1);
      expect(y).toBeLessThanOrEqual(M + h + 1);
    }
  });

  it("keeps a long horizon label within the figure's box and names the horizon in full in the legend", () => {
    const { file, w, h, text } = figures[1];
    // The horizon is drawn (its line and legend sample in brown).
    expect(pixels(file).near('#6f4500', 35).length).toBeGreaterThan(50);
    // Every word's box, as poppler places the glyphs (rotated ones included, and whether or not the
    // figure's box would clip them), lies within the figure's box on the page.
    const words = [
      ...run('pdftotext', ['-bbox', file, '-']).matchAll(
        /<word xMin="([-\d.]+)" yMin="([-\d.]+)" xMax="([-\d.]+)" yMax="([-\d.]+)">([^<]*)<\/word>/g,
      ),
    ].map((m) => ({ box: m.slice(1, 5).map(Number), word: m[5] }));
    expect(words.length).toBeGreaterThan(20);
    const outside = words.filter(
      ({ box: [x0, y0, x1, y1] }) => x0 < M - 1 || y0 < M - 1 || x1 > M + w + 1 || y1 > M + h + 1,
    );
    expect(outside).toEqual([]);
    expect(text).toContain('horizon Rindler horizon of the probe leaving the pad: x = ct − 0.3800 ly');
  });

  it('keeps the limit label and the legend of the curve plot within its box', () => {
    const { file, w, h } = figures[0];
    const words = [
      ...run('pdftotext', ['-bbox', file, '-']).matchAll(
        /<word xMin="([-\d.]+)" yMin="([-\d.]+)" xMax="([-\d.]+)" yMax="([-\d.]+)">([^<]*)<\/word>/g,
      ),
    ].map((m) => ({ box: m.slice(1, 5).map(Number), word: m[5] }));
    expect(words.map((x) => x.word)).toContain('limit');
    const outside = words.filter(
      ({ box: [x0, y0, x1, y1] }) => x0 < M - 1 || y0 < M - 1 || x1 > M + w + 1 || y1 > M + h + 1,
    );
    expect(outside).toEqual([]);
  });
});
