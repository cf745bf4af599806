// The issued PDF of a revision (product brief, "The issued PDF"): drawn with @react-pdf/renderer
// from RevisionPdfData alone. Every page carries the ISO 7200 title block at its foot; the body runs
// cautions → revision history → calculation record → cells in order → attachments → evaluation →
// signatures → verification. Formulas are MathJax outlines (./tex-svg.ts); beside each one the
// statement's source and result stay real text, so the file can be searched and copied.
import { Document, Page, Text, View, renderToBuffer } from '@react-pdf/renderer';
import { isValidElement, type ReactElement, type ReactNode } from 'react';
import { bidiSegments, revealBidiControlsDeep } from '@/lib/calc/bidi-controls';
import type { CellResult, StatementResult } from '@/lib/calc/types';
import type { Cell } from '@/lib/sheets/content';
import type { RevisionPdfData } from '../pdf-data';
import { MONO_FONT, TEXT_FONT, registerPdfFonts } from './fonts';
import { type Block, type Inline, markdownBlocks } from './markdown-blocks';
import { MathBlock, MathGraphic, mathSize } from './math-view';
import {
  Breakable,
  type FigureRenderer,
  PlotFigurePdf,
  ReferenceLines,
  statementExtras,
  UncertaintyLine,
} from './statement-extras';
import { SheetNumber } from './sheet-number';
import { installFontReuse } from './pdfkit-fonts';
import { keepTextLayouts } from './text-layout-cache';
import { Group, Leaf, PageArtifact, installPdfStructure, structureInstructionsActedOn } from './structure';
import { type TypesetMath, createTexCache } from './tex-svg';
import { DISPLAY_UNITS_DEFAULT, DISPLAY_UNITS_LABEL } from '@/lib/calc/display-units';

// Worldsheet's palette (tailwind.config.ts `tokens`): drafting-paper neutrals, one teal, and the
// signal colours kept for pass, fail and caution.
const C = {
  ink: '#17212b',
  muted: '#4b5563',
  rule: '#d6d1c4',
  ruleStrong: '#7d7768',
  accent: '#0b5a61',
  accentSoft: '#e3f0f0',
  pass: '#1d6a33',
  passSoft: '#e6f2e8',
  fail: '#a3242b',
  failSoft: '#fae9e9',
  caution: '#6f4500',
  cautionSoft: '#fff3d4',
  cautionRule: '#c2861a',
  codeSoft: '#f3f2ec',
} as const;

// A4 portrait. ISO 7200 limits the title block to 180 mm wide, which is the text width here.
const MM = 72 / 25.4;
const MARGIN_X = 15 * MM;
const CONTENT_WIDTH = 595.28 - 2 * MARGIN_X;
const TITLE_BLOCK_ROWS = [25, 28, 22];
const TITLE_BLOCK_HEIGHT = TITLE_BLOCK_ROWS.reduce((a, b) => a + b, 0);
const TITLE_BLOCK_BOTTOM = 16;
const PAGE_PADDING_TOP = 40;
// Content stops well above the title block (fixed elements do not take part in the page's flow).
const PAGE_PADDING_BOTTOM = TITLE_BLOCK_BOTTOM + TITLE_BLOCK_HEIGHT + 18;

const BODY = 9.5;
const MATH_EM = 10;
// Width left for a formula inside a calculation cell: cell border and padding, line-number gutter.
const CELL_PAD = 7;
const GUTTER = 22;
const FORMULA_WIDTH = CONTENT_WIDTH - 2 * CELL_PAD - 2 - GUTTER;

const s = {
  page: {
    fontFamily: TEXT_FONT,
    fontSize: BODY,
    color: C.ink,
    paddingTop: PAGE_PADDING_TOP,
    paddingBottom: PAGE_PADDING_BOTTOM,
    paddingHorizontal: MARGIN_X,
  },
  runningHeadBox: { position: 'absolute' as const, top: 18, left: MARGIN_X, right: MARGIN_X },
  runningHead: {
    flexDirection: 'row' as const,
    justifyContent: 'space-between' as const,
    fontSize: 7.5,
    color: C.muted,
    borderBottomWidth: 0.5,
    borderBottomColor: C.rule,
    paddingBottom: 3,
  },
  h1: { fontSize: 17, fontWeight: 700, lineHeight: 1.2, marginBottom: 4 },
  h2: {
    fontSize: 12.5,
    fontWeight: 700,
    color: C.accent,
    marginTop: 14,
    marginBottom: 5,
    paddingBottom: 2,
    borderBottomWidth: 1,
    borderBottomColor: C.accent,
  },
  h3: { fontSize: 10.5, fontWeight: 700, marginTop: 8, marginBottom: 3 },
  muted: { color: C.muted },
  mono: { fontFamily: MONO_FONT },
  para: { marginBottom: 4 },
  label: { fontSize: 7, fontWeight: 600, color: C.muted, textTransform: 'uppercase' as const, letterSpacing: 0.3 },
  table: { borderWidth: 0.75, borderColor: C.ruleStrong, marginBottom: 6 },
  tr: { flexDirection: 'row' as const, borderTopWidth: 0.5, borderTopColor: C.rule },
  th: {
    fontSize: 7.5,
    fontWeight: 700,
    color: C.muted,
    paddingVertical: 3,
    paddingHorizontal: 4,
    backgroundColor: C.codeSoft,
  },
  td: { fontSize: 8.5, paddingVertical: 3, paddingHorizontal: 4 },
};

/**
 * Text with its bidirectional control markers (⟦U+202E⟧, written by `revealBidiControlsDeep` in
 * RevisionPdfDocument) drawn in the caution colours and the mono face, so that a control character
 * someone typed shows as what it is. A string without one is returned as it is.
 */
function shown(text: string): ReactNode {
  const segments = bidiSegments(text);
  if (segments.length === 1 && segments[0].control === null) return text;
  return segments.map((seg, i) =>
    seg.control ? (
      <Text
        key={i}
        style={{
          fontFamily: MONO_FONT,
          fontWeight: 700,
          fontStyle: 'normal',
          color: C.caution,
          backgroundColor: C.cautionSoft,
        }}
      >
        {seg.text}
      </Text>
    ) : (
      seg.text
    ),
  );
}

