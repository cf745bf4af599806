// One figure for a statement's plot, built with Observable Plot on whatever Document it is given:
// the browser's in the app (components/calc/plot-view.tsx), a jsdom document on the server for the
// SVG text (plot-svg.ts) and for the issued PDF (lib/issue/pdf/svg-to-pdf.tsx). Same numbers, same
// drawing. Series differ by colour (Okabe & Ito's colour-blind-safe hues, darkened where needed
// to reach 3:1 against white for WCAG 2.2 1.4.11), by dash pattern and, on short series, by marker
// shape, so they can be told apart without colour and in a black-and-white print.
import * as Plot from '@observablehq/plot';
import { formatNumberText } from '@/lib/calc/format';
import type { PlotData } from '@/lib/calc/types';
import { axisLabel, unitLabel } from '@/lib/calc/unit-label';

export interface PlotFigureOptions {
  /** Outer width in pixels (points in the PDF). Default 640. */
  width?: number;
  /** Outer height of a curve plot; the largest height of a space-time diagram. Default 400 and 480. */
  height?: number;
  /** Default: the faces shipped in fonts/ ("Source Sans 3"), then the system's. */
  fontFamily?: string;
  /** Default 11. */
  fontSize?: number;
}

const PLOT_FONT_FAMILY = "'Source Sans 3', system-ui, sans-serif";

/** Series styles in order; the seventh series starts again with the first colour but a new dash and marker. */
export const SERIES_COLORS = ['#0072b2', '#d55e00', '#007a5a', '#a8527e', '#17212b'] as const;
const SERIES_DASHES = [null, '8 3', '2 2.5', '10 3 2 3', '5 2 1 2 1 2', '1.5 4'] as const;
const MARKERS_UP_TO = 40;

const LIGHT_COLOR = '#7d7768';
const LIGHT_DASH = '4 3';
const HORIZON_COLOR = '#6f4500';
const HORIZON_DASH = '12 3 3 3';
/** Design limits: a dark red long dash, unlike any series' colour or dash. */
const LIMIT_COLOR = '#9b1c31';
const LIMIT_DASH = '9 3 1.5 3';

type PathSink = {
  moveTo(x: number, y: number): void;
  lineTo(x: number, y: number): void;
  bezierCurveTo(a: number, b: number, c: number, d: number, x: number, y: number): void;
  closePath(): void;
};
interface SymbolType {
  draw(context: PathSink, size: number): void;
}

const K = 0.5522847498; // cubic Bézier control distance of a quarter circle
/** Marker shapes of equal area (`size` is the area in px², as d3's symbols take it); a circle as four cubics, no arcs. */
const MARKERS: Record<string, SymbolType> = {
  circle: {
    draw(c, size) {
      const r = Math.sqrt(size / Math.PI);
      c.moveTo(r, 0);
      c.bezierCurveTo(r, r * K, r * K, r, 0, r);
      c.bezierCurveTo(-r * K, r, -r, r * K, -r, 0);
      c.bezierCurveTo(-r, -r * K, -r * K, -r, 0, -r);
      c.bezierCurveTo(r * K, -r, r, -r * K, r, 0);
      c.closePath();
    },
  },
  square: {
    draw(c, size) {
      const h = Math.sqrt(size) / 2;
      c.moveTo(-h, -h);
      c.lineTo(h, -h);
      c.lineTo(h, h);
      c.lineTo(-h, h);
      c.closePath();
    },
  },
  triangle: {
    draw(c, size) {
      // Equilateral, pointing up, centred on its centroid.
      const s = Math.sqrt((4 * size) / Math.sqrt(3));
      const h = (s * Math.sqrt(3)) / 2;
      c.moveTo(0, (-2 * h) / 3);
      c.lineTo(s / 2, h / 3);
      c.lineTo(-s / 2, h / 3);
      c.closePath();
    },
  },
  diamond: {
    draw(c, size) {
      const d = Math.sqrt(size / 2);
      c.moveTo(0, -d * 1.2);
      c.lineTo(d / 1.2, 0);
      c.lineTo(0, d * 1.2);
      c.lineTo(-d / 1.2, 0);
      c.closePath();
    },
  },
  'triangle-down': {
    draw(c, size) {
      const s = Math.sqrt((4 * size) / Math.sqrt(3));
      const h = (s * Math.sqrt(3)) / 2;
      c.moveTo(0, (2 * h) / 3);
      c.lineTo(s / 2, -h / 3);
      c.lineTo(-s / 2, -h / 3);
      c.closePath();
    },
  },
  plus: {
    draw(c, size) {
      const a = Math.sqrt(size / 5) / 2;
      const b = 3 * a;
      c.moveTo(-a, -b);
      c.lineTo(a, -b);
      c.lineTo(a, -a);
      c.lineTo(b, -a);
      c.lineTo(b, a);
      c.lineTo(a, a);
      c.lineTo(a, b);
      c.lineTo(-a, b);
      c.lineTo(-a, a);
      c.lineTo(-b, a);
      c.lineTo(-b, -a);
      c.lineTo(-a, -a);
      c.closePath();
    },
  },
};
const MARKER_ORDER = ['circle', 'square', 'triangle', 'diamond', 'triangle-down', 'plus'] as const;

