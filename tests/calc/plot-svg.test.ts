// The plot figure drawn on the server (lib/plots/plot-svg.ts): read back as SVG and checked against
// the data and the figure's own scales, for a worldline whose shape and horizon are known.
import { JSDOM } from 'jsdom';
import { describe, expect, it } from 'vitest';
import type { PlotData } from '../../lib/calc/types';
import { unitLabel } from '../../lib/calc/unit-label';
import { clip45, SERIES_COLORS } from '../../lib/plots/plot-figure';
import { plotSvg, serverPlotElement } from '../../lib/plots/plot-svg';

// SI Brochure, 9th ed. (2019): c = 299 792 458 m/s exact. A proper acceleration of 25 m/s² (a test
// value, no published source). IAU: light-year = c × one Julian year of 365.25 days of 86 400 s.
const c = 299_792_458;
const a = 25;
const year = 365.25 * 86_400;
const ly = c * year;
// Rindler horizon of constant proper acceleration a from rest at the origin: x = ct − c²/a
// (Rindler, Relativity: Special, General, and Cosmological, 2nd ed., §3.8; MTW §6.2).
const horizon = (c * c) / a / ly;

/** Hyperbolic motion from rest, x(t) = (c²/a)(√(1 + (at/c)²) − 1) (MTW §6.2), in light-years against ct. */
function worldline(years: number, steps: number): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (let i = 0; i <= steps; i++) {
    const t = (years * year * i) / steps;
    const x = ((c * c) / a) * (Math.sqrt(1 + ((a * t) / c) ** 2) - 1);
    out.push([x / ly, (c * t) / ly]);
  }
  return out;
}

const spacetime: PlotData = {
  kind: 'spacetime',
  x: { label: 'x', unit: 'ly' },
  y: { label: 'ct', unit: 'ly' },
  series: [{ name: 'worldline at 25 m/s²', points: worldline(3, 60) }],
  horizons: [{ name: 'Rindler horizon', distance: horizon }],
};

const curve: PlotData = {
  kind: 'curve',
  x: { label: 'T_kin', unit: 'MeV' },
  y: { label: 'Brho', unit: 'T m' },
  series: [
    // Values for the picture only (common practice, no published source): two rising series.
    {
      name: 'protons',
      points: [
        [70, 1.2],
        [150, 1.83],
        [250, 2.43],
      ],
    },
    {
      name: 'helium ions',
      points: [
        [70, 2.4],
        [150, 3.66],
        [250, 4.86],
      ],
    },
  ],
};

const OPTIONS = { width: 640 };

function parse(svgText: string): Element {
  const doc = new JSDOM(svgText, { contentType: 'image/svg+xml' }).window.document;
  return doc.documentElement;
}

/** The points of a polyline path "M x,y L x,y …" (Plot's linear lines). */
function pathPoints(d: string): Array<[number, number]> {
  expect(d).toMatch(/^M[-\d.e,L]+$/);
  return d
    .slice(1)
    .split('L')
    .map((pair) => pair.split(',').map(Number) as [number, number]);
}

type Scale = { apply: (v: number) => number; domain: number[]; range: number[] };
const scales = (data: PlotData) => {
  const figure = serverPlotElement(data, OPTIONS) as SVGSVGElement & { scale: (name: 'x' | 'y') => Scale };
  return { x: figure.scale('x'), y: figure.scale('y') };
};

const text = (root: Element, label: string) =>
  [...root.querySelectorAll(`g[aria-label="${label}"] text`)].map((t) => t.textContent ?? '').join(' ');