/** "2026-12-02T14:03:07.000Z" → "2026-12-02 14:03:07 UTC"; anything unparseable is shown as given. */
function formatUtc(value: string): string {
  const d = new Date(value);
  if (Number.isNaN(d.getTime())) return value;
  const iso = d.toISOString();
  return `${iso.slice(0, 10)} ${iso.slice(11, 19)} UTC`;
}

function formatBytes(n: number): string {
  const grouped = String(n).replace(/\B(?=(\d{3})+(?!\d))/g, ' ');
  if (n < 1024) return `${grouped} B`;
  const units = ['KiB', 'MiB', 'GiB'];
  let v = n / 1024;
  let u = 0;
  while (v >= 1024 && u < units.length - 1) {
    v /= 1024;
    u++;
  }
  return `${grouped} B (${v.toFixed(1)} ${units[u]})`;
}

type Typeset = (tex: string, display?: boolean) => TypesetMath | null;

// ---------------------------------------------------------------------------------------------
// Page furniture

function TitleField({
  label,
  children,
  width,
  last,
  valueStyle,
  lines = 1,
}: {
  label: string;
  children?: ReactNode;
  width: string;
  last?: boolean;
  valueStyle?: Record<string, unknown>;
  lines?: number;
}) {
  return (
    <View
      style={{
        width,
        paddingHorizontal: 3,
        paddingTop: 1.5,
        borderRightWidth: last ? 0 : 0.75,
        borderRightColor: C.ink,
      }}
    >
      <Text style={{ fontSize: 5.5, color: C.muted, lineHeight: 1.2 }}>{label}</Text>
      <Text style={{ fontSize: 8, lineHeight: 1.15, maxLines: lines, textOverflow: 'ellipsis', ...valueStyle }}>
        {children}
      </Text>
    </View>
  );
}

/** ISO 7200:2004 data fields in title blocks, as one fixed block at the foot of every page. */
function TitleBlock({ data }: { data: RevisionPdfData }) {
  const t = data.titleBlock;
  const row = (i: number, last = false) => ({
    flexDirection: 'row' as const,
    height: TITLE_BLOCK_ROWS[i],
    borderBottomWidth: last ? 0 : 0.75,
    borderBottomColor: C.ink,
  });
  return (
    // Page furniture (the body's heading, revision history and signatures say what it says): the
    // fixed box draws nothing itself, so that its frame is inside the artifact.
    <View fixed style={{ position: 'absolute', left: MARGIN_X, right: MARGIN_X, bottom: TITLE_BLOCK_BOTTOM }}>
      <PageArtifact whole>
        <View style={{ borderWidth: 1.25, borderColor: C.ink, backgroundColor: '#ffffff' }}>
          <View style={row(0)}>
            <TitleField label="Legal owner" width="38%" valueStyle={{ fontWeight: 700 }}>
              {t.legalOwner}
            </TitleField>
            <TitleField label="Project" width="32%" lines={2} valueStyle={{ fontSize: 7, lineHeight: 1.1 }}>
              {`${t.project.code} · ${t.project.name}`}
            </TitleField>
            <TitleField label="Document type" width="15%">
              {t.documentType}
            </TitleField>
            <TitleField label="Document status" width="15%" last valueStyle={{ fontWeight: 700 }}>
              {t.status}
            </TitleField>
          </View>
          <View style={row(1)}>
            <TitleField label="Title" width="70%" lines={2} valueStyle={{ fontWeight: 600, fontSize: 8.5 }}>
              {shown(t.title)}
            </TitleField>
            <TitleField label="Identification number" width="30%" last valueStyle={{ fontWeight: 700, fontSize: 10 }}>
              {t.identificationNumber}
            </TitleField>
          </View>
          <View style={row(2, true)}>
            <TitleField label="Creator" width="23%">
              {t.creator}
            </TitleField>
            <TitleField label="Approval person" width="23%">
              {t.approvalPerson}
            </TitleField>
            <TitleField label="Rev." width="8%" valueStyle={{ fontWeight: 700 }}>
              {t.revisionIndex}
            </TitleField>
            <TitleField label="Date of issue" width="15%">
              {t.dateOfIssue}
            </TitleField>
            <TitleField label="Lang." width="8%">
              {t.language}
            </TitleField>
            <View style={{ width: '23%', paddingHorizontal: 3, paddingTop: 1.5 }}>
              <Text style={{ fontSize: 5.5, color: C.muted, lineHeight: 1.2 }}>Sheet</Text>
              {/* Not a render prop: that would make react-pdf paginate the whole document twice. */}
              <SheetNumber size={8} ink={C.ink} />
            </View>
          </View>
        </View>
      </PageArtifact>
    </View>
  );
}

function RunningHead({ data }: { data: RevisionPdfData }) {
  const t = data.titleBlock;
  return (
    // Page furniture; the fixed box draws nothing itself, so that its rule is inside the artifact.
    <View fixed style={s.runningHeadBox}>
      <PageArtifact whole>
        <View style={s.runningHead}>
          <Text>{t.legalOwner}</Text>
          <Text>{`${t.identificationNumber} · Rev. ${t.revisionIndex} · ${t.status}`}</Text>
        </View>
      </PageArtifact>
    </View>
  );
}

function SectionHeading({ children }: { children: string }) {
  return (
    <Leaf as="H2">
      <Text style={s.h2} minPresenceAhead={40}>
        {children}
      </Text>
    </Leaf>
  );
}

/**
 * `anchor` names the table, its last row and that row's last cell as destinations: react-pdf writes
 * each box's offset from its parent, so their sum (with the anchored text's) places that cell.
 */
