// Property-based fuzzing (fast-check) of every place hostile input enters: calculation source,
// sheet files for import, API bodies and query strings, Markdown text cells and attachment file
// names. Each property says what must hold whatever the input: an answer or a clear refusal (a
// per-cell error, a 400), never another exception, never markup that acts, never a path.
// Sources of the checks: OWASP (Cross Site Scripting Prevention Cheat Sheet; Path Traversal; File
// Upload Cheat Sheet) for the Markdown and file-name properties; common practice (robustness of
// parsers and validators: total functions over their input) for the rest. Runs are bounded so that
// the file stays well under a minute.
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { ZodError, type ZodType } from 'zod';
import { sanitizeFileName } from '../../lib/attachments/file-name';
import { ATTACHMENT_KINDS, type AttachmentKind } from '../../lib/attachments/kinds';
import { CONSTANTS } from '../../lib/calc/constants';
import { LIBRARY } from '../../lib/calc/functions/index';
import { LIMITS } from '../../lib/calc/limits';
import { getEvaluator } from '../../lib/sheets/evaluate-sandboxed';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { parseSheetFile, SheetFileError, sheetFileSchema } from '../../lib/calc/sheet-file';
import type { CellInput, SheetResult } from '../../lib/calc/types';
import { AppError, errorResponse, isUnstorableTextError } from '../../lib/errors/app-error';
import { OPERATIONS } from '../../lib/http/openapi';
import { INT4_MAX, PATH_PARAMS, routeParams, type PathParamName } from '../../lib/http/params';
import { parseValue } from '../../lib/http/route';
import { renderMarkdown } from '../../lib/sheets/markdown';
import { importSheetFile } from '../../lib/sheets/sheet-files';
import { createSheet, getVersion, saveVersion, saveVersionSchema } from '../../lib/sheets/sheets';
import { testDb } from '../support/database';
import { makeProject, makeUser } from '../support/people';
import { seedFastCheck } from '../calc/fast-check-seed';

seedFastCheck('tests/fuzz/hostile-input.test.ts', 20260317);

// A shorter time limit than the server's 5 s, so that a runaway input costs the run less; the
// behaviour under test (stop the cell, replace the worker, answer the next request) is the same.
process.env.WORLDSHEET_CALC_TIMEOUT_MS ??= '2000';

afterAll(async () => {
  await getEvaluator().close();
});

/** Runs `fn`; returns the error it throws, or null. */
function thrown(fn: () => unknown): unknown {
  try {
    fn();
    return null;
  } catch (error) {
    return error;
  }
}

const expectBadRequest = (error: unknown) => {
  if (error === null) return;
  if (!(error instanceof AppError))
    throw new Error(
      `expected an AppError 400, got ${error instanceof Error ? `${error.name}: ${error.message}` : String(error)}`,
    );
  expect(error.status).toBe(400);
};

// ── 1. Calculation source ──────────────────────────────────────────────────────────────────

const LIBRARY_NAMES = LIBRARY.map((f) => f.name);
const NAMES = [
  'x',
  'y_1',
  'T',
  'E_k',
  'v',
  'beta',
  'L',
  'f',
  'table',
  'ans',
  ...CONSTANTS.map((c) => c.name),
  'MeV',
  'm',
  's',
  'pi',
  'e',
  'i',
  'Infinity',
  'NaN',
  'true',
  'null',
  'end',
  'to',
  'in',
  'import',
  'createUnit',
  'evaluate',
  'config',
  'constructor',
  '__proto__',
  'prototype',
];
const UNITS = [
  'm',
  'MeV',
  'GeV',
  'eV',
  'T*m',
  'm/s',
  'km/h',
  'kg',
  'ns',
  'us',
  's',
  'ft',
  'degC',
  'degF',
  'rad',
  'deg',
  'C',
  'J',
  'T',
  'A',
  'MeV/c',
  'GeV/c^2',
  'm^2',
  'kg m/s',
  '1/s',
  'Hz',
  'mm',
  'foo',
];
const OPS = [
  '+',
  '-',
  '*',
  '/',
  '^',
  '.*',
  './',
  '%',
  ' mod ',
  ' and ',
  ' or ',
  ' xor ',
  '==',
  '!=',
  '&',
  '|',
  '<<',
  '>>',
];
const CRITERIA = ['<', '<=', '>', '>=', '==', '!='];

const numberText = fc.oneof(
  fc.integer({ min: -1000, max: 1000 }).map(String),
  fc.double({ noNaN: false }).map((d) => String(d)),
  fc.constantFrom(
    '0',
    '1e308',
    '1e-400',
    '1e999999',
    '-0',
    '0x1F',
    '0b101',
    '1_000',
    '.5',
    '5.',
    '1e',
    '2.5e-3',
    '6.02214076e23',
  ),
);
const name = fc.oneof(fc.constantFrom(...NAMES), fc.stringMatching(/^[a-zA-Z_][a-zA-Z0-9_]{0,8}$/));
const unit = fc.constantFrom(...UNITS);

