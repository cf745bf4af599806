// An SVG element tree (Observable Plot's figure on a jsdom document, lib/plots/) redrawn with
// react-pdf's SVG primitives, so a plot in the issued PDF is vector graphics from the same drawing
// the app shows. Everything is resolved here rather than left to react-pdf: the presentation
// attributes each element inherits (including `currentColor` and `style="…"` declarations), the
// transforms composed down the tree into one matrix per element, text offsets in em (Plot's
// `y="0.32em"`, `dy`), and the text face (always one registered for the PDF, lib/issue/pdf/fonts.ts).
// Groups are kept as plain `G`s; `<style>`, `<title>`, `<defs>` and anything unknown are dropped.
import { Circle, Ellipse, G, Line, Path, Polygon, Polyline, Rect, Svg, Text } from '@react-pdf/renderer';
import type { ReactElement } from 'react';
import type { PlotData } from '@/lib/calc/types';
import type { PlotFigureOptions } from '@/lib/plots/plot-figure';
import { serverPlotElement } from '@/lib/plots/plot-svg';
import { IDENTITY, multiply, type Matrix } from './affine';
import { TEXT_FONT } from './fonts';

const INK = '#17212b';

/** An SVG `transform` attribute as one matrix (translate, scale, rotate with or without centre, skewX, skewY, matrix). */
export function parseTransform(value: string | null): Matrix {
  let m: Matrix = IDENTITY;
  if (!value) return m;
  for (const [, op, args] of value.matchAll(/([a-zA-Z]+)\s*\(([^)]*)\)/g)) {
    const a = (args.match(/[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?/g) ?? []).map(Number);
    let t: Matrix = IDENTITY;
    switch (op) {
      case 'matrix':
        if (a.length === 6) t = a as Matrix;
        break;
      case 'translate':
        t = [1, 0, 0, 1, a[0] ?? 0, a[1] ?? 0];
        break;
      case 'scale':
        t = [a[0] ?? 1, 0, 0, a[1] ?? a[0] ?? 1, 0, 0];
        break;
      case 'rotate': {
        const r = ((a[0] ?? 0) * Math.PI) / 180;
        const cos = Math.cos(r);
        const sin = Math.sin(r);
        t = [cos, sin, -sin, cos, 0, 0];
        if (a.length >= 3) t = multiply(multiply([1, 0, 0, 1, a[1], a[2]], t), [1, 0, 0, 1, -a[1], -a[2]]);
        break;
      }
      case 'skewX':
        t = [1, 0, Math.tan(((a[0] ?? 0) * Math.PI) / 180), 1, 0, 0];
        break;
      case 'skewY':
        t = [1, Math.tan(((a[0] ?? 0) * Math.PI) / 180), 0, 1, 0, 0];
        break;
    }
    m = multiply(m, t);
  }
  return m;
}

/** What an element inherits from its ancestors (SVG 1.1 inherited properties), resolved. */
interface Paint {
  color: string;
  fill: string | null;
  stroke: string | null;
  strokeWidth: number;
  strokeDasharray: string | null;
  strokeLinecap: string | null;
  strokeLinejoin: string | null;
  fillOpacity: number;
  strokeOpacity: number;
  fontSize: number;
  fontWeight: number;
  fontStyle: 'normal' | 'italic';
  textAnchor: 'start' | 'middle' | 'end';
}

const ROOT_PAINT: Paint = {
  color: INK,
  fill: '#000000',
  stroke: null,
  strokeWidth: 1,
  strokeDasharray: null,
  strokeLinecap: null,
  strokeLinejoin: null,
  fillOpacity: 1,
  strokeOpacity: 1,
  fontSize: 16,
  fontWeight: 400,
  fontStyle: 'normal',
  textAnchor: 'start',
};

/** The element's own presentation attributes, with `style="…"` declarations taking precedence. */
function declarations(el: Element): Map<string, string> {
  const out = new Map<string, string>();
  for (const attr of Array.from(el.attributes)) out.set(attr.name, attr.value.trim());
  const style = el.getAttribute('style');
  if (style) {
    for (const decl of style.split(';')) {
      const i = decl.indexOf(':');
      if (i > 0)
        out.set(
          decl.slice(0, i).trim().toLowerCase(),
          decl
            .slice(i + 1)
            .replace(/!important/, '')
            .trim(),
        );
    }
  }
  return out;
}

/** A length in user units: "12", "12px", "0.71em" (against `fontSize`); null when absent or unreadable. */
export function parseLength(value: string | null | undefined, fontSize: number): number | null {
  if (value === null || value === undefined || value === '') return null;
  const m = /^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(px|em|pt)?\s*$/.exec(value);
  if (!m) return null;
  const n = Number(m[1]);
  if (m[2] === 'em') return n * fontSize;
  if (m[2] === 'pt') return (n * 4) / 3;
  return n;
}

/** A paint value: none → null; currentColor → the inherited colour; a CSS variable → white (Plot uses one only for halos behind text). */
function resolveColor(value: string, color: string): string | null {
  const v = value.trim();
  if (v === 'none' || v === 'transparent') return null;
  if (v === 'currentColor' || v === 'currentcolor') return color;
  if (v.startsWith('var(')) return '#ffffff';
  if (v.startsWith('url(')) return null;
  return v;
}