interface SeriesStyle {
  color: string;
  dash: string | null;
  marker: (typeof MARKER_ORDER)[number];
}

/** The style of series number `i` (0-based). */
function seriesStyle(i: number): SeriesStyle {
  return {
    color: SERIES_COLORS[i % SERIES_COLORS.length],
    dash: SERIES_DASHES[i % SERIES_DASHES.length],
    marker: MARKER_ORDER[i % MARKER_ORDER.length],
  };
}

function symbolPath(marker: string, size: number, dx: number, dy: number): string {
  const r = (v: number) => String(Math.round(v * 1000) / 1000);
  let d = '';
  MARKERS[marker].draw(
    {
      moveTo: (x, y) => (d += `M${r(x + dx)},${r(y + dy)}`),
      lineTo: (x, y) => (d += `L${r(x + dx)},${r(y + dy)}`),
      bezierCurveTo: (a, b, c2, e, x, y) =>
        (d += `C${r(a + dx)},${r(b + dy)},${r(c2 + dx)},${r(e + dy)},${r(x + dx)},${r(y + dy)}`),
      closePath: () => (d += 'Z'),
    },
    size,
  );
  return d;
}

/** Tick labels the way results are written: U+2212 minus, thin-space groups, × 10ⁿ beyond 10⁶ or below 10⁻³. */
export function tickText(value: number): string {
  return formatNumberText(value, 10, { trailingZeros: false });
}

/** The x and ct axes of a space-time diagram carry one length unit. */
function spacetimeUnit(data: PlotData): string | null {
  return data.x.unit ?? data.y.unit;
}

/** Axis titles as drawn. */
export function plotAxisLabels(data: PlotData): { x: string; y: string } {
  if (data.kind === 'spacetime') {
    const unit = spacetimeUnit(data);
    return { x: axisLabel('x', unit), y: axisLabel('ct', unit) };
  }
  return { x: axisLabel(data.x.label, data.x.unit), y: axisLabel(data.y.label, data.y.unit) };
}

/** One sentence saying what the figure shows, for its caption and its text alternative. */
export function plotDescription(data: PlotData): string {
  const labels = plotAxisLabels(data);
  const names = data.series.map((s) => s.name).join(', ');
  const count = `${data.series.length} series${names ? ` (${names})` : ''}`;
  if (data.kind === 'spacetime') {
    const unit = unitLabel(spacetimeUnit(data));
    const horizons = (data.horizons ?? []).map(
      (h) => `horizon ${h.name}: x = ct − ${formatNumberText(h.distance, 6)}${unit ? ` ${unit}` : ''}`,
    );
    return `Space-time diagram, ${labels.y} against ${labels.x}, equal scales: ${count}; light lines x = ±ct${horizons.length ? `; ${horizons.join('; ')}` : ''}.`;
  }
  const unit = unitLabel(data.y.unit);
  const limits = (data.limits ?? []).map((l) => `design limit ${limitText(l, unit)}`);
  const tables = (data.data ?? []).map((d) => `${d.points.length} points of ${d.y} against ${d.x} (table data)`);
  const more = [...limits, ...tables];
  return `Plot of ${labels.y} against ${labels.x}: ${count}${more.length ? `; ${more.join('; ')}` : ''}.`;
}

