// Completion in the calculation cell editor: what is offered, with what description, and where
// nothing is offered.
import { CompletionContext } from '@codemirror/autocomplete';
import { EditorState } from '@codemirror/state';
import { describe, expect, it } from 'vitest';
import { CONSTANTS } from '../../lib/calc/constants';
import {
  calcCompletionOptions,
  calcCompletionSource,
  completeCalcAt,
  functionSignature,
  inCommentOrString,
} from '../../components/sheet/editor-completions';
import { LIBRARY } from '../../lib/calc/functions';

describe('the options', () => {
  const options = calcCompletionOptions([
    { name: 'T_kin', summary: '250 MeV' },
    { name: 'p_1' },
    { name: 'T_kin', summary: 'redefined' },
  ]);
  const byLabel = (label: string) => options.find((o) => o.label === label)!;

  it('offers the names above once, first, as variables with their summary', () => {
    expect(options.filter((o) => o.label === 'T_kin')).toHaveLength(1);
    expect(byLabel('T_kin')).toMatchObject({ type: 'variable', info: 'redefined', boost: 2 });
    expect(byLabel('p_1')).toMatchObject({ type: 'variable', info: undefined });
    // The nearest definition first.
    expect(options.slice(0, 2).map((o) => o.label)).toEqual(['T_kin', 'p_1']);
  });

  it('offers every built-in constant with its description, unit and provenance', () => {
    for (const k of CONSTANTS) {
      const o = byLabel(k.name);
      expect(o.type).toBe('constant');
      expect(o.detail).toContain(k.unit);
      expect(o.info).toBe(`${k.description} — ${k.provenance}`);
    }
    expect(byLabel('m_p').info).toBe('proton mass — CODATA 2022');
    expect(byLabel('c').info).toContain('exact by definition');
  });

  it('offers every library function with its signature and one-sentence summary, inserting `name(`', () => {
    for (const f of LIBRARY) {
      const o = byLabel(f.name);
      expect(o.type).toBe('function');
      expect(o.apply).toBe(`${f.name}(`);
      expect(o.info).toMatch(new RegExp(`^${f.name}\\(.*\\) — \\S`));
      expect(String(o.info)).not.toContain('\n');
      expect(f.doc.summary.replace(/\s+/g, ' ')).toContain(String(o.info).split(' — ')[1].slice(0, -1));
    }
    const lorentz = LIBRARY.find((f) => f.name === 'lorentzFactor')!;
    expect(functionSignature(lorentz)).toBe(`lorentzFactor(${lorentz.params.map((p) => p.name).join(', ')})`);
    expect(
      functionSignature({
        name: 'f',
        params: [
          { name: 'a', kind: 'speed', description: '' },
          { name: 'b', kind: 'mass', description: '' },
        ],
      }),
    ).toBe('f(a, b)');
  });

  it('lets a name above hide a constant of the same name', () => {
    const shadow = calcCompletionOptions([{ name: 'c', summary: 'a length' }]).filter((o) => o.label === 'c');
    expect(shadow).toEqual([expect.objectContaining({ type: 'variable', info: 'a length' })]);
  });
});

describe('where completion applies', () => {
  it('completes the word before the cursor', () => {
    const r = completeCalcAt('x = lorentzF', 12, false, []);
    expect(r?.from).toBe(4);
    expect(r?.options.some((o) => o.label === 'lorentzFactor')).toBe(true);
  });

  it('offers the columns of an input table after `table.`, with their units, and nothing after another name', () => {
    const tables = [
      {
        name: 'scan',
        columns: [
          { name: 'energy', unit: 'MeV' },
          { name: 'turns', unit: null },
        ],
      },
    ];
    const r = completeCalcAt('E = scan.en', 11, false, tables);
    expect(r?.from).toBe(9);
    expect(r?.options.map((o) => [o.label, o.detail])).toEqual([
      ['energy', 'column, MeV'],
      ['turns', 'column, plain numbers'],
    ]);
    expect(completeCalcAt('E = scan.', 9, true, tables)?.options).toHaveLength(2);
    expect(completeCalcAt('E = other.', 10, true, tables)).toBeNull();
  });

  it('offers nothing in a comment, in a string, in a number exponent, or with no word unless asked', () => {
    expect(completeCalcAt('x = 1 # lorentz', 15, true, [])).toBeNull();
    expect(completeCalcAt('s = "lore', 9, true, [])).toBeNull();
    expect(completeCalcAt('x = 2e', 6, false, [])).toBeNull();
    expect(completeCalcAt('x = ', 4, false, [])).toBeNull();
    expect(completeCalcAt('x = ', 4, true, [])?.from).toBe(4);
  });

  it('knows strings and comments', () => {
    expect(inCommentOrString('a = "x # y" + ')).toBe(false);
    expect(inCommentOrString('a = "x \\" y')).toBe(true);
    expect(inCommentOrString("a = 'x' # c")).toBe(true);
    expect(inCommentOrString('a = b')).toBe(false);
  });

  it('works as a CodeMirror completion source, reading the names above at each request', () => {
    let names = [{ name: 'gamma_1' }];
    const source = calcCompletionSource(() => names);
    const state = EditorState.create({ doc: 'a = 1\nb = gam' });
    const ctx = new CompletionContext(state, state.doc.length, false);
    const first = source(ctx) as unknown as { from: number; options: Array<{ label: string }> };
    expect(first.from).toBe(state.doc.length - 3);
    expect(first.options[0].label).toBe('gamma_1');
    names = [{ name: 'gamma_2' }];
    expect((source(ctx) as unknown as { options: Array<{ label: string }> }).options[0].label).toBe('gamma_2');
  });
});