describe('the space-time diagram of hyperbolic motion', () => {
  const svg = parse(plotSvg(spacetime, OPTIONS));
  const { x: sx, y: sy } = scales(spacetime);

  it('uses the horizon distance c²/a of 25 m/s², about 0.380 ly', () => {
    // c²/a = 3.595 02 × 10¹⁵ m; 1 ly = 9.460 730 472 580 8 × 10¹⁵ m (IAU); ratio 0.379 99 (computed above from the exact constants).
    expect(horizon).toBeGreaterThan(0.3799);
    expect(horizon).toBeLessThan(0.3801);
  });

  it('is a standalone SVG with an explicit size and the shipped text face', () => {
    expect(svg.tagName.toLowerCase()).toBe('svg');
    expect(svg.getAttribute('xmlns')).toBe('http://www.w3.org/2000/svg');
    expect(Number(svg.getAttribute('width'))).toBe(640);
    expect(Number(svg.getAttribute('height'))).toBeGreaterThan(100);
    expect(svg.getAttribute('font-family')).toContain('Source Sans 3');
  });

  it("draws the worldline through the figure's scales, point by point", () => {
    const paths = [...svg.querySelectorAll('path[aria-label="series worldline at 25 m/s²"]')];
    expect(paths).toHaveLength(1);
    const drawn = pathPoints(paths[0].getAttribute('d')!);
    const data = spacetime.series[0].points;
    expect(drawn).toHaveLength(data.length);
    drawn.forEach(([px, py], i) => {
      // Plot writes path coordinates to 3 decimals.
      expect(Math.abs(px - sx.apply(data[i][0]))).toBeLessThan(0.0011);
      expect(Math.abs(py - sy.apply(data[i][1]))).toBeLessThan(0.0011);
    });
    // The curve starts at the origin and bends away from the light line x = ct.
    expect(drawn[0][0]).toBeCloseTo(sx.apply(0), 2);
    expect(drawn[0][1]).toBeCloseTo(sy.apply(0), 2);
  });

  it('has equal scales: one light-year is as many pixels across as up', () => {
    const perX = sx.apply(1) - sx.apply(0);
    const perY = sy.apply(0) - sy.apply(1);
    expect(perX).toBeGreaterThan(10);
    expect(Math.abs(perX - perY)).toBeLessThan(1e-9 * perX);
  });

  it('draws both light lines through the origin at 45°, dashed', () => {
    const lines = [...svg.querySelectorAll('path[aria-label="light line"]')];
    expect(lines).toHaveLength(2);
    const slopes = lines.map((l) => {
      const [[x1, y1], [x2, y2]] = pathPoints(l.getAttribute('d')!);
      const dx = x2 - x1;
      const dy = y2 - y1;
      expect(Math.abs(dx)).toBeGreaterThan(50);
      // Equal pixel runs (to Plot's 3 decimals on each end).
      expect(Math.abs(Math.abs(dx) - Math.abs(dy))).toBeLessThan(0.003);
      // Through the origin: the origin's pixel lies on the segment's line.
      const [ox, oy] = [sx.apply(0), sy.apply(0)];
      expect(Math.abs((ox - x1) * dy - (oy - y1) * dx) / Math.hypot(dx, dy)).toBeLessThan(0.003);
      expect(l.parentElement!.getAttribute('stroke-dasharray')).toBeTruthy();
      return Math.sign(dx) * Math.sign(-dy);
    });
    expect(slopes.sort()).toEqual([-1, 1]);
  });

  it('draws and names the horizon x = ct − c²/a, parallel to the light line and left of every event', () => {
    const line = svg.querySelector('path[aria-label="horizon"]')!;
    expect(line).not.toBeNull();
    const [[x1, y1], [x2, y2]] = pathPoints(line.getAttribute('d')!);
    expect(Math.abs(Math.abs(x2 - x1) - Math.abs(y2 - y1))).toBeLessThan(0.003);
    // It meets ct = 0 at x = −c²/a.
    const [hx, hy] = [sx.apply(-horizon), sy.apply(0)];
    expect(Math.abs((hx - x1) * (y2 - y1) - (hy - y1) * (x2 - x1)) / Math.hypot(x2 - x1, y2 - y1)).toBeLessThan(0.003);
    // Hyperbolic motion never reaches its horizon: x > ct − c²/a at every event.
    for (const [x, ct] of spacetime.series[0].points) expect(x).toBeGreaterThan(ct - horizon);
    expect(text(svg, 'text')).toContain('Rindler horizon: x = ct − 0.3800 ly');
  });

  it('titles the axes "x (ly)" and "ct (ly)", and has a legend', () => {
    expect(text(svg, 'x-axis label')).toContain('x (ly)');
    expect(text(svg, 'y-axis label')).toContain('ct (ly)');
    expect(text(svg, 'legend')).toContain('worldline at 25 m/s²');
    expect(text(svg, 'legend')).toContain('light lines x = ±ct');
  });

  it('clips a 45° line to the frame exactly', () => {
    expect(clip45(1, 0, { x0: -1, x1: 2, y0: 0, y1: 3 })).toEqual([
      [0, 0],
      [2, 2],
    ]);
    // (JSON drops the sign of −0.)
    expect(JSON.parse(JSON.stringify(clip45(-1, 0, { x0: -1, x1: 2, y0: 0, y1: 3 })))).toEqual([
      [0, 0],
      [-1, 1],
    ]);
    expect(clip45(1, -5, { x0: -1, x1: 2, y0: 0, y1: 3 })).toBeNull();
  });
});

