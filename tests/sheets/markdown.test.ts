// Text cells: Markdown with TeX math rendered to safe HTML.
import katex from 'katex';
import { describe, expect, it } from 'vitest';
import { renderMarkdown } from '../../lib/sheets/markdown';

// Every `<` of text is escaped as &lt;, so each `<` left in the output opens a real element: the
// checks below look at the elements and their attributes, where markup could act. (What the author
// typed may still be shown as text, e.g. the TeX source in KaTeX's annotation.)
const FORBIDDEN_ELEMENTS =
  /^<\/?(?:script|iframe|img|object|embed|style|form|input|button|link|meta|base|frame|frameset|video|audio|source|image|use|foreignobject|animate|set)\b/i;

function expectHarmless(html: string) {
  expect(html).not.toMatch(/<script/i);
  const elements = html.match(/<\/?[a-zA-Z][^>]*>/g) ?? [];
  for (const el of elements) {
    expect(el).not.toMatch(FORBIDDEN_ELEMENTS);
    expect(el).not.toMatch(/\son[a-z]+\s*=/i);
    expect(el).not.toMatch(/javascript:|vbscript:|data:/i);
    expect(el).not.toMatch(/\s(?:id|src|srcset|formaction|xlink:href|action)\s*=/i);
    for (const [, href] of el.matchAll(/\shref="([^"]*)"/g)) expect(href).toMatch(/^(?:https?:\/\/|mailto:)/);
  }
  // Outside elements, any `<` is escaped.
  expect(html.replace(/<\/?[a-zA-Z][^>]*>/g, '')).not.toContain('<');
}

describe('Markdown', () => {
  it('renders headings, lists, emphasis, code and links', () => {
    const html = renderMarkdown(
      '# Beam line\n\n## Inputs\n\n- *kinetic* energy\n- **rest** mass\n\n1. one\n2. two\n\nUse `T_kin`; see https://example.org/x.',
    );
    expect(html).toContain('<h1>Beam line</h1>');
    expect(html).toContain('<h2>Inputs</h2>');
    expect(html).toMatch(/<ul>\s*<li><em>kinetic<\/em> energy<\/li>\s*<li><strong>rest<\/strong> mass<\/li>\s*<\/ul>/);
    expect(html).toMatch(/<ol>\s*<li>one<\/li>/);
    expect(html).toContain('<code>T_kin</code>');
    expect(html).toContain('<a href="https://example.org/x" rel="noopener noreferrer">https://example.org/x</a>');
  });

  it('keeps mailto and http(s) links and gives each rel="noopener noreferrer"', () => {
    const html = renderMarkdown('[mail](mailto:a@example.org) [web](http://example.org)');
    expect(html).toContain('<a href="mailto:a@example.org" rel="noopener noreferrer">mail</a>');
    expect(html).toContain('<a href="http://example.org" rel="noopener noreferrer">web</a>');
  });
});

