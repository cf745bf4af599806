// Functions of engineering studies that are not relativistic kernels: value lists for sweeps and
// plots (`steps`, `points`), and the names the engine treats as statements or markers of their own
// (`uncertain`, `sweep`, `plot`, `dataPoints`, `spacetime`, `fromRevision`). Registered with mathjs
// so that a sheet cannot redefine them and the editor knows them; the engine evaluates the statement
// forms itself, and these bodies only answer when one is used where it has no meaning.
import type { MathJsInstance, Unit } from 'mathjs';
import type { LibraryBinding } from './math-instance';

/** Longest list `steps` and `points` make: a sweep or a plot evaluates its model once per value. */
const MAX_STUDY_VALUES = 2000;

export const STUDY_STATEMENTS = ['sweep', 'plot', 'spacetime'] as const;
export type StudyStatement = (typeof STUDY_STATEMENTS)[number];

export interface StudyFunctionDoc {
  name: string;
  signature: string;
  summary: string;
  example: string;
}

/** Reference entries for the in-app function reference. */
export const STUDY_FUNCTION_DOCS: readonly StudyFunctionDoc[] = [
  {
    name: 'steps',
    signature: 'steps(from, to, step)',
    summary:
      'The list from, from + step, … up to and including to (when to falls on a step); all of one dimension. At most 2000 values.',
    example: 'T_list = steps(70 MeV, 250 MeV, 20 MeV)',
  },
  {
    name: 'points',
    signature: 'points(from, to, n)',
    summary: 'n evenly spaced values from from to to, both included (2 ≤ n ≤ 2000).',
    example: 't_list = points(0 yr, 3 yr, 61)',
  },
  {
    name: '±',
    signature: 'x = value ± u',
    summary:
      'An input with its standard uncertainty u (k = 1), same dimension as the value; also written value +/- u or uncertain(value, u). Results that depend on it carry the combined standard uncertainty (JCGM 100:2008, law of propagation of uncertainty), a budget, and y ± U with k = 2. Inputs are taken as uncorrelated.',
    example: 'T_kin = 250 MeV ± 0.5 MeV',
  },
  {
    name: 'correlation',
    signature: 'correlation(x, y, r)',
    summary:
      'The correlation coefficient r (a number from −1 to 1) between two inputs that carry a standard uncertainty, for example two readings from one calibration; a statement of its own line, applied to every result of the sheet that depends on both (JCGM 100:2008, 5.2).',
    example: 'correlation(V_m, I_m, -0.36)',
  },
  {
    name: 'sweep',
    signature: 'sweep(input, values, result1, result2, …)',
    summary:
      'A table of the named results for each value of one input defined above, each row evaluated exactly as the sheet evaluates a single value. Exportable as CSV.',
    example: 'sweep(T_kin, steps(70 MeV, 250 MeV, 20 MeV), beta, gamma, p, Brho)',
  },
  {
    name: 'plot',
    signature: 'plot(input, values, result1, result2, …)',
    summary:
      "Curves of the named results (of one dimension) against one input defined above, over the values given. A named result that does not depend on the input is a design limit: a dash-dot horizontal line at exactly its value in the axis unit, labelled with its name and value; it must be of the curves' dimension. Points of an attached data table are added with dataPoints(table.x, table.y).",
    example: 'plot(T_kin, points(70 MeV, 250 MeV, 91), Brho, Brho_max)',
  },
  {
    name: 'dataPoints',
    signature: 'dataPoints(table.x, table.y)',
    summary:
      "Among the results of a plot, plot(input, values, result1, …, dataPoints(table.x, table.y)): the rows of two columns of an attached data table drawn as outlined markers without a line, named in the legend. The x column must be of the input's dimension and the y column of the curves'; both of one length and not empty. A column in the axis unit is drawn with its own numbers, another unit is converted.",
    example: 'plot(T_kin, points(70 MeV, 250 MeV, 91), Brho, dataPoints(energies.T, energies.Brho))',
  },
  {
    name: 'spacetime',
    signature: 'spacetime(t, values, x1, x2, …)',
    summary:
      'A space-time diagram: each named distance x(t) as a worldline, ct up and x across on one scale, light lines at 45°. A named length that does not depend on t is drawn as a horizon, the light line x = ct − d.',
    example: 'spacetime(t, points(0 ns, 2 ns, 81), x_e, d_h)',
  },
  {
    name: 'fromRevision',
    signature: 'fromRevision("SHEET-NUMBER", "REVISION", "name")',
    summary:
      'The result called name in the issued revision of another sheet of this project, pinned to that revision and shown with its source. When that sheet is issued again, this sheet is flagged as having a superseded input.',
    example: 'Brho_max = fromRevision("TPT2-CALC-0003", "B", "Brho")',
  },
];

