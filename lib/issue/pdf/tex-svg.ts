// TeX to vector outlines for the issued PDF: MathJax typesets the TeX on the server into SVG with
// every glyph as an inline path (`fontCache: 'none'`); this module walks MathJax's own node tree
// (never the SVG text) and flattens it into glyph outlines, rules (fraction bars, radicals'
// overlines) and lines, each with the transforms of its enclosing groups composed into one matrix.
// The renderer (`math-view.tsx`) draws them. Flat, one path per glyph in the glyph's own
// coordinates (rather than all glyphs baked into one path), because a glyph's data is then the same
// string at every use: the renderer writes each distinct glyph once per document and draws every use
// of it by reference.
import { liteAdaptor, type LiteAdaptor } from 'mathjax-full/js/adaptors/liteAdaptor.js';
import type { LiteElement, LiteNode } from 'mathjax-full/js/adaptors/lite/Element.js';
import { RegisterHTMLHandler } from 'mathjax-full/js/handlers/html.js';
import { TeX } from 'mathjax-full/js/input/tex.js';
// The TeX packages the app's KaTeX also understands (text cells are written for it), and no more:
// each package adds parsing work to every formula; \require or autoloading would load code while a
// PDF is drawn; and \newcommand definitions would outlive their formula in this shared document
// (KaTeX in the app forgets them too).
import 'mathjax-full/js/input/tex/base/BaseConfiguration.js';
import 'mathjax-full/js/input/tex/ams/AmsConfiguration.js';
import 'mathjax-full/js/input/tex/amscd/AmsCdConfiguration.js';
import 'mathjax-full/js/input/tex/boldsymbol/BoldsymbolConfiguration.js';
import 'mathjax-full/js/input/tex/braket/BraketConfiguration.js';
import 'mathjax-full/js/input/tex/cancel/CancelConfiguration.js';
import 'mathjax-full/js/input/tex/color/ColorConfiguration.js';
import 'mathjax-full/js/input/tex/verb/VerbConfiguration.js';
import { mathjax } from 'mathjax-full/js/mathjax.js';
import { SVG } from 'mathjax-full/js/output/svg.js';
import { IDENTITY, multiply, type Matrix } from './affine';
import { pdfPathData } from './svg-path';

/** A drawable piece; `left` is where it starts in viewBox units, for cutting a long formula. */
export type MathPrimitive = { left: number } & (
  | { kind: 'path'; d: string; matrix: Matrix }
  | { kind: 'rect'; x: number; y: number; width: number; height: number; matrix: Matrix }
  | { kind: 'line'; x1: number; y1: number; x2: number; y2: number; strokeWidth: number; matrix: Matrix }
  /** A character MathJax's fonts lack, drawn by MathJax as SVG text (baseline at 0, y down). */
  | { kind: 'text'; text: string; fontSize: number; italic: boolean; bold: boolean; matrix: Matrix }
);

/** Typeset TeX in MathJax units: 1000 per em, baseline at y = 0, y pointing down (SVG user space). */
export interface TypesetMath {
  /** The viewBox: minX, minY (minus the height above the baseline), width, height. */
  viewBox: [number, number, number, number];
  /** Distance from the baseline to the bottom of the box, in units (positive below the baseline). */
  depth: number;
  items: MathPrimitive[];
  /**
   * Where the formula may be cut when it is too wide for the page, ascending, in viewBox units:
   * after an operator, relation or comma of the main line (also inside \left…\right), never inside
   * a fraction, root, script or braced group, as TeX breaks inline formulas.
   */
  breaks: number[];
}

/** Parses an SVG transform list ("translate(759,0) scale(0.707)", "matrix(…)", "rotate(a cx cy)"). */
function parseTransform(value: string | undefined | null): Matrix {
  let m: Matrix = IDENTITY;
  if (!value) return m;
  const ops = value.matchAll(/([a-zA-Z]+)\s*\(([^)]*)\)/g);
  for (const [, name, args] of ops) {
    const n = args
      .split(/[\s,]+/)
      .filter((s) => s !== '')
      .map(Number);
    if (n.some((x) => !Number.isFinite(x))) throw new Error(`bad transform ${value}`);
    let t: Matrix;
    switch (name) {
      case 'translate':
        t = [1, 0, 0, 1, n[0] ?? 0, n[1] ?? 0];
        break;
      case 'scale':
        t = [n[0] ?? 1, 0, 0, n[1] ?? n[0] ?? 1, 0, 0];
        break;
      case 'matrix':
        if (n.length !== 6) throw new Error(`bad transform ${value}`);
        t = n as Matrix;
        break;
      case 'rotate': {
        const a = ((n[0] ?? 0) * Math.PI) / 180;
        const [cx = 0, cy = 0] = n.slice(1);
        const r: Matrix = [Math.cos(a), Math.sin(a), -Math.sin(a), Math.cos(a), 0, 0];
        t = multiply(multiply([1, 0, 0, 1, cx, cy], r), [1, 0, 0, 1, -cx, -cy]);
        break;
      }
      case 'skewX':
        t = [1, 0, Math.tan(((n[0] ?? 0) * Math.PI) / 180), 1, 0, 0];
        break;
      case 'skewY':
        t = [1, Math.tan(((n[0] ?? 0) * Math.PI) / 180), 0, 1, 0, 0];
        break;
      default:
        throw new Error(`unsupported transform ${name}`);
    }
    m = multiply(m, t);
  }
  return m;
}