const { expr } = fc.letrec<{ expr: string }>((tie) => ({
  expr: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    numberText,
    name,
    fc.tuple(numberText, unit).map(([n, u]) => `${n} ${u}`),
    fc.tuple(tie('expr'), fc.constantFrom(...OPS), tie('expr')).map(([a, op, b]) => `(${a} ${op} ${b})`),
    fc
      .tuple(
        fc.constantFrom(
          ...LIBRARY_NAMES,
          'sqrt',
          'sin',
          'abs',
          'max',
          'log',
          'exp',
          'factorial',
          'gamma',
          'zeros',
          'ones',
          'range',
          'det',
          'inv',
          'string',
          'unit',
          'number',
        ),
        fc.array(tie('expr'), { maxLength: 4 }),
      )
      .map(([f, args]) => `${f}(${args.join(', ')})`),
    tie('expr').map((a) => `-${a}`),
    fc.tuple(tie('expr'), unit).map(([a, u]) => `${a} to ${u}`),
    fc.array(tie('expr'), { maxLength: 4 }).map((xs) => `[${xs.join(', ')}]`),
    fc.tuple(tie('expr'), tie('expr'), tie('expr')).map(([a, b, c]) => `${a} ? ${b} : ${c}`),
    fc.string({ maxLength: 12 }).map((s) => JSON.stringify(s)),
  ),
}));

const statement = fc.oneof(
  fc.tuple(name, expr).map(([n, e]) => `${n} = ${e}`),
  expr,
  fc.tuple(expr, fc.constantFrom(...CRITERIA), expr).map(([a, c, b]) => `${a} ${c} ${b}`),
  fc
    .tuple(name, fc.array(name, { minLength: 1, maxLength: 3 }), expr)
    .map(([f, params, body]) => `${f}(${params.join(', ')}) = ${body}`),
  fc.tuple(name, expr, unit).map(([n, e, u]) => `${n} = ${e} to ${u}`),
  fc.constantFrom('# a comment', '', '   ', 'x =', '= 3', 'to m', '1 +', '((', ')', '"unclosed', "'", '\\', '@', '$x$'),
);
const calcSource = fc.array(statement, { minLength: 1, maxLength: 6 }).map((lines) => lines.join('\n'));
const anySource = fc.oneof(
  calcSource,
  fc.string({ maxLength: 300, unit: 'binary' }),
  fc.string({ maxLength: 300, unit: 'grapheme' }),
);
const cellsArb = fc
  .array(fc.tuple(fc.constantFrom<'calc' | 'text'>('calc', 'calc', 'calc', 'text'), anySource), {
    minLength: 1,
    maxLength: 4,
  })
  .map((cs): CellInput[] => cs.map(([kind, source], i) => ({ id: `c${i + 1}`, kind, source })));

// A sheet that touches constants, prefixed and derived units, conversions, the library and a criterion.
const REFERENCE: CellInput[] = [
  {
    id: 'r1',
    kind: 'calc',
    source: 'T_kin = 250 MeV\nBrho = magneticRigidity(momentumFromKinetic(T_kin, m_p), q_e) to T*m\nBrho < 3 T*m',
  },
  {
    id: 'r2',
    kind: 'calc',
    source: 'E_0 = m_p * c^2 to MeV\ngam = lorentzFactor(speedFromKinetic(T_kin, m_p))\nv_c = c to km/s',
  },
  {
    id: 'r3',
    kind: 'calc',
    source:
      'L = 1 ft to m\ndT = 10 degC to K\nq = q_e to C\nh = h_P * 1 Hz to eV\nm_ratio = m_p / m_e\ng = g_n to m/s^2\nx = 1 MeV to J',
  },
];
const comparable = (r: SheetResult) => JSON.stringify({ ...r, evaluatedCells: 0 });

function expectWellFormed(cells: CellInput[], r: SheetResult) {
  expect(r.cells.map((c) => c.id)).toEqual(cells.map((c) => c.id));
  for (const cell of r.cells) {
    expect(cell.error === null || typeof cell.error === 'string').toBe(true);
    expect(cell.ok).toBe(cell.error === null);
    for (const st of cell.statements) {
      expect(st.error === null || typeof st.error === 'string').toBe(true);
      expect(typeof st.tex).toBe('string');
    }
  }
  expect(r.ok).toBe(r.cells.every((c) => c.ok));
}