function inherit(parent: Paint, d: Map<string, string>): Paint {
  const p: Paint = { ...parent };
  const fontSize = d.get('font-size');
  if (fontSize) p.fontSize = parseLength(fontSize, parent.fontSize) ?? parent.fontSize;
  const color = d.get('color');
  if (color) p.color = resolveColor(color, parent.color) ?? parent.color;
  const fill = d.get('fill');
  if (fill) p.fill = resolveColor(fill, p.color);
  const stroke = d.get('stroke');
  if (stroke) p.stroke = resolveColor(stroke, p.color);
  const sw = d.get('stroke-width');
  if (sw) p.strokeWidth = parseLength(sw, p.fontSize) ?? p.strokeWidth;
  const dash = d.get('stroke-dasharray');
  if (dash) p.strokeDasharray = dash === 'none' ? null : dash.replace(/,/g, ' ');
  const cap = d.get('stroke-linecap');
  if (cap) p.strokeLinecap = cap;
  const join = d.get('stroke-linejoin');
  if (join) p.strokeLinejoin = join;
  const fo = d.get('fill-opacity');
  if (fo) p.fillOpacity = Number(fo);
  const so = d.get('stroke-opacity');
  if (so) p.strokeOpacity = Number(so);
  // Group opacity is not inherited in SVG, but folding it into the descendants' paint opacities
  // draws the same for Plot's figures, whose shapes inside one group do not overlap.
  const opacity = d.get('opacity');
  if (opacity && Number.isFinite(Number(opacity))) {
    p.fillOpacity *= Number(opacity);
    p.strokeOpacity *= Number(opacity);
  }
  const weight = d.get('font-weight');
  if (weight)
    p.fontWeight =
      weight === 'bold' || weight === 'bolder' ? 700 : weight === 'normal' ? 400 : Number(weight) >= 600 ? 700 : 400;
  const style = d.get('font-style');
  if (style) p.fontStyle = style === 'italic' || style === 'oblique' ? 'italic' : 'normal';
  const anchor = d.get('text-anchor');
  if (anchor === 'start' || anchor === 'middle' || anchor === 'end') p.textAnchor = anchor;
  return p;
}

const round = (n: number) => Math.round(n * 1000) / 1000;

function matrixAttr(m: Matrix): string | undefined {
  if (m[0] === 1 && m[1] === 0 && m[2] === 0 && m[3] === 1 && m[4] === 0 && m[5] === 0) return undefined;
  return `matrix(${m.map(round).join(',')})`;
}

/** The paint props of a shape: only what is drawn (react-pdf strokes or fills whatever it is given). */
function shapeProps(p: Paint, m: Matrix, filled: boolean) {
  const props: Record<string, unknown> = {};
  const transform = matrixAttr(m);
  if (transform) props.transform = transform;
  if (filled && p.fill) {
    props.fill = p.fill;
    if (p.fillOpacity !== 1) props.fillOpacity = p.fillOpacity;
  }
  if (p.stroke && p.strokeWidth > 0) {
    props.stroke = p.stroke;
    props.strokeWidth = p.strokeWidth;
    if (p.strokeOpacity !== 1) props.strokeOpacity = p.strokeOpacity;
    if (p.strokeDasharray) props.strokeDasharray = p.strokeDasharray;
    if (p.strokeLinecap) props.strokeLinecap = p.strokeLinecap;
    if (p.strokeLinejoin) props.strokeLinejoin = p.strokeLinejoin;
  }
  return props;
}

const num = (el: Element, name: string, fontSize: number) => parseLength(el.getAttribute(name), fontSize) ?? 0;

/** The text's runs: its own text, or one run per `<tspan>` with its position. */
function textRuns(el: Element, p: Paint): Array<{ text: string; x: number; y: number; paint: Paint }> {
  const x = num(el, 'x', p.fontSize) + num(el, 'dx', p.fontSize);
  const y = num(el, 'y', p.fontSize) + num(el, 'dy', p.fontSize);
  const spans = Array.from(el.children).filter((c) => c.tagName.toLowerCase() === 'tspan');
  if (spans.length === 0) return [{ text: el.textContent ?? '', x, y, paint: p }];
  const runs: Array<{ text: string; x: number; y: number; paint: Paint }> = [];
  let cy = y;
  for (const span of spans) {
    const sp = inherit(p, declarations(span));
    const sx = parseLength(span.getAttribute('x'), sp.fontSize) ?? x;
    const abs = parseLength(span.getAttribute('y'), sp.fontSize);
    cy = (abs ?? cy) + (parseLength(span.getAttribute('dy'), sp.fontSize) ?? 0);
    runs.push({
      text: span.textContent ?? '',
      x: sx + (parseLength(span.getAttribute('dx'), sp.fontSize) ?? 0),
      y: cy,
      paint: sp,
    });
  }
  return runs;
}