function num(value: unknown, fallback = 0): number {
  const n = typeof value === 'number' ? value : parseFloat(String(value ?? ''));
  return Number.isFinite(n) ? n : fallback;
}

// One MathJax document for the process: TeX in, SVG out, glyphs as inline paths. Building it takes
// a few tens of milliseconds, so it is made on first use.
let converter: { adaptor: LiteAdaptor; convert: (tex: string, display: boolean) => LiteElement } | null = null;

function getConverter() {
  if (converter) return converter;
  const adaptor = liteAdaptor();
  RegisterHTMLHandler(adaptor);
  const tex = new TeX({
    packages: ['base', 'ams', 'amscd', 'boldsymbol', 'braket', 'cancel', 'color', 'verb'],
    // A TeX error throws instead of being typeset in red, so the caller can fall back to text.
    formatError: (_jax: unknown, error: Error) => {
      throw error;
    },
  });
  const svg = new SVG({ fontCache: 'none' });
  const doc = mathjax.document('', { InputJax: tex, OutputJax: svg });
  converter = { adaptor, convert: (source, display) => doc.convert(source, { display }) as LiteElement };
  return converter;
}

function isElement(node: LiteNode): node is LiteElement {
  return (node as LiteElement).children !== undefined;
}

// Rows whose children sit on the main line of the formula.
const MAIN_LINE = new Set(['math', 'mrow', 'mstyle', 'semantics']);
// Opening delimiters (by code point in MathJax's data-c), after which a line is never cut.
const OPENING = new Set(['28', '5B', '7B', '27E8', '2308', '230A', '239B', '23A1', '23A7']);

/**
 * Typesets one TeX string. Throws on a TeX error or on output it cannot draw; the renderer then
 * shows the source as text.
 */
