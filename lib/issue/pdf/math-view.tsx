// Typeset TeX drawn as vector outlines, so formulas stay sharp at any zoom. Each distinct glyph
// outline of a document is written once, as a form XObject (ISO 32000-1 §8.10), and every use of it
// is a `Do` under the glyph's own matrix, in a Canvas that draws with pdfkit directly: a 200-cell
// sheet has some 40,000 glyphs, and drawing each as a react-pdf SVG path (styles resolved, path
// data parsed, graphics state set, one by one) cost more than the whole rest of the page. A strip
// holding something a form cannot carry (a character drawn as text) is drawn with react-pdf's
// SVG elements, as before. Sizes: MathJax works in units of 1/1000 em, drawn here at `emPt`
// points per em (1 ex ≈ 0.442 em in MathJax's TeX fonts, so 10 pt per em is about 4.4 pt per ex).
import { Canvas, Line, Path, Rect, Svg, Text, View } from '@react-pdf/renderer';
import type { ReactElement } from 'react';
import { multiply, type Matrix } from './affine';
import { TEXT_FONT } from './fonts';
import { closeLeafInPaint, drawDirect, Leaf, openLeafInPaint, type LeafType } from './structure';
import { pdfGlyph } from './svg-path';
import type { MathPrimitive, TypesetMath } from './tex-svg';

const INK = '#17212b';

function round(n: number): number {
  return Math.round(n * 1000) / 1000;
}

function matrixAttr(m: Matrix): string | undefined {
  if (m[0] === 1 && m[1] === 0 && m[2] === 0 && m[3] === 1 && m[4] === 0 && m[5] === 0) return undefined;
  return `matrix(${m.map(round).join(',')})`;
}

/** Size of a typeset formula in points at `emPt`, shrunk to `maxWidth` when wider. */
export function mathSize(
  math: TypesetMath,
  emPt: number,
  maxWidth = Infinity,
): { width: number; height: number; depth: number; scale: number } {
  const [, , w, h] = math.viewBox;
  let scale = emPt / 1000;
  if (w * scale > maxWidth) scale = maxWidth / w;
  return { width: w * scale, height: h * scale, depth: math.depth * scale, scale };
}

/** One line of a formula: the part of the viewBox from `start` to `end`, drawn at `scale` pt/unit. */
interface MathStrip {
  start: number;
  end: number;
  scale: number;
  items: MathPrimitive[];
}

/**
 * A formula cut into lines no wider than `maxWidth` (the lines after the first `indent` narrower).
 * A formula that fits, or fits when shrunk to no less than `minShrink` of its size, stays whole;
 * otherwise it is cut at its break points, as TeX breaks a long inline formula after an operator
 * or relation, and a piece with no break point narrow enough is shrunk to fit.
 */
function mathStrips(math: TypesetMath, emPt: number, maxWidth: number, indent = 0, minShrink = 0.8): MathStrip[] {
  const [minX, , w] = math.viewBox;
  const scale = emPt / 1000;
  const end = minX + w;
  if (w * scale <= maxWidth) return [{ start: minX, end, scale, items: math.items }];
  if (w * scale * minShrink <= maxWidth || math.breaks.length === 0)
    return [{ start: minX, end, scale: maxWidth / w, items: math.items }];
  const cuts: number[] = [minX];
  let start = minX;
  while (end - start > (maxWidth - (cuts.length > 1 ? indent : 0)) / scale) {
    const room = (maxWidth - (cuts.length > 1 ? indent : 0)) / scale;
    const candidates = math.breaks.filter((b) => b > start);
    if (candidates.length === 0) break;
    const fitting = candidates.filter((b) => b - start <= room);
    const cut = fitting.length ? fitting[fitting.length - 1] : candidates[0];
    cuts.push(cut);
    start = cut;
  }
  cuts.push(end);
  const strips: MathStrip[] = [];
  for (let i = 0; i + 1 < cuts.length; i++) {
    const a = cuts[i];
    const b = cuts[i + 1];
    const room = maxWidth - (i > 0 ? indent : 0);
    const last = i + 2 === cuts.length;
    strips.push({
      start: a,
      end: b,
      scale: Math.min(scale, room / (b - a)),
      // A piece belongs to the line where it starts (the first line also takes anything left of it).
      items: math.items.filter((it) => (i === 0 || it.left >= a) && (last || it.left < b)),
    });
  }
  return strips;
}