describe('math', () => {
  it('typesets inline $…$ with KaTeX, MathML included', () => {
    const html = renderMarkdown('The factor $\\gamma = 1/\\sqrt{1-\\beta^2}$ grows.');
    expect(html).toMatch(/^<p>The factor <span class="katex">/);
    expect(html).toContain('<math xmlns="http://www.w3.org/1998/Math/MathML">');
    expect(html).toContain('<annotation encoding="application/x-tex">\\gamma = 1/\\sqrt{1-\\beta^2}</annotation>');
    expect(html).toContain('class="katex-html" aria-hidden="true"');
    expect(html).toMatch(/<span class="mord mathnormal"[^>]*>γ<\/span>/);
    expect(html).toMatch(/style="height:[\d.]+em;?/);
    expect(html).toContain(' grows.</p>');
  });

  it('typesets $$…$$ on its own lines and inside a paragraph as display math', () => {
    const block = renderMarkdown('Energy:\n\n$$\nE = \\gamma m c^2\n$$\n\nafter');
    expect(block).toContain('<div class="math-display"><span class="katex-display">');
    expect(block).toContain('<p>after</p>');
    expect(renderMarkdown('so $$p = \\gamma m v$$ here')).toContain('<span class="katex-display">');
    expect(renderMarkdown('$$ a^2 $$')).toContain('katex-display');
  });

  it('leaves prices, escaped dollars and unclosed math as text', () => {
    expect(renderMarkdown('costs $5 and $10')).toBe('<p>costs $5 and $10</p>\n');
    expect(renderMarkdown('a \\$x\\$ b')).toBe('<p>a $x$ b</p>\n');
    expect(renderMarkdown('one $ two')).toBe('<p>one $ two</p>\n');
  });

  it('keeps everything KaTeX produces (sanitising changes only the spelling of the markup)', () => {
    const spelling = (html: string) =>
      html.replace(/;"/g, '"').replace(/<(path|line|mspace)([^>]*)\/>/g, '<$1$2></$1>');
    for (const f of [
      '\\sqrt{1-\\beta^2}',
      '\\overrightarrow{AB} + \\widehat{xyz}',
      '\\frac{a}{b} \\cdot \\left(\\frac{1}{2}\\right)',
      '\\begin{pmatrix}1&2\\\\3&4\\end{pmatrix}',
      '\\color{red}{x} \\colorbox{yellow}{y} \\boxed{z}',
      '\\xrightarrow{abc} \\cancel{x} \\underbrace{a+b}_{n}',
      '\\mathrm{MeV}\\,\\text{kg m/s} \\quad \\hat{p}_{\\mathrm{T}}',
    ]) {
      const direct = katex.renderToString(f, {
        throwOnError: false,
        trust: false,
        strict: 'ignore',
        output: 'htmlAndMathml',
        maxSize: 20,
        maxExpand: 200,
      });
      expect(spelling(renderMarkdown(`$${f}$`)), f).toBe(spelling(`<p>${direct}</p>\n`));
    }
  });

  it('shows a TeX mistake in the text instead of throwing', () => {
    const html = renderMarkdown('bad $\\frac{1}{$ here');
    expect(html).toContain('here');
    expect(html).toMatch(/katex-error|\\frac/);
  });
});

describe('hostile input', () => {
  const attacks: Array<[string, string]> = [
    ['script tag', '<script>alert(1)</script>'],
    ['img onerror', '<img src=x onerror="alert(1)">'],
    ['markdown image', '![x](https://evil.example/track.png)'],
    ['markdown image with js', '![x" onerror="alert(1)](javascript:alert(1))'],
    ['javascript link', '[click](javascript:alert(1))'],
    ['encoded javascript link', '[click](jav&#x09;ascript:alert(1)) [c2](JaVaScRiPt:alert(1))'],
    ['data link', '[click](data:text/html;base64,PHNjcmlwdD5hbGVydCgxKTwvc2NyaXB0Pg==)'],
    ['vbscript link', '[click](vbscript:msgbox(1))'],
    ['autolink', '<javascript:alert(1)>'],
    ['iframe', '<iframe src="https://evil.example"></iframe>'],
    ['raw html block', '<div onclick="alert(1)">x</div>\n\n<a href="javascript:alert(1)">y</a>'],
    ['svg', '<svg onload=alert(1)><circle r=1></svg>'],
    ['href in math', '$\\href{javascript:alert(1)}{x}$'],
    ['url in math', '$\\url{javascript:alert(1)}$'],
    ['htmlId in math', '$\\htmlId{x" onmouseover="alert(1)}{y}$'],
    ['htmlClass and htmlStyle in math', '$\\htmlClass{x}{y} \\htmlStyle{background:url(javascript:alert(1))}{z}$'],
    ['htmlData in math', '$\\htmlData{onclick=alert(1)}{z}$'],
    ['includegraphics in math', '$\\includegraphics{https://evil.example/x.png}$'],
    ['display math href', '$$\n\\href{javascript:alert(1)}{x}\n$$'],
    ['html in math text', '$\\text{<script>alert(1)</script>}$'],
    ['colour with expression', '$\\color{red;background:url(javascript:alert(1))}{x}$'],
    ['link title', '[x](https://example.org "a\\" onmouseover=\\"alert(1)")'],
  ];

  for (const [name, source] of attacks) {
    it(`neutralises ${name}`, () => expectHarmless(renderMarkdown(source)));
  }

  it('shows raw HTML as text rather than dropping what the author wrote', () => {
    expect(renderMarkdown('<b>bold</b>')).toBe('<p>&lt;b&gt;bold&lt;/b&gt;</p>\n');
  });

  it('renders a \\href as plain text, not as a link', () => {
    const html = renderMarkdown('$\\href{https://example.org}{x}$');
    expect(html).not.toContain('<a ');
  });
});