describe('a curve plot', () => {
  const svg = parse(plotSvg(curve, OPTIONS));
  const { x: sx, y: sy } = scales(curve);

  it('titles each axis with its unit, written readably', () => {
    expect(text(svg, 'y-axis label')).toContain('Brho (T·m)');
    expect(text(svg, 'x-axis label')).toContain('T_kin (MeV)');
  });

  it('tells series apart by colour, dash pattern and marker, and names them in a legend', () => {
    const a = svg.querySelector('path[aria-label="series protons"]')!;
    const b = svg.querySelector('path[aria-label="series helium ions"]')!;
    const style = (p: Element) => ({
      stroke: p.parentElement!.getAttribute('stroke'),
      dash: p.parentElement!.getAttribute('stroke-dasharray'),
    });
    expect(style(a).stroke).toBe(SERIES_COLORS[0]);
    expect(style(b).stroke).toBe(SERIES_COLORS[1]);
    expect(style(a).dash).not.toBe(style(b).dash);
    const markerA = svg.querySelector('path[aria-label="markers protons"]')!.getAttribute('d');
    const markerB = svg.querySelector('path[aria-label="markers helium ions"]')!.getAttribute('d');
    expect(markerA).not.toBe(markerB);
    expect(text(svg, 'legend')).toContain('protons');
    expect(text(svg, 'legend')).toContain('helium ions');
    const drawn = pathPoints(b.getAttribute('d')!);
    drawn.forEach(([px, py], i) => {
      expect(Math.abs(px - sx.apply(curve.series[1].points[i][0]))).toBeLessThan(0.0011);
      expect(Math.abs(py - sy.apply(curve.series[1].points[i][1]))).toBeLessThan(0.0011);
    });
  });

  it('has no legend for a single series', () => {
    const one = parse(plotSvg({ ...curve, series: [curve.series[0]] }, OPTIONS));
    expect(one.querySelector('g[aria-label="legend"]')).toBeNull();
  });
});

describe('unit labels', () => {
  it('write products with a half-high dot, powers as superscripts and micro as µ', () => {
    // ISO 80000-1 §7.1.3 and the SI Brochure §5.4.3 (products and quotients of units).
    expect(unitLabel('T m')).toBe('T·m');
    expect(unitLabel('m / s^2')).toBe('m/s²');
    expect(unitLabel('kg m^2 / s^2')).toBe('kg·m²/s²');
    expect(unitLabel('J / (kg K)')).toBe('J/(kg·K)');
    expect(unitLabel('us')).toBe('µs');
    expect(unitLabel('m s^-1')).toBe('m/s');
    expect(unitLabel('1 / s')).toBe('1/s');
    expect(unitLabel(null)).toBe('');
  });
});

