// A sweep's table as CSV (lib/calc/study-csv.ts): RFC 4180 quoting and line ends, numbers at full
// double precision, and a header the data-table attachments can read back.
import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { parseInputTable } from '../../lib/attachments/csv-table';
import { studyCsvFileName, studyTableCsv } from '../../lib/calc/study-csv';
import type { StudyTable } from '../../lib/calc/types';

const table: StudyTable = {
  columns: [
    { name: 'T_kin', unit: 'MeV', tex: 'T_{kin}' },
    { name: 'Brho', unit: 'T m', tex: 'B\\rho' },
    { name: 'beta', unit: null, tex: '\\beta' },
  ],
  rows: [
    // Doubles whose shortest round-trip text needs 16 or 17 digits or an exponent (IEEE 754 binary64:
    // 0.1 + 0.2, π, the smallest normal and the largest finite double), beside plain ones.
    [70, 0.1 + 0.2, Math.PI],
    [2.2250738585072014e-308, 1.7976931348623157e308, -1e-300],
    [250, 2.42968, 0.6136],
  ],
  errors: [null, null, null],
};

describe('studyTableCsv', () => {
  it('writes a header of name [unit], CRLF line ends, and every number at full precision', () => {
    const csv = studyTableCsv(table);
    expect(csv).toBe(
      'T_kin [MeV],Brho [T m],beta\r\n' +
        '70,0.30000000000000004,3.141592653589793\r\n' +
        '2.2250738585072014e-308,1.7976931348623157e+308,-1e-300\r\n' +
        '250,2.42968,0.6136\r\n',
    );
    // Every number reads back as the very same double (ECMAScript Number::toString is the shortest round trip).
    const back = (parse(csv, { from_line: 2 }) as string[][]).map((r) => r.map(Number));
    expect(back).toEqual(table.rows);
  });

  it('quotes fields with commas, quotes or line breaks (RFC 4180 §2.6, §2.7), and defuses formulas', () => {
    const odd: StudyTable = {
      columns: [
        { name: 'E', unit: 'MeV', tex: 'E' },
        { name: 'ratio, "corrected"', unit: null, tex: 'r' },
      ],
      rows: [
        [1, null],
        [2, 3],
      ],
      errors: ['domain error: speedFromKinetic, "T" must be positive\nsee line 3', null],
    };
    const csv = studyTableCsv(odd);
    const lines = csv.split('\r\n');
    expect(lines[0]).toBe('E [MeV],"ratio, ""corrected""",error');
    expect(lines[1]).toBe('1,,"domain error: speedFromKinetic, ""T"" must be positive\nsee line 3"');
    expect(lines[2]).toBe('2,3,');
    const records = parse(csv) as string[][];
    expect(records[1][2]).toBe(odd.errors[0]);
    expect(records).toHaveLength(3);
    // OWASP CSV injection: a text field starting with = is prefixed; numbers are never altered.
    expect(studyTableCsv({ columns: [{ name: '=cmd', unit: null, tex: '' }], rows: [[-1]], errors: [null] })).toBe(
      "'=cmd\r\n-1\r\n",
    );
  });

  it('reads back as an input table attachment when no step failed', () => {
    // Units accepted as written here (the attachment upload checks them with the engine).
    const read = parseInputTable(studyTableCsv(table), () => null);
    expect(read.columns.map((c) => [c.name, c.unit])).toEqual([
      ['T_kin', 'MeV'],
      ['Brho', 'T m'],
      ['beta', null],
    ]);
    expect(read.columns[1].values).toEqual(table.rows.map((r) => r[1]));
  });

  it('names the download after the sheet, version, cell and line', () => {
    expect(studyCsvFileName({ sheet: 'TPT2-CALC-0003', version: 4, cellNumber: 2, line: 3 })).toBe(
      'TPT2-CALC-0003-v4-cell2-line3.csv',
    );
  });
});