function Table({
  columns,
  rows,
  empty = 'None.',
  anchor,
}: {
  columns: Array<{ title: string; width: string; mono?: boolean }>;
  rows: ReactNode[][];
  empty?: string;
  anchor?: string;
}) {
  if (rows.length === 0)
    return (
      <Leaf as="P">
        <Text style={[s.muted, s.para]}>{empty}</Text>
      </Leaf>
    );
  const last = (r: number, i?: number) =>
    anchor && r === rows.length - 1 && (i === undefined || i === columns.length - 1)
      ? { id: `${anchor}-${i === undefined ? 'row' : 'cell'}` }
      : {};
  return (
    <View style={s.table} {...(anchor ? { id: `${anchor}-table` } : {})}>
      <Group as="Table">
        <View style={{ flexDirection: 'row' }}>
          <Group as="TR" inRow>
            {columns.map((c, i) => (
              <Leaf key={i} as="TH" inRow>
                <Text style={[s.th, { width: c.width }]}>{c.title}</Text>
              </Leaf>
            ))}
          </Group>
        </View>
        {rows.map((cells, r) => (
          <View key={r} style={s.tr} wrap={false} {...last(r)}>
            <Group as="TR" inRow>
              {cells.map((cell, i) => (
                <View key={i} style={[s.td, { width: columns[i].width }]} {...last(r, i)}>
                  <Leaf as="TD">
                    {typeof cell === 'string' ? (
                      <Text style={columns[i].mono ? [s.mono, { fontSize: 7.5 }] : undefined}>{shown(cell)}</Text>
                    ) : (
                      cell
                    )}
                  </Leaf>
                </View>
              ))}
            </Group>
          </View>
        ))}
      </Group>
    </View>
  );
}

// ---------------------------------------------------------------------------------------------
// Math and text

/** A formula as outlines (cut into lines when too wide), or its TeX in the mono face when MathJax cannot typeset it. */
function Formula({ tex, typeset, maxWidth }: { tex: string; typeset: Typeset; maxWidth: number }) {
  // Display style: fractions and limits at full size, as a checker reads them on paper.
  const math = typeset(tex, true);
  if (!math)
    return (
      <Leaf as="Code">
        <Text style={[s.mono, { fontSize: 7.5, color: C.muted }]}>{tex}</Text>
      </Leaf>
    );
  return (
    <View style={{ marginVertical: 1.5 }}>
      <MathBlock math={math} emPt={MATH_EM} maxWidth={maxWidth} leaf={{ as: 'Formula', alt: tex }} />
    </View>
  );
}

function spanStyle(i: Extract<Inline, { kind: 'text' }>) {
  return {
    ...(i.bold ? { fontWeight: 700 } : {}),
    ...(i.italic ? { fontStyle: 'italic' as const } : {}),
    ...(i.code ? { fontFamily: MONO_FONT, fontSize: BODY * 0.85, fontWeight: 400, fontStyle: 'normal' as const } : {}),
  };
}

/** A run of inlines. Without math it is one text with styled spans; with math the words and the
 * formulas are laid out as a wrapping row, each formula sitting on the text's baseline. */
function InlineFlow({
  inlines,
  typeset,
  fontSize = BODY,
  style,
  maxWidth,
}: {
  inlines: Inline[];
  typeset: Typeset;
  fontSize?: number;
  style?: Record<string, unknown>;
  maxWidth: number;
}) {
  const hasMath = inlines.some((i) => i.kind === 'math' && typeset(i.tex, i.display));
  if (!hasMath) {
    return (
      <Text style={{ fontSize, ...style }}>
        {inlines.map((i, k) =>
          i.kind === 'text' ? (
            <Text key={k} style={spanStyle(i)}>
              {shown(i.text)}
            </Text>
          ) : (
            <Text key={k} style={{ fontFamily: MONO_FONT, fontSize: fontSize * 0.85 }}>
              {`$${i.tex}$`}
            </Text>
          ),
        )}
      </Text>
    );
  }
  const parts: ReactElement[] = [];
  // A text line is Source Sans 3's natural 1.424 em high (ascender 1.024, descender 0.400): its
  // baseline sits 0.4 em above the bottom of the line.
  const baselineFromBottom = fontSize * 0.4;
  inlines.forEach((i, k) => {
    if (i.kind === 'text') {
      const words = i.text.split(/(?<=\s)/);
      words.forEach((w, j) => {
        if (w === '') return;
        parts.push(
          <Text key={`${k}-${j}`} style={{ fontSize, ...style, ...spanStyle(i) }}>
            {shown(w)}
          </Text>,
        );
      });
      return;
    }
    const math = typeset(i.tex, i.display);
    if (!math) {
      parts.push(
        <Text key={k} style={{ fontFamily: MONO_FONT, fontSize: fontSize * 0.85 }}>
          {`$${i.tex}$ `}
        </Text>,
      );
      return;
    }
    const em = fontSize * 1.05;
    const size = mathSize(math, em, maxWidth);
    parts.push(
      <View
        key={k}
        style={
          i.display
            ? { width: '100%', alignItems: 'center', marginVertical: 3 }
            : { marginBottom: baselineFromBottom - size.depth }
        }
      >
        <MathGraphic math={math} emPt={em} maxWidth={maxWidth} />
      </View>,
    );
  });
  return <View style={{ flexDirection: 'row', flexWrap: 'wrap', alignItems: 'flex-end' }}>{parts}</View>;
}

/** A text cell's blocks, one element each (the cell frames them). */
function markdownElements(blocks: Block[], typeset: Typeset, maxWidth: number): ReactElement[] {
  return blocks.map((b, k) => {
    switch (b.kind) {
      case 'heading':
        // Below the cell's own heading (H3): a text cell's levels 1, 2, 3+ are H4, H5, H6.
        return (
          <Leaf key={k} as={b.level <= 1 ? 'H4' : b.level === 2 ? 'H5' : 'H6'}>
            <View style={{ marginTop: 3, marginBottom: 2 }} minPresenceAhead={24}>
              <InlineFlow
                inlines={b.inlines}
                typeset={typeset}
                fontSize={b.level <= 1 ? 12 : b.level === 2 ? 11 : 10}
                style={{ fontWeight: 700 }}
                maxWidth={maxWidth}
              />
            </View>
          </Leaf>
        );
      case 'paragraph': {
        const indent = b.indent * 12;
        return (
          <Leaf key={k} as="P">
            <View
              style={{
                flexDirection: 'row',
                marginBottom: 3,
                paddingLeft: b.marker ? Math.max(0, indent - 12) : indent,
                ...(b.quote ? { borderLeftWidth: 2, borderLeftColor: C.rule } : {}),
              }}
            >
              {b.marker ? <Text style={{ width: 12 }}>{b.marker}</Text> : null}
              <View style={{ flex: 1 }}>
                <InlineFlow inlines={b.inlines} typeset={typeset} maxWidth={maxWidth - indent} />
              </View>
            </View>
          </Leaf>
        );
      }
      case 'code':
        return (
          <Leaf key={k} as="Code">
            <Text
              style={[
                s.mono,
                { fontSize: 7.5, backgroundColor: C.codeSoft, padding: 4, marginBottom: 3, marginLeft: b.indent * 12 },
              ]}
            >
              {b.text}
            </Text>
          </Leaf>
        );
      case 'math': {
        const math = typeset(b.tex, true);
        return (
          <View key={k} style={{ alignItems: 'center', marginVertical: 3, marginLeft: b.indent * 12 }} wrap={false}>
            {math ? (
              <MathBlock
                math={math}
                emPt={MATH_EM}
                maxWidth={maxWidth - b.indent * 12}
                leaf={{ as: 'Formula', alt: b.tex }}
              />
            ) : (
              <Leaf as="Code">
                <Text style={[s.mono, { fontSize: 7.5 }]}>{`$$${b.tex}$$`}</Text>
              </Leaf>
            )}
          </View>
        );
      }
      case 'table': {
        const n = Math.max(b.header.length, ...b.rows.map((r) => r.length), 1);
        const width = `${100 / n}%`;
        const cell = (inl: Inline[] | undefined) => (
          <InlineFlow inlines={inl ?? []} typeset={typeset} fontSize={8.5} maxWidth={maxWidth / n - 8} />
        );
        return (
          <View key={k}>
            <Table
              columns={Array.from({ length: n }, (_, i) => ({
                title: b.header[i]?.map((x) => (x.kind === 'text' ? x.text : x.tex)).join('') ?? '',
                width,
              }))}
              rows={b.rows.map((r) => Array.from({ length: n }, (_, i) => cell(r[i])))}
            />
          </View>
        );
      }
      case 'rule':
        return <View key={k} style={{ borderBottomWidth: 0.5, borderBottomColor: C.rule, marginVertical: 4 }} />;
    }
  });
}