describe('calculation source (common practice: the engine is total over its input)', () => {
  const engine = createSheetEngine();
  const constantsBefore = JSON.stringify(CONSTANTS);
  const referenceBefore = comparable(engine.evaluate(REFERENCE, { significantFigures: 6 }));

  it('the reference sheet evaluates without errors (so that comparing it means something)', () => {
    const r = engine.evaluate(REFERENCE, { significantFigures: 6 });
    expect(r.ok).toBe(true);
    // CODATA 2022: m_p c^2 = 938.272 089 43 MeV.
    expect(r.cells[1].statements[0].value?.number).toBeCloseTo(938.27208943, 6);
  });

  it('answers grammar-like statements and arbitrary text with one result per cell and errors as strings', () => {
    fc.assert(
      fc.property(cellsArb, fc.integer({ min: 2, max: 15 }), (cells, significantFigures) => {
        let r: SheetResult | undefined;
        const error = thrown(() => (r = engine.evaluate(cells, { significantFigures })));
        if (error) throw new Error(`evaluate threw: ${String(error)}`);
        expectWellFormed(cells, r!);
      }),
      { numRuns: 300 },
    );
  });

  it('changes no unit and no constant: the reference sheet gives the same results after all of that', () => {
    engine.clearCache();
    expect(comparable(engine.evaluate(REFERENCE, { significantFigures: 6 }))).toBe(referenceBefore);
    expect(comparable(createSheetEngine().evaluate(REFERENCE, { significantFigures: 6 }))).toBe(referenceBefore);
    expect(JSON.stringify(CONSTANTS)).toBe(constantsBefore);
  });

  it(
    'keeps the sandboxed evaluator answering after deep nesting, huge exponents and long strings',
    { timeout: 60_000 },
    async () => {
      const evaluator = getEvaluator();
      const healthy = async () => {
        const r = await evaluator.evaluate(
          [{ id: 'h1', kind: 'calc', source: `x_h = ${Math.random().toFixed(6)} m\ny_h = x_h * 2 to cm` }],
          { significantFigures: 6 },
        );
        expect(r.ok).toBe(true);
        expect(r.cells[0].statements[1].value?.unit).toBe('cm');
      };
      const nested = (depth: number, open = '(', close = ')') => `${open.repeat(depth)}1${close.repeat(depth)}`;
      const longLine = 'a'.repeat(LIMITS.maxLineChars - 10);
      const hostile = [
        `x = ${nested(990)}`,
        `x = ${nested(600, '[', ']')}`,
        `x = ${nested(400, 'sqrt(', ')')}`,
        Array.from({ length: 9 }, () => `y = ${nested(220)}`).join('\n'),
        'x = 10^10^10^10^10',
        'x = 1e308 MeV * 1e308 * 1e308',
        'x = 2^1e308 m to km',
        'x = factorial(1e6)',
        'x = gamma(171.7)',
        'x = ones(1000, 1001)',
        'x = range(0, 1e12)',
        `s = "${longLine}"`,
        `s = "${'b'.repeat(LIMITS.maxCellSourceChars + 5)}"`,
        Array.from({ length: 9 }, (_, i) => `s_${i} = "${'c'.repeat(1900)}"`).join('\n'),
        'f(n) = f(n + 1)\ny = f(1)',
        'f(n) = n > 0 ? f(n - 1) + f(n - 1) : 0\ny = f(60)',
        'x = "\u202e\u0000\ud800"',
        `x = ${'1 + '.repeat(480)}1`,
      ];
      await healthy();
      for (const source of hostile) {
        const cells: CellInput[] = [{ id: 'z1', kind: 'calc', source }];
        const r = await evaluator.evaluate(cells, { significantFigures: 6 });
        expectWellFormed(cells, r);
        await healthy();
      }
      // And fast-check's own nesting of brackets, operators and exponents, a few at a time.
      await fc.assert(
        fc.asyncProperty(
          fc.array(
            fc.tuple(
              fc.constantFrom('(', '[', 'sqrt(', '-', '2^', '10^', 'lorentzFactor(', '{'),
              fc.integer({ min: 1, max: 300 }),
            ),
            { minLength: 1, maxLength: 3 },
          ),
          async (parts) => {
            const source = `x = ${parts.map(([p, n]) => p.repeat(n)).join('')}1e300${')'.repeat(200)}`.slice(
              0,
              LIMITS.maxLineChars + 50,
            );
            const cells: CellInput[] = [{ id: 'z2', kind: 'calc', source }];
            expectWellFormed(cells, await evaluator.evaluate(cells, { significantFigures: 6 }));
          },
        ),
        { numRuns: 25 },
      );
      await healthy();
    },
  );
});

// ── 2. Sheet files for import ──────────────────────────────────────────────────────────────

const VALID_FILE = {
  title: 'Gantry dipole rigidity',
  significantFigures: 6,
  safetyRelated: true,
  cells: [
    {
      id: 'c1',
      kind: 'calc',
      source: 'T_kin = 250 MeV\nBrho = magneticRigidity(momentumFromKinetic(T_kin, m_p), q_e) to T*m',
    },
    { id: 'c2', kind: 'text', source: '# Result\n\nBρ is *under* 3 T·m.' },
  ],
  record: { objective: 'Bρ of the dipoles', inputs: [], assumptions: [], method: '', references: [], conclusions: '' },
  exportedFrom: { sheet: 'TPT2-CALC-0001', version: 3, sha256: 'a'.repeat(64) },
};

const nasty = fc.oneof(
  fc.jsonValue({ maxDepth: 3 }),
  fc.constantFrom(
    '',
    ' ',
    '\u0000',
    'a\u0000b',
    '\ud800',
    '\udfff x',
    '\u202e',
    'x'.repeat(301),
    'c1',
    'C1',
    '-a',
    'a'.repeat(41),
    1.5,
    -1,
    0,
    16,
    Number.POSITIVE_INFINITY, // 1e309 overflows to Infinity
    null,
    true,
    [],
    {},
    { __proto__: { polluted: true } },
  ),
  fc.string({ maxLength: 40, unit: 'binary' }),
);
const FILE_PATHS: Array<Array<string | number>> = [
  [],
  ['title'],
  ['significantFigures'],
  ['safetyRelated'],
  ['cells'],
  ['cells', 0],
  ['cells', 0, 'id'],
  ['cells', 0, 'kind'],
  ['cells', 0, 'source'],
  ['cells', 1, 'id'],
  ['cells', 1],
  ['record'],
  ['record', 'objective'],
  ['record', 'inputs'],
  ['exportedFrom'],
  ['__proto__'],
  ['constructor'],
  ['cells', 5],
];

type Mutation = { path: Array<string | number>; op: 'set' | 'delete' | 'duplicate'; value: unknown };
const mutation: fc.Arbitrary<Mutation> = fc.record({
  path: fc.constantFrom(...FILE_PATHS),
  op: fc.constantFrom('set', 'set', 'delete', 'duplicate'),
  value: nasty,
});

