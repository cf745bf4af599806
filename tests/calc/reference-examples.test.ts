// The function reference's own examples run (issue 15, "Names and messages"): every library
// function's documented example (lib/calc/functions/*: doc.example → doc.exampleResult), the naming
// examples (lib/calc/reference-examples.ts), and every study statement's example, read from where the
// reference page reads them (so functions and examples added later are covered), evaluated by the
// engine and compared with what the reference says. The documented values are the functions' own
// published checks (each file's doc.source names it); this test holds the engine to them as shown.
import { describe, expect, it } from 'vitest';
import { LIBRARY } from '../../lib/calc/functions';
import { LINT_EXAMPLES } from '../../lib/calc/lint';
import { NAME_EXAMPLES, STUDY_EXAMPLE_SETUP } from '../../lib/calc/reference-examples';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { STUDY_FUNCTION_DOCS } from '../../lib/calc/study-functions';
import type { CellInput, DisplayValue, EvaluateOptions, StatementResult } from '../../lib/calc/types';
import { UNIT_EXAMPLES } from '../../lib/calc/display-units';

const engine = createSheetEngine();
const math = engine.em.math;

/** The statements of one cell, evaluated on their own. */
function statementsOf(source: string, options: Partial<EvaluateOptions> = {}): StatementResult[] {
  const cells: CellInput[] = [{ id: 'example', kind: 'calc', source }];
  return engine.evaluate(cells, { significantFigures: 15, ...options }).cells[0].statements;
}

const SUPERSCRIPT: Record<string, string> = {
  '⁰': '0',
  '¹': '1',
  '²': '2',
  '³': '3',
  '⁴': '4',
  '⁵': '5',
  '⁶': '6',
  '⁷': '7',
  '⁸': '8',
  '⁹': '9',
  '⁻': '-',
};

/** A number as the engine displays it ("−2.248 443 44 × 10⁸ m") or as a reference writes it ("-2.24844344e8 m"): value and unit. */
function parseQuantity(text: string): { value: number; digits: number; unit: string } {
  const t = text
    .trim()
    .replace(/[\u202f\u2009]/g, '')
    .replace(/−/g, '-');
  const m = /^(-?\d+(?:\.\d+)?)(?:(?:e|E)([+-]?\d+)|\s*×\s*10([⁰¹²³⁴⁵⁶⁷⁸⁹⁻]+))?\s*(.*)$/.exec(t);
  if (!m) throw new Error(`not a number with a unit: ${text}`);
  const exponent = m[2] ?? (m[3] ? [...m[3]].map((c) => SUPERSCRIPT[c]).join('') : '0');
  const digits = m[1].replace(/^-?0*\.?0*/, '').replace('.', '').length;
  return { value: Number(`${m[1]}e${exponent}`), digits: Math.max(1, digits), unit: m[4].replace(/·/g, ' ').trim() };
}

/** The documented result without its comment: "1.8396e8 m/s (β = 0.61361)" → "1.8396e8 m/s". */
function documented(result: string): string {
  return result.replace(/\s*\(.*\)\s*$/, '').trim();
}

/** Does the engine's value (number in unit) equal the documented one to the digits documented? */
function agrees(
  actual: { value: number; unit: string | null },
  doc: { value: number; digits: number; unit: string },
): { ok: boolean; inDocUnit: number } {
  let inDocUnit = actual.value;
  if (doc.unit || actual.unit) {
    if (!doc.unit || !actual.unit) return { ok: false, inDocUnit: NaN };
    inDocUnit = math.unit(actual.value, actual.unit).toNumber(doc.unit);
  }
  if (doc.value === 0) return { ok: Math.abs(inDocUnit) < 1e-300, inDocUnit };
  const lastDigit = 10 ** (Math.floor(Math.log10(Math.abs(doc.value))) - doc.digits + 1);
  // Rounded to the documented digits, the value is the documented one (half a unit in the last
  // documented digit, and a few ulp for the decimal-to-binary conversions).
  return {
    ok: Math.abs(inDocUnit - doc.value) <= 0.5 * lastDigit * (1 + 1e-9) + 4 * Number.EPSILON * Math.abs(doc.value),
    inDocUnit,
  };
}