const DROPPED = new Set([
  'style',
  'title',
  'desc',
  'defs',
  'clippath',
  'mask',
  'metadata',
  'script',
  'foreignobject',
  'marker',
  'lineargradient',
  'radialgradient',
  'pattern',
]);

function walk(el: Element, parent: Paint, parentMatrix: Matrix, key: string): ReactElement | ReactElement[] | null {
  const tag = el.tagName.toLowerCase();
  if (DROPPED.has(tag)) return null;
  const d = declarations(el);
  if (d.get('display') === 'none' || d.get('visibility') === 'hidden') return null;
  const p = inherit(parent, d);
  const m = multiply(parentMatrix, parseTransform(el.getAttribute('transform')));
  const fs = p.fontSize;
  switch (tag) {
    case 'svg':
    case 'g':
    case 'a': {
      const children = Array.from(el.children).flatMap((c, i) => {
        const out = walk(c, p, m, `${key}.${i}`);
        return out === null ? [] : Array.isArray(out) ? out : [out];
      });
      return children.length ? <G key={key}>{children}</G> : null;
    }
    case 'path': {
      const path = el.getAttribute('d');
      return path ? <Path key={key} d={path} {...shapeProps(p, m, true)} /> : null;
    }
    case 'line':
      return (
        <Line
          key={key}
          x1={num(el, 'x1', fs)}
          y1={num(el, 'y1', fs)}
          x2={num(el, 'x2', fs)}
          y2={num(el, 'y2', fs)}
          {...shapeProps(p, m, false)}
        />
      );
    case 'rect': {
      const width = num(el, 'width', fs);
      const height = num(el, 'height', fs);
      if (width <= 0 || height <= 0) return null;
      return (
        <Rect
          key={key}
          x={num(el, 'x', fs)}
          y={num(el, 'y', fs)}
          width={width}
          height={height}
          {...shapeProps(p, m, true)}
        />
      );
    }
    case 'circle': {
      const r = num(el, 'r', fs);
      return r > 0 ? (
        <Circle key={key} cx={num(el, 'cx', fs)} cy={num(el, 'cy', fs)} r={r} {...shapeProps(p, m, true)} />
      ) : null;
    }
    case 'ellipse':
      return (
        <Ellipse
          key={key}
          cx={num(el, 'cx', fs)}
          cy={num(el, 'cy', fs)}
          rx={num(el, 'rx', fs)}
          ry={num(el, 'ry', fs)}
          {...shapeProps(p, m, true)}
        />
      );
    case 'polyline':
      return <Polyline key={key} points={el.getAttribute('points') ?? ''} {...shapeProps(p, m, true)} />;
    case 'polygon':
      return <Polygon key={key} points={el.getAttribute('points') ?? ''} {...shapeProps(p, m, true)} />;
    case 'text':
      return textRuns(el, p)
        .filter((run) => run.text.trim() !== '' && run.paint.fill)
        .map((run, i) => (
          <Text
            key={`${key}.${i}`}
            x={0}
            y={0}
            fill={run.paint.fill!}
            fillOpacity={run.paint.fillOpacity !== 1 ? run.paint.fillOpacity : undefined}
            textAnchor={run.paint.textAnchor}
            transform={matrixAttr(multiply(m, [1, 0, 0, 1, run.x, run.y]))}
            style={{
              fontFamily: TEXT_FONT,
              fontSize: run.paint.fontSize,
              fontWeight: run.paint.fontWeight,
              fontStyle: run.paint.fontStyle,
            }}
          >
            {run.text}
          </Text>
        ));
    default:
      return null;
  }
}

/** The size an SVG declares (width/height, else its viewBox), in user units. */
export function svgSize(svg: Element): { width: number; height: number; viewBox: [number, number, number, number] } {
  const vb = (svg.getAttribute('viewBox') ?? '').split(/[\s,]+/).map(Number);
  const width = parseLength(svg.getAttribute('width'), 16) ?? vb[2] ?? 300;
  const height = parseLength(svg.getAttribute('height'), 16) ?? vb[3] ?? 150;
  const viewBox: [number, number, number, number] =
    vb.length === 4 && vb.every(Number.isFinite) ? (vb as [number, number, number, number]) : [0, 0, width, height];
  return { width, height, viewBox };
}

/** `svg` as react-pdf graphics `width` points wide (height in proportion). */
export function svgToPdf(svg: SVGSVGElement | Element, width?: number): ReactElement {
  const size = svgSize(svg);
  const w = width ?? size.width;
  const h = (w * size.viewBox[3]) / size.viewBox[2];
  const root = walk(svg, ROOT_PAINT, IDENTITY, 'svg');
  return (
    <Svg width={w} height={h} viewBox={size.viewBox.join(' ')}>
      {root}
    </Svg>
  );
}

/** A statement's plot drawn for the PDF: the figure made `width` points wide (one pixel of it per point). */
export function plotPdfGraphic(
  data: PlotData,
  width: number,
  options: Omit<PlotFigureOptions, 'width' | 'fontFamily'> = {},
): ReactElement {
  const svg = serverPlotElement(data, { fontSize: 8.5, ...options, width, fontFamily: TEXT_FONT });
  return svgToPdf(svg, width);
}