function Primitive({ item }: { item: MathPrimitive }): ReactElement {
  const transform = matrixAttr(item.matrix);
  switch (item.kind) {
    case 'path':
      return <Path d={item.d} fill={INK} transform={transform} />;
    case 'rect':
      return <Rect x={item.x} y={item.y} width={item.width} height={item.height} fill={INK} transform={transform} />;
    case 'line':
      return (
        <Line
          x1={item.x1}
          y1={item.y1}
          x2={item.x2}
          y2={item.y2}
          stroke={INK}
          strokeWidth={item.strokeWidth}
          transform={transform}
        />
      );
    case 'text':
      return (
        <Text
          x={0}
          y={0}
          fill={INK}
          transform={transform}
          style={{
            fontFamily: TEXT_FONT,
            fontSize: item.fontSize,
            fontWeight: item.bold ? 700 : 400,
            fontStyle: item.italic ? 'italic' : 'normal',
          }}
        >
          {item.text}
        </Text>
      );
  }
}

// The slice of pdfkit's document the direct drawing uses.
interface PdfDoc {
  ref(data: Record<string, unknown>): { end(chunk?: string): void };
  page: { xobjects: Record<string, unknown> };
  addContent(data: string): PdfDoc;
  save(): PdfDoc;
  restore(): PdfDoc;
  fillColor(color: string): PdfDoc;
  strokeColor(color: string): PdfDoc;
}

// The glyph forms of each document, by outline; named Wg1, Wg2… in order of first use, so the same
// document gives the same bytes.
const formsByDoc = new WeakMap<object, Map<string, { name: string; ref: unknown }>>();

function glyphForm(doc: PdfDoc, d: string): string {
  let forms = formsByDoc.get(doc);
  if (!forms) {
    forms = new Map();
    formsByDoc.set(doc, forms);
  }
  let form = forms.get(d);
  if (!form) {
    const glyph = pdfGlyph(d);
    if (!glyph) throw new Error('PDF drawing: a glyph outline that cannot be a form reached the direct drawing.');
    const ref = doc.ref({ Type: 'XObject', Subtype: 'Form', BBox: glyph.bbox, Resources: {} });
    ref.end(`${glyph.ops}\nf`);
    form = { name: `Wg${forms.size + 1}`, ref };
    forms.set(d, form);
  }
  // Every page that draws the glyph names it among its resources.
  doc.page.xobjects[form.name] = form.ref;
  return form.name;
}

/** A number for a content stream, to a millionth (as pdfkit writes its own). */
function pdfNumber(n: number): string {
  const r = Math.round(n * 1e6) / 1e6;
  return r === 0 ? '0' : String(r);
}

/** Whether every piece of `items` can be drawn directly (outlines that make forms, rules and lines). */
function drawableDirectly(items: MathPrimitive[]): boolean {
  return items.every((it) => it.kind === 'rect' || it.kind === 'line' || (it.kind === 'path' && pdfGlyph(it.d)));
}

/**
 * Draws a strip at the current origin (its top left corner, y down): the viewBox part from
 * `strip.start` mapped to points at `strip.scale`, each piece under that mapping times its own
 * matrix, filled (and lines stroked) in ink, exactly as the SVG elements would draw them.
 */