/** "B_max = 1.8 T": a design limit's name and value in the axis unit. */
function limitText(limit: { name: string; value: number }, unit: string): string {
  return `${limit.name} = ${formatNumberText(limit.value, 6, { trailingZeros: false })}${unit ? ` ${unit}` : ''}`;
}

/** A horizon's label: "d_h: x = ct − 0.38 ly". */
function horizonText(h: { name: string; distance: number }, unit: string): string {
  return `${h.name}: x = ct − ${formatNumberText(h.distance, 4)}${unit ? ` ${unit}` : ''}`;
}

type Box = { x0: number; x1: number; y0: number; y1: number };

/** The part of the line x = s·ct + b (s = ±1) inside the box, as two [x, ct] ends, or null. */
export function clip45(s: 1 | -1, b: number, box: Box): [[number, number], [number, number]] | null {
  const a = (box.x0 - b) / s;
  const c = (box.x1 - b) / s;
  const lo = Math.max(box.y0, Math.min(a, c));
  const hi = Math.min(box.y1, Math.max(a, c));
  if (!(hi > lo)) return null;
  return [
    [s * lo + b, lo],
    [s * hi + b, hi],
  ];
}

function extent(values: number[]): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return lo <= hi ? [lo, hi] : [0, 1];
}

/** Widens an empty or zero-width interval so a scale can be made of it. */
function widen([lo, hi]: [number, number]): [number, number] {
  if (hi > lo) return [lo, hi];
  const d = lo === 0 ? 1 : Math.abs(lo) * 0.1;
  return [lo - d, hi + d];
}

interface Layout {
  width: number;
  height: number;
  marginLeft: number;
  marginRight: number;
  marginTop: number;
  marginBottom: number;
}

interface LegendItem {
  label: string;
  color: string;
  /** Null: a solid line; undefined with `line: false`: no line (points of a table). */
  dash: string | null;
  marker: string | null;
  strokeWidth: number;
  /** Drawn without its line sample (markers only). */
  line?: boolean;
  /** An outlined marker (table data) rather than a filled one (a curve's points). */
  hollow?: boolean;
}

interface LegendRow {
  items: Array<{ item: LegendItem; lines: string[]; x: number }>;
  height: number;
}

const LEGEND_ROW = 18;
const LEGEND_SAMPLE = 30;

/** Rough text width (Source Sans 3 averages about 0.5 em per character). */
const textWidth = (s: string, fontSize: number) => s.length * fontSize * 0.52;
/**
 * A generous text width, for deciding whether a label fits where it is placed: Source Sans 3's
 * widest common glyphs (m, w, digits, capitals) run to about 0.6 em, and a fallback face wider.
 */
const fitWidth = (s: string, fontSize: number) => s.length * fontSize * 0.62;

/** A label broken at spaces (or anywhere, for a word too long) into lines no wider than `room`. */
function wrapText(label: string, room: number, fontSize: number): string[] {
  const perLine = Math.max(4, Math.floor(room / (fontSize * 0.62)));
  if (label.length <= perLine) return [label];
  const lines: string[] = [];
  let line = '';
  for (const word of label.split(' ')) {
    let w = word;
    while (w.length > perLine) {
      if (line) lines.push(line);
      line = '';
      lines.push(w.slice(0, perLine));
      w = w.slice(perLine);
    }
    if (!line) line = w;
    else if (line.length + 1 + w.length <= perLine) line += ` ${w}`;
    else {
      lines.push(line);
      line = w;
    }
  }
  if (line) lines.push(line);
  return lines;
}

/**
 * The legend in rows no wider than `width`: items side by side while they fit, a label longer than
 * a whole row broken into lines under one another, so that no text runs past the figure's edge.
 */
