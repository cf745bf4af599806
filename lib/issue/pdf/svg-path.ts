// Glyph outlines rewritten for PDF: MathJax's path data uses H/V, smooth quadratics (T) and
// quadratics (Q). A PDF has only cubic curves, and pdfkit draws a quadratic with the `v` operator,
// which is not the same curve and visibly dents round glyphs; react-pdf also re-parses every path
// that contains a T. So each distinct path is rewritten once per process into absolute M, L, C and
// Z only: H/V become L, S and T get their reflected control point, quadratics become their exact
// cubics, relative commands are resolved. Arcs are not handled (MathJax's glyphs have none): such
// a path is left as it is.
/** One absolute segment: command letter and its points, flattened [x1, y1, x2, y2, …]. */
type Segment = { c: 'M' | 'L' | 'C' | 'Q' | 'Z'; p: number[] };

const ARGS: Record<string, number> = { m: 2, l: 2, h: 1, v: 1, c: 6, s: 4, q: 4, t: 2, a: 7, z: 0 };

/** Parses path data into absolute M/L/C/Q/Z segments, or null when it holds an arc or is malformed. */
export function parsePathData(d: string): Segment[] | null {
  const tokens = d.match(/[a-zA-Z]|[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?/g);
  if (!tokens) return [];
  const out: Segment[] = [];
  let i = 0;
  let cmd = '';
  let x = 0;
  let y = 0;
  let startX = 0;
  let startY = 0;
  // The last control point of a C/S (for S) or Q/T (for T), absolute.
  let lastCubic: [number, number] | null = null;
  let lastQuad: [number, number] | null = null;
  while (i < tokens.length) {
    if (/[a-zA-Z]/.test(tokens[i])) cmd = tokens[i++];
    else if (!cmd) return null;
    const lower = cmd.toLowerCase();
    const n = ARGS[lower];
    if (n === undefined || lower === 'a') return null;
    const rel = cmd !== cmd.toUpperCase();
    if (lower === 'z') {
      out.push({ c: 'Z', p: [] });
      x = startX;
      y = startY;
      lastCubic = lastQuad = null;
      continue;
    }
    if (i + n > tokens.length) return null;
    const a = tokens.slice(i, i + n).map(Number);
    if (a.some((v) => !Number.isFinite(v))) return null;
    i += n;
    const ox = rel ? x : 0;
    const oy = rel ? y : 0;
    switch (lower) {
      case 'm':
        x = a[0] + ox;
        y = a[1] + oy;
        startX = x;
        startY = y;
        out.push({ c: 'M', p: [x, y] });
        // Further pairs after a moveto are linetos.
        cmd = rel ? 'l' : 'L';
        lastCubic = lastQuad = null;
        break;
      case 'l':
        x = a[0] + ox;
        y = a[1] + oy;
        out.push({ c: 'L', p: [x, y] });
        lastCubic = lastQuad = null;
        break;
      case 'h':
        x = a[0] + ox;
        out.push({ c: 'L', p: [x, y] });
        lastCubic = lastQuad = null;
        break;
      case 'v':
        y = a[0] + oy;
        out.push({ c: 'L', p: [x, y] });
        lastCubic = lastQuad = null;
        break;
      case 'c': {
        const p = [a[0] + ox, a[1] + oy, a[2] + ox, a[3] + oy, a[4] + ox, a[5] + oy];
        out.push({ c: 'C', p });
        lastCubic = [p[2], p[3]];
        lastQuad = null;
        x = p[4];
        y = p[5];
        break;
      }
      case 's': {
        const c1: number[] = lastCubic ? [2 * x - lastCubic[0], 2 * y - lastCubic[1]] : [x, y];
        const p: number[] = [c1[0], c1[1], a[0] + ox, a[1] + oy, a[2] + ox, a[3] + oy];
        out.push({ c: 'C', p });
        lastCubic = [p[2], p[3]];
        lastQuad = null;
        x = p[4];
        y = p[5];
        break;
      }
      case 'q': {
        const p = [a[0] + ox, a[1] + oy, a[2] + ox, a[3] + oy];
        out.push({ c: 'Q', p });
        lastQuad = [p[0], p[1]];
        lastCubic = null;
        x = p[2];
        y = p[3];
        break;
      }
      case 't': {
        const c1: number[] = lastQuad ? [2 * x - lastQuad[0], 2 * y - lastQuad[1]] : [x, y];
        const p: number[] = [c1[0], c1[1], a[0] + ox, a[1] + oy];
        out.push({ c: 'Q', p });
        lastQuad = [p[0], p[1]];
        lastCubic = null;
        x = p[2];
        y = p[3];
        break;
      }
    }
  }
  return out;
}

function fmt(v: number): string {
  // Glyph units are 1/1000 em, 0.01 pt at 10 pt: whole units are below anything a printer shows,
  // and short numbers keep the (repeated, so well compressed) glyph data small.
  const r = Math.round(v);
  return r === 0 ? '0' : String(r);
}

/** Absolute M/L/C/Z path data for `segs`. */
function serialize(segs: Segment[]): string {
  let out = '';
  let x0 = 0;
  let y0 = 0;
  let sx = 0;
  let sy = 0;
  for (const seg of segs) {
    let cmd: string = seg.c;
    let p = seg.p;
    if (cmd === 'Q') {
      p = [
        x0 + (2 / 3) * (p[0] - x0),
        y0 + (2 / 3) * (p[1] - y0),
        p[2] + (2 / 3) * (p[0] - p[2]),
        p[3] + (2 / 3) * (p[1] - p[3]),
        p[2],
        p[3],
      ];
      cmd = 'C';
    }
    out += cmd;
    for (let k = 0; k < p.length; k += 2) out += `${k ? ' ' : ''}${fmt(p[k])} ${fmt(p[k + 1])}`;
    if (cmd === 'M') {
      sx = p[0];
      sy = p[1];
    }
    if (cmd === 'Z') {
      x0 = sx;
      y0 = sy;
    } else {
      x0 = p[p.length - 2];
      y0 = p[p.length - 1];
    }
  }
  return out;
}

// Glyph outlines repeat across formulas (every "p", every "="), so each distinct path data is
// rewritten once per process. The table is bounded: a glyph set is a few hundred entries.
const rewritten = new Map<string, string>();

/** `d` as absolute M/L/C/Z path data; `d` itself when it cannot be rewritten. */
export function pdfPathData(d: string): string {
  let out = rewritten.get(d);
  if (out === undefined) {
    const segs = parsePathData(d);
    out = segs ? serialize(segs) : d;
    if (rewritten.size > 20_000) rewritten.clear();
    rewritten.set(d, out);
  }
  return out;
}

/** A glyph outline as PDF content: path operators and the box its points span, in glyph units. */
export interface PdfGlyph {
  ops: string;
  bbox: [number, number, number, number];
}

// The PDF operators of each distinct rewritten outline, made once per process (the same bound).
const glyphOps = new Map<string, PdfGlyph | null>();

/**
 * The path operators (ISO 32000-1 §8.5.2: m, l, c, h) of absolute M/L/C/Z path data as
 * `pdfPathData` writes it, with the box of its points (control points included, so the outline is
 * inside it); null for any other data, which is then drawn as SVG.
 */
export function pdfGlyph(d: string): PdfGlyph | null {
  let out = glyphOps.get(d);
  if (out !== undefined) return out;
  out = null;
  const tokens = d.match(/[A-Za-z]|[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?/g) ?? [];
  const ops: string[] = [];
  let x0 = Infinity;
  let y0 = Infinity;
  let x1 = -Infinity;
  let y1 = -Infinity;
  let ok = tokens.length > 0;
  for (let i = 0; ok && i < tokens.length;) {
    const c = tokens[i++];
    const n = c === 'M' || c === 'L' ? 2 : c === 'C' ? 6 : c === 'Z' ? 0 : -1;
    if (n < 0 || i + n > tokens.length) {
      ok = false;
      break;
    }
    const p = tokens.slice(i, i + n);
    i += n;
    for (let k = 0; k < n; k += 2) {
      const x = Number(p[k]);
      const y = Number(p[k + 1]);
      if (!Number.isFinite(x) || !Number.isFinite(y)) ok = false;
      x0 = Math.min(x0, x);
      y0 = Math.min(y0, y);
      x1 = Math.max(x1, x);
      y1 = Math.max(y1, y);
    }
    ops.push(n ? `${p.join(' ')} ${c === 'M' ? 'm' : c === 'L' ? 'l' : 'c'}` : 'h');
  }
  if (ok && Number.isFinite(x0)) out = { ops: ops.join('\n'), bbox: [x0, y0, x1, y1] };
  if (glyphOps.size > 20_000) glyphOps.clear();
  glyphOps.set(d, out);
  return out;
}
