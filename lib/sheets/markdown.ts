// Text cells: Markdown with TeX math, rendered to HTML that is safe to insert.
//
// markdown-it with raw HTML off (`html: false`: tags are shown as text) and linkify on; `$…$` is
// inline math and `$$…$$` display math (on its own lines or inside a paragraph), typeset by KaTeX
// with `throwOnError: false` (a mistake is shown in red, not thrown) and `trust: false` (\href,
// \url, \htmlId, \htmlClass, \htmlStyle, \htmlData and \includegraphics are refused). The result then
// goes through sanitize-html, allowing only the elements and attributes markdown-it and KaTeX
// produce, links only to http(s) and mailto (with rel="noopener noreferrer"), and no images;
// bidirectional control characters come out as visible markers.
import katex from 'katex';
import MarkdownIt from 'markdown-it';
import sanitizeHtml from 'sanitize-html';
import { bidiControlPattern, bidiMarker, describeBidiControl } from '../calc/bidi-controls';

// The parser states, as the rulers of this markdown-it instance type them.
type StateInline = Parameters<Parameters<typeof md.inline.ruler.push>[1]>[0];
type StateBlock = Parameters<Parameters<typeof md.block.ruler.push>[1]>[0];

function tex(source: string, displayMode: boolean): string {
  return katex.renderToString(source, {
    displayMode,
    throwOnError: false,
    trust: false,
    strict: 'ignore',
    output: 'htmlAndMathml',
    maxSize: 20,
    maxExpand: 200,
  });
}

/** `$…$` (inline) and `$$…$$` (display) inside a paragraph. `\$` stays a dollar sign. */
function mathInline(state: StateInline, silent: boolean): boolean {
  const src = state.src;
  const start = state.pos;
  if (src.charCodeAt(start) !== 0x24 /* $ */) return false;
  const display = src.charCodeAt(start + 1) === 0x24;
  const open = display ? 2 : 1;
  const first = src[start + open];
  if (first === undefined || (!display && /\s/.test(first))) return false;
  let end = start + open;
  for (;;) {
    end = src.indexOf(display ? '$$' : '$', end);
    if (end < 0) return false;
    if (src[end - 1] === '\\') {
      end += 1;
      continue;
    }
    // Inline: the closing $ follows a non-space and is not followed by a digit ($5 and $10).
    if (!display && (/\s/.test(src[end - 1]) || /\d/.test(src[end + 1] ?? ''))) {
      end += 1;
      continue;
    }
    break;
  }
  const content = src.slice(start + open, end);
  if (!content.trim()) return false;
  if (!silent) {
    const token = state.push(display ? 'math_display_inline' : 'math_inline', 'math', 0);
    token.content = content;
    token.markup = display ? '$$' : '$';
  }
  state.pos = end + open;
  return true;
}

/** A `$$` block: from a line starting with `$$` to the line ending with `$$`. */
function mathBlock(state: StateBlock, startLine: number, endLine: number, silent: boolean): boolean {
  let pos = state.bMarks[startLine] + state.tShift[startLine];
  let max = state.eMarks[startLine];
  if (state.sCount[startLine] - state.blkIndent >= 4) return false;
  if (state.src.slice(pos, pos + 2) !== '$$') return false;
  pos += 2;
  let firstLine = state.src.slice(pos, max);
  let lastLine = '';
  let next = startLine;
  let found = false;
  if (firstLine.trim().endsWith('$$')) {
    firstLine = firstLine.trim().slice(0, -2);
    found = true;
  }
  if (silent) return true;
  while (!found) {
    next++;
    if (next >= endLine) break;
    pos = state.bMarks[next] + state.tShift[next];
    max = state.eMarks[next];
    if (pos < max && state.tShift[next] < state.blkIndent) break;
    const text = state.src.slice(pos, max).trim();
    if (text.endsWith('$$')) {
      lastLine = text.slice(0, -2);
      found = true;
    }
  }
  state.line = next + 1;
  const token = state.push('math_block', 'math', 0);
  token.block = true;
  token.content =
    (firstLine.trim() ? `${firstLine}\n` : '') +
    state.getLines(startLine + 1, next, state.tShift[startLine], true) +
    (lastLine.trim() ? lastLine : '');
  token.map = [startLine, state.line];
  token.markup = '$$';
  return true;
}

const md = new MarkdownIt({ html: false, linkify: true, typographer: false, breaks: false });
md.inline.ruler.after('escape', 'math_inline', mathInline);
md.block.ruler.before('fence', 'math_block', mathBlock, { alt: ['paragraph', 'reference', 'blockquote', 'list'] });
md.renderer.rules.math_inline = (tokens, idx) => tex(tokens[idx].content, false);
md.renderer.rules.math_display_inline = (tokens, idx) => tex(tokens[idx].content, true);
md.renderer.rules.math_block = (tokens, idx) => `<div class="math-display">${tex(tokens[idx].content, true)}</div>\n`;
// No images at all: a text cell must not fetch anything. The alternative text stays.
md.renderer.rules.image = (tokens, idx) => md.utils.escapeHtml(tokens[idx].content);