/** Plain multi-line text (record fields): paragraphs split at blank lines, line breaks kept. */
function PlainText({ text, empty = '—' }: { text: string; empty?: string }) {
  const paragraphs = text
    .split(/\n\s*\n/)
    .map((p) => p.trim())
    .filter(Boolean);
  if (paragraphs.length === 0)
    return (
      <Leaf as="P">
        <Text style={[s.muted, s.para]}>{empty}</Text>
      </Leaf>
    );
  return (
    <View>
      {paragraphs.map((p, i) => (
        <Leaf key={i} as="P">
          <Text style={s.para}>{shown(p)}</Text>
        </Leaf>
      ))}
    </View>
  );
}

// ---------------------------------------------------------------------------------------------
// Cells

function resultText(st: StatementResult): string | null {
  if (!st.value) return null;
  if (st.kind === 'definition' || st.kind === 'function') return `${st.name ?? ''} = ${st.value.text}`;
  return `= ${st.value.text}`;
}

function Statement({ st, typeset }: { st: StatementResult; typeset: Typeset }) {
  const result = resultText(st);
  const showSubstituted = st.substitutedTex && st.substitutedTex !== st.tex;
  // The statement's box is never split by a page, so its tags ride on its own elements (`whole`):
  // a sheet has hundreds of statements, and markers would be eight layout nodes each.
  return (
    <Group as="Div" whole>
      <View
        wrap={false}
        style={{ flexDirection: 'row', paddingVertical: 3, borderTopWidth: 0.5, borderTopColor: C.rule }}
      >
        <Leaf as="Lbl" whole>
          <Text style={[s.mono, { width: GUTTER, fontSize: 7, color: C.muted, paddingTop: 0.5 }]}>{`L${st.line}`}</Text>
        </Leaf>
        <View style={{ flex: 1 }}>
          <Leaf as="Code" whole>
            <Text style={[s.mono, { fontSize: 7.5, color: C.muted }]}>{shown(st.source)}</Text>
          </Leaf>
          {st.tex ? <Formula tex={st.tex} typeset={typeset} maxWidth={FORMULA_WIDTH} /> : null}
          {showSubstituted ? <Formula tex={st.substitutedTex!} typeset={typeset} maxWidth={FORMULA_WIDTH} /> : null}
          {st.error ? (
            <Leaf as="P" whole>
              <Text
                style={{
                  color: C.fail,
                  backgroundColor: C.failSoft,
                  paddingHorizontal: 3,
                  paddingVertical: 1,
                  fontSize: 8.5,
                }}
              >{`Error: ${st.error}`}</Text>
            </Leaf>
          ) : st.criterion ? (
            <Leaf as="P" whole>
              <View style={{ flexDirection: 'row', alignItems: 'center', marginTop: 1 }}>
                <Text
                  style={{
                    fontWeight: 700,
                    fontSize: 8.5,
                    color: '#ffffff',
                    backgroundColor: st.criterion.pass ? C.pass : C.fail,
                    paddingHorizontal: 4,
                    paddingVertical: 0.5,
                    marginRight: 5,
                  }}
                >
                  {st.criterion.pass ? 'PASS' : 'FAIL'}
                </Text>
                <Text style={{ fontSize: 8.5, color: st.criterion.pass ? C.pass : C.fail }}>
                  {st.criterion.marginText}
                </Text>
              </View>
            </Leaf>
          ) : result ? (
            <Leaf as="P" whole>
              <Text style={{ fontWeight: 600, fontSize: 10, marginTop: 1 }}>{result}</Text>
            </Leaf>
          ) : null}
          {!st.error && st.uncertainty ? (
            <Leaf as="P">
              <UncertaintyLine uncertainty={st.uncertainty} />
            </Leaf>
          ) : null}
          {(st.warnings ?? []).map((w, i) => (
            // The physics lint's warnings (absent in results stored before they existed: none), in the caution colours and introduced by the word.
            <Leaf key={`w${i}`} as="P" whole>
              <Text
                style={{
                  color: C.caution,
                  backgroundColor: C.cautionSoft,
                  borderLeftWidth: 2,
                  borderLeftColor: C.cautionRule,
                  paddingHorizontal: 3,
                  paddingVertical: 1,
                  marginTop: 1,
                  fontSize: 8.5,
                }}
              >
                Warning: {shown(w)}
              </Text>
            </Leaf>
          ))}
          {st.references?.length ? (
            <Leaf as="P">
              <ReferenceLines references={st.references} />
            </Leaf>
          ) : null}
        </View>
      </View>
    </Group>
  );
}

