// Bidirectional control characters (Unicode Standard Annex #9; CVE-2021-42574, "Trojan Source"):
// refused in calculation sources wherever a source comes in (the save schema, the save itself, the
// sheet-file import, /api/evaluate, the checker's alternate calculation, the engine), and shown as
// visible markers everywhere else text is shown (Markdown, the read-only, compare and check views).
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { CheckCell } from '../../components/checks/check-cell';
import { RecordChanges } from '../../components/sheet/record-changes';
import { VisibleText } from '../../components/data/visible-text';
import { SourceDiff } from '../../components/sheet/source-diff';
import { VersionView } from '../../components/sheet/version-view';
import {
  BIDI_CONTROLS,
  bidiControlsInCalcCells,
  bidiSegments,
  findBidiControl,
  revealBidiControls,
  revealBidiControlsDeep,
} from '../../lib/calc/bidi-controls';
import { evaluateRequestSchema } from '../../lib/calc/evaluate-request';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { checkWorkSchema } from '../../lib/checks/workflow';
import { AppError } from '../../lib/errors/app-error';
import { parseValue } from '../../lib/http/route';
import { compareVersions } from '../../lib/sheets/compare';
import { emptyRecord, versionContentSchema, type VersionContent } from '../../lib/sheets/content';
import { renderMarkdown } from '../../lib/sheets/markdown';
import { importSheetFile } from '../../lib/sheets/sheet-files';
import { createSheet, getVersion, saveVersion, saveVersionSchema } from '../../lib/sheets/sheets';
import { testDb } from '../support/database';
import { makeProject, makeUser } from '../support/people';
import { refusal } from '../support/refusal';