export function typesetTex(source: string, display = false): TypesetMath {
  const { adaptor, convert } = getConverter();
  const container = convert(source, display);
  const svg = adaptor.childNodes(container).find((n): n is LiteElement => isElement(n) && adaptor.kind(n) === 'svg');
  if (!svg) throw new Error('MathJax returned no SVG');
  const box = String(adaptor.getAttribute(svg, 'viewBox') ?? '')
    .split(/[\s,]+/)
    .map(Number);
  if (box.length !== 4 || box.some((x) => !Number.isFinite(x)) || box[2] <= 0 || box[3] <= 0)
    throw new Error('MathJax returned no viewBox');
  const items: MathPrimitive[] = [];
  const breaks: number[] = [];
  const mml = (node: LiteElement) => String(adaptor.getAttribute(node, 'data-mml-node') ?? '');
  const firstGlyph = (node: LiteElement): string | null => {
    if (adaptor.kind(node) === 'path') return String(adaptor.getAttribute(node, 'data-c') ?? '');
    for (const child of adaptor.childNodes(node)) if (isElement(child)) return firstGlyph(child);
    return null;
  };

  const walk = (node: LiteElement, parent: Matrix, mainLine: boolean) => {
    const kind = adaptor.kind(node);
    if (kind === 'title' || kind === 'defs' || kind === 'style') return;
    if (adaptor.getAttribute(node, 'data-background')) return; // backgrounds (\colorbox, errors)
    let m = multiply(parent, parseTransform(adaptor.getAttribute(node, 'transform')));
    switch (kind) {
      case 'path': {
        const d = adaptor.getAttribute(node, 'd');
        if (!d) return;
        items.push({ kind: 'path', d: pdfPathData(String(d)), matrix: m, left: m[4] });
        return;
      }
      case 'rect': {
        const width = num(adaptor.getAttribute(node, 'width'));
        const height = num(adaptor.getAttribute(node, 'height'));
        const x = num(adaptor.getAttribute(node, 'x'));
        if (width > 0 && height > 0)
          items.push({
            kind: 'rect',
            x,
            y: num(adaptor.getAttribute(node, 'y')),
            width,
            height,
            matrix: m,
            left: m[0] * x + m[4],
          });
        return;
      }
      case 'line': {
        const attr = (name: string) => num(adaptor.getAttribute(node, name));
        items.push({
          kind: 'line',
          x1: attr('x1'),
          y1: attr('y1'),
          x2: attr('x2'),
          y2: attr('y2'),
          strokeWidth: num(adaptor.getAttribute(node, 'stroke-width'), 40),
          matrix: m,
          left: m[0] * Math.min(attr('x1'), attr('x2')) + m[4],
        });
        return;
      }
      case 'text': {
        const variant = String(adaptor.getAttribute(node, 'data-variant') ?? '');
        const text = adaptor.textContent(node);
        if (text)
          items.push({
            kind: 'text',
            text,
            fontSize: num(adaptor.getAttribute(node, 'font-size'), 1000),
            italic: variant.includes('italic'),
            bold: variant.includes('bold'),
            matrix: m,
            left: m[4],
          });
        return;
      }
      case 'svg': {
        // A nested svg (MathJax uses them for some tables and links): placed at x, y.
        m = multiply(m, [1, 0, 0, 1, num(adaptor.getAttribute(node, 'x')), num(adaptor.getAttribute(node, 'y'))]);
        break;
      }
      case 'g':
      case 'a':
        break;
      default:
        throw new Error(`cannot draw SVG element <${kind}>`);
    }
    // A row on the main line: the formula may be cut before any child that follows an operator,
    // relation or separator (but not an opening delimiter); those children are on the main line too.
    const row = mainLine && kind === 'g' && MAIN_LINE.has(mml(node));
    let previous: LiteElement | null = null;
    for (const child of adaptor.childNodes(node)) {
      if (!isElement(child)) continue;
      if (row && previous && mml(previous) === 'mo' && !OPENING.has(firstGlyph(previous) ?? '')) {
        breaks.push(multiply(m, parseTransform(adaptor.getAttribute(child, 'transform')))[4]);
      }
      // The outer group (no data-mml-node) leads to the math node.
      walk(child, m, row || (mainLine && kind === 'g' && !mml(node)));
      previous = child;
    }
  };

  for (const child of adaptor.childNodes(svg)) if (isElement(child)) walk(child, IDENTITY, true);
  const [minX, minY, width, height] = box;
  return {
    viewBox: [minX, minY, width, height],
    depth: minY + height,
    items,
    breaks: [...new Set(breaks)].sort((a, b) => a - b),
  };
}

// Typeset formulas kept across renders, keyed by the TeX and its display mode: a sheet issued again,
// or another revision of it, typesets only the formulas that changed. A result is never mutated by
// the renderer (strips filter into new arrays), so one object serves every document. Bounded by an
// estimate of what each formula holds of its own, oldest use evicted first: a glyph's path data is
// one string shared by every formula that uses the glyph (`pdfPathData` keeps one per distinct
// outline, itself bounded), so a piece counts as 48 characters and text as its length. Counting
// each path's characters again at every use bounded the cache at about 400 formulas, and issuing a
// 200-cell sheet a second time typeset all of its 1,200 formulas again.
const SHARED_LIMIT_CHARS = 8_000_000;
const shared = new Map<string, { math: TypesetMath | null; chars: number }>();
let sharedChars = 0;

function weight(math: TypesetMath | null): number {
  if (!math) return 16;
  let chars = 64;
  for (const it of math.items) chars += 48 + (it.kind === 'text' ? it.text.length : 0);
  return chars;
}

/** typesetTex with a cache and no exceptions: null when the TeX cannot be typeset. */
export function createTexCache(): (source: string, display?: boolean) => TypesetMath | null {
  return (source, display = false) => {
    const key = `${display ? 'D' : 'I'}${source}`;
    const hit = shared.get(key);
    if (hit) {
      // Most recently used last, so eviction takes the oldest use.
      shared.delete(key);
      shared.set(key, hit);
      return hit.math;
    }
    let math: TypesetMath | null;
    try {
      math = source.trim() ? typesetTex(source, display) : null;
    } catch {
      math = null;
    }
    const chars = weight(math);
    shared.set(key, { math, chars });
    sharedChars += chars;
    for (const [k, v] of shared) {
      if (sharedChars <= SHARED_LIMIT_CHARS) break;
      shared.delete(k);
      sharedChars -= v.chars;
    }
    return math;
  };
}