/** What the cells need besides the typesetter: the figure renderer (null when the sheet has no plots) and the sheet's significant figures. */
interface CellContext {
  typeset: Typeset;
  figure: FigureRenderer | null;
  significantFigures: number;
}

/** A calculation cell's lines in order, one element each (the cell frames them): statements with formula, substitution and result, comment-only lines as written. */
function calcElements(cell: Cell, result: CellResult | undefined, ctx: CellContext): ReactElement[] {
  const { typeset } = ctx;
  const byLine = new Map((result?.statements ?? []).map((st) => [st.line, st]));
  const lines = cell.source.split('\n');
  const out: ReactElement[] = [];
  lines.forEach((line, i) => {
    const st = byLine.get(i + 1);
    if (st) {
      // Figure, sweep table and uncertainty budget follow as boxes of their own, indented like the
      // formulas; a figure stays on the page of its statement (together they fit any page).
      const extras = st.error
        ? []
        : statementExtras(st, {
            width: FORMULA_WIDTH,
            significantFigures: ctx.significantFigures,
            figure: ctx.figure,
            keyPrefix: String(i),
          });
      const figure = extras.length && extras[0].type === PlotFigurePdf ? extras.shift()! : null;
      out.push(
        figure ? (
          <View key={i}>
            <Statement st={st} typeset={typeset} />
            <View style={{ marginLeft: GUTTER }}>{figure}</View>
          </View>
        ) : (
          <Statement key={i} st={st} typeset={typeset} />
        ),
      );
      for (const extra of extras) {
        out.push(
          extra.type === Breakable ? (
            <Breakable key={extra.key}>
              <View style={{ marginLeft: GUTTER }}>{extra}</View>
            </Breakable>
          ) : (
            <View key={extra.key} style={{ marginLeft: GUTTER }}>
              {extra}
            </View>
          ),
        );
      }
    } else if (line.trim())
      out.push(
        <View
          key={i}
          style={{ flexDirection: 'row', paddingVertical: 2, borderTopWidth: 0.5, borderTopColor: C.rule }}
          wrap={false}
        >
          <Leaf as="Code" inRow>
            <Text style={[s.mono, { width: GUTTER, fontSize: 7, color: C.muted }]}>{`L${i + 1}`}</Text>
            <Text style={[s.mono, { flex: 1, fontSize: 7.5, color: C.muted }]}>{shown(line)}</Text>
          </Leaf>
        </View>,
      );
  });
  // A cell the engine did not evaluate (a limit, or a dependency) says why once.
  const cellError = result?.error && !result.statements.some((st) => st.error === result.error) ? result.error : null;
  if (cellError)
    out.push(
      <Leaf key="error" as="P">
        <Text
          style={{ color: C.fail, backgroundColor: C.failSoft, padding: 3, marginVertical: 2, fontSize: 8.5 }}
        >{`Error: ${cellError}`}</Text>
      </Leaf>,
    );
  if (!result)
    out.push(
      <Leaf key="missing" as="P">
        <Text style={{ color: C.fail, fontSize: 8.5, marginVertical: 2 }}>
          No evaluation result was recorded for this cell.
        </Text>
      </Leaf>,
    );
  return out;
}

/**
 * The cells, flat: each cell's header and each of its statements or blocks is a box of its own,
 * framed so that together they read as one cell, and all of them are children of the page.
 * react-pdf 4.9's pagination gives up on a box tens of thousands of points tall (it places it on
 * one page and the rest is lost: seen with one box around the cells of a 180-cell sheet), and a
 * single cell may hold 500 statements; flat boxes of a statement each always paginate.
 */
function cellElements(data: RevisionPdfData, ctx: CellContext): ReactElement[] {
  const { typeset } = ctx;
  const results = data.version.results.cells;
  const byId = new Map(results.map((r) => [r.id, r]));
  const out: ReactElement[] = [];
  data.version.content.cells.forEach((cell, index) => {
    const result = byId.get(cell.id) ?? (results[index]?.id === cell.id ? results[index] : undefined);
    const failed = cell.kind === 'calc' && (!result || !result.ok);
    const frame = { borderColor: failed ? C.fail : C.rule, borderLeftWidth: 0.75, borderRightWidth: 0.75 };
    out.push(
      <View
        key={`${cell.id}-head`}
        style={{
          ...frame,
          borderTopWidth: 0.75,
          flexDirection: 'row',
          justifyContent: 'space-between',
          backgroundColor: cell.kind === 'calc' ? C.accentSoft : C.codeSoft,
          paddingHorizontal: CELL_PAD,
          paddingVertical: 1.5,
        }}
        minPresenceAhead={40}
      >
        <Leaf as="H3" whole>
          <Text
            style={{ fontSize: 7.5, fontWeight: 700, color: C.accent }}
          >{`Cell ${index + 1} · ${cell.kind === 'calc' ? 'calculation' : 'text'}`}</Text>
          <Text style={[s.mono, { fontSize: 6.5, color: C.muted }]}>{`id ${cell.id}`}</Text>
        </Leaf>
      </View>,
    );
    const parts =
      cell.kind === 'calc'
        ? calcElements(cell, result, ctx)
        : markdownElements(markdownBlocks(cell.source), typeset, CONTENT_WIDTH - 2 * CELL_PAD - 2);
    if (parts.length === 0)
      parts.push(
        <Leaf key="empty" as="P">
          <Text style={[s.muted, { fontSize: 8, paddingVertical: 2 }]}>(empty)</Text>
        </Leaf>,
      );
    parts.forEach((part, k) => {
      const first = k === 0;
      const last = k === parts.length - 1;
      out.push(
        <View
          key={`${cell.id}-${k}`}
          wrap={cell.kind === 'text' || (isValidElement(part) && part.type === Breakable)}
          style={{
            ...frame,
            paddingHorizontal: CELL_PAD,
            ...(cell.kind === 'text' && first ? { paddingTop: 4 } : {}),
            ...(last ? { borderBottomWidth: 0.75, marginBottom: 6, paddingBottom: cell.kind === 'text' ? 2 : 0 } : {}),
          }}
        >
          {part}
        </View>,
      );
    });
  });
  if (out.length === 0)
    out.push(
      <Leaf key="none" as="P">
        <Text style={s.muted}>The sheet has no cells.</Text>
      </Leaf>,
    );
  return out;
}

// ---------------------------------------------------------------------------------------------
// Sections

