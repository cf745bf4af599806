// The issued PDF as an outside reader sees it (product brief, "The issued PDF"): rendered from a real
// engine evaluation and read back with poppler (pdfinfo, pdftotext page by page, pdffonts, pdftoppm)
// and pdf-lib. Each check names where its requirement comes from.
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import { PDFArray, PDFDict, PDFDocument, PDFHexString, PDFName, PDFRawStream, type PDFRef, PDFString } from 'pdf-lib';
import { beforeAll, describe, expect, it } from 'vitest';
import type { RevisionPdfData } from '../../lib/issue/pdf-data';
import { renderRevisionPdf } from '../../lib/issue/pdf/render';
import { parsePathData, pdfPathData } from '../../lib/issue/pdf/svg-path';
import { createTexCache, typesetTex } from '../../lib/issue/pdf/tex-svg';
import { buildRevisionPdfData, FIXTURE_SHA_ATTACHMENT_1, FIXTURE_SHA_ATTACHMENT_2 } from './pdf-fixture';

const folder = mkdtempSync(path.join(tmpdir(), 'ws-pdf-render-'));
const run = (tool: string, args: string[]) =>
  execFileSync(tool, args, { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
/** Whitespace runs to one space: text wrapped over lines or spread over layout columns reads as one run. */
const flat = (s: string) => s.replace(/\s+/g, ' ');

let data: RevisionPdfData;
let bytes: Buffer;
let file: string;
let pageCount: number;
/** pdftotext -layout of each page, 1-based. */
const pages: string[] = [];
let whole: string;

beforeAll(async () => {
  data = buildRevisionPdfData();
  bytes = await renderRevisionPdf(data);
  file = path.join(folder, 'revision.pdf');
  writeFileSync(file, bytes);
  pageCount = Number(/^Pages:\s+(\d+)/m.exec(run('pdfinfo', [file]))?.[1]);
  for (let p = 1; p <= pageCount; p++)
    pages[p] = run('pdftotext', ['-layout', '-f', String(p), '-l', String(p), file, '-']);
  whole = flat(run('pdftotext', [file, '-']));
  // A picture of the first page for people to look at (git-ignored).
  const artifacts = path.join(process.cwd(), 'tests', '.artifacts');
  mkdirSync(artifacts, { recursive: true });
  run('pdftoppm', ['-r', '100', '-png', '-f', '1', '-l', '1', '-singlefile', file, path.join(artifacts, 'pdf-page-1')]);
}, 180_000);

/** The decoded content streams of a page. */
async function pageContent(pageIndex: number): Promise<string> {
  const doc = await PDFDocument.load(bytes);
  const page = doc.getPage(pageIndex);
  const contents = doc.context.lookup(page.node.get(PDFName.of('Contents')));
  const refs = contents instanceof PDFArray ? contents.asArray() : [contents];
  return refs
    .map((ref) => {
      const stream = (ref instanceof PDFRawStream ? ref : doc.context.lookup(ref as PDFRef)) as PDFRawStream;
      const raw = Buffer.from(stream.getContents());
      return stream.dict.get(PDFName.of('Filter')) ? zlib.inflateSync(raw).toString('latin1') : raw.toString('latin1');
    })
    .join('\n');
}

function streamText(stream: PDFRawStream): string {
  const raw = Buffer.from(stream.getContents());
  return stream.dict.get(PDFName.of('Filter')) ? zlib.inflateSync(raw).toString('latin1') : raw.toString('latin1');
}

/** The content of each form XObject a page names among its resources, by name. */
async function pageForms(pageIndex: number): Promise<Map<string, string>> {
  const doc = await PDFDocument.load(bytes);
  const page = doc.getPage(pageIndex);
  const forms = new Map<string, string>();
  const xobjects = page.node.Resources()?.lookupMaybe(PDFName.of('XObject'), PDFDict);
  for (const [name, ref] of xobjects?.entries() ?? []) {
    const stream = doc.context.lookup(ref);
    if (stream instanceof PDFRawStream && stream.dict.get(PDFName.of('Subtype'))?.toString() === '/Form')
      forms.set(name.decodeText(), streamText(stream));
  }
  return forms;
}

describe('the page furniture', () => {
  it('is a PDF of several A4 pages', () => {
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(pageCount).toBeGreaterThanOrEqual(3);
    expect(run('pdfinfo', [file])).toMatch(/Page size:\s+595\.2\d? x 841\.8\d? pts \(A4\)/);
  });

  it('carries the title block with every ISO 7200 field on every page, numbered "Sheet n of m"', () => {
    // ISO 7200:2004 §4 data fields: legal owner, identification number, revision index, date of
    // issue, title, document type, creator, approval person, document status, language, sheet number
    // and number of sheets.
    const t = data.titleBlock;
    const fields: Array<[string, string]> = [
      ['Legal owner', t.legalOwner],
      ['Identification number', t.identificationNumber],
      ['Rev.', t.revisionIndex],
      ['Date of issue', t.dateOfIssue],
      ['Title', t.title],
      ['Document type', 'Calculation'],
      ['Creator', t.creator],
      ['Approval person', t.approvalPerson],
      ['Document status', t.status],
      ['Lang.', t.language],
    ];
    for (let p = 1; p <= pageCount; p++) {
      const text = flat(pages[p]);
      for (const [label, value] of fields) {
        expect(text, `page ${p}: ${label}`).toContain(label);
        expect(text, `page ${p}: ${label} value`).toContain(value);
      }
      expect(text, `page ${p}`).toContain(`Sheet ${p} of ${pageCount}`);
    }
  });

  it('embeds only subsets of Source Sans 3 and Noto Sans Mono, never a standard-14 font', () => {
    // Common practice for archived documents (ISO 19005 requires every font embedded); the product
    // ships these two faces for their coverage of Greek, ≤, →, −, ± and superscripts.
    const rows = run('pdffonts', [file])
      .split('\n')
      .slice(2)
      .filter((l) => l.trim());
    expect(rows.length).toBeGreaterThan(0);
    for (const row of rows) {
      expect(row).toMatch(/^[A-Z]{6}\+(SourceSans3-(Regular|Italic|SemiBold|Bold)|NotoSansMono-(Regular|Bold))\s/);
      const [emb, sub, uni] = row.trim().split(/\s+/).slice(-5, -2);
      expect([emb, sub, uni]).toEqual(['yes', 'yes', 'yes']);
    }
    expect(rows.join('\n')).not.toMatch(/Helvetica|Times|Courier/);
  });
});

describe('the content', () => {
  it('shows the cautions, the safety-related one included', () => {
    // Product brief, "Cautions to show".
    expect(data.cautions).toHaveLength(4);
    for (const caution of data.cautions) expect(whole).toContain(flat(caution));
  });

  it('has the revision history table', () => {
    // ISO 9001:2015 §7.5.3.2 c): control of changes (version control) — common practice for a revision table.
    const text = flat(pages.join('\n'));
    for (const r of data.revisionHistory)
      expect(text).toContain(`${r.revision} ${r.date} ${r.version} ${r.description} ${r.approvedBy} ${r.status}`);
  });

  it("has the calculation record fields, with the inputs' sources and the assumptions to be verified", () => {
    // ASME NQA-1 Requirement 3 §400: objective, design inputs with their sources, assumptions (those
    // needing later verification identified), method, references, conclusions.
    const r = data.version.content.record;
    for (const heading of ['Objective', 'Design inputs', 'Assumptions', 'Method', 'References', 'Conclusions'])
      expect(whole).toContain(heading);
    for (const paragraph of r.objective.split('\n\n')) expect(whole).toContain(flat(paragraph));
    const layout = flat(pages.join('\n'));
    for (const i of r.inputs) expect(layout).toContain(`${i.name} ${i.value} ${i.source} ${i.sourceRevision}`);
    for (const a of r.assumptions) expect(whole).toContain(a.text);
    const lines = pages.join('\n').split('\n');
    expect(flat(lines.find((l) => l.includes('A2 '))!).trim()).toBe(
      'A2 The energy loss in the vacuum window is below 0.1 MeV, so T ≈ T₀. TO BE VERIFIED',
    );
    expect(lines.find((l) => l.includes('A1 '))).not.toContain('TO BE VERIFIED');
    expect(whole).toContain(r.method);
    for (const ref of r.references) expect(whole).toContain(ref);
    expect(whole).toContain(r.conclusions);
  });

  it('keeps Greek letters, ≤, →, −, ±, superscripts and subscripts in the text layer', () => {
    // Common practice: a reader searches and copies the quantities as written.
    for (const s of [
      '70 → 250 MeV',
      'Bρ ≤ 3 T·m',
      'β ≤ 0.62',
      'γ − 1 ≈ 0.27',
      '±0.5 %',
      '(−0.5 %/+0.5 %)',
      'm⁻¹',
      's²',
      'µm',
      'Δθ and Ω',
      'H₂⁺',
      '1.672 621 925 95 × 10⁻²⁷ kg',
    ]) {
      expect(whole).toContain(s);
    }
  });

  it("shows every cell in order: each statement's source and result as text", () => {
    // Product brief, "The calculation language": formula, substitution and result for each statement.
    let at = -1;
    for (const [index, cell] of data.version.content.cells.entries()) {
      const next = whole.indexOf(`Cell ${index + 1} · ${cell.kind === 'calc' ? 'calculation' : 'text'}`);
      expect(next, `cell ${index + 1}`).toBeGreaterThan(at);
      at = next;
    }
    const statements = data.version.results.cells.flatMap((c) => c.statements);
    const layout = flat(pages.join('\n'));
    at = -1;
    for (const st of statements) {
      const next = layout.indexOf(`L${st.line} ${flat(st.source)}`, at + 1);
      expect(next, st.source).toBeGreaterThan(at);
      at = next;
    }
    // The engine's own results (a real evaluation), as text beside the formulas.
    expect(whole).toContain('T_kin = 250 MeV');
    // Six significant figures, the trailing zero kept (common practice).
    expect(whole).toContain('p = 3.896 70 × 10⁻¹⁹ kg·m/s');
    expect(whole).toContain('Brho = 2.432 13 T·m');
    expect(whole).toContain('gamma_L = 1.250 00');
    expect(whole).toContain('beta_p = 0.613 608');
    // The text cell's Markdown as prose (heading, bold, list items), no markup left.
    expect(whole).toContain('Beam transport to gantry 2');
    expect(whole).toContain('The proton kinetic energy at the gantry entrance fixes the magnetic rigidity');
    expect(whole).toContain('dipole limit checked as a criterion');
    expect(whole).not.toMatch(/\*\*|##/);
  });

  it('marks design criteria PASS or FAIL with their margins, and shows errors on their statements', () => {
    // Product brief: criteria compared exactly; an error is shown on its cell.
    const criteria = data.version.results.cells.flatMap((c) => c.statements).filter((st) => st.criterion);
    expect(criteria.map((st) => st.criterion!.pass)).toEqual([true, false]);
    const layout = flat(pages.join('\n'));
    expect(layout).toContain(`PASS ${criteria[0].criterion!.marginText}`);
    expect(layout).toContain(`FAIL ${criteria[1].criterion!.marginText}`);
    expect(whole).toContain('Error: cannot add');
  });

  it('lists the attachments with their SHA-256, the engine version and the constants edition', () => {
    // Product brief, "The issued PDF": attachments with their SHA-256; engine version and constants edition.
    const layout = flat(pages.join('\n'));
    for (const a of data.version.content.attachments) expect(layout).toContain(a.name);
    expect(whole).toContain(FIXTURE_SHA_ATTACHMENT_1);
    expect(whole).toContain(FIXTURE_SHA_ATTACHMENT_2);
    expect(layout).toContain(`Engine version ${data.version.engineVersion}`);
    expect(data.version.engineVersion).toMatch(/^worldsheet-calc /);
    expect(layout).toContain(`Constants edition ${data.version.constantsEdition}`);
    // The display-units setting: the fixture's content predates it, so it showed SI units.
    expect('displayUnits' in data.version.content).toBe(false);
    expect(layout).toContain('Units shown SI units');
    for (const k of data.constants) expect(layout).toContain(`${k.name} ${k.value} ${k.provenance}`);
  });

  it('prints each signature with printed name, meaning and UTC time', () => {
    // 21 CFR Part 11 §11.50(a): the printed name of the signer, the date and time of signing, and the
    // meaning of the signature.
    const layout = flat(pages.join('\n'));
    expect(layout).toContain('Prepared Ada Pennington 2026-11-27 09:41:12 UTC');
    expect(layout).toContain('Checked Tomasz Ellery-Whyte 2026-11-30 16:05:44 UTC');
    expect(layout).toContain('Approved Hamid Okonkwo-Reyes 2026-12-01 10:12:09 UTC');
    expect(layout).toContain('Issued Rosalind Achterberg 2026-12-02 14:03:07 UTC');
  });

  it('ends with the version hash, the verification code, where to verify and the verification method', () => {
    // Product brief, "The issued PDF": the version hash and a verification code; NQA-1 Requirement 3
    // §500 for the verification method.
    expect(data.version.sha256).toMatch(/^[0-9a-f]{64}$/);
    const layout = flat(pages.join('\n'));
    expect(layout).toContain(`Version SHA-256 ${data.version.sha256}`);
    expect(layout).toContain(`Verification code ${data.verificationCode}`);
    expect(layout).toContain(`Verify at ${data.verifyUrl}`);
    expect(layout).toContain(`Verification method ${data.verificationMethod}`);
    // The last page holds it.
    expect(flat(pages[pageCount])).toContain(data.verificationCode);
  });

  it('renders the same data to the same bytes', async () => {
    // Common practice: a rerun of an issue produces the identical file (creation date = date of issue).
    expect(Buffer.compare(await renderRevisionPdf(data), bytes)).toBe(0);
  });

  it('carries document information', () => {
    // Common practice: a document's information dictionary names it.
    const info = run('pdfinfo', [file]);
    expect(info).toMatch(/Title:\s+TPT2-CALC-0007 rev\. B — Magnetic rigidity/);
    expect(info).toMatch(/Author:\s+Kestrelwick Beam Systems Ltd/);
    expect(info).toMatch(/Creator:\s+Worldsheet/);
  });
});

describe('the formulas', () => {
  it('are drawn as vector outlines, not text', async () => {
    // Issue text: formulas typeset as vector graphics.
    const statements = data.version.results.cells.flatMap((c) => c.statements);
    for (const st of statements) {
      expect(whole).not.toContain(st.tex);
      if (st.substitutedTex) expect(whole).not.toContain(st.substitutedTex);
    }
    expect(whole).not.toMatch(/\\mathrm|\\left|\\frac/);
    // The substituted values appear only inside the typeset formula, never as text.
    expect(whole).not.toContain('(3.896');
    const calcPage = pages.findIndex((text) => /T_kin = 250 MeV\s+# kinetic energy/.test(text ?? ''));
    expect(calcPage).toBeGreaterThan(0);
    const content = await pageContent(calcPage - 1);
    // Glyph outlines: many cubic curves and fills on the page that holds the calculation cells. Each
    // distinct glyph is a form XObject (ISO 32000-1 §8.10) holding its outline and a fill, drawn by
    // reference (`Do`) at each use; count what the uses draw.
    const forms = await pageForms(calcPage - 1);
    let curves = content.match(/ c\n/g)?.length ?? 0;
    let fills = content.match(/\nf\n/g)?.length ?? 0;
    for (const [, name] of content.matchAll(/\/(\S+) Do\b/g)) {
      const form = forms.get(name);
      expect(form).toBeDefined();
      curves += form!.match(/ c\n/g)?.length ?? 0;
      fills += form!.match(/\nf\n?$/g)?.length ?? 0;
    }
    expect(curves).toBeGreaterThan(1000);
    expect(fills).toBeGreaterThan(100);
  });

  it("leave ink between a statement's source line and its result, where there is no text", () => {
    // Common practice: look at the rendered page. The formula of `p = momentumFromKinetic(…)` and its
    // substitution lie between the source line and the result line.
    const calcPage = pages.findIndex((text) => text?.includes('p = momentumFromKinetic(T_kin, m_p)'));
    const html = run('pdftotext', ['-bbox', '-f', String(calcPage), '-l', String(calcPage), file, '-']);
    const words = [
      ...html.matchAll(/<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">([^<]*)<\/word>/g),
    ].map((m) => ({
      xMin: Number(m[1]),
      yMin: Number(m[2]),
      xMax: Number(m[3]),
      yMax: Number(m[4]),
      text: m[5],
    }));
    const source = words.find((w) => w.text === 'momentumFromKinetic(T_kin,');
    // 3.896 70 × 10⁻¹⁹ (six figures, the trailing zero kept): its first group is a word of its own.
    const result = words.find((w) => w.text.startsWith('3.896') && source && w.yMin > source.yMax);
    expect(source && result).toBeTruthy();
    const top = source!.yMax + 1;
    const bottom = result!.yMin - 1;
    expect(bottom - top).toBeGreaterThan(20); // two typeset lines
    expect(words.filter((w) => w.yMin < bottom && w.yMax > top && w.xMin >= source!.xMin - 5)).toEqual([]);
    // Count dark pixels in that band at 100 dpi (a PGM is simple to read).
    const pgm = path.join(folder, 'band');
    run('pdftoppm', ['-r', '100', '-gray', '-f', String(calcPage), '-l', String(calcPage), '-singlefile', file, pgm]);
    const image = readFileSync(`${pgm}.pgm`);
    const header = /^P5\s+(\d+)\s+(\d+)\s+(\d+)\s/.exec(image.subarray(0, 40).toString('latin1'))!;
    const [width] = [Number(header[1])];
    const pixels = image.subarray(header[0].length);
    const k = 100 / 72;
    let dark = 0;
    for (let y = Math.ceil(top * k); y < Math.floor(bottom * k); y++) {
      for (let x = Math.floor(source!.xMin * k); x < Math.floor(500 * k); x++) if (pixels[y * width + x] < 128) dark++;
    }
    expect(dark).toBeGreaterThan(500);
  });

  it('fall back to the TeX source in the mono face when MathJax cannot typeset it, without failing the render', async () => {
    // Common practice: one bad formula never stops the document.
    expect(() => typesetTex('\\frac{a')).toThrow();
    expect(createTexCache()('\\frac{a')).toBeNull();
    // Kept across renders: a second document's typesetter answers with the same outlines, not a new typesetting.
    expect(createTexCache()('x_{k} = \\sqrt{y}', true)).toBe(createTexCache()('x_{k} = \\sqrt{y}', true));
    expect(createTexCache()('x_{k} = \\sqrt{y}', true)).not.toBe(createTexCache()('x_{k} = \\sqrt{y}', false));
    const broken = buildRevisionPdfData({
      cells: [{ id: 'bad', kind: 'text', source: 'Broken: $\\frac{a$ and fine: $x^2$' }],
    });
    const pdf = await renderRevisionPdf(broken);
    const f = path.join(folder, 'broken.pdf');
    writeFileSync(f, pdf);
    expect(flat(run('pdftotext', [f, '-']))).toContain('Broken: $\\frac{a$ and fine:');
  });

  it('show bidirectional control characters as ⟦U+202E⟧ markers instead of letting them reorder the text (UAX #9; CVE-2021-42574)', async () => {
    // Text cells and record fields may hold them (calculation sources are refused on save; this one
    // stands for a version stored before that rule).
    const d = buildRevisionPdfData({
      cells: [
        { id: 'note', kind: 'text', source: 'Limit \u202e3 T m\u202c, see the **spec\u2067**.' },
        { id: 'calc', kind: 'calc', source: 'x = 2 m # ok \u202e' },
      ],
    });
    d.titleBlock.title = `Dipole \u202eexe.fdp`;
    d.version.content.record.method = 'By hand \u200f';
    d.version.content.attachments = [{ ...d.version.content.attachments[0], name: 'scan\u202efdp.pdf' }];
    const f = path.join(folder, 'bidi.pdf');
    writeFileSync(f, await renderRevisionPdf(d));
    const text = flat(run('pdftotext', [f, '-']));
    expect(text).not.toMatch(/[\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/);
    for (const shown of [
      'Dipole ⟦U+202E⟧exe.fdp',
      'Limit ⟦U+202E⟧3 T m⟦U+202C⟧',
      'spec⟦U+2067⟧',
      'By hand ⟦U+200F⟧',
      'scan⟦U+202E⟧fdp.pdf',
      '# ok ⟦U+202E⟧',
    ]) {
      expect(text).toContain(shown);
    }
  });

  it('draw a character the math fonts lack as text, and each glyph outline once however often it is used', async () => {
    // Common practice: a character MathJax's fonts lack is drawn by MathJax as SVG text; the glyphs
    // it has are drawn by reference to one form XObject each (ISO 32000-1 §8.10).
    const d = buildRevisionPdfData({
      cells: [{ id: 'note', kind: 'text', source: 'Two charges: $q = 5\\,\\text{€}$ and $r = 5 + 5$.' }],
    });
    const out = await renderRevisionPdf(d);
    const f = path.join(folder, 'euro.pdf');
    writeFileSync(f, out);
    const text = flat(run('pdftotext', [f, '-']));
    expect(text).toContain('€');
    expect(text).not.toContain('\\text'); // typeset, not shown as its TeX source
    const doc = await PDFDocument.load(out);
    const contents = doc.getPages().map((page) => {
      const ref = page.node.get(PDFName.of('Contents'));
      const list = ref instanceof PDFArray ? ref.asArray() : [ref];
      return list.map((r) => streamText(doc.context.lookup(r as PDFRef) as PDFRawStream)).join('\n');
    });
    const uses = contents.flatMap((c) => [...c.matchAll(/\/(Wg\d+) Do\b/g)].map((m) => m[1]));
    // "5" is drawn three times from one outline.
    expect(uses.length).toBeGreaterThan(new Set(uses).size);
    const forms = doc.context
      .enumerateIndirectObjects()
      .filter(([, o]) => o instanceof PDFRawStream && o.dict.get(PDFName.of('Subtype'))?.toString() === '/Form')
      // The one form that writes text is the title block's page count ("Sheet n of m").
      .filter(([, o]) => !/\bTj\b|\bTJ\b/.test(streamText(o as PDFRawStream)));
    expect(forms.length).toBe(new Set(uses).size);
  });

  it('cut a formula too wide for the page at its operators instead of shrinking it to nothing', () => {
    // Common practice (TeX breaks an inline formula after a relation or binary operator).
    const math = typesetTex(Array.from({ length: 30 }, (_, i) => `${i + 1}~\\mathrm{m}`).join(' + '), true);
    expect(math.breaks.length).toBeGreaterThan(20);
    const [minX, , width] = math.viewBox;
    expect(math.breaks.every((b) => b > minX && b < minX + width)).toBe(true);
  });

  it('have their quadratic pieces drawn as the exact cubics', () => {
    // Degree elevation of a quadratic Bézier: control points P0 + 2/3 (Q − P0) and P2 + 2/3 (Q − P2);
    // a smooth quadratic (T) reflects the previous control point (SVG 1.1 §8.3.7).
    expect(pdfPathData('M0 0Q10 10 20 0T40 0Z')).toBe('M0 0C7 7 13 7 20 0C27 -7 33 -7 40 0Z');
    expect(pdfPathData('M1 2h3v4l-1 1z')).toBe('M1 2L4 2L4 6L3 7Z');
    expect(parsePathData('M0 0A5 5 0 0 1 10 0')).toBeNull();
  });
});

/**
 * The operators of a content stream with the depth of marked content each is drawn at (strings,
 * dictionaries and comments skipped; ISO 32000-1 §7.8.2 and §14.6).
 */
function markedDepths(content: string): Array<{ op: string; depth: number }> {
  const out: Array<{ op: string; depth: number }> = [];
  let depth = 0;
  let i = 0;
  let word = '';
  const flush = () => {
    if (/^[A-Za-z'"][A-Za-z*'"0-9]*$/.test(word)) {
      if (word === 'EMC') depth -= 1;
      out.push({ op: word, depth });
      if (word === 'BDC' || word === 'BMC') depth += 1;
    }
    word = '';
  };
  while (i < content.length) {
    const c = content[i];
    if (c === '(') {
      flush();
      let nest = 1;
      i += 1;
      while (i < content.length && nest > 0) {
        if (content[i] === '\\') i += 2;
        else {
          if (content[i] === '(') nest += 1;
          if (content[i] === ')') nest -= 1;
          i += 1;
        }
      }
    } else if (c === '<' && content[i + 1] !== '<') {
      flush();
      i = content.indexOf('>', i) + 1;
    } else if (c === '%') {
      flush();
      while (i < content.length && content[i] !== '\n' && content[i] !== '\r') i += 1;
    } else if (c === '/') {
      flush();
      i += 1;
      while (i < content.length && !/[\s/<>[\]()]/.test(content[i])) i += 1;
    } else if (/[\s<>[\]{}]/.test(c)) {
      flush();
      i += 1;
    } else {
      word += c;
      i += 1;
    }
  }
  flush();
  return out;
}

describe('the structure (a tagged PDF, ISO 32000-1 §14.8)', () => {
  /** `pdfinfo -struct-text`: the structure tree with each element's text, as a reader that uses tags sees the file. */
  let tree: string;
  beforeAll(() => {
    tree = run('pdfinfo', ['-struct-text', file]);
  });
  const texts = () => [...tree.matchAll(/^\s*"(.*)"$/gm)].map((m) => m[1]);

  it('is tagged, with a structure tree and the document language', async () => {
    // ISO 32000-1 §14.7.1 (StructTreeRoot), §14.8.1 (MarkInfo /Marked true), §14.9.2 (the catalog's /Lang).
    expect(run('pdfinfo', [file])).toMatch(/^Tagged:\s+yes$/m);
    const doc = await PDFDocument.load(bytes, { updateMetadata: false });
    expect(doc.catalog.get(PDFName.of('StructTreeRoot'))).toBeDefined();
    const markInfo = doc.catalog.lookup(PDFName.of('MarkInfo'), PDFDict);
    expect(markInfo.get(PDFName.of('Marked'))?.toString()).toBe('true');
    const lang = doc.catalog.lookup(PDFName.of('Lang'));
    expect(lang instanceof PDFString || lang instanceof PDFHexString ? lang.decodeText() : null).toBe(
      data.titleBlock.language,
    );
    expect(bytes.subarray(0, 8).toString('latin1')).toBe('%PDF-1.7');
  });

  it('reads as a document: the title as H1, the cautions, then the seven numbered sections in order, each under its H2', () => {
    // ISO 32000-1 §14.8.4.3 standard structure types (Document, Sect, H1–H6, P, Table, TR, TH, TD, Formula).
    expect(tree.split('\n')[0]).toBe('Document');
    expect(tree).toMatch(
      new RegExp(`H1 \\(block\\)\\n\\s+"${data.titleBlock.title.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}"`),
    );
    expect(tree).toMatch(/H2 \(block\)\n\s+"Caution"/);
    const sections = [...tree.matchAll(/^ {2}Sect\n {4}H2 \(block\)\n\s+"(.*)"$/gm)].map((m) =>
      m[1].replace(/\s+/g, ' '),
    );
    expect(sections).toEqual([
      '1 Revision history',
      '2 Calculation record',
      '3 Calculation',
      '4 Attachments',
      '5 Evaluation',
      '6 Signatures',
      '7 Verification',
    ]);
    for (const field of ['Objective', 'Design inputs', 'Assumptions', 'Method', 'References', 'Conclusions'])
      expect(tree).toMatch(new RegExp(`H3 \\(block\\)\\n\\s+"${field}"`));
  });

  it('tags tables as rows of header and data cells', () => {
    // ISO 32000-1 §14.8.4.3.4 (table elements).
    const history = /Table \(block\)\n((?:\s+(?:TR|TH|TD|".*")\n)+)/.exec(tree)![1];
    const headers = [...history.matchAll(/TH\n\s+"(.*)"/g)].map((m) => m[1]);
    expect(headers).toEqual(['Rev.', 'Date', 'Version', 'Description', 'Approved by', 'Status']);
    expect([...history.matchAll(/^\s+TR$/gm)]).toHaveLength(1 + data.revisionHistory.length);
    for (const row of data.revisionHistory) expect(history).toContain(`"${row.description}"`);
  });

  it('gives every typeset formula a Formula element whose alternate text is its TeX', async () => {
    // ISO 32000-1 §14.9.3 (alternate descriptions): a formula drawn as outlines is read through its /Alt.
    const doc = await PDFDocument.load(bytes, { updateMetadata: false });
    const alts: string[] = [];
    for (const [, object] of doc.context.enumerateIndirectObjects()) {
      if (!(object instanceof PDFDict) || object.get(PDFName.of('S'))?.toString() !== '/Formula') continue;
      const alt = object.lookup(PDFName.of('Alt'));
      alts.push(alt instanceof PDFString || alt instanceof PDFHexString ? alt.decodeText() : '');
    }
    const statements = data.version.results.cells.flatMap((c) => c.statements);
    const expected = statements
      .flatMap((st) => [st.tex, st.substitutedTex && st.substitutedTex !== st.tex ? st.substitutedTex : null])
      .filter((t): t is string => Boolean(t));
    expect(expected.length).toBeGreaterThan(5);
    for (const tex of expected) expect(alts).toContain(tex);
    expect(alts.every((a) => a.length > 0)).toBe(true);
  });

  it('tags a formula cut over several lines as one Formula element, and one drawn partly as text too', async () => {
    // ISO 32000-1 §14.8.2.2.1 and §14.9.3: a formula is one element with its TeX as /Alt, however it
    // is drawn (lines drawn directly open and close their element from their own drawing; a formula
    // holding text is drawn as SVG between the element's markers).
    const long = Array.from({ length: 40 }, (_, i) => `${i + 1}~\\mathrm{m}`).join(' + ');
    const euro = 'q = 5\\,\\text{€}';
    const d = buildRevisionPdfData({
      cells: [{ id: 'note', kind: 'text', source: `Lengths:\n\n$$${long}$$\n\nCharge:\n\n$$${euro}$$` }],
    });
    const out = await renderRevisionPdf(d);
    const doc = await PDFDocument.load(out, { updateMetadata: false });
    const alts: string[] = [];
    for (const [, object] of doc.context.enumerateIndirectObjects()) {
      if (!(object instanceof PDFDict) || object.get(PDFName.of('S'))?.toString() !== '/Formula') continue;
      const alt = object.lookup(PDFName.of('Alt'));
      alts.push(alt instanceof PDFString || alt instanceof PDFHexString ? alt.decodeText().trim() : '');
    }
    expect(alts.filter((a) => a === long)).toHaveLength(1);
    expect(alts.filter((a) => a === euro)).toHaveLength(1);
    const shows = new Set(['Tj', 'TJ', 'f', 'S', 'Do']);
    let lines = 0;
    for (const page of doc.getPages()) {
      const ref = page.node.get(PDFName.of('Contents'));
      const list = ref instanceof PDFArray ? ref.asArray() : [ref];
      const content = list.map((r) => streamText(doc.context.lookup(r as PDFRef) as PDFRawStream)).join('\n');
      const ops = markedDepths(content);
      expect(ops.filter((o) => shows.has(o.op) && o.depth === 0)).toEqual([]);
      expect(ops.filter((o) => o.op === 'EMC').length).toBe(ops.filter((o) => o.op === 'BDC' || o.op === 'BMC').length);
      // Each line of a formula drawn directly is its own q … Q holding its Do's.
      lines += [...content.matchAll(/\/Wg\d+ Do\nQ\nQ/g)].length;
    }
    expect(lines).toBeGreaterThan(2); // the long sum took several lines
  });

  it('tags what each statement says (source, result, PASS/FAIL, error) and leaves the page furniture out as artifacts', () => {
    // ISO 32000-1 §14.8.2.2 (real content and artifacts: running heads and title blocks are pagination artifacts).
    const tagged = texts()
      .join('\n')
      .replace(/[ \t]+/g, ' ');
    const statements = data.version.results.cells.flatMap((c) => c.statements);
    for (const st of statements) expect(tagged).toContain(st.source.replace(/\s+/g, ' ').trim().slice(0, 30));
    expect(tagged).toMatch(/PASS/);
    expect(tagged).toMatch(/FAIL/);
    expect(tagged).toContain(data.verificationCode);
    expect(tagged).not.toMatch(/Sheet \d+ of \d+/);
    expect(tagged).not.toContain('Identification number');
  });

  it('draws nothing outside marked content: every text and path is tagged or an artifact', async () => {
    // ISO 32000-1 §14.8.2.2.1: in a tagged PDF, content that is not an artifact is part of the structure.
    const shows = new Set(['Tj', 'TJ', "'", '"', 'f', 'F', 'f*', 'B', 'B*', 'b', 'b*', 'S', 's', 'Do', 'sh']);
    for (let p = 0; p < pageCount; p++) {
      const ops = markedDepths(await pageContent(p));
      const drawn = ops.filter((o) => shows.has(o.op));
      expect(drawn.length).toBeGreaterThan(10);
      expect(drawn.filter((o) => o.depth === 0)).toEqual([]);
      expect(ops.at(-1)?.depth ?? 0).toBeGreaterThanOrEqual(0);
      expect(ops.filter((o) => o.op === 'EMC').length).toBe(ops.filter((o) => o.op === 'BDC' || o.op === 'BMC').length);
    }
  });
});