describe('a design limit and table data on a curve plot', () => {
  // A dipole field against kinetic energy, its limit and measured points (numbers for the picture
  // only, no published source).
  const limited: PlotData = {
    kind: 'curve',
    x: { label: 'T_kin', unit: 'MeV' },
    y: { label: 'B_dip', unit: 'T' },
    series: [
      {
        name: 'B_dip',
        points: [
          [70, 0.82],
          [150, 1.22],
          [250, 1.62],
        ],
      },
    ],
    limits: [{ name: 'B_max', value: 1.8 }],
    data: [
      {
        name: 'energies.B',
        x: 'energies.T',
        y: 'energies.B',
        points: [
          [70.1, 0.818],
          [180.7, 1.3592],
          [249.9, 1.6207],
        ],
      },
    ],
  };
  const svg = parse(plotSvg(limited, OPTIONS));
  const { x: sx, y: sy } = scales(limited);

  it('draws the limit as one dashed horizontal line at exactly its value on the y scale', () => {
    const lines = [...svg.querySelectorAll('line[aria-label="design limit B_max"]')];
    expect(lines).toHaveLength(1);
    const line = lines[0];
    expect(Number(line.getAttribute('y1'))).toBe(sy.apply(1.8));
    expect(Number(line.getAttribute('y2'))).toBe(sy.apply(1.8));
    expect(line.parentElement!.getAttribute('stroke-dasharray')).toBeTruthy();
    // Not a curve: no series path is drawn for the limit.
    expect(svg.querySelector('path[aria-label="series B_max"]')).toBeNull();
    // Inside the frame, not on its edge.
    expect(sy.apply(1.8)).toBeGreaterThan(Math.min(...sy.range));
  });

  it('labels the limit with its name and value inside the figure, and says in the legend that it is the limit', () => {
    const label = svg.querySelector('text[aria-label="design limit label B_max"]')!;
    expect(label.textContent).toBe('B_max = 1.8 T limit');
    expect(label.getAttribute('text-anchor')).toBe('end');
    expect(Number(label.getAttribute('x'))).toBeLessThanOrEqual(640);
    expect(text(svg, 'legend')).toContain('B_max = 1.8 T (design limit)');
    expect(text(svg, 'legend')).toContain('B_dip');
  });

  it('draws each table row as an outlined marker at its point, named in the legend as table data', () => {
    const marks = [...svg.querySelectorAll('path[aria-label="table data energies.B"]')];
    expect(marks).toHaveLength(3);
    marks.forEach((m, i) => {
      const [, tx, ty] = /translate\(([-\d.e]+),([-\d.e]+)\)/.exec(m.getAttribute('transform')!)!.map(Number);
      expect(tx).toBeCloseTo(sx.apply(limited.data![0].points[i][0]), 6);
      expect(ty).toBeCloseTo(sy.apply(limited.data![0].points[i][1]), 6);
    });
    // Outlined (white inside), a shape other than the curve's filled circles.
    const group = marks[0].parentElement!;
    expect(group.getAttribute('fill')).toBe('#ffffff');
    expect(marks[0].getAttribute('d')).not.toBe(
      svg.querySelector('path[aria-label="markers B_dip"]')!.getAttribute('d'),
    );
    expect(text(svg, 'legend')).toContain('energies.B (table data)');
  });

  it('breaks a legend label longer than the figure into lines within its width', () => {
    const narrow = {
      ...limited,
      limits: [{ name: 'B_max_of_the_main_dipole_at_the_gantry_entrance_per_spec', value: 1.8 }],
    };
    const out = parse(plotSvg(narrow, { width: 240 }));
    const texts = [...out.querySelectorAll('g[aria-label="legend"] text')];
    expect(texts.length).toBeGreaterThan(3);
    const left = Number(
      /translate\(([-\d.]+),/.exec(out.querySelector('g[aria-label="legend"]')!.getAttribute('transform')!)![1],
    );
    for (const t of texts)
      expect(left + Number(t.getAttribute('x')) + (t.textContent ?? '').length * 11 * 0.52).toBeLessThanOrEqual(240);
  });
});

describe('the label of a horizon whose line is short', () => {
  // The horizon 0.38 ly away and events up to ct = 0.1 ly: its line crosses only the lower left corner.
  const short: PlotData = {
    kind: 'spacetime',
    x: { label: 'x', unit: 'ly' },
    y: { label: 'ct', unit: 'ly' },
    series: [{ name: 'worldline at 25 m/s²', points: worldline(0.1, 20) }],
    horizons: [{ name: 'Rindler horizon of the probe accelerating at 25 m/s² from the pad', distance: horizon }],
  };
  const svg = parse(plotSvg(short, { width: 390 }));

  it('is left off the line when it cannot lie along it within the figure, and the legend names the horizon in full', () => {
    expect(svg.querySelector('text[aria-label="horizon label"]')).toBeNull();
    expect(text(svg, 'legend')).toContain('horizon Rindler horizon of the probe accelerating at 25 m/s² from the pad');
  });

  it('is shortened to the name where only the name fits, ending inside the figure', () => {
    const named = parse(plotSvg({ ...short, horizons: [{ name: 'd_h', distance: horizon }] }, { width: 390 }));
    const label = named.querySelector('text[aria-label="horizon label"]')!;
    expect(label.textContent).toBe('d_h');
    const [, tx, ty] = /translate\(([-\d.e]+),([-\d.e]+)\)/.exec(label.getAttribute('transform')!)!.map(Number);
    // Rotated 45° up, its start runs down-left from (tx, ty): three glyphs of at most 0.62 em.
    const run = 3 * 11 * 0.62 * Math.SQRT1_2;
    expect(tx - run).toBeGreaterThanOrEqual(58);
    expect(ty + run).toBeLessThanOrEqual(Number(named.getAttribute('height')));
    expect(text(named, 'legend')).toContain('horizon d_h: x = ct − 0.3800 ly');
  });
});
