import { describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import type { CellResult, SheetResult, StatementResult } from '../../lib/calc/types';
import {
  compareTables,
  compareVersions,
  MAX_TABLE_ROW_CHANGES,
  wordDiff,
  type ComparedVersion,
} from '../../lib/sheets/compare';
import { parseInputTable } from '../../lib/attachments/csv-table';
import { emptyRecord, type Cell, type VersionContent } from '../../lib/sheets/content';

function content(cells: Cell[], overrides: Partial<VersionContent> = {}): VersionContent {
  return {
    schema: 1,
    title: 'Dipole bending',
    safetyRelated: false,
    significantFigures: 6,
    record: emptyRecord(),
    cells,
    attachments: [],
    ...overrides,
  };
}

const calc = (id: string, source: string): Cell => ({ id, kind: 'calc', source });
const text = (id: string, source: string): Cell => ({ id, kind: 'text', source });

/** A version evaluated with the server's engine. */
function evaluated(cells: Cell[], overrides: Partial<VersionContent> = {}): ComparedVersion {
  const engine = createSheetEngine();
  return { content: content(cells, overrides), results: engine.evaluate(cells, { significantFigures: 6 }) };
}

/** A small hand-built result: one calc cell holding the given statements. */
function handResult(cellId: string, statements: Array<Partial<StatementResult>>): SheetResult {
  const cell: CellResult = {
    id: cellId,
    index: 0,
    kind: 'calc',
    ok: statements.every((s) => !s.error),
    error: statements.find((s) => s.error)?.error ?? null,
    statements: statements.map((s, i) => ({
      line: i + 1,
      source: '',
      kind: 'definition',
      name: null,
      tex: '',
      substitutedTex: null,
      value: null,
      criterion: null,
      error: null,
      ...s,
    })),
    defines: [],
    uses: [],
  };
  return { ok: cell.ok, cells: [cell], engineVersion: 'hand', constantsEdition: 'hand', evaluatedCells: 1 };
}

describe('word diff', () => {
  it('keeps numbers whole and puts removed text before added text', () => {
    expect(wordDiff('B = 1.5 T\nr = 1.62 m', 'B = 1.6 T\nr = 1.62 m')).toEqual([
      { text: 'B = ' },
      { text: '1.5', removed: true },
      { text: '1.6', added: true },
      { text: ' T\nr = 1.62 m' },
    ]);
    expect(wordDiff('t = 1e-3 s', 't = 2e-3 s')).toEqual([
      { text: 't = ' },
      { text: '1e-3', removed: true },
      { text: '2e-3', added: true },
      { text: ' s' },
    ]);
  });

  it('folds the spaces between changed words on one line into the change', () => {
    expect(wordDiff('use the nominal field', 'use the measured peak field')).toEqual([
      { text: 'use the ' },
      { text: 'nominal', removed: true },
      { text: 'measured peak', added: true },
      { text: ' field' },
    ]);
  });

  it('always rebuilds both texts from its pieces', () => {
    const pairs: Array<[string, string]> = [
      ['use the nominal field', 'use the measured peak field'],
      ['a b c d', 'x b y d'],
      ['p = gamma(v) * m * v\n# momentum', 'p = gamma(v)*m_p*v  \n# momentum, proton'],
      ['  indented   text ', 'indented text'],
      ['Δp/p = 1e-3', 'Δp/p = 2.5e-3 (worst case)'],
    ];
    for (const [a, b] of pairs) {
      const pieces = wordDiff(a, b);
      expect(
        pieces
          .filter((p) => !p.added)
          .map((p) => p.text)
          .join(''),
      ).toBe(a);
      expect(
        pieces
          .filter((p) => !p.removed)
          .map((p) => p.text)
          .join(''),
      ).toBe(b);
      expect(pieces.every((p) => p.text !== '')).toBe(true);
    }
  });

  it('gives nothing for two empty texts and one piece for equal texts', () => {
    expect(wordDiff('', '')).toEqual([]);
    expect(wordDiff('same', 'same')).toEqual([{ text: 'same' }]);
    expect(wordDiff('', 'new')).toEqual([{ text: 'new', added: true }]);
  });
});

describe('cells', () => {
  it('reports added, removed, changed and unchanged cells in target order, removed ones where they stood', () => {
    const base = {
      content: content([calc('a', 'x = 1 m'), text('b', 'Intro'), calc('c', 'y = 2 m'), calc('d', 'z = 3 m')]),
      results: null,
    };
    const target = {
      content: content([calc('a', 'x = 1 m'), calc('c', 'y = 2.5 m'), calc('n', 'w = 4 m'), calc('d', 'z = 3 m')]),
      results: null,
    };
    const cmp = compareVersions(base, target);
    expect(cmp.cells).toEqual([
      {
        id: 'a',
        status: 'unchanged',
        kind: 'calc',
        baseKind: 'calc',
        baseIndex: 0,
        targetIndex: 0,
        moved: false,
        sourceDiff: null,
      },
      {
        id: 'b',
        status: 'removed',
        kind: 'text',
        baseKind: 'text',
        baseIndex: 1,
        targetIndex: null,
        moved: false,
        sourceDiff: [{ text: 'Intro', removed: true }],
      },
      {
        id: 'c',
        status: 'changed',
        kind: 'calc',
        baseKind: 'calc',
        baseIndex: 2,
        targetIndex: 1,
        moved: false,
        sourceDiff: [{ text: 'y = ' }, { text: '2', removed: true }, { text: '2.5', added: true }, { text: ' m' }],
      },
      {
        id: 'n',
        status: 'added',
        kind: 'calc',
        baseKind: null,
        baseIndex: null,
        targetIndex: 2,
        moved: false,
        sourceDiff: [{ text: 'w = 4 m', added: true }],
      },
      {
        id: 'd',
        status: 'unchanged',
        kind: 'calc',
        baseKind: 'calc',
        baseIndex: 3,
        targetIndex: 3,
        moved: false,
        sourceDiff: null,
      },
    ]);
    expect(cmp.summary.cells).toEqual({ added: 1, removed: 1, changed: 1, moved: 0, unchanged: 2 });
    expect(cmp.resultsCompared).toBe(false);
    expect(cmp.results).toEqual([]);
  });

  it('calls a cell moved only when it left the order of the others, not when cells before it were inserted', () => {
    const base = {
      content: content([calc('a', 'x = 1'), calc('b', 'y = 2'), calc('c', 'z = 3'), calc('d', 'w = 4')]),
      results: null,
    };
    const moved = compareVersions(base, {
      content: content([calc('b', 'y = 2'), calc('c', 'z = 3'), calc('d', 'w = 4'), calc('a', 'x = 1')]),
      results: null,
    });
    expect(moved.cells.map((c) => [c.id, c.status, c.baseIndex, c.targetIndex])).toEqual([
      ['b', 'unchanged', 1, 0],
      ['c', 'unchanged', 2, 1],
      ['d', 'unchanged', 3, 2],
      ['a', 'moved', 0, 3],
    ]);
    expect(moved.summary.cells).toEqual({ added: 0, removed: 0, changed: 0, moved: 1, unchanged: 3 });

    const inserted = compareVersions(base, {
      content: content([calc('n', 'v = 0'), ...base.content.cells]),
      results: null,
    });
    expect(inserted.cells.map((c) => c.status)).toEqual(['added', 'unchanged', 'unchanged', 'unchanged', 'unchanged']);

    const movedAndEdited = compareVersions(base, {
      content: content([calc('b', 'y = 2'), calc('a', 'x = 10'), calc('c', 'z = 3'), calc('d', 'w = 4')]),
      results: null,
    });
    // Swapping a and b leaves either in order; the diff keeps b (first in the target) in place.
    expect(movedAndEdited.cells.map((c) => [c.id, c.status, c.moved])).toEqual([
      ['b', 'unchanged', false],
      ['a', 'changed', true],
      ['c', 'unchanged', false],
      ['d', 'unchanged', false],
    ]);
    expect(movedAndEdited.cells[1].sourceDiff).toEqual([
      { text: 'x = ' },
      { text: '1', removed: true },
      { text: '10', added: true },
    ]);
  });

  it('puts a cell removed from the start first, before any cell added there', () => {
    const cmp = compareVersions(
      { content: content([text('old', 'Old intro'), calc('a', 'x = 1')]), results: null },
      { content: content([text('new', 'New intro'), calc('a', 'x = 1')]), results: null },
    );
    expect(cmp.cells.map((c) => [c.id, c.status])).toEqual([
      ['old', 'removed'],
      ['new', 'added'],
      ['a', 'unchanged'],
    ]);
  });

  it('counts a change of kind as a change, with the source diff all common', () => {
    const cmp = compareVersions(
      { content: content([text('a', 'E = m c^2')]), results: null },
      { content: content([calc('a', 'E = m c^2')]), results: null },
    );
    expect(cmp.cells).toEqual([
      {
        id: 'a',
        status: 'changed',
        kind: 'calc',
        baseKind: 'text',
        baseIndex: 0,
        targetIndex: 0,
        moved: false,
        sourceDiff: [{ text: 'E = m c^2' }],
      },
    ]);
    expect(cmp.summary.cells.changed).toBe(1);
  });
});

describe('results', () => {
  const baseSource = 'B = 1.5 T\nr = 1.62 m\nBr = B * r\nBr <= 2.45 T m';
  const targetSource = 'B = 1.25 T\nr = 2 m\nBr = B * r\nBr <= 2.45 T m';

  it('gives the relative change of a named result and flags a criterion that flipped (real engine)', () => {
    const cmp = compareVersions(evaluated([calc('c1', baseSource)]), evaluated([calc('c1', targetSource)]));
    const br = cmp.results.find((r) => r.key === 'value:Br')!;
    expect(br).toMatchObject({
      type: 'value',
      name: 'Br',
      cellId: 'c1',
      status: 'changed',
      // Six significant figures with their trailing zeros (common practice).
      old: { text: '2.430\u202f00 T·m', number: 2.43, unit: 'T m', kind: 'quantity', error: null },
      new: { text: '2.500\u202f00 T·m', number: 2.5, unit: 'T m', kind: 'quantity', error: null },
      unitChanged: false,
      flipped: false,
    });
    // common practice: relative change = (new − old) / |old| = (2.5 − 2.43) / 2.43 = 0.07 / 2.43
    // = 0.028 806 6 (2.43 × 0.0288 = 0.069 984; the remaining 0.000 016 / 2.43 = 0.000 006 6).
    expect(br.relativeChange).toBeCloseTo(0.0288066, 6);

    const criterion = cmp.results.find((r) => r.type === 'criterion')!;
    expect(criterion).toMatchObject({
      key: 'criterion:c1:Br <= 2.45 T m',
      name: 'Br <= 2.45 T m',
      status: 'changed',
      passOld: true,
      passNew: false,
      flipped: true,
      relativeChange: null,
    });
    // common practice: margins relative to the limit, (2.45 − 2.43)/2.45 = 0.008 16 and (2.45 − 2.5)/2.45 = −0.020 4.
    expect(criterion.old!.number).toBeCloseTo(0.00816, 5);
    expect(criterion.new!.number).toBeCloseTo(-0.0204, 4);

    expect(cmp.results.map((r) => [r.key, r.status])).toEqual([
      ['value:B', 'changed'],
      ['value:r', 'changed'],
      ['value:Br', 'changed'],
      ['criterion:c1:Br <= 2.45 T m', 'changed'],
    ]);
    expect(cmp.summary.results).toEqual({ added: 0, removed: 0, changed: 4, unchanged: 0 });
    expect(cmp.summary.criteriaFlipped).toBe(1);
    expect(JSON.parse(JSON.stringify(cmp))).toEqual(cmp);
  });

  it('reports an error appearing, and the dependents that lost their value (real engine)', () => {
    const cmp = compareVersions(
      evaluated([calc('c1', 'v = 2 m / s\nw = v * 2\nL = 3 m')]),
      evaluated([calc('c1', 'v = 2 m / s + 1 kg\nw = v * 2\nL = 3 m')]),
    );
    const [v, w, l] = cmp.results;
    expect(v).toMatchObject({
      name: 'v',
      status: 'changed',
      old: { text: '2 m/s', error: null },
      new: { text: '', number: null, unit: null, kind: null },
      relativeChange: null,
    });
    expect(v.new!.error).toMatch(/^cannot add `2 m \/ s` \(a speed\) and `1 kg` \(a mass\)/);
    expect(w.status).toBe('changed');
    expect(w.new!.error).toMatch(/depends on `v`/);
    expect(l).toMatchObject({ name: 'L', status: 'unchanged', relativeChange: 0 });

    // And the error disappearing again is a change the other way.
    const back = compareVersions(evaluated([calc('c1', 'v = 2 m / s + 1 kg')]), evaluated([calc('c1', 'v = 2 m / s')]));
    expect(back.results[0]).toMatchObject({ status: 'changed', new: { text: '2 m/s', number: 2, error: null } });
    expect(back.results[0].old!.error).not.toBeNull();
  });

  it('matches a named result by name wherever its cell went, and criteria by cell and line', () => {
    const cmp = compareVersions(
      evaluated([calc('c1', 'm = 2 kg\nm <= 3 kg'), calc('c2', 'g2 = 9.81 m/s^2')]),
      evaluated([calc('c2', 'g2 = 9.81 m/s^2\nm = 2 kg'), calc('c1', 'm <= 3 kg\nm >= 1 kg')]),
    );
    expect(cmp.results.map((r) => [r.key, r.cellId, r.status])).toEqual([
      ['value:g2', 'c2', 'unchanged'],
      ['value:m', 'c2', 'unchanged'],
      ['criterion:c1:m <= 3 kg', 'c1', 'unchanged'],
      ['criterion:c1:m >= 1 kg', 'c1', 'added'],
    ]);
  });

  it('says when the unit changed instead of comparing numbers in different units', () => {
    const quantity = (number: number, unit: string) => ({
      kind: 'quantity' as const,
      text: `${number} ${unit}`,
      tex: '',
      number,
      unit,
      raw: null,
    });
    const cmp = compareVersions(
      {
        content: content([calc('c1', 'Br = 2.43 T m')]),
        results: handResult('c1', [{ name: 'Br', value: quantity(2.43, 'T m') }]),
      },
      {
        content: content([calc('c1', 'Br = 2430 mT m')]),
        results: handResult('c1', [{ name: 'Br', value: quantity(2430, 'mT m') }]),
      },
    );
    expect(cmp.results).toEqual([
      {
        key: 'value:Br',
        type: 'value',
        name: 'Br',
        cellId: 'c1',
        status: 'changed',
        old: { text: '2.43 T m', number: 2.43, unit: 'T m', kind: 'quantity', error: null },
        new: { text: '2430 mT m', number: 2430, unit: 'mT m', kind: 'quantity', error: null },
        relativeChange: null,
        unitChanged: true,
        passOld: null,
        passNew: null,
        flipped: false,
      },
    ]);
  });

  it('compares no results when one side was not evaluated, rather than calling them all removed', () => {
    const base = evaluated([calc('c1', baseSource)]);
    const cmp = compareVersions(base, { content: base.content, results: null });
    expect(cmp.resultsCompared).toBe(false);
    expect(cmp.results).toEqual([]);
    expect(cmp.summary.cells.unchanged).toBe(1);
  });
});

describe('record and attachments', () => {
  const hashA = 'a'.repeat(64);
  const hashB = 'b'.repeat(64);
  const hashC = 'c'.repeat(64);

  it('lists the changed fields, inputs, assumptions, references and attachments', () => {
    const base = content([calc('c1', 'x = 1')], {
      title: 'Dipole bending',
      record: {
        objective: 'Check the bending power of dipole D1',
        inputs: [
          { name: 'Field', value: '1.5 T', source: 'Magnet specification MS-12', sourceRevision: 'B' },
          { name: 'Length', value: '1.62 m', source: 'Drawing D-100', sourceRevision: '3' },
        ],
        assumptions: [{ text: 'Vacuum in the beam pipe', needsVerification: false }],
        method: 'Rigidity from field and radius',
        references: ['PDG 2024, section 34', 'Wiedemann, Particle Accelerator Physics'],
        conclusions: '',
      },
      attachments: [
        { name: 'field-map.csv', mediaType: 'text/csv', size: 100, sha256: hashA },
        { name: 'photo.jpg', mediaType: 'image/jpeg', size: 5000, sha256: hashC },
      ],
    });
    const target = content([calc('c1', 'x = 1')], {
      title: 'Dipole bending power',
      record: {
        ...base.record,
        inputs: [
          { name: 'Field', value: '1.5 T', source: 'Magnet specification MS-12', sourceRevision: 'C' },
          { name: 'Length', value: '1.62 m', source: 'Drawing D-100', sourceRevision: '3' },
        ],
        assumptions: [
          { text: 'Vacuum in the beam pipe', needsVerification: false },
          { text: 'Beam on the design orbit', needsVerification: true },
        ],
        references: ['PDG 2024, section 34'],
      },
      attachments: [{ name: 'field-map.csv', mediaType: 'text/csv', size: 100, sha256: hashB }],
    });
    const cmp = compareVersions({ content: base, results: null }, { content: target, results: null });

    expect(cmp.record.fields).toEqual([
      {
        field: 'title',
        old: 'Dipole bending',
        new: 'Dipole bending power',
        diff: [{ text: 'Dipole bending' }, { text: ' power', added: true }],
      },
    ]);
    expect(cmp.record.inputs).toEqual([
      {
        key: 'Field',
        status: 'changed',
        old: { name: 'Field', value: '1.5 T', source: 'Magnet specification MS-12', sourceRevision: 'B' },
        new: { name: 'Field', value: '1.5 T', source: 'Magnet specification MS-12', sourceRevision: 'C' },
        changedFields: ['sourceRevision'],
      },
    ]);
    expect(cmp.record.assumptions).toEqual([
      {
        key: 'Beam on the design orbit',
        status: 'added',
        old: null,
        new: { text: 'Beam on the design orbit', needsVerification: true },
        changedFields: [],
      },
    ]);
    expect(cmp.record.references).toEqual([
      {
        key: 'Wiedemann, Particle Accelerator Physics',
        status: 'removed',
        old: 'Wiedemann, Particle Accelerator Physics',
        new: null,
        changedFields: [],
      },
    ]);
    expect(cmp.record.attachments).toEqual([
      {
        key: 'field-map.csv',
        status: 'changed',
        old: { name: 'field-map.csv', mediaType: 'text/csv', size: 100, sha256: hashA },
        new: { name: 'field-map.csv', mediaType: 'text/csv', size: 100, sha256: hashB },
        changedFields: ['sha256'],
        table: null,
      },
      {
        key: 'photo.jpg',
        status: 'removed',
        old: { name: 'photo.jpg', mediaType: 'image/jpeg', size: 5000, sha256: hashC },
        new: null,
        changedFields: [],
        table: null,
      },
    ]);
    expect(cmp.summary).toMatchObject({ recordChanges: 4, attachmentChanges: 2 });
    expect(cmp.summary.cells.unchanged).toBe(1);
  });

  it('reports the scalar fields and a changed assumption flag', () => {
    const base = content([], {
      record: { ...emptyRecord(), assumptions: [{ text: 'Beam on axis', needsVerification: true }] },
    });
    const target = content([], {
      safetyRelated: true,
      significantFigures: 4,
      record: { ...emptyRecord(), assumptions: [{ text: 'Beam on axis', needsVerification: false }] },
    });
    const cmp = compareVersions({ content: base, results: null }, { content: target, results: null });
    expect(cmp.record.fields).toEqual([
      { field: 'safetyRelated', old: false, new: true, diff: null },
      { field: 'significantFigures', old: 6, new: 4, diff: null },
    ]);
    expect(cmp.record.assumptions).toEqual([
      {
        key: 'Beam on axis',
        status: 'changed',
        old: { text: 'Beam on axis', needsVerification: true },
        new: { text: 'Beam on axis', needsVerification: false },
        changedFields: ['needsVerification'],
      },
    ]);
  });

  it('reports a change of the units shown, reading a version saved without the setting as SI units', () => {
    const before = content([]);
    expect('displayUnits' in before).toBe(false);
    const trade = compareVersions(
      { content: before, results: null },
      { content: content([], { displayUnits: 'trade' }), results: null },
    );
    expect(trade.record.fields).toEqual([
      { field: 'displayUnits', old: 'SI units', new: 'Accelerator units (eV, eV/c, eV/c²)', diff: null },
    ]);
    // Writing 'si' explicitly shows the same as before: no change to report.
    expect(
      compareVersions(
        { content: before, results: null },
        { content: content([], { displayUnits: 'si' }), results: null },
      ).record.fields,
    ).toEqual([]);
  });
});

describe('first check and identical versions', () => {
  it('reports everything in the target as added when there is no base', () => {
    const target = evaluated([text('t', 'Rigidity of the beam'), calc('c1', 'B = 1.5 T\nB <= 2 T')], {
      record: {
        ...emptyRecord(),
        objective: 'Rigidity',
        inputs: [{ name: 'Field', value: '1.5 T', source: 'MS-12', sourceRevision: 'B' }],
        references: ['PDG 2024'],
      },
      attachments: [{ name: 'map.csv', mediaType: 'text/csv', size: 1, sha256: 'd'.repeat(64) }],
    });
    const cmp = compareVersions(null, target);
    expect(cmp.firstCheck).toBe(true);
    expect(cmp.resultsCompared).toBe(true);
    expect(cmp.cells.map((c) => [c.id, c.status, c.baseIndex, c.targetIndex])).toEqual([
      ['t', 'added', null, 0],
      ['c1', 'added', null, 1],
    ]);
    expect(cmp.results.map((r) => [r.key, r.status, r.old, r.passOld, r.passNew, r.flipped])).toEqual([
      ['value:B', 'added', null, null, null, false],
      ['criterion:c1:B <= 2 T', 'added', null, null, true, false],
    ]);
    expect(cmp.record.fields.map((f) => [f.field, f.old])).toEqual([
      ['title', null],
      ['safetyRelated', null],
      ['significantFigures', null],
      // The display-units setting is a record field (new with issue 15).
      ['displayUnits', null],
      ['objective', null],
      ['method', null],
      ['conclusions', null],
    ]);
    expect(cmp.record.fields[4].diff).toEqual([{ text: 'Rigidity', added: true }]);
    expect(cmp.record.inputs.map((i) => [i.key, i.status])).toEqual([['Field', 'added']]);
    expect(cmp.record.references.map((r) => [r.key, r.status])).toEqual([['PDG 2024', 'added']]);
    expect(cmp.record.attachments.map((a) => [a.key, a.status])).toEqual([['map.csv', 'added']]);
    expect(cmp.summary).toEqual({
      cells: { added: 2, removed: 0, changed: 0, moved: 0, unchanged: 0 },
      results: { added: 2, removed: 0, changed: 0, unchanged: 0 },
      criteriaFlipped: 0,
      recordChanges: 9,
      attachmentChanges: 1,
    });
  });

  it('gives all unchanged and zero change counts for identical versions', () => {
    const version = evaluated([text('t', 'Intro'), calc('c1', 'B = 1.5 T\nr = 1.62 m\nBr = B * r\nBr <= 3 T m')], {
      record: {
        ...emptyRecord(),
        inputs: [{ name: 'Field', value: '1.5 T', source: 'MS-12', sourceRevision: 'B' }],
        references: ['PDG 2024'],
      },
    });
    const again = evaluated(version.content.cells, { record: version.content.record });
    const cmp = compareVersions(version, again);
    expect(cmp.cells.every((c) => c.status === 'unchanged' && c.sourceDiff === null)).toBe(true);
    expect(cmp.results.every((r) => r.status === 'unchanged' && !r.flipped)).toBe(true);
    expect(cmp.results.find((r) => r.key === 'value:Br')!.relativeChange).toBe(0);
    expect(cmp.record).toEqual({ fields: [], inputs: [], assumptions: [], references: [], attachments: [] });
    expect(cmp.summary).toEqual({
      cells: { added: 0, removed: 0, changed: 0, moved: 0, unchanged: 2 },
      results: { added: 0, removed: 0, changed: 0, unchanged: 4 },
      criteriaFlipped: 0,
      recordChanges: 0,
      attachmentChanges: 0,
    });
  });
});

describe('attachments and CSV tables', () => {
  // Unit checks are not the subject here: every unit is accepted.
  const table = (csv: string) => parseInputTable(csv, () => null);
  const sha = (c: string) => c.repeat(64);

  it('lists attachments added, removed and replaced with name, size and SHA-256, and diffs a replaced CSV table by rows and columns', () => {
    // Invented demo data: a field map measured at four currents, then re-measured.
    const before = table('current [A], field [T]\n100, 0.50\n200, 1.00\n300, 1.50\n400, 2.00\n');
    const after = table(
      'current [A], field [T], temperature [K]\n100, 0.50, 300\n200, 1.01, 300\n400, 2.00, 301\n500, 2.49, 302\n',
    );
    const base = content([], {
      attachments: [
        { name: 'field-map.csv', mediaType: 'text/csv', size: 60, sha256: sha('a') },
        { name: 'old-drawing.pdf', mediaType: 'application/pdf', size: 12000, sha256: sha('b') },
      ],
    });
    const target = content([], {
      attachments: [
        { name: 'field-map.csv', mediaType: 'text/csv', size: 90, sha256: sha('c') },
        { name: 'scan.csv', mediaType: 'text/csv', size: 30, sha256: sha('d') },
      ],
    });
    const scan = table('t [s]\n1\n2\n');
    const cmp = compareVersions(
      { content: base, results: null },
      { content: target, results: null },
      { tables: { [sha('a')]: before, [sha('c')]: after, [sha('d')]: scan } },
    );
    const byKey = new Map(cmp.record.attachments.map((a) => [a.key, a]));
    expect([...byKey.keys()]).toEqual(['field-map.csv', 'scan.csv', 'old-drawing.pdf']);

    const replaced = byKey.get('field-map.csv')!;
    expect(replaced.status).toBe('changed');
    expect(replaced.changedFields).toEqual(['sha256', 'size']);
    expect(replaced.old).toMatchObject({ size: 60, sha256: sha('a') });
    expect(replaced.new).toMatchObject({ size: 90, sha256: sha('c') });
    const diff = replaced.table!;
    expect(diff.oldRows).toBe(4);
    expect(diff.newRows).toBe(4);
    expect(diff.columns).toEqual([
      { name: 'current', status: 'unchanged', oldUnit: 'A', newUnit: 'A' },
      { name: 'field', status: 'unchanged', oldUnit: 'T', newUnit: 'T' },
      { name: 'temperature', status: 'added', oldUnit: null, newUnit: 'K' },
    ]);
    // Row 2 changed its field, row 3 (300 A) was removed, a row at 500 A was added; the added column
    // alone does not make rows 1 and 4 changed.
    expect(diff.rows).toEqual([
      {
        status: 'changed',
        oldRow: 2,
        newRow: 2,
        old: [200, 1.0, null],
        new: [200, 1.01, 300],
        changedColumns: ['field'],
      },
      { status: 'removed', oldRow: 3, newRow: null, old: [300, 1.5, null], new: null, changedColumns: [] },
      { status: 'added', oldRow: null, newRow: 4, old: null, new: [500, 2.49, 302], changedColumns: [] },
    ]);
    expect(diff.rowCounts).toEqual({ added: 1, removed: 1, changed: 1 });
    expect(diff.truncated).toBe(false);

    const added = byKey.get('scan.csv')!;
    expect(added).toMatchObject({ status: 'added', old: null, new: { name: 'scan.csv', size: 30, sha256: sha('d') } });
    expect(added.table).toMatchObject({
      oldRows: null,
      newRows: 2,
      columns: [{ name: 't', status: 'added', oldUnit: null, newUnit: 's' }],
      rowCounts: { added: 2, removed: 0, changed: 0 },
    });

    const removed = byKey.get('old-drawing.pdf')!;
    expect(removed).toMatchObject({
      status: 'removed',
      new: null,
      old: { name: 'old-drawing.pdf', size: 12000, sha256: sha('b') },
      table: null,
    });
    expect(cmp.summary.attachmentChanges).toBe(3);
    // Plain JSON: what the API returns is what the page renders.
    expect(JSON.parse(JSON.stringify(cmp))).toEqual(cmp);
  });

  it('reports a removed column, a changed unit, and lists at most the row limit while counting every row', () => {
    const oldT = table('x [m], y [m], w\n1, 2, 3\n');
    const newT = table('x [mm], y [m]\n1, 2\n');
    const d = compareTables(oldT, newT);
    expect(d.columns).toEqual([
      { name: 'x', status: 'unitChanged', oldUnit: 'm', newUnit: 'mm' },
      { name: 'y', status: 'unchanged', oldUnit: 'm', newUnit: 'm' },
      { name: 'w', status: 'removed', oldUnit: null, newUnit: null },
    ]);
    expect(d.rows).toEqual([]);

    const rows = (n: number, f: (i: number) => number) =>
      'i, v\n' + Array.from({ length: n }, (_, i) => `${i}, ${f(i)}`).join('\n');
    const big = compareTables(table(rows(500, (i) => i)), table(rows(500, (i) => i + 0.5)));
    expect(big.rowCounts).toEqual({ added: 0, removed: 0, changed: 500 });
    expect(big.rows).toHaveLength(MAX_TABLE_ROW_CHANGES);
    expect(big.truncated).toBe(true);
    expect(big.rows[0]).toMatchObject({ oldRow: 1, newRow: 1, changedColumns: ['v'] });
    // Far apart (1000 row edits): compared row k with row k, every row changed.
    expect(big.rows.every((r, k) => r.status === 'changed' && r.oldRow === k + 1 && r.newRow === k + 1)).toBe(true);
    // Close: one row inserted near the top of 500 shifts nothing else.
    const inserted = compareTables(
      table(rows(500, (i) => i)),
      table('i, v\n' + ['0, 0', '0.5, 0.5', ...Array.from({ length: 499 }, (_, k) => `${k + 1}, ${k + 1}`)].join('\n')),
    );
    expect(inserted.rows).toEqual([
      { status: 'added', oldRow: null, newRow: 2, old: null, new: [0.5, 0.5], changedColumns: [] },
    ]);
  });

  it('gives no table diff for an attachment whose table was not passed in, and the same answer either way round', () => {
    const a = content([], { attachments: [{ name: 'd.csv', mediaType: 'text/csv', size: 10, sha256: sha('e') }] });
    const b = content([], { attachments: [{ name: 'd.csv', mediaType: 'text/csv', size: 11, sha256: sha('f') }] });
    expect(
      compareVersions({ content: a, results: null }, { content: b, results: null }).record.attachments[0].table,
    ).toBeNull();
    const t1 = table('n\n1\n2\n');
    const t2 = table('n\n1\n3\n');
    const forward = compareTables(t1, t2);
    const backward = compareTables(t2, t1);
    expect(forward.rows.map((r) => [r.oldRow, r.newRow, r.old, r.new])).toEqual(
      backward.rows.map((r) => [r.newRow, r.oldRow, r.new, r.old]),
    );
  });
});