function legendRows(items: LegendItem[], width: number, fontSize: number): LegendRow[] {
  const rows: LegendRow[] = [];
  let row: LegendRow = { items: [], height: LEGEND_ROW };
  let used = 0;
  const room = width - LEGEND_SAMPLE - 6;
  for (const item of items) {
    const lines = wrapText(item.label, room, fontSize);
    const w =
      LEGEND_SAMPLE + 6 + Math.max(...lines.map((l) => Math.max(textWidth(l, fontSize), fitWidth(l, fontSize)))) + 18;
    if (row.items.length && used + w > width) {
      rows.push(row);
      row = { items: [], height: LEGEND_ROW };
      used = 0;
    }
    row.items.push({ item, lines, x: used });
    row.height = Math.max(row.height, lines.length * LEGEND_ROW);
    used += w;
  }
  if (row.items.length) rows.push(row);
  return rows;
}

function drawLegend(svg: SVGSVGElement, document: Document, rows: LegendRow[], left: number, top: number): void {
  const ns = 'http://www.w3.org/2000/svg';
  const g = document.createElementNS(ns, 'g');
  g.setAttribute('aria-label', 'legend');
  g.setAttribute('transform', `translate(${left},${top})`);
  let rowTop = 0;
  for (const row of rows) {
    const y = rowTop + LEGEND_ROW / 2;
    for (const { item, lines, x } of row.items) {
      if (item.line !== false) {
        const line = document.createElementNS(ns, 'line');
        line.setAttribute('x1', String(x));
        line.setAttribute('x2', String(x + LEGEND_SAMPLE));
        line.setAttribute('y1', String(y));
        line.setAttribute('y2', String(y));
        line.setAttribute('stroke', item.color);
        line.setAttribute('stroke-width', String(item.strokeWidth));
        if (item.dash) line.setAttribute('stroke-dasharray', item.dash);
        g.appendChild(line);
      }
      if (item.marker) {
        const path = document.createElementNS(ns, 'path');
        path.setAttribute('d', symbolPath(item.marker, item.hollow ? 38 : 22, x + LEGEND_SAMPLE / 2, y));
        if (item.hollow) {
          path.setAttribute('fill', '#ffffff');
          path.setAttribute('stroke', item.color);
          path.setAttribute('stroke-width', '1.25');
        } else path.setAttribute('fill', item.color);
        g.appendChild(path);
      }
      lines.forEach((l, k) => {
        const text = document.createElementNS(ns, 'text');
        text.setAttribute('x', String(x + LEGEND_SAMPLE + 6));
        text.setAttribute('y', String(y + k * LEGEND_ROW));
        text.setAttribute('dy', '0.32em');
        text.setAttribute('text-anchor', 'start');
        text.setAttribute('fill', 'currentColor');
        text.textContent = l;
        g.appendChild(text);
      });
    }
    rowTop += row.height;
  }
  svg.appendChild(g);
}

/** The longest tick label's width on the y axis, from a figure already drawn. */
function yTickWidth(svg: SVGSVGElement, fontSize: number): number {
  const labels = [...svg.querySelectorAll('g[aria-label="y-axis tick label"] text')].map((t) => t.textContent ?? '');
  return Math.max(0, ...labels.map((l) => textWidth(l, fontSize)));
}

/**
 * Where a horizon's label goes along its line x = ct − d (clipped to the frame as `seg`): its end at
 * the point of the line, from 90 % of the way up downwards, where the whole rotated text (a box of
 * its estimated width and one font height, 4 px off the line) lies within `frame`; the first of
 * `texts` that fits somewhere. Null when none does.
 */
function horizonLabelPlace(
  seg: [[number, number], [number, number]],
  px: (x: number) => number,
  py: (ct: number) => number,
  frame: { left: number; right: number; top: number; bottom: number },
  fontSize: number,
  texts: string[],
): { at: [number, number]; text: string } | null {
  const [[ax, ay], [bx, by]] = seg;
  const r = Math.SQRT1_2;
  for (const text of texts) {
    const L = fitWidth(text, fontSize);
    const F = fontSize * 1.2;
    for (let f = 0.9; f >= 0.05; f -= 0.05) {
      const at: [number, number] = [ax + (bx - ax) * f, ay + (by - ay) * f];
      // The text's end, 4 px up and left of the line; it runs down-left from there along the line.
      const ex = px(at[0]) - 4;
      const ey = py(at[1]) - 4;
      const corners = [
        [ex, ey],
        [ex - L * r, ey + L * r],
        [ex - F * r, ey - F * r],
        [ex - (L + F) * r, ey + (L - F) * r],
      ];
      if (corners.every(([x, y]) => x >= frame.left && x <= frame.right && y >= frame.top && y <= frame.bottom))
        return { at, text };
    }
  }
  return null;
}