function mutate(file: unknown, mutations: Mutation[]): unknown {
  let root = structuredClone(file) as Record<string | number, unknown>;
  for (const m of mutations) {
    if (m.path.length === 0) {
      if (m.op === 'set') root = m.value as Record<string, unknown>;
      continue;
    }
    let target = root as Record<string | number, unknown> | null;
    for (const key of m.path.slice(0, -1)) {
      const next = target && typeof target === 'object' ? target[key] : undefined;
      target = next && typeof next === 'object' ? (next as Record<string | number, unknown>) : null;
    }
    if (!target || typeof target !== 'object') continue;
    const last = m.path[m.path.length - 1];
    // defineProperty, so that "__proto__" becomes an own key as JSON.parse would make it.
    if (m.op === 'set')
      Object.defineProperty(target, last, { value: m.value, enumerable: true, writable: true, configurable: true });
    else if (m.op === 'delete') delete target[last];
    else if (Array.isArray(target) && typeof last === 'number' && target[last] !== undefined)
      target.push(structuredClone(target[last]));
  }
  return root;
}

const mutatedFileText = fc
  .tuple(fc.array(mutation, { minLength: 1, maxLength: 4 }), fc.boolean())
  .map(([ms, pretty]) => JSON.stringify(mutate(VALID_FILE, ms), null, pretty ? 2 : undefined) ?? 'undefined');
const anyFileText = fc.oneof(
  mutatedFileText,
  fc.jsonValue().map((v) => JSON.stringify(v)),
  fc.string({ maxLength: 200, unit: 'binary' }),
  fc.constantFrom(
    '{"title": "x", "cells": [], "__proto__": {"polluted": 1}}',
    '{"title": "x", "cells": [{"kind": "calc", "source": "x = 1", "constructor": {"prototype": {"polluted": 1}}}]}',
    '[]',
    'null',
    '{',
    '\ufeff{"title":"x","cells":[]}',
  ),
);