function Heading({ data }: { data: RevisionPdfData }) {
  const t = data.titleBlock;
  return (
    <View style={{ marginBottom: 8 }}>
      <Leaf as="P">
        <Text
          style={{ fontSize: 8.5, color: C.accent, fontWeight: 600, marginBottom: 2 }}
        >{`${t.project.code} · ${t.project.name}`}</Text>
      </Leaf>
      <Leaf as="H1">
        <Text style={s.h1}>{shown(t.title)}</Text>
      </Leaf>
      <Leaf as="P">
        <Text style={{ fontSize: 10 }}>
          <Text style={{ fontWeight: 700 }}>{t.identificationNumber}</Text>
          {`  ·  Revision ${t.revisionIndex}  ·  version ${data.version.number}  ·  issued ${t.dateOfIssue}  ·  ${t.documentType}`}
        </Text>
      </Leaf>
      {data.safetyRelated ? (
        <Leaf as="P">
          <Text
            style={{
              marginTop: 4,
              alignSelf: 'flex-start',
              fontSize: 8,
              fontWeight: 700,
              color: C.caution,
              borderWidth: 1,
              borderColor: C.cautionRule,
              paddingHorizontal: 4,
              paddingVertical: 1,
            }}
          >
            SAFETY-RELATED CALCULATION
          </Text>
        </Leaf>
      ) : null}
    </View>
  );
}

function Cautions({ data }: { data: RevisionPdfData }) {
  return (
    <View
      wrap={false}
      style={{
        borderLeftWidth: 4,
        borderLeftColor: C.cautionRule,
        backgroundColor: C.cautionSoft,
        paddingVertical: 6,
        paddingHorizontal: 9,
        marginBottom: 4,
      }}
    >
      <Leaf as="H2">
        <Text style={{ fontSize: 10.5, fontWeight: 700, color: C.caution, marginBottom: 2 }}>Caution</Text>
      </Leaf>
      {data.cautions.map((c, i) => (
        <View key={i} style={{ flexDirection: 'row', marginTop: 1 }}>
          <Text style={{ width: 9, color: C.caution }}>•</Text>
          <Leaf as="P" inRow>
            <Text style={{ flex: 1, color: C.caution, fontWeight: 600 }}>{c}</Text>
          </Leaf>
        </View>
      ))}
    </View>
  );
}

function RevisionHistory({ data }: { data: RevisionPdfData }) {
  return (
    <Table
      columns={[
        { title: 'Rev.', width: '7%' },
        { title: 'Date', width: '13%' },
        { title: 'Version', width: '9%' },
        { title: 'Description', width: '39%' },
        { title: 'Approved by', width: '18%' },
        { title: 'Status', width: '14%' },
      ]}
      // The last row is this revision: its status carries a named destination, where a stamped copy
      // (lib/issue/stamp.ts) overlays "superseded" or "withdrawn".
      anchor="revision-history-this-status"
      rows={data.revisionHistory.map((r, i, all) => [
        r.revision,
        r.date,
        String(r.version),
        r.description,
        r.approvedBy,
        i === all.length - 1 ? <Text id="revision-history-this-status">{shown(r.status)}</Text> : r.status,
      ])}
    />
  );
}

function Record({ data }: { data: RevisionPdfData }) {
  const r = data.version.content.record;
  return (
    <View>
      <Leaf as="H3">
        <Text style={s.h3} minPresenceAhead={20}>
          Objective
        </Text>
      </Leaf>
      <PlainText text={r.objective} />
      <Leaf as="H3">
        <Text style={s.h3} minPresenceAhead={30}>
          Design inputs
        </Text>
      </Leaf>
      <Table
        columns={[
          { title: 'Input', width: '24%' },
          { title: 'Value', width: '22%' },
          { title: 'Source', width: '40%' },
          { title: 'Source revision', width: '14%' },
        ]}
        rows={r.inputs.map((i, index) => {
          const linked = data.designInputChecks?.find((d) => d.index === index);
          const value = linked
            ? `${i.value} (cell ${linked.cell}: ${linked.match ? `used ${linked.engineValue}` : `ERROR, ${linked.words}`})`
            : i.value;
          return [i.name, value, i.source, i.sourceRevision];
        })}
      />
      <Leaf as="H3">
        <Text style={s.h3} minPresenceAhead={20}>
          Assumptions
        </Text>
      </Leaf>
      {r.assumptions.length === 0 ? (
        <Leaf as="P">
          <Text style={[s.muted, s.para]}>None.</Text>
        </Leaf>
      ) : null}
      {r.assumptions.map((a, i) => (
        <View key={i} style={{ flexDirection: 'row', marginBottom: 2 }} wrap={false}>
          <Leaf as="P" inRow>
            <Text style={{ width: 16 }}>{`A${i + 1}`}</Text>
            <Text style={{ flex: 1 }}>{shown(a.text)}</Text>
            {a.needsVerification ? (
              <Text
                style={{
                  marginLeft: 6,
                  fontSize: 7,
                  fontWeight: 700,
                  color: C.caution,
                  backgroundColor: C.cautionSoft,
                  borderWidth: 0.75,
                  borderColor: C.cautionRule,
                  paddingHorizontal: 3,
                  alignSelf: 'flex-start',
                }}
              >
                TO BE VERIFIED
              </Text>
            ) : null}
          </Leaf>
        </View>
      ))}
      {r.assumptions.some((a) => a.needsVerification) ? (
        <Leaf as="P">
          <Text style={{ fontSize: 8, color: C.caution, marginBottom: 3 }}>
            Assumptions marked TO BE VERIFIED must be confirmed before the results are relied upon.
          </Text>
        </Leaf>
      ) : null}
      <Leaf as="H3">
        <Text style={s.h3} minPresenceAhead={20}>
          Method
        </Text>
      </Leaf>
      <PlainText text={r.method} />
      <Leaf as="H3">
        <Text style={s.h3} minPresenceAhead={20}>
          References
        </Text>
      </Leaf>
      {r.references.length === 0 ? (
        <Leaf as="P">
          <Text style={[s.muted, s.para]}>None.</Text>
        </Leaf>
      ) : null}
      {r.references.map((ref, i) => (
        <View key={i} style={{ flexDirection: 'row', marginBottom: 2 }} wrap={false}>
          <Leaf as="P" inRow>
            <Text style={{ width: 20 }}>{`[${i + 1}]`}</Text>
            <Text style={{ flex: 1 }}>{shown(ref)}</Text>
          </Leaf>
        </View>
      ))}
      <Leaf as="H3">
        <Text style={s.h3} minPresenceAhead={20}>
          Conclusions
        </Text>
      </Leaf>
      <PlainText text={r.conclusions} />
    </View>
  );
}