const MARKDOWN_TAGS = [
  'p',
  'h1',
  'h2',
  'h3',
  'h4',
  'h5',
  'h6',
  'ul',
  'ol',
  'li',
  'blockquote',
  'pre',
  'code',
  'em',
  'strong',
  's',
  'a',
  'hr',
  'br',
  'table',
  'thead',
  'tbody',
  'tr',
  'th',
  'td',
  'div',
  'span',
];
const MATHML_TAGS = [
  'math',
  'semantics',
  'annotation',
  'mrow',
  'mi',
  'mn',
  'mo',
  'ms',
  'mtext',
  'mspace',
  'msup',
  'msub',
  'msubsup',
  'mfrac',
  'msqrt',
  'mroot',
  'mover',
  'munder',
  'munderover',
  'mtable',
  'mtr',
  'mtd',
  'mstyle',
  'mpadded',
  'mphantom',
  'menclose',
  'mglyph',
  'mlabeledtr',
  'merror',
];
const SVG_TAGS = ['svg', 'path', 'line'];
const MATHML_ATTRIBUTES = [
  'xmlns',
  'display',
  'encoding',
  'mathvariant',
  'stretchy',
  'fence',
  'separator',
  'lspace',
  'rspace',
  'accent',
  'accentunder',
  'minsize',
  'maxsize',
  'width',
  'height',
  'depth',
  'voffset',
  'columnalign',
  'rowspacing',
  'columnspacing',
  'columnlines',
  'rowlines',
  'scriptlevel',
  'displaystyle',
  'notation',
  'linethickness',
  'movablelimits',
  'symmetric',
  'largeop',
  'form',
  'class',
  'mathcolor',
  'mathbackground',
  'mathsize',
  'rowalign',
  'frame',
  'side',
];

/** CSS properties KaTeX writes in style attributes, with values that cannot reach outside. */
const LENGTH = /^-?(?:\d+(?:\.\d+)?|\.\d+)(?:em|ex|px|pt|%|mu|rem)?$/;
const KATEX_STYLES: Record<string, RegExp[]> = Object.fromEntries(
  [
    'height',
    'width',
    'min-width',
    'max-width',
    'vertical-align',
    'top',
    'bottom',
    'left',
    'right',
    'margin-left',
    'margin-right',
    'margin-top',
    'margin-bottom',
    'padding-left',
    'padding-right',
    'padding-top',
    'padding-bottom',
    'min-height',
    'border-width',
    'border-bottom-width',
    'border-top-width',
    'border-right-width',
    'border-left-width',
  ].map((p) => [p, [LENGTH]]),
);
KATEX_STYLES.color = [/^(?:#[0-9a-fA-F]{3,8}|[a-zA-Z]+|rgba?\([\d\s.,%]+\))$/];
KATEX_STYLES['border-color'] = KATEX_STYLES.color;
KATEX_STYLES['background-color'] = KATEX_STYLES.color;
KATEX_STYLES['border-style'] = [/^(?:solid|dashed|dotted|none)$/];
KATEX_STYLES.position = [/^(?:relative|absolute)$/];
KATEX_STYLES['font-style'] = [/^(?:normal|italic)$/];

const SANITIZE: sanitizeHtml.IOptions = {
  allowedTags: [...MARKDOWN_TAGS, ...MATHML_TAGS, ...SVG_TAGS],
  allowedAttributes: {
    a: ['href', 'rel'],
    span: ['class', 'style', 'aria-hidden'],
    div: ['class'],
    code: ['class'],
    ol: ['start'],
    th: ['style'],
    td: ['style'],
    svg: ['xmlns', 'width', 'height', 'viewbox', 'viewBox', 'preserveaspectratio', 'preserveAspectRatio', 'style'],
    path: ['d'],
    line: ['x1', 'x2', 'y1', 'y2', 'stroke-width'],
    ...Object.fromEntries(MATHML_TAGS.map((t) => [t, MATHML_ATTRIBUTES])),
  },
  allowedSchemes: ['http', 'https', 'mailto'],
  allowedSchemesByTag: {},
  allowedSchemesAppliedToAttributes: ['href'],
  allowProtocolRelative: false,
  allowedStyles: {
    span: KATEX_STYLES,
    svg: KATEX_STYLES,
    th: { 'text-align': [/^(?:left|right|center)$/] },
    td: { 'text-align': [/^(?:left|right|center)$/] },
  },
  transformTags: {
    // Only absolute http(s) and mailto links; anything else (relative, or a scheme disguised with
    // escapes such as `jav%09ascript:`) loses its href and stays as text.
    a: (tagName, attribs) => {
      const { href, ...rest } = attribs;
      return {
        tagName,
        attribs: {
          ...rest,
          ...(href && /^(?:https?:\/\/|mailto:)/i.test(href) ? { href } : {}),
          rel: 'noopener noreferrer',
        },
      };
    },
  },
  parser: { lowerCaseTags: false, lowerCaseAttributeNames: false },
  // Bidirectional control characters are shown as markers (⟦U+202E⟧), never allowed to reorder
  // the text around them (lib/calc/bidi-controls.ts). The filter gets text already escaped.
  textFilter: (text) =>
    text.replace(bidiControlPattern(), (c) => {
      const cp = c.codePointAt(0)!;
      return `<span class="ws-bidi-marker" title="${describeBidiControl(cp)}">${bidiMarker(cp)}</span>`;
    }),
};

/** Markdown with `$…$` / `$$…$$` math to sanitised HTML. */
export function renderMarkdown(source: string): string {
  return sanitizeHtml(md.render(source), SANITIZE);
}

/** The markdown-it tokens of a text cell, with the same math rules (`math_inline`, `math_display_inline`, `math_block`); the issued PDF draws them. */
export function parseMarkdown(source: string): ReturnType<typeof md.parse> {
  return md.parse(source, {});
}