const RLO = '\u202e';
const ANY_CONTROL = /[\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/;
// The Trojan Source paper's "commenting-out" shape, in a calculation: read in a bidi-aware view the
// line looks like a comment about the limit followed by the criterion, while the engine sees only a
// comment (the criterion is never evaluated).
const TROJAN = `limit = 3 T*m\nBrho = 2.5 T*m\n# check ${RLO} ⁦Brho < limit⁩ ⁦# against the magnet`;
const REFUSAL =
  'cell 3: holds U+202E (RIGHT-TO-LEFT OVERRIDE) on line 3, which can make the source read differently from what is evaluated';

function content(cells: VersionContent['cells'], extra: Partial<VersionContent> = {}): VersionContent {
  return {
    schema: 1,
    title: 'Dipole rigidity',
    safetyRelated: false,
    significantFigures: 6,
    record: emptyRecord(),
    cells,
    attachments: [],
    ...extra,
  };
}
const threeCells = (third: string): VersionContent['cells'] => [
  { id: 'c1', kind: 'calc', source: 'x = 2 m' },
  { id: 't1', kind: 'text', source: 'The field, as specified.' },
  { id: 'c3', kind: 'calc', source: third },
];

describe('finding the characters (UAX #9 explicit formatting characters and the implicit marks)', () => {
  it('finds each of the twelve, with its name and line, and nothing in ordinary text', () => {
    expect(BIDI_CONTROLS.size).toBe(12);
    for (const [cp, name] of BIDI_CONTROLS) {
      expect(findBidiControl(`a = 1\nb = 2 ${String.fromCodePoint(cp)}`)).toEqual({ codePoint: cp, name, line: 2 });
    }
    // Right-to-left letters themselves, ZWJ, NBSP and the ⟦ ⟧ brackets are not controls.
    expect(findBidiControl('x = 1 # שלום مرحبا \u200d\u00a0 ⟦U+202E⟧')).toBeNull();
  });

  it('names the calculation cell, the code point, its name and the line; text cells are not refused', () => {
    expect(bidiControlsInCalcCells(threeCells(TROJAN))).toEqual([{ index: 2, message: REFUSAL }]);
    expect(bidiControlsInCalcCells([{ kind: 'text', source: `a ${RLO} b` }])).toEqual([]);
  });
});

describe('the refusal at every door a calculation source comes in by', () => {
  it('the save schema answers 400 naming the cell and the character', () => {
    const e = (() => {
      try {
        parseValue({ parentNumber: 1, message: 'x', content: content(threeCells(TROJAN)) }, saveVersionSchema);
      } catch (error) {
        return error as AppError;
      }
      throw new Error('not refused');
    })();
    expect(e).toBeInstanceOf(AppError);
    expect(e.status).toBe(400);
    expect(e.message).toBe(`content.cells.2.source: ${REFUSAL}`);
    // The same content with the character in a text cell, the title and the record is accepted.
    expect(() =>
      versionContentSchema.parse(
        content([{ id: 't1', kind: 'text', source: `a ${RLO} b` }], {
          title: `T ${RLO}`,
          record: { ...emptyRecord(), method: RLO },
        }),
      ),
    ).not.toThrow();
  });

  it("/api/evaluate and the checker's alternate calculation refuse it too", () => {
    const r = evaluateRequestSchema.safeParse({ cells: threeCells(TROJAN) });
    expect(r.success).toBe(false);
    expect(r.error!.issues.map((i) => [i.path.join('.'), i.message])).toEqual([['cells.2.source', REFUSAL]]);
    const w = checkWorkSchema.safeParse({ alternateCells: [{ id: 'a1', kind: 'calc', source: `y = 1 # \u2066` }] });
    expect(w.success).toBe(false);
    expect(w.error!.issues[0].message).toMatch(/^cell 1: holds U\+2066 \(LEFT-TO-RIGHT ISOLATE\) on line 1,/);
  });

  it('the engine makes such a line an error, even a comment, and evaluates the rest', () => {
    const r = createSheetEngine().evaluate([{ id: 'c1', kind: 'calc', source: TROJAN }], { significantFigures: 6 });
    const st = r.cells[0].statements;
    expect(st.map((s) => [s.line, s.error])).toEqual([
      [1, null],
      [2, null],
      [
        3,
        'cannot read this line: holds U+202E (RIGHT-TO-LEFT OVERRIDE), which can make the source read differently from what is evaluated',
      ],
    ]);
    expect(r.cells[0].ok).toBe(false);
  });

  it('a save that bypasses the schema is refused with 400 and stores nothing', async () => {
    const db = testDb();
    const author = await makeUser(db, 'author@example.test');
    const projectId = await makeProject(db, 'BEAM', [[author, 'originator']]);
    const created = await createSheet(
      db,
      author,
      { id: projectId, code: 'BEAM' },
      { title: 'Dipole rigidity', safetyRelated: false, objective: '' },
    );
    const sheet = { id: created.id, project_id: projectId };
    const e = await refusal(
      saveVersion(db, author, sheet, { parentNumber: 1, message: 'Trojan', content: content(threeCells(TROJAN)) }),
    );
    expect([e.status, e.message]).toEqual([400, REFUSAL]);
    expect((await getVersion(db, sheet.id))!.number).toBe(1);
    expect(await db.selectFrom('audit_events').select('action').where('action', '=', 'version.save').execute()).toEqual(
      [],
    );
    // A text cell holding one is stored as typed (and shown with a marker).
    const saved = await saveVersion(db, author, sheet, {
      parentNumber: 1,
      message: 'Note',
      content: content([{ id: 't1', kind: 'text', source: `note ${RLO} here` }]),
    });
    expect(saved.number).toBe(2);
    expect((await getVersion(db, sheet.id, 2))!.content.cells[0].source).toBe(`note ${RLO} here`);
  });

  it('the sheet-file import is refused with 400 and leaves no sheet', async () => {
    const db = testDb();
    const author = await makeUser(db, 'author@example.test');
    const projectId = await makeProject(db, 'BEAM', [[author, 'originator']]);
    const file = JSON.stringify({ title: 'Imported', cells: [{ kind: 'calc', source: `T = 250 MeV # \u2067 note` }] });
    const e = await refusal(importSheetFile(db, author, { id: projectId, code: 'BEAM' }, file));
    expect(e.status).toBe(400);
    expect(e.message).toBe(
      'not a sheet file: cells.0.source: cell 1: holds U+2067 (RIGHT-TO-LEFT ISOLATE) on line 1, which can make the source read differently from what is evaluated',
    );
    expect(await db.selectFrom('sheets').select('id').execute()).toEqual([]);
  });
});

describe('showing them everywhere else, as markers', () => {
  it('replaces each character by ⟦U+XXXX⟧, in strings and in whole documents', () => {
    expect(revealBidiControls(`abc ${RLO}fdp.exe\u200f`)).toBe('abc ⟦U+202E⟧fdp.exe⟦U+200F⟧');
    expect(revealBidiControls('plain')).toBe('plain');
    const doc = revealBidiControlsDeep({
      title: `a${RLO}`,
      list: [{ name: '\u2066x\u2069' }],
      n: 3,
      ok: true,
      none: null,
    });
    expect(doc).toEqual({ title: 'a⟦U+202E⟧', list: [{ name: '⟦U+2066⟧x⟦U+2069⟧' }], n: 3, ok: true, none: null });
  });

  it('cuts text into runs and markers, a marker already written out included', () => {
    expect(bidiSegments(`a${RLO}b ⟦U+2066⟧`)).toEqual([
      { text: 'a', control: null },
      { text: '⟦U+202E⟧', control: { codePoint: 0x202e, name: 'RIGHT-TO-LEFT OVERRIDE' } },
      { text: 'b ', control: null },
      { text: '⟦U+2066⟧', control: { codePoint: 0x2066, name: 'LEFT-TO-RIGHT ISOLATE' } },
    ]);
    expect(bidiSegments('')).toEqual([{ text: '', control: null }]);
  });

  it('text cells (Markdown) show the marker in its own style and never the character', () => {
    const html = renderMarkdown(
      `Safe **below** ${RLO}3 T·m\u202c, see [the spec${RLO}](https://example.test/a${RLO}b) and $x${RLO}$`,
    );
    expect(html).toContain(
      '<span class="ws-bidi-marker" title="U+202E (RIGHT-TO-LEFT OVERRIDE)">⟦U+202E⟧</span>3 T·m<span class="ws-bidi-marker" title="U+202C (POP DIRECTIONAL FORMATTING)">⟦U+202C⟧</span>',
    );
    // Link text gets the marker; the href stays an attribute (escaped), never broken into markup.
    expect(html).toMatch(/<a href="[^"<>]*" rel="noopener noreferrer">the spec<span class="ws-bidi-marker"/);
    expect(html.replace(/href="[^"]*"/g, '')).not.toMatch(ANY_CONTROL);
  });

  it('the read-only view shows them in the record fields, the calculation source and the attachment names', () => {
    const v = content(
      [
        { id: 'c1', kind: 'calc', source: `x = 2 m # ${RLO}stored before the rule` },
        { id: 't1', kind: 'text', source: `text ${RLO}` },
      ],
      {
        record: {
          ...emptyRecord(),
          objective: `Obj ${RLO}`,
          inputs: [{ name: `in${RLO}`, value: '1 T', source: 'spec', sourceRevision: 'A' }],
          assumptions: [{ text: `as\u2067`, needsVerification: false }],
          references: [`ref\u200e`],
        },
        attachments: [{ name: `scan${RLO}vsc.pdf`, mediaType: 'application/pdf', size: 10, sha256: 'a'.repeat(64) }],
      },
    );
    const html = renderToStaticMarkup(
      createElement(VersionView, {
        sheetId: 's',
        sheetCode: 'BEAM-CALC-0001',
        versionNumber: 2,
        content: v,
        results: null,
        renderText: (s: string) => createElement(VisibleText, { text: s }),
      }),
    );
    expect(html).not.toMatch(ANY_CONTROL);
    for (const shown of [
      'x = 2 m # <span class="ws-bidi-marker"',
      'Obj <span class="ws-bidi-marker"',
      'in<span class="ws-bidi-marker"',
      'as<span class="ws-bidi-marker"',
      'ref<span class="ws-bidi-marker"',
      'scan<span class="ws-bidi-marker"',
    ]) {
      expect(html).toContain(shown);
    }
    // Five shown, and the sixth in the download attribute's file name.
    expect(html.match(/⟦U\+202E⟧/g)).toHaveLength(6);
    expect(html).toContain('download="scan⟦U+202E⟧vsc.pdf"');
  });

  it('the compare and check views show them in the word diff, the cell source and the record changes', () => {
    const base = { content: content([{ id: 'c1', kind: 'text', source: 'limit is 3 T m' }]), results: null };
    const target = {
      content: content([{ id: 'c1', kind: 'text', source: `limit is ${RLO}3 T m` }], {
        record: { ...emptyRecord(), method: `by hand ${RLO}` },
      }),
      results: null,
    };
    const cmp = compareVersions(base, target);
    const cell = cmp.cells[0];
    const diff = renderToStaticMarkup(createElement(SourceDiff, { pieces: cell.sourceDiff! }));
    expect(diff).toContain('⟦U+202E⟧');
    expect(diff).not.toMatch(ANY_CONTROL);
    const check = renderToStaticMarkup(
      createElement(CheckCell, {
        cell: { ...cell, kind: 'calc' },
        label: 'Cell 1',
        source: `y = 1 # ${RLO}`,
        result: undefined,
        changes: [],
        baseNumber: 1,
        first: true,
        renderText: (s: string) => s,
      }),
    );
    expect(check).toContain('y = 1 # <span class="ws-bidi-marker"');
    expect(check).not.toMatch(ANY_CONTROL);
    const record = renderToStaticMarkup(createElement(RecordChanges, { record: cmp.record, first: false }));
    expect(record).toContain('⟦U+202E⟧');
    expect(record).not.toMatch(ANY_CONTROL);
  });
});