export function studyBindings(math: MathJsInstance): LibraryBinding[] {
  const isQuantity = (x: unknown): x is Unit => math.isUnit(x) && (x as Unit).value !== null;
  const sameKind = (fn: string, a: unknown, b: unknown, names: [string, string]) => {
    if ((typeof a === 'number') !== (typeof b === 'number') || (isQuantity(a) && isQuantity(b) && !a.equalBase(b))) {
      throw new Error(`${fn}: ${names[0]} and ${names[1]} must be of one dimension`);
    }
    if (isQuantity(a) && (a.units as Array<{ unit: { offset: number } }>).some((u) => u.unit.offset !== 0)) {
      throw new Error(`${fn}: quantities with an offset (temperatures in °C or °F) cannot be stepped; use K`);
    }
  };
  const make = (template: unknown, value: number): unknown => {
    if (typeof template === 'number') return value;
    const u = (template as Unit).clone();
    (u as unknown as { value: number }).value = value;
    return u;
  };
  /** Numbers in the unit a quantity is written in, and quantities back from such numbers (mathjs's own conversion). */
  const ownUnit = (template: unknown) => {
    if (typeof template === 'number')
      return { number: (x: unknown) => x as number, list: (values: number[]) => math.matrix(values as never[]) };
    const t = template as Unit & { _normalize(x: number): number; _denormalize(x: number): number };
    return {
      number: (x: unknown) => t._denormalize((x as Unit).value as number),
      list: (values: number[]) => math.matrix(values.map((v) => make(template, t._normalize(v))) as never[]),
    };
  };

  const refuse = (name: string, message: string): LibraryBinding => ({
    name,
    fn: () => {
      throw new Error(message);
    },
  });

  return [
    {
      name: 'steps',
      fn: (...args: unknown[]) => {
        if (args.length !== 3) throw new Error('steps takes 3 arguments (from, to, step)');
        const [from, to, step] = args;
        sameKind('steps', from, to, ['from', 'to']);
        sameKind('steps', from, step, ['from', 'step']);
        // Stepped in the unit `from` is written in, so that 70 MeV + 2 × 20 MeV is 110 MeV as written.
        const own = ownUnit(from);
        const a = own.number(from);
        const b = own.number(to);
        const h = own.number(step);
        if (![a, b, h].every(Number.isFinite)) throw new Error('steps: from, to and step must be finite');
        if (h === 0 || Math.sign(h) !== Math.sign(b - a || h))
          throw new Error('steps: step must be non-zero and go from `from` towards `to`');
        const span = (b - a) / h;
        // The end is included when it falls on a step, to within rounding of the step count.
        const n = Math.floor(span + 1e-9 * Math.max(1, Math.abs(span))) + 1;
        if (n > MAX_STUDY_VALUES) throw new Error(`steps: ${n} values; at most ${MAX_STUDY_VALUES}`);
        return own.list(
          Array.from({ length: n }, (_, k) =>
            k === n - 1 && Math.abs(a + k * h - b) <= 1e-9 * Math.abs(h) ? b : a + k * h,
          ),
        );
      },
    },
    {
      name: 'points',
      fn: (...args: unknown[]) => {
        if (args.length !== 3) throw new Error('points takes 3 arguments (from, to, n)');
        const [from, to, count] = args;
        sameKind('points', from, to, ['from', 'to']);
        if (typeof count !== 'number' || !Number.isInteger(count) || count < 2 || count > MAX_STUDY_VALUES) {
          throw new Error(`points: n must be a whole number from 2 to ${MAX_STUDY_VALUES}`);
        }
        const own = ownUnit(from);
        const a = own.number(from);
        const b = own.number(to);
        if (!Number.isFinite(a) || !Number.isFinite(b)) throw new Error('points: from and to must be finite');
        return own.list(
          Array.from({ length: count }, (_, k) => (k === count - 1 ? b : a + ((b - a) * k) / (count - 1))),
        );
      },
    },
    refuse(
      'uncertain',
      'uncertain(value, u) gives an input its standard uncertainty: write it as the whole definition, x = 250 MeV ± 0.5 MeV',
    ),
    refuse('correlation', 'correlation(…) is a statement of its own line: correlation(x, y, r)'),
    refuse('sweep', 'sweep(…) is a statement of its own line: sweep(input, values, result1, result2, …)'),
    refuse('plot', 'plot(…) is a statement of its own line: plot(input, values, result1, …)'),
    refuse(
      'dataPoints',
      'dataPoints(table.x, table.y) overlays the rows of a data table on a plot: write it among the results of plot(input, values, result1, …)',
    ),
    refuse('spacetime', 'spacetime(…) is a statement of its own line: spacetime(t, values, x1, …)'),
    refuse(
      'fromRevision',
      'a cited result is written as the whole definition, name = fromRevision("SHEET-NUMBER", "REVISION", "name"), so that it shows with its source',
    ),
  ];
}