function Attachments({ data }: { data: RevisionPdfData }) {
  const list = data.version.content.attachments;
  if (list.length === 0)
    return (
      <Leaf as="P">
        <Text style={[s.muted, s.para]}>None.</Text>
      </Leaf>
    );
  return (
    <View style={s.table}>
      <Group as="Table">
        <View style={{ flexDirection: 'row' }}>
          <Group as="TR" inRow>
            {['Name', 'Media type', 'Size'].map((title, i) => (
              <Leaf key={title} as="TH" inRow>
                <Text style={[s.th, { width: i === 0 ? '50%' : '25%' }]}>{title}</Text>
              </Leaf>
            ))}
          </Group>
        </View>
        {list.map((a, i) => (
          <View key={i} style={[s.tr, { flexDirection: 'column' }]} wrap={false}>
            <Group as="TR">
              <View style={{ flexDirection: 'row' }}>
                <Leaf as="TD" inRow>
                  <Text style={[s.td, { width: '50%', fontWeight: 600 }]}>{shown(a.name)}</Text>
                </Leaf>
                <Leaf as="TD" inRow>
                  <Text style={[s.td, { width: '25%' }]}>{a.mediaType}</Text>
                </Leaf>
                <Leaf as="TD" inRow>
                  <Text style={[s.td, { width: '25%' }]}>{formatBytes(a.size)}</Text>
                </Leaf>
              </View>
              {/* The digest spans the row under the three cells: a fourth cell of the row. */}
              <Leaf as="TD">
                <Text style={[s.td, { paddingTop: 0 }]}>
                  <Text style={{ fontSize: 7, color: C.muted }}>{'SHA-256  '}</Text>
                  <Text style={[s.mono, { fontSize: 7.5 }]}>{a.sha256}</Text>
                </Text>
              </Leaf>
            </Group>
          </View>
        ))}
      </Group>
    </View>
  );
}

function Evaluation({ data }: { data: RevisionPdfData }) {
  const statements = data.version.results.cells.flatMap((c) => c.statements);
  const criteria = statements.filter((st) => st.criterion);
  const passed = criteria.filter((st) => st.criterion?.pass).length;
  const errors = data.version.results.cells.filter((c) => c.kind === 'calc' && !c.ok).length;
  const warnings = statements.reduce((n, st) => n + (st.warnings?.length ?? 0), 0);
  const field = (label: string, value: string, mono = false) => (
    <View style={{ flexDirection: 'row', marginBottom: 2 }}>
      <Leaf as="P" inRow>
        <Text style={{ width: 130, color: C.muted }}>{label}</Text>
        <Text style={[{ flex: 1 }, mono ? [s.mono, { fontSize: 8 }] : {}].flat()}>{value}</Text>
      </Leaf>
    </View>
  );
  return (
    <View>
      {field('Engine version', data.version.engineVersion, true)}
      {field('Constants edition', data.version.constantsEdition)}
      {field('Significant figures shown', String(data.version.content.significantFigures))}
      {field('Units shown', DISPLAY_UNITS_LABEL[data.version.content.displayUnits ?? DISPLAY_UNITS_DEFAULT])}
      {field(
        'Statements',
        `${statements.length} in ${data.version.content.cells.length} cells; ${errors} cell${errors === 1 ? '' : 's'} with errors`,
      )}
      {field(
        'Warnings',
        warnings === 0
          ? 'none'
          : `${warnings} (a name read as a unit or a mathematical constant where a physical constant may be meant; shown beside each statement)`,
      )}
      {field('Design criteria', `${criteria.length} (${passed} pass, ${criteria.length - passed} fail)`)}
      <Leaf as="H3">
        <Text style={s.h3} minPresenceAhead={30}>
          Built-in constants used
        </Text>
      </Leaf>
      <Table
        columns={[
          { title: 'Name', width: '14%', mono: true },
          { title: 'Value', width: '36%' },
          { title: 'Provenance', width: '50%' },
        ]}
        rows={data.constants.map((k) => [k.name, k.value, k.provenance])}
      />
    </View>
  );
}

function Signatures({ data }: { data: RevisionPdfData }) {
  return (
    <View>
      <Table
        columns={[
          { title: 'Meaning', width: '22%' },
          { title: 'Printed name', width: '40%' },
          { title: 'Signed (UTC)', width: '38%' },
        ]}
        rows={data.signatures.map((sig) => [sig.meaning, sig.printedName, formatUtc(sig.signedAt)])}
        empty="No signatures recorded."
      />
      <Leaf as="P">
        <Text style={{ fontSize: 8, color: C.muted }}>
          {`Electronic signatures, each bound to the SHA-256 of version ${data.version.number} shown below; each signer re-entered their password to sign.`}
        </Text>
      </Leaf>
      {data.alternateComparison ? (
        <View style={{ marginTop: 6 }}>
          <Leaf as="Caption">
            <Text
              style={{ fontWeight: 700, marginBottom: 2 }}
            >{`Checker's alternate calculation compared with the sheet (tolerance ${data.alternateComparison.toleranceText ?? 'not stated'}, relative)`}</Text>
          </Leaf>
          <Table
            columns={[
              { title: 'Name', width: '14%', mono: true },
              { title: 'Sheet', width: '20%' },
              { title: 'Alternate', width: '20%' },
              { title: '|a − s|/|s|', width: '14%' },
              { title: 'Outcome', width: '32%' },
            ]}
            rows={data.alternateComparison.rows.map((r) => [
              r.name,
              r.sheet,
              r.alternate,
              r.relativeDifference,
              r.outcome,
            ])}
          />
        </View>
      ) : null}
      {data.acknowledgements?.length ? (
        <View style={{ marginTop: 6 }}>
          <Leaf as="Caption">
            <Text style={{ fontWeight: 700, marginBottom: 2 }}>
              Acknowledged in writing by the originator on submission
            </Text>
          </Leaf>
          <Table
            columns={[
              { title: 'Item', width: '50%' },
              { title: 'Acknowledgement', width: '50%' },
            ]}
            rows={data.acknowledgements.map((a) => [a.item, a.text])}
          />
        </View>
      ) : null}
    </View>
  );
}