function drawStrip(doc: PdfDoc, minY: number, strip: MathStrip): void {
  const s = strip.scale;
  const view: Matrix = [s, 0, 0, s, -strip.start * s, -minY * s];
  const parts: string[] = [];
  let stroked = false;
  for (const item of strip.items) {
    const cm = multiply(view, item.matrix).map(pdfNumber).join(' ');
    let draw: string;
    switch (item.kind) {
      case 'path':
        draw = `/${glyphForm(doc, item.d)} Do`;
        break;
      case 'rect':
        draw = `${pdfNumber(item.x)} ${pdfNumber(item.y)} ${pdfNumber(item.width)} ${pdfNumber(item.height)} re f`;
        break;
      case 'line':
        stroked = true;
        draw =
          `${pdfNumber(item.strokeWidth)} w ${pdfNumber(item.x1)} ${pdfNumber(item.y1)} m ` +
          `${pdfNumber(item.x2)} ${pdfNumber(item.y2)} l S`;
        break;
      default:
        throw new Error('PDF drawing: text in a formula reached the direct drawing.');
    }
    // Each piece in its own q … Q; the Q is written before the next piece, so the content written
    // ends with a drawing operator (the tagging opens its marked content on one).
    parts.push(`${parts.length ? 'Q ' : ''}q ${cm} cm ${draw}`);
  }
  if (!parts.length) return;
  doc.save();
  doc.fillColor(INK);
  if (stroked) doc.strokeColor(INK);
  doc.addContent(parts.join('\n'));
  doc.addContent('Q');
  doc.restore();
}

/** The leaf a formula is: its type and alternate text (its TeX). */
export interface MathLeaf {
  as: LeafType;
  alt: string;
}

/**
 * One strip. Drawn directly, it may also open the formula's leaf before it draws (`open`) and close
 * it after (`close`), so that the formula needs no markers of its own.
 */
function StripGraphic({
  math,
  strip,
  open,
  close = false,
}: {
  math: TypesetMath;
  strip: MathStrip;
  open?: MathLeaf;
  close?: boolean;
}): ReactElement {
  const [, minY, , h] = math.viewBox;
  const w = strip.end - strip.start;
  if (drawableDirectly(strip.items))
    return (
      <Canvas
        style={{ width: w * strip.scale, height: h * strip.scale }}
        paint={(painter) => {
          if (open) openLeafInPaint(painter, open.as, open.alt);
          drawDirect(painter, (doc) => drawStrip(doc as PdfDoc, minY, strip));
          if (close) closeLeafInPaint(painter);
          return null;
        }}
      />
    );
  if (open || close) throw new Error('PDF drawing: only a strip drawn directly can carry its leaf.');
  return (
    <Svg width={w * strip.scale} height={h * strip.scale} viewBox={`${strip.start} ${minY} ${w} ${h}`}>
      {strip.items.map((item, i) => (
        <Primitive key={i} item={item} />
      ))}
    </Svg>
  );
}

/** A formula on one line, shrunk to `maxWidth` if need be (inline math in text). */
export function MathGraphic({
  math,
  emPt,
  maxWidth = Infinity,
}: {
  math: TypesetMath;
  emPt: number;
  maxWidth?: number;
}): ReactElement {
  const [minX, , w] = math.viewBox;
  const { scale } = mathSize(math, emPt, maxWidth);
  return <StripGraphic math={math} strip={{ start: minX, end: minX + w, scale, items: math.items }} />;
}

/**
 * A displayed formula: on as many lines as it needs, the continuation lines indented, tagged as
 * `leaf`. When every line is drawn directly, the first line's Canvas opens the leaf and the last
 * one's closes it (two layout nodes fewer per formula: a 200-cell sheet has over 1,000 formulas);
 * otherwise the leaf's markers stand around it.
 */
export function MathBlock({
  math,
  emPt,
  maxWidth,
  leaf,
}: {
  math: TypesetMath;
  emPt: number;
  maxWidth: number;
  leaf: MathLeaf;
}): ReactElement {
  const indent = emPt * 2;
  const strips = mathStrips(math, emPt, maxWidth, indent);
  const self = strips.every((strip) => drawableDirectly(strip.items));
  const graphic = (strip: MathStrip, i: number) => (
    <StripGraphic
      math={math}
      strip={strip}
      open={self && i === 0 ? leaf : undefined}
      close={self && i === strips.length - 1}
    />
  );
  const block =
    strips.length === 1 ? (
      graphic(strips[0], 0)
    ) : (
      <View>
        {strips.map((strip, i) => (
          <View key={i} style={{ marginLeft: i > 0 ? indent : 0 }}>
            {graphic(strip, i)}
          </View>
        ))}
      </View>
    );
  return self ? (
    block
  ) : (
    <Leaf as={leaf.as} alt={leaf.alt}>
      {block}
    </Leaf>
  );
}