/**
 * Each design limit's label on its line, at the right of the frame: "B_max = 1.8 T limit" above the
 * line (below it when the line runs along the top), the name alone when the whole does not fit the
 * frame's width, none when neither does (the legend names every limit in full).
 */
function drawLimitLabels(
  svg: SVGSVGElement,
  document: Document,
  limits: Array<{ name: string; value: number }>,
  unit: string,
  layout: Layout,
  fontSize: number,
): void {
  const ns = 'http://www.w3.org/2000/svg';
  const scale = (svg as unknown as { scale(name: 'y'): { apply(v: number): number } }).scale('y');
  const right = layout.width - layout.marginRight - 4;
  const room = right - layout.marginLeft - 4;
  const g = document.createElementNS(ns, 'g');
  g.setAttribute('aria-label', 'design limit labels');
  for (const l of limits) {
    const text = [`${limitText(l, unit)} limit`, `${l.name} limit`, l.name].find((t) => fitWidth(t, fontSize) <= room);
    if (!text) continue;
    const y = scale.apply(l.value);
    const above = y - 4 - fontSize >= 2;
    const t = document.createElementNS(ns, 'text');
    t.setAttribute('x', String(right));
    t.setAttribute('y', String(above ? y - 4 : y + 4));
    t.setAttribute('dy', above ? '0' : '0.8em');
    t.setAttribute('text-anchor', 'end');
    t.setAttribute('fill', LIMIT_COLOR);
    t.setAttribute('aria-label', `design limit label ${l.name}`);
    t.textContent = text;
    g.appendChild(t);
  }
  svg.appendChild(g);
}

/**
 * The figure of `data` as an SVG element of `document`. Curve plots: one line per series, axes titled
 * "label (unit)". Space-time diagrams: x across, ct up, one pixel per unit on both axes so that light
 * travels at 45°; dashed light lines x = ±ct through the origin; each horizon x = ct − d drawn and
 * named. A legend below the axes names the series (always on a space-time diagram, which also
 * explains the light lines; on a curve plot when there is more than one series).
 */