function scalarOf(value: DisplayValue): { value: number; unit: string | null } {
  expect(value.number).not.toBeNull();
  return { value: value.number!, unit: value.unit };
}

describe('every library function’s documented example gives its documented result', () => {
  it('documents an example and a result for every function', () => {
    for (const f of LIBRARY) {
      expect(f.doc.example, f.name).toMatch(new RegExp(`\\b${f.name}\\(`));
      expect(f.doc.exampleResult, f.name).toBeTruthy();
    }
  });

  for (const f of LIBRARY) {
    it(`${f.name}: ${f.doc.example} → ${f.doc.exampleResult}`, () => {
      const statements = statementsOf(f.doc.example);
      const last = statements[statements.length - 1];
      expect(last.error, f.doc.example).toBeNull();
      const doc = documented(f.doc.exampleResult);
      if (doc.startsWith('[')) {
        // A list: each element as displayed against each documented one.
        expect(last.value!.kind).toBe('matrix');
        const shown = last.value!.text.replace(/^\[|\]$/g, '').split(/,\s*/);
        const wanted = doc.replace(/^\[|\]$/g, '').split(/,\s*/);
        expect(shown.length).toBe(wanted.length);
        wanted.forEach((w, i) => {
          const a = parseQuantity(shown[i]);
          const check = agrees({ value: a.value, unit: a.unit || null }, parseQuantity(w));
          expect(check.ok, `${f.name} element ${i + 1}: ${shown[i]} against ${w}`).toBe(true);
        });
        return;
      }
      const check = agrees(scalarOf(last.value!), parseQuantity(doc));
      expect(
        check.ok,
        `${f.name}: shown ${last.value!.text} (${check.inDocUnit} in the documented unit) against ${doc}`,
      ).toBe(true);
    });
  }
});

describe('the naming examples of the reference page', () => {
  for (const x of NAME_EXAMPLES) {
    it(x.source.replace(/\n/g, ' ⏎ '), () => {
      const statements = statementsOf(x.source, { significantFigures: 6 });
      const last = statements[statements.length - 1];
      if (x.result === null) {
        expect(last.error).toContain(x.error!);
      } else {
        expect(last.error).toBeNull();
        expect(last.value!.text.replace(/\u202f/g, ' ')).toBe(x.result);
      }
      for (const st of statements.slice(0, -1)) expect(st.error, st.source).toBeNull();
    });
  }
});

describe('the study statements’ examples', () => {
  // A cited result as the server resolves it (lib/sheets/references.ts): an issued revision's value.
  const references = [
    {
      sheet: 'TPT2-CALC-0003',
      revision: 'B',
      name: 'Brho',
      value: { number: 2.4321, unit: 'T m', uncertainty: null },
      error: null,
      status: 'current' as const,
      supersededBy: null,
      title: 'Gantry 2 rigidity',
      versionSha256: 'a'.repeat(64),
    },
  ];
  // An attached data table as the server reads it (lib/attachments/csv-table.ts), for dataPoints;
  // the numbers are illustrative (no published source).
  const tables = [
    {
      name: 'energies',
      sha256: 'b'.repeat(64),
      fileName: 'energies.csv',
      columns: [
        { name: 'T', unit: 'MeV', values: [70, 150, 250] },
        { name: 'Brho', unit: 'T m', values: [1.23, 1.83, 2.43] },
      ],
    },
  ];
  for (const d of STUDY_FUNCTION_DOCS) {
    it(`${d.name}: ${d.example}`, () => {
      const setup = STUDY_EXAMPLE_SETUP[d.name];
      const statements = statementsOf(setup ? `${setup}\n${d.example}` : d.example, {
        significantFigures: 6,
        references,
        tables,
      });
      for (const st of statements) expect(st.error, st.source).toBeNull();
    });
  }
});

describe('the units and lint examples of the reference page evaluate', () => {
  for (const x of UNIT_EXAMPLES) {
    it(`${x.source} (${x.displayUnits})`, () => {
      const [st] = statementsOf(x.source, { significantFigures: 6, displayUnits: x.displayUnits });
      expect(st.error).toBeNull();
    });
  }
  for (const x of LINT_EXAMPLES) {
    it(x.source, () => {
      const [st] = statementsOf(x.source, { significantFigures: 6 });
      expect(st.error).toBeNull();
    });
  }
});