describe('sheet files for import (common practice: a parser answers with a value or its own refusal)', () => {
  it('parses a sheet file or refuses it with a SheetFileError (a 400 on import), never anything else', () => {
    fc.assert(
      fc.property(anyFileText, (text) => {
        let parsed: unknown;
        const error = thrown(() => (parsed = parseSheetFile(text)));
        if (error !== null) {
          if (!(error instanceof SheetFileError)) throw new Error(`parseSheetFile threw ${String(error)}`);
          return;
        }
        expect(sheetFileSchema.safeParse(parsed).success).toBe(true);
        expect(({} as Record<string, unknown>).polluted).toBeUndefined();
      }),
      { numRuns: 300 },
    );
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  it(
    'imports a mutated sheet file into a new sheet, or refuses it with AppError 400',
    { timeout: 90_000 },
    async () => {
      const db = testDb();
      const author = await makeUser(db, 'author@example.test');
      const projectId = await makeProject(db, 'IMP', [[author, 'originator']]);
      const project = { id: projectId, code: 'IMP' };
      const outcomes = { imported: 0, refused: 0, refusedByDatabase: 0 };
      const sheetCount = async () =>
        Number(
          (
            await db
              .selectFrom('sheets')
              .select((eb) => eb.fn.countAll().as('n'))
              .executeTakeFirstOrThrow()
          ).n,
        );
      await fc.assert(
        fc.asyncProperty(
          fc.oneof(
            mutatedFileText,
            mutatedFileText,
            fc.jsonValue({ maxDepth: 2 }).map((v) => JSON.stringify(v)),
          ),
          async (text) => {
            const before = await sheetCount();
            try {
              const sheet = await importSheetFile(db, author, project, text);
              expect(sheet.version).toBe(2);
              outcomes.imported++;
            } catch (error) {
              // Text PostgreSQL cannot store (U+0000) is refused by the database; the route handler's
              // errorResponse answers it with 400 like the refusals of the parser.
              if (isUnstorableTextError(error)) outcomes.refusedByDatabase++;
              else expectBadRequest(error);
              expect(errorResponse(error).status).toBe(400);
              // A refused import leaves no sheet behind.
              expect(await sheetCount()).toBe(before);
              outcomes.refused++;
            }
          },
        ),
        {
          numRuns: 60,
          // Text PostgreSQL cannot store, in each place a file puts text.
          examples: [
            [JSON.stringify({ ...VALID_FILE, title: 'Rigidity\u0000' })],
            [JSON.stringify({ ...VALID_FILE, cells: [{ kind: 'calc', source: 'x = 1 m # \u0000' }] })],
            [JSON.stringify({ ...VALID_FILE, cells: [{ kind: 'text', source: 'half a pair \ud800' }] })],
            [JSON.stringify({ ...VALID_FILE, title: 'half a pair \udc00' })],
            [JSON.stringify({ ...VALID_FILE, record: { ...VALID_FILE.record, objective: '\u0000' } })],
          ],
        },
      );
      // Both paths were taken.
      expect(outcomes.imported).toBeGreaterThan(0);
      expect(outcomes.refused).toBeGreaterThan(0);
    },
  );
});

// ── 3. API bodies and query parameters ─────────────────────────────────────────────────────

/** Objects with the schema's own keys (so the fuzz gets past "unknown shape") holding anything. */
function shaped(schema: ZodType): fc.Arbitrary<unknown> {
  const shape = (schema as unknown as { shape?: Record<string, unknown> }).shape;
  if (!shape || typeof shape !== 'object') return fc.jsonValue({ maxDepth: 3 });
  const keys = Object.keys(shape);
  return fc.dictionary(fc.constantFrom(...keys, '__proto__', 'extra'), fc.oneof(fc.jsonValue({ maxDepth: 3 }), nasty), {
    maxKeys: keys.length + 2,
  });
}

function expectParsedOrBadRequest(value: unknown, schema: ZodType) {
  const error = thrown(() => parseValue(value, schema));
  if (error instanceof ZodError) throw new Error('parseValue let a ZodError through');
  expectBadRequest(error);
}

describe('API bodies and query parameters (common practice: validation answers 400, never 500)', () => {
  const bodies = OPERATIONS.filter((op) => op.body && op.body.schema !== 'binary').map((op) => ({
    id: op.operationId,
    schema: op.body!.schema as ZodType,
  }));
  const queries = OPERATIONS.filter((op) => op.query).map((op) => ({
    id: op.operationId,
    schema: op.query! as ZodType,
  }));
  const params = OPERATIONS.flatMap((op) =>
    Object.entries(op.params ?? {}).map(([p, spec]) => ({ id: `${op.operationId}.${p}`, schema: spec.schema })),
  );

  it('has schemas to fuzz', () => {
    expect(bodies.length).toBeGreaterThan(15);
    expect(queries.length).toBeGreaterThan(4);
  });

  it('answers arbitrary JSON bodies, shaped or not, with a value or AppError 400', () => {
    for (const { id, schema } of bodies) {
      fc.assert(
        fc.property(
          fc.oneof(
            fc.jsonValue({ maxDepth: 4 }),
            shaped(schema),
            fc.json().map((t) => JSON.parse(t) as unknown),
          ),
          (value) => expectParsedOrBadRequest(value, schema),
        ),
        { numRuns: 120, seed: hashSeed(id) },
      );
    }
  });

  it('answers arbitrary query strings (records of strings) and path parameters with a value or AppError 400', () => {
    const text = fc.oneof(
      fc.string({ maxLength: 30 }),
      fc.string({ maxLength: 30, unit: 'binary' }),
      fc.constantFrom('', '0', '-1', '1e400', 'NaN', 'Infinity', '0x10', '9'.repeat(30), 'true', '1,2', '../', '%00'),
    );
    for (const { id, schema } of queries) {
      const shape = Object.keys((schema as unknown as { shape: Record<string, unknown> }).shape);
      fc.assert(
        fc.property(
          fc.dictionary(fc.oneof(fc.constantFrom(...shape), fc.string({ maxLength: 8 })), text, {
            maxKeys: shape.length + 2,
          }),
          (query) => expectParsedOrBadRequest(query, schema),
        ),
        { numRuns: 150, seed: hashSeed(id) },
      );
    }
    for (const { id, schema } of params) {
      fc.assert(
        fc.property(text, (value) => expectParsedOrBadRequest(value, schema)),
        { numRuns: 60, seed: hashSeed(id) },
      );
    }
  });
});

describe('text the database cannot store (common practice: refuse at the door, not half way through a save)', () => {
  const saveBody = (source: string, message = 'edit') => ({
    parentNumber: 1,
    message,
    content: {
      schema: 1,
      title: 'T',
      safetyRelated: false,
      significantFigures: 6,
      record: { objective: '', inputs: [], assumptions: [], method: '', references: [], conclusions: '' },
      cells: [{ id: 'c1', kind: 'calc', source }],
      attachments: [],
    },
  });

  it('refuses U+0000 and half surrogate pairs anywhere in a body with a 400 naming where', () => {
    const bad = fc.constantFrom('\u0000', '\ud800', '\udbff', '\udc00', '\udfff');
    fc.assert(
      fc.property(
        fc.string({ maxLength: 20 }),
        bad,
        fc.string({ maxLength: 20 }),
        fc.boolean(),
        (before, char, after, inMessage) => {
          const text = before + char + after;
          const body = inMessage ? saveBody('x = 1', text) : saveBody(text);
          const error = thrown(() => parseValue(body, saveVersionSchema));
          expect(error).toBeInstanceOf(AppError);
          expect((error as AppError).status).toBe(400);
          expect((error as AppError).message).toMatch(inMessage ? /^message: / : /^content\.cells\.0\.source: /);
        },
      ),
      { numRuns: 100 },
    );
    // A whole surrogate pair is a character like any other.
    expect(parseValue(saveBody('x = 1 # \u{1d49c}'), saveVersionSchema).content.cells[0].source).toBe(
      'x = 1 # \u{1d49c}',
    );
  });

  it('answers 400, with nothing written, when such text reaches the database another way', async () => {
    const db = testDb();
    const author = await makeUser(db, 'author@example.test');
    const projectId = await makeProject(db, 'NUL', [[author, 'originator']]);
    const created = await createSheet(
      db,
      author,
      { id: projectId, code: 'NUL' },
      { title: 'Nul', safetyRelated: false, objective: '' },
    );
    const sheet = { id: created.id, project_id: projectId };
    const v1 = (await getVersion(db, sheet.id, 1))!;
    for (const input of [
      { message: 'edit\u0000', source: 'x = 1' },
      { message: 'edit', source: 'x = 1 # \u0000' },
    ]) {
      let error: unknown = null;
      try {
        await saveVersion(db, author, sheet, {
          parentNumber: 1,
          message: input.message,
          content: { ...v1.content, cells: [{ id: 'c1', kind: 'calc', source: input.source }] },
        });
      } catch (e) {
        error = e;
      }
      expect(isUnstorableTextError(error)).toBe(true);
      expect(errorResponse(error).status).toBe(400);
    }
    expect(
      (await db.selectFrom('versions').select('number').where('sheet_id', '=', sheet.id).execute()).map(
        (v) => v.number,
      ),
    ).toEqual([1]);
  });
});

/** A fixed seed per schema, so a failure names a reproducible run. */
function hashSeed(text: string): number {
  let h = 2166136261;
  for (let i = 0; i < text.length; i++) h = Math.imul(h ^ text.charCodeAt(i), 16777619);
  return h | 0;
}

// ── 4. Markdown with script ────────────────────────────────────────────────────────────────

const PAYLOADS = [
  '<script>alert(1)</script>',
  '<SCRIPT SRC=//x.test/x.js></SCRIPT>',
  '<scr<script>ipt>alert(1)</script>',
  '<img src=x onerror=alert(1)>',
  '<img src="x" onerror="alert(1)">',
  '<svg onload=alert(1)>',
  '<svg><script>alert(1)</script></svg>',
  '<iframe src="javascript:alert(1)"></iframe>',
  '<iframe srcdoc="<script>alert(1)</script>">',
  '<a href="javascript:alert(1)">x</a>',
  '[x](javascript:alert(1))',
  '[x](JaVaScRiPt:alert(1))',
  '[x](&#106;avascript:alert(1))',
  '[x](java\tscript:alert(1))',
  '[x](javascript&colon;alert(1))',
  '[x](data:text/html;base64,PHNjcmlwdD5hbGVydCgxKTwvc2NyaXB0Pg==)',
  '[x](vbscript:msgbox(1))',
  '![x" onerror="alert(1)](javascript:alert(1))',
  '<div style="background:url(javascript:alert(1))">',
  '<span style="x:expression(alert(1))">',
  '<p onmouseover=alert(1)>',
  '<body onload=alert(1)>',
  '<math><mtext><script>alert(1)</script></mtext></math>',
  '<object data="x.swf">',
  '<embed src="x">',
  '<meta http-equiv="refresh" content="0;url=javascript:alert(1)">',
  '&lt;script&gt;alert(1)&lt;/script&gt;',
  '&#60;script&#62;',
  '$\\href{javascript:alert(1)}{x}$',
  '$\\url{javascript:alert(1)}$',
  '$\\htmlStyle{background:url(x)}{x}$',
  '$\\htmlData{onerror=alert(1)}{x}$',
  '$\\includegraphics{x.png}$',
  '$$\\color{red" onmouseover="alert(1)}{x}$$',
  '$\\text{<img src=x onerror=alert(1)>}$',
  '<https://example.org/"onmouseover="alert(1)>',
  'https://example.org/<script>',
  '`<script>`',
  '```\n<script>alert(1)</script>\n```',
  '| a | b |\n| --- | --- |\n| <img src=x onerror=alert(1)> | x |',
];
const FRAGMENTS = [
  '\n',
  '\n\n',
  ' ',
  '[',
  ']',
  '(',
  ')',
  '<',
  '>',
  '"',
  "'",
  '`',
  '$',
  '$$',
  '\\',
  '*',
  '_',
  '#',
  '> ',
  '- ',
  '1. ',
  '&',
  '&#',
  ';',
  '=',
  'on',
  'error',
  'javascript',
  ':',
  'script',
  'http://',
  'mailto:',
];
const markdownSource = fc
  .array(
    fc.oneof(
      fc.constantFrom(...PAYLOADS),
      fc.constantFrom(...FRAGMENTS),
      fc.string({ maxLength: 20 }),
      fc.string({ maxLength: 10, unit: 'binary' }),
    ),
    { minLength: 1, maxLength: 25 },
  )
  .map((parts) => parts.join(''));

/** Decodes the character references an HTML parser would decode in an attribute value. */
function decodeEntities(value: string): string {
  return value
    .replace(/&#x([0-9a-f]+);?/gi, (_, h: string) => String.fromCodePoint(Math.min(parseInt(h, 16), 0x10ffff)))
    .replace(/&#(\d+);?/g, (_, d: string) => String.fromCodePoint(Math.min(Number(d), 0x10ffff)))
    .replace(/&colon;/gi, ':')
    .replace(/&tab;/gi, '\t')
    .replace(/&newline;/gi, '\n')
    .replace(/&quot;/g, '"')
    .replace(/&apos;/g, "'")
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&amp;/g, '&');
}

const TAG = /<(\/?)([a-zA-Z][a-zA-Z0-9:-]*)((?:\s+[^\s=/>]+(?:\s*=\s*(?:"[^"]*"|'[^']*'|[^\s>"']+))?)*)\s*(\/?)>/g;
const ATTRIBUTE = /([^\s=/>]+)(?:\s*=\s*(?:"([^"]*)"|'([^']*)'|([^\s>"']+)))?/g;
const FORBIDDEN_TAGS = new Set([
  'script',
  'iframe',
  'frame',
  'frameset',
  'object',
  'embed',
  'style',
  'img',
  'image',
  'link',
  'meta',
  'base',
  'form',
  'input',
  'button',
  'video',
  'audio',
  'source',
  'foreignobject',
  'use',
  'animate',
  'set',
  'template',
  'body',
  'html',
]);
const URL_ATTRIBUTES = new Set([
  'href',
  'src',
  'srcset',
  'action',
  'formaction',
  'xlink:href',
  'data',
  'poster',
  'background',
]);

/** Tokenises the output's tags and attributes and returns what would act in a browser. */
function activeMarkup(html: string): string[] {
  const problems: string[] = [];
  if (/<script/i.test(html)) problems.push('<script');
  for (const tag of html.matchAll(TAG)) {
    const tagName = tag[2].toLowerCase();
    if (FORBIDDEN_TAGS.has(tagName)) problems.push(`element <${tagName}>`);
    for (const attr of (tag[3] ?? '').matchAll(ATTRIBUTE)) {
      const attrName = attr[1].toLowerCase();
      const value = decodeEntities(attr[2] ?? attr[3] ?? attr[4] ?? '');
      if (/^on/.test(attrName)) problems.push(`event handler ${attrName} on <${tagName}>`);
      // Browsers drop ASCII tab and newline anywhere in a URL and leading spaces and controls (WHATWG URL).
      const url = value.replace(/[\t\n\r]/g, '').replace(/^[\u0000-\u0020]+/, ''); // eslint-disable-line no-control-regex -- C0 controls are what browsers strip;
      if (URL_ATTRIBUTES.has(attrName) && !/^(?:https?:\/\/|mailto:)/i.test(url))
        problems.push(`${attrName}="${value}" on <${tagName}>`);
      if (/^(?:javascript|vbscript|data):/i.test(url)) problems.push(`script URL in ${attrName}`);
      if (attrName === 'style' && /url\s*\(|expression\s*\(|javascript:|@import|behavior\s*:/i.test(value))
        problems.push(`style ${value}`);
    }
  }
  // Every `<` left outside a tag the tokenizer read would be a tag a browser might read differently.
  if (html.replace(TAG, '').includes('<')) problems.push('a stray "<" outside the tags');
  return problems;
}

describe('Markdown with script (OWASP Cross Site Scripting Prevention Cheat Sheet: no script, no handlers, no script URLs)', () => {
  it('the checker sees script where there is script', () => {
    expect(activeMarkup('<p><img src=x onerror=alert(1)></p>')).toEqual(
      expect.arrayContaining(['element <img>', 'event handler onerror on <img>']),
    );
    expect(activeMarkup('<a href="&#106;avascript:alert(1)">x</a>')).toContain('script URL in href');
    expect(activeMarkup('<a href="java&#x09;script:x">x</a>')).toContain('script URL in href');
    expect(activeMarkup('<span style="background:url(x)">')).toHaveLength(1);
    expect(activeMarkup('<p>a &lt;script&gt; b</p>')).toEqual([]);
  });

  it('renders payloads mixed with arbitrary text to HTML with no script, handler, script URL or frame', () => {
    fc.assert(
      fc.property(markdownSource, (source) => {
        const html = renderMarkdown(source);
        const problems = activeMarkup(html);
        if (problems.length) throw new Error(`${problems.join('; ')}\nin ${html}`);
      }),
      { numRuns: 300 },
    );
  });
});

// ── 5. Attachment file names ───────────────────────────────────────────────────────────────

const NAME_PARTS = [
  '../',
  '..\\',
  '/',
  '\\',
  '//',
  'C:\\Windows\\',
  '/etc/',
  '\\\\server\\share\\',
  '~/',
  '.',
  '..',
  ' ',
  '\u0000',
  '\u0001',
  '\u001f',
  '\u007f',
  '\u0085',
  '\u009f',
  '\u202e',
  '\u202d',
  '\u2066',
  '\u200f',
  '\ufeff',
  '\t',
  '\n',
  '\r',
  '%2e%2e%2f',
  '%00',
  'passwd',
  'CON',
  'évaluation',
  'e\u0301',
  '𝒜𝒷',
  '日本語',
  '<script>',
  '"',
  "'",
  ':',
  '*',
  '?',
  '|',
  '.pdf',
  '.csv',
  '.PNG',
  '.jpeg',
  '.JPG',
  '.exe',
  '.pdf.exe',
  'fdp.exe',
  '.',
  '_',
  '-',
];
const fileName = fc.oneof(
  fc
    .array(
      fc.oneof(
        fc.constantFrom(...NAME_PARTS),
        fc.string({ maxLength: 12 }),
        fc.string({ maxLength: 6, unit: 'binary' }),
      ),
      { maxLength: 20 },
    )
    .map((p) => p.join('')),
  fc
    .tuple(
      fc.constantFrom('', '../', '/', 'C:\\'),
      fc.string({ minLength: 100, maxLength: 400, unit: 'grapheme' }),
      fc.constantFrom('', '.pdf', '.csv', '.png', '.jpg', '.exe'),
    )
    .map(([a, b, c]) => a + b + c),
  fc.string({ maxLength: 200, unit: 'binary' }),
);
const kindArb = fc.constantFrom<AttachmentKind>('pdf', 'png', 'jpeg', 'csv');

describe('attachment file names (OWASP Path Traversal; OWASP File Upload Cheat Sheet: filename sanitisation)', () => {
  it("keeps no folder, control or bidirectional character, no leading dot, the kind's extension, at most 120 characters", () => {
    fc.assert(
      fc.property(fileName, kindArb, (raw, kind) => {
        const name = sanitizeFileName(raw, kind);
        expect(name).not.toMatch(/[/\\]/);
        // eslint-disable-next-line no-control-regex
        expect(name).not.toMatch(/[\u0000-\u001f\u007f-\u009f]/);
        // Bidirectional overrides and isolates disguise an extension ("invoice\u202Efdp.exe").
        expect(name).not.toMatch(/[\u200e\u200f\u202a-\u202e\u2066-\u2069\ufeff]/);
        expect(name.startsWith('.')).toBe(false);
        expect(name).not.toMatch(/^\s/);
        expect(ATTACHMENT_KINDS[kind].extensions.some((ext) => name.endsWith(`.${ext}`))).toBe(true);
        expect([...name].length).toBeLessThanOrEqual(120);
        expect(name).not.toMatch(/^\.\.?$/);
        // Idempotent: a stored name sanitises to itself.
        expect(sanitizeFileName(name, kind)).toBe(name);
      }),
      // The first counterexample found: cut to length, the stem ended in " ." ("xx…x ..pdf").
      { numRuns: 300, examples: [[`${'x'.repeat(114)} .yyy.pdf`, 'pdf']] },
    );
  });
});

// ── 6. Bidirectional control characters (UAX #9; CVE-2021-42574, "Trojan Source") ─────────

const BIDI = [
  '\u061c',
  '\u200e',
  '\u200f',
  '\u202a',
  '\u202b',
  '\u202c',
  '\u202d',
  '\u202e',
  '\u2066',
  '\u2067',
  '\u2068',
  '\u2069',
];
const BIDI_ANY = /[\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/;
const withBidi = fc
  .array(
    fc.oneof(
      fc.constantFrom(
        ...BIDI,
        '#',
        '\n',
        '$',
        '**',
        '`',
        '[a](https://x.test/',
        ')',
        ' ',
        'x = 1',
        '⟦U+202E⟧',
        'שלום',
        'مرحبا',
      ),
      fc.string({ maxLength: 8 }),
    ),
    { maxLength: 24 },
  )
  .map((p) => p.join(''));

describe('bidirectional control characters (UAX #9; CVE-2021-42574): refused in calculation sources, shown everywhere else', () => {
  it('a calculation source is refused (400, naming the cell and the code point) exactly when it holds one; a text cell never is', () => {
    fc.assert(
      fc.property(withBidi, withBidi, (calc, text) => {
        const body = {
          parentNumber: 1,
          message: 'm',
          content: {
            schema: 1,
            title: 't',
            safetyRelated: false,
            significantFigures: 6,
            record: { objective: '', inputs: [], assumptions: [], method: '', references: [], conclusions: '' },
            cells: [
              { id: 't1', kind: 'text', source: text },
              { id: 'c2', kind: 'calc', source: calc },
            ],
            attachments: [],
          },
        };
        let refusal: AppError | null = null;
        try {
          parseValue(body, saveVersionSchema);
        } catch (error) {
          if (!(error instanceof AppError)) throw error;
          refusal = error;
        }
        if (BIDI_ANY.test(calc)) {
          expect(refusal?.status).toBe(400);
          expect(refusal?.message).toMatch(
            /^content\.cells\.1\.source: cell 2: holds U\+(061C|200E|200F|202[A-E]|206[6-9]) \([A-Z -]+\) on line \d+, /,
          );
        } else {
          expect(refusal).toBeNull();
        }
      }),
      { numRuns: 300 },
    );
  });

  it('text shown as Markdown holds none of them outside attributes; each becomes a marker', () => {
    fc.assert(
      fc.property(withBidi, (source) => {
        const html = renderMarkdown(source);
        expect(html.replace(/="[^"]*"/g, '')).not.toMatch(BIDI_ANY);
      }),
      { numRuns: 300 },
    );
  });
});

describe('path parameters (common practice: an id that names nothing is a 404, never a 500)', () => {
  const uuidLike = fc.oneof(
    fc.uuid(),
    fc.stringMatching(/^[0-9a-fA-F-]{36}$/),
    fc.constantFrom(
      '-'.repeat(36),
      '0'.repeat(36),
      '00000000-0000-0000-0000-000000000000',
      'ffffffff-ffff-ffff-ffff-ffffffffffff',
      '%00',
      '../',
      '',
    ),
  );
  const numberLike = fc.oneof(
    fc.nat().map(String),
    fc.bigInt({ min: 0n, max: 10n ** 30n }).map(String),
    fc.constantFrom('2147483647', '2147483648', '-0', '+1', '1e3', '0x1F', ' 1', '1.5'),
  );
  const anyText = fc.oneof(
    uuidLike,
    numberLike,
    fc.string({ maxLength: 40 }),
    fc.string({ maxLength: 40, unit: 'binary' }),
  );

  it('parses every segment to a UUID, a project code or an integer within int4, or answers 404 naming what does not exist', async () => {
    for (const name of Object.keys(PATH_PARAMS) as PathParamName[]) {
      await fc.assert(
        fc.asyncProperty(anyText, async (value) => {
          try {
            const parsed = (await routeParams({ [name]: value }))[name] as unknown;
            if (typeof parsed === 'number')
              expect(Number.isInteger(parsed) && parsed >= 0 && parsed <= INT4_MAX).toBe(true);
            else expect(parsed).toBe(value);
          } catch (error) {
            if (!(error instanceof AppError)) throw error;
            expect(error.status).toBe(404);
          }
        }),
        { numRuns: 150, seed: hashSeed(name) },
      );
    }
  });

  it('answers PostgreSQL’s refusal of a malformed or out-of-range value (22P02, 22003) with 400, not 500', async () => {
    for (const code of ['22P02', '22003']) {
      const response = errorResponse(
        Object.assign(new Error('invalid input syntax for type uuid: "------------------------------------"'), {
          code,
        }),
      );
      expect(response.status).toBe(400);
      expect(JSON.stringify(await response.json())).not.toContain('invalid input syntax');
    }
  });
});