export function plotElement(data: PlotData, document: Document, options: PlotFigureOptions = {}): SVGSVGElement {
  const fontSize = options.fontSize ?? 11;
  const width = Math.max(200, options.width ?? 640);
  const spacetime = data.kind === 'spacetime';
  const maxHeight = Math.max(160, options.height ?? (spacetime ? 480 : 400));
  const labels = plotAxisLabels(data);
  const series = data.series.map((s, i) => ({
    ...s,
    style: seriesStyle(i),
    points: s.points.filter(([x, y]) => Number.isFinite(x) && Number.isFinite(y)),
  }));
  const markers = series.every((s) => s.points.length <= MARKERS_UP_TO);
  const yUnit = unitLabel(data.y.unit);
  const limits = spacetime ? [] : (data.limits ?? []).filter((l) => Number.isFinite(l.value));
  // Points of data tables: outlined markers without a line, in shapes after the curves' own.
  const tables = spacetime
    ? []
    : (data.data ?? []).map((d, i) => {
        const style = seriesStyle(series.length + i);
        return {
          ...d,
          color: style.color,
          marker: style.marker,
          points: d.points.filter(([x, y]) => Number.isFinite(x) && Number.isFinite(y)),
        };
      });
  const horizonUnit = unitLabel(spacetimeUnit(data));

  const legend: LegendItem[] = [];
  if (spacetime || series.length > 1 || limits.length || tables.length) {
    for (const s of series)
      legend.push({
        label: s.name,
        color: s.style.color,
        dash: s.style.dash,
        marker: markers ? s.style.marker : null,
        strokeWidth: 1.75,
      });
  }
  for (const t of tables)
    legend.push({
      label: `${t.name} (table data)`,
      color: t.color,
      dash: null,
      marker: t.marker,
      strokeWidth: 1,
      line: false,
      hollow: true,
    });
  for (const l of limits)
    legend.push({
      label: `${limitText(l, yUnit)} (design limit)`,
      color: LIMIT_COLOR,
      dash: LIMIT_DASH,
      marker: null,
      strokeWidth: 1.5,
    });
  const horizons = spacetime ? (data.horizons ?? []).filter((h) => Number.isFinite(h.distance)) : [];
  if (spacetime) {
    legend.push({ label: 'light lines x = ±ct', color: LIGHT_COLOR, dash: LIGHT_DASH, marker: null, strokeWidth: 1 });
    // Each horizon is named in full here too, whatever room its line leaves for its label.
    for (const h of horizons)
      legend.push({
        label: `horizon ${horizonText(h, horizonUnit)}`,
        color: HORIZON_COLOR,
        dash: HORIZON_DASH,
        marker: null,
        strokeWidth: 1.25,
      });
  }
  const legendWidth = Math.max(120, width - 60);
  const rows = legendRows(legend, legendWidth, fontSize);
  const legendHeight = rows.length ? rows.reduce((h, r) => h + r.height, 0) + 8 : 0;

  const xs = [...series, ...tables].flatMap((s) => s.points.map((p) => p[0]));
  const ys = [...series, ...tables].flatMap((s) => s.points.map((p) => p[1]));

  const build = (marginLeft: number): SVGSVGElement => {
    const layout: Layout = {
      width,
      height: maxHeight,
      marginLeft,
      marginRight: 24,
      marginTop: 20,
      marginBottom: 42 + legendHeight,
    };
    const marks: Plot.Markish[] = [];
    let xDomain: [number, number];
    let yDomain: [number, number];
    if (spacetime) {
      // Space-time: the origin, the events and where each horizon meets ct = 0 are inside.
      let [x0, x1] = widen(extent([0, ...xs, ...horizons.map((h) => -h.distance)]));
      let [y0, y1] = widen(extent([0, ...ys]));
      const padX = (x1 - x0) * 0.05;
      const padY = (y1 - y0) * 0.05;
      x0 -= padX;
      x1 += padX;
      y0 -= y0 < 0 ? padY : 0;
      y1 += padY;
      // One scale for both axes: the larger of the two spans per pixel; the other axis is widened
      // evenly to fill its room, so the figure keeps its width and light still travels at 45°.
      const innerW = width - layout.marginLeft - layout.marginRight;
      const innerHMax = maxHeight - layout.marginTop - layout.marginBottom;
      const k = Math.min(innerW / (x1 - x0), innerHMax / (y1 - y0));
      const extraX = innerW / k - (x1 - x0);
      x0 -= extraX / 2;
      x1 += extraX / 2;
      const innerH = (y1 - y0) * k;
      layout.height = layout.marginTop + layout.marginBottom + innerH;
      xDomain = [x0, x1];
      yDomain = [y0, y1];
      const box = { x0, x1, y0, y1 };
      marks.push(
        Plot.ruleX([0], { stroke: 'currentColor', strokeOpacity: 0.6, strokeWidth: 0.75, ariaLabel: () => 'ct axis' }),
      );
      marks.push(
        Plot.ruleY([0], { stroke: 'currentColor', strokeOpacity: 0.6, strokeWidth: 0.75, ariaLabel: () => 'x axis' }),
      );
      for (const s of [1, -1] as const) {
        const seg = clip45(s, 0, box);
        if (seg)
          marks.push(
            Plot.line(seg, {
              x: (d: [number, number]) => d[0],
              y: (d: [number, number]) => d[1],
              stroke: LIGHT_COLOR,
              strokeWidth: 1,
              strokeDasharray: LIGHT_DASH,
              ariaLabel: () => 'light line',
            }),
          );
      }
      const unit = horizonUnit;
      for (const h of horizons) {
        const seg = clip45(1, -h.distance, box);
        if (!seg) continue;
        marks.push(
          Plot.line(seg, {
            x: (d: [number, number]) => d[0],
            y: (d: [number, number]) => d[1],
            stroke: HORIZON_COLOR,
            strokeWidth: 1.25,
            strokeDasharray: HORIZON_DASH,
            ariaLabel: () => 'horizon',
          }),
        );
        // The name along the line, towards its upper end, just above it, where all of it lies
        // inside the frame (or the top margin); else the name alone; else none (the legend has it).
        const px = (x: number) => layout.marginLeft + (x - x0) * k;
        const py = (ct: number) => layout.marginTop + (y1 - ct) * k;
        const frame = {
          left: layout.marginLeft,
          right: width - 2,
          top: 2,
          bottom: layout.marginTop + innerH,
        };
        const place = horizonLabelPlace(seg, px, py, frame, fontSize, [horizonText(h, unit), h.name]);
        if (place)
          marks.push(
            Plot.text([place.at], {
              x: (d: [number, number]) => d[0],
              y: (d: [number, number]) => d[1],
              text: () => place.text,
              rotate: -45,
              textAnchor: 'end',
              lineAnchor: 'bottom',
              // Off the line by 4√2 px at right angles, so descenders clear it.
              dx: -4,
              dy: -4,
              fill: HORIZON_COLOR,
              ariaLabel: () => 'horizon label',
            }),
          );
      }
    } else {
      xDomain = widen(extent(xs));
      // Each limit is inside the y domain, so its line is always drawn.
      yDomain = widen(extent([...ys, ...limits.map((l) => l.value)]));
      if (limits.length) {
        // Room above and below, so that a limit at the end of the range is not the frame's edge.
        const pad = (yDomain[1] - yDomain[0]) * 0.06;
        yDomain = [yDomain[0] - pad, yDomain[1] + pad];
      }
      // Under the curves, so that a curve crossing a limit stays visible.
      for (const l of limits)
        marks.push(
          Plot.ruleY([l.value], {
            stroke: LIMIT_COLOR,
            strokeWidth: 1.5,
            strokeDasharray: LIMIT_DASH,
            ariaLabel: () => `design limit ${l.name}`,
          }),
        );
    }
    series.forEach((s) => {
      const st = s.style;
      marks.push(
        Plot.line(s.points, {
          x: (d: [number, number]) => d[0],
          y: (d: [number, number]) => d[1],
          stroke: st.color,
          strokeWidth: 1.75,
          ...(st.dash ? { strokeDasharray: st.dash } : {}),
          ariaLabel: () => `series ${s.name}`,
        }),
      );
      if (markers && s.points.length > 0) {
        marks.push(
          Plot.dot(s.points, {
            x: (d: [number, number]) => d[0],
            y: (d: [number, number]) => d[1],
            symbol: MARKERS[st.marker],
            r: 3,
            fill: st.color,
            stroke: 'none',
            ariaLabel: () => `markers ${s.name}`,
          }),
        );
      }
    });
    for (const t of tables) {
      if (!t.points.length) continue;
      marks.push(
        Plot.dot(t.points, {
          x: (d: [number, number]) => d[0],
          y: (d: [number, number]) => d[1],
          symbol: MARKERS[t.marker],
          r: 4,
          fill: '#ffffff',
          stroke: t.color,
          strokeWidth: 1.25,
          ariaLabel: () => `table data ${t.name}`,
        }),
      );
    }
    const svg = Plot.plot({
      document,
      ...layout,
      x: {
        domain: xDomain,
        nice: !spacetime,
        inset: 0,
        label: labels.x,
        labelAnchor: 'center',
        labelArrow: 'none',
        labelOffset: 34,
        grid: true,
        tickFormat: tickText,
      },
      y: {
        domain: yDomain,
        nice: !spacetime,
        inset: 0,
        label: labels.y,
        labelAnchor: 'center',
        labelArrow: 'none',
        labelOffset: marginLeft - 6,
        grid: true,
        tickFormat: tickText,
      },
      marks,
    }) as SVGSVGElement;
    svg.setAttribute('font-family', options.fontFamily ?? PLOT_FONT_FAMILY);
    svg.setAttribute('font-size', String(fontSize));
    if (limits.length) drawLimitLabels(svg, document, limits, yUnit, layout, fontSize);
    if (rows.length)
      drawLegend(svg, document, rows, Math.min(layout.marginLeft, width - legendWidth), layout.height - legendHeight);
    return svg;
  };

  // Drawn once to learn how wide the y tick labels are, again with room for them and the y title.
  const first = build(58);
  const needed = Math.ceil(yTickWidth(first, fontSize) + 9 + fontSize * 1.6 + 6);
  return needed > 58 ? build(needed) : first;
}
