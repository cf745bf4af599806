// A CSV attachment read as an input table: a header row naming each column and its unit in square
// brackets (`energy [MeV], field [T], n`), then one row of numbers per line. Cells use the table as
// `table.column`, a list of quantities with the column's unit.
import { parse } from 'csv-parse/sync';
import type { InputTable } from '@/lib/calc/types';
import { reserved } from './table-name';

export { tableNameFor } from './table-name';

const TABLE_LIMITS = { maxRows: 10_000, maxColumns: 50 };

const IDENTIFIER = /^[A-Za-z][A-Za-z0-9_]*$/;
/** Numbers as written in engineering data files: a point for decimals, optional exponent. */
const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

export class TableError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'TableError';
  }
}

export interface ParsedTable {
  columns: InputTable['columns'];
  rows: number;
}

/**
 * Reads the CSV text into columns. `checkUnit` says what is wrong with a unit (null when the engine
 * knows it). Every problem is reported with its row and column, as a person would look for it.
 */
export function parseInputTable(text: string, checkUnit: (unit: string) => string | null): ParsedTable {
  let records: string[][];
  try {
    records = parse(text.replace(/^\uFEFF/, ''), {
      delimiter: [',', ';', '\t'],
      trim: true,
      skip_empty_lines: true,
      relax_column_count: false,
      max_record_size: 64 * 1024,
    }) as string[][];
  } catch (error) {
    const message = error instanceof Error ? error.message.replace(/^Invalid Record Length: /, '') : String(error);
    throw new TableError(`The file cannot be read as CSV: ${message}`);
  }
  if (records.length < 2) throw new TableError('A data table needs a header row and at least one row of numbers.');
  const [header, ...rows] = records;
  if (header.length > TABLE_LIMITS.maxColumns)
    throw new TableError(`A data table has at most ${TABLE_LIMITS.maxColumns} columns; this one has ${header.length}.`);
  if (rows.length > TABLE_LIMITS.maxRows)
    throw new TableError(
      `A data table has at most ${TABLE_LIMITS.maxRows} rows of numbers; this one has ${rows.length}.`,
    );

  const seen = new Set<string>();
  const columns = header.map((heading, c) => {
    const m = /^([^[\]]*?)\s*(?:\[([^[\]]*)\])?$/.exec(heading);
    const where = `column ${c + 1} of the header ("${heading.slice(0, 60)}")`;
    if (!m) throw new TableError(`${where}: write a column as name [unit], for example energy [MeV]`);
    const name = m[1].trim().replace(/[\s-]+/g, '_');
    if (!IDENTIFIER.test(name))
      throw new TableError(`${where}: a column name starts with a letter and holds letters, digits and underscores`);
    if (name.length > 40) throw new TableError(`${where}: column names are at most 40 characters long`);
    if (reserved(name)) throw new TableError(`${where}: "${name}" is a reserved word; rename the column`);
    if (seen.has(name)) throw new TableError(`${where}: there are two columns named ${name}`);
    seen.add(name);
    const unit = m[2]?.trim() || null;
    if (unit) {
      const problem = checkUnit(unit);
      if (problem) throw new TableError(`${where}: ${problem}`);
    }
    return { name, unit, values: [] as number[] };
  });

  rows.forEach((row, r) => {
    row.forEach((cell, c) => {
      const where = `row ${r + 2}, column ${columns[c].name}`;
      if (cell === '') throw new TableError(`${where} is empty; every row needs a number in every column`);
      if (!NUMBER.test(cell)) {
        const hint = /^\d+,\d+$/.test(cell) ? ' (use a point, not a comma, for decimals)' : '';
        throw new TableError(`${where}: "${cell.slice(0, 40)}" is not a number${hint}`);
      }
      const value = Number(cell);
      if (!Number.isFinite(value)) throw new TableError(`${where}: ${cell.slice(0, 40)} is out of range`);
      columns[c].values.push(value);
    });
  });
  return { columns, rows: rows.length };
}