function Verification({ data }: { data: RevisionPdfData }) {
  const row = (label: string, value: ReactNode) => (
    <View style={{ flexDirection: 'row', marginBottom: 3 }}>
      <Leaf as="P" inRow>
        <Text style={{ width: 118, color: C.muted }}>{label}</Text>
        <View style={{ flex: 1 }}>{typeof value === 'string' ? <Text>{value}</Text> : value}</View>
      </Leaf>
    </View>
  );
  return (
    <View style={{ borderWidth: 1.25, borderColor: C.accent, padding: 8, marginTop: 2 }}>
      {row(
        'Document',
        `${data.titleBlock.identificationNumber}, revision ${data.titleBlock.revisionIndex}, version ${data.version.number}`,
      )}
      {row('Version SHA-256', <Text style={[s.mono, { fontSize: 8 }]}>{data.version.sha256}</Text>)}
      {row(
        'Verification code',
        <Text style={[s.mono, { fontSize: 13, fontWeight: 700, color: C.accent }]}>{data.verificationCode}</Text>,
      )}
      {row('Verify at', <Text style={[s.mono, { fontSize: 8.5 }]}>{data.verifyUrl}</Text>)}
      {row('Verification method', data.verificationMethod ?? 'Not recorded')}
      <Leaf as="P">
        <Text style={{ fontSize: 8, color: C.muted, marginTop: 3 }}>
          {`Upload this file or enter the verification code at the address above to learn whether it is an authentic issued revision of ${data.titleBlock.legalOwner} and whether it is still current. The file also carries the issuing organisation's digital signature, which standard PDF tools can check.`}
        </Text>
      </Leaf>
    </View>
  );
}

// ---------------------------------------------------------------------------------------------

/** The "issued" signature's time (written "YYYY-MM-DD HH:MM:SS UTC"), else midnight of the date of issue. */
function issueTime(data: RevisionPdfData): Date | undefined {
  const issued = data.signatures.find((x) => x.meaning === 'issued');
  const at = issued ? Date.parse(issued.signedAt.replace(' UTC', 'Z').replace(' ', 'T')) : NaN;
  if (!Number.isNaN(at)) return new Date(at);
  const day = Date.parse(`${data.titleBlock.dateOfIssue}T00:00:00Z`);
  return Number.isNaN(day) ? undefined : new Date(day);
}

function RevisionPdfDocument({
  data: given,
  typeset,
  figure = null,
}: {
  data: RevisionPdfData;
  typeset: Typeset;
  figure?: FigureRenderer | null;
}) {
  // Every bidirectional control character anyone typed (title, record, cells, attachment names,
  // signatures…) becomes a visible marker before anything is drawn, so none can reorder the text.
  const data = revealBidiControlsDeep(given);
  const t = data.titleBlock;
  return (
    <Document
      title={`${t.identificationNumber} rev. ${t.revisionIndex} — ${t.title}`}
      author={t.legalOwner}
      subject={`${t.documentType}, ${t.project.code} ${t.project.name}`}
      keywords={`${t.identificationNumber}; revision ${t.revisionIndex}; SHA-256 ${data.version.sha256}`}
      creator="Worldsheet"
      producer="Worldsheet"
      language={t.language}
      // A tagged PDF (./structure.tsx) needs PDF 1.4 or later; react-pdf writes 1.3 unless told.
      pdfVersion="1.7"
      // The time of issue (the "issued" signature's), so that the same revision always renders to the same content.
      creationDate={issueTime(data)}
    >
      <Page size="A4" style={s.page} experimentalPagination>
        {/* Fixed page furniture first: the pagination repeats a fixed element on the pages after the one where it enters the flow. */}
        <RunningHead data={data} />
        <TitleBlock data={data} />
        <Heading data={data} />
        <Cautions data={data} />
        <Group as="Sect">
          <SectionHeading>1 Revision history</SectionHeading>
          <RevisionHistory data={data} />
        </Group>
        <Group as="Sect">
          <SectionHeading>2 Calculation record</SectionHeading>
          <Record data={data} />
        </Group>
        <Group as="Sect">
          <SectionHeading>3 Calculation</SectionHeading>
          {cellElements(data, { typeset, figure, significantFigures: data.version.content.significantFigures })}
        </Group>
        <Group as="Sect">
          <SectionHeading>4 Attachments</SectionHeading>
          <Attachments data={data} />
        </Group>
        <Group as="Sect">
          <SectionHeading>5 Evaluation</SectionHeading>
          <Evaluation data={data} />
        </Group>
        <Group as="Sect">
          <SectionHeading>6 Signatures</SectionHeading>
          <Signatures data={data} />
        </Group>
        <View wrap={false}>
          <Group as="Sect">
            <SectionHeading>7 Verification</SectionHeading>
            <Verification data={data} />
          </Group>
        </View>
      </Page>
    </Document>
  );
}

/** The issued PDF of one revision, unsigned (lib/issue/sign-pdf.ts adds the organisation's signature). */
export async function renderRevisionPdf(data: RevisionPdfData): Promise<Buffer> {
  registerPdfFonts();
  await keepTextLayouts([TEXT_FONT, MONO_FONT]);
  // One TeX → outline conversion per distinct string, kept across renders (./tex-svg.ts).
  const typeset = createTexCache();
  // Plots are drawn by Observable Plot on a jsdom document (./svg-to-pdf.tsx), loaded only for a
  // sheet that has one, so issuing any other sheet (and every module importing this one) skips it.
  const hasPlot = data.version.results.cells.some((c) => c.statements.some((st) => st.plot));
  const figure: FigureRenderer | null = hasPlot ? (await import('./svg-to-pdf')).plotPdfGraphic : null;
  installPdfStructure();
  installFontReuse();
  const before = structureInstructionsActedOn();
  const pdf = await renderToBuffer(<RevisionPdfDocument data={data} typeset={typeset} figure={figure} />);
  // A silent fall-back to an untagged file would go unnoticed: refuse it.
  if (structureInstructionsActedOn() === before)
    throw new Error(
      'The issued PDF was drawn without its structure tree (the structure markers never reached pdfkit).',
    );
  return pdf;
}
