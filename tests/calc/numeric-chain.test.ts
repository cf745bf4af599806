// The propagation's re-evaluation on plain SI numbers (lib/calc/numeric-chain.ts) against mathjs's own
// evaluation of the same statements: the same doubles in the same operations, so every figure of a
// first-order and of a Monte Carlo propagation is the same to the bit; and what it cannot prove
// equal, it refuses (the propagation then evaluates with mathjs as before).
import { afterEach, describe, expect, it } from 'vitest';
import { LIBRARY } from '../../lib/calc/functions';
import { bindLibrary, numericLibraryCall } from '../../lib/calc/library-adapter';
import { createEngineMath } from '../../lib/calc/math-instance';
import { compileNumeric, siNumberOf } from '../../lib/calc/numeric-chain';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { numericChainCounts, setNumericChain } from '../../lib/calc/studies';
import type { CellInput, SheetResult } from '../../lib/calc/types';

afterEach(() => setNumericChain(true));

const figures = (r: SheetResult) =>
  r.cells
    .flatMap((c) => c.statements)
    .filter((s) => s.uncertainty?.kind === 'propagated')
    .map((s) => {
      const u = s.uncertainty!;
      return {
        name: s.name,
        value: s.value?.number,
        u: u.u,
        U: u.U,
        nonLinear: u.nonLinear,
        warning: u.warning,
        budget: u.budget.map((b) => [b.sensitivity, b.contribution, b.share]),
        monteCarlo: u.monteCarlo && {
          mean: u.monteCarlo.mean,
          u: u.monteCarlo.u,
          low: u.monteCarlo.low,
          high: u.monteCarlo.high,
          outOfDomain: u.monteCarlo.outOfDomain,
          tolerance: u.monteCarlo.tolerance,
          agrees: u.monteCarlo.agrees,
        },
      };
    });

/** The figures with the numeric chain on and off, each from an engine of its own. */
function bothWays(source: string) {
  const cells: CellInput[] = [{ id: 'c1', kind: 'calc', source }];
  const options = { significantFigures: 6, monteCarlo: 'always' as const };
  setNumericChain(true);
  const before = { ...numericChainCounts };
  const fast = figures(createSheetEngine().evaluate(cells, options));
  const compiled = numericChainCounts.compiled - before.compiled;
  const refused = numericChainCounts.refused - before.refused;
  setNumericChain(false);
  const reference = figures(createSheetEngine().evaluate(cells, options));
  setNumericChain(true);
  return { fast, reference, compiled, refused };
}

describe('propagation on SI numbers', () => {
  it('gives the same bits as mathjs for the beam model of the benchmark (first order and 10 000 draws)', () => {
    const { fast, reference, compiled, refused } = bothWays(
      [
        'T_kin = 250 MeV ± 0.4 MeV',
        'beta = speedFromKinetic(T_kin, m_p) / c',
        'gamma_L = lorentzFactor(beta)',
        'p = momentumFromKinetic(T_kin, m_p)',
        'Brho = magneticRigidity(p, q_e) to T*m',
        'B_dip = Brho / (1.5 m) to T',
      ].join('\n'),
    );
    expect(fast.length).toBe(5);
    expect(fast.every((f) => f.monteCarlo !== null)).toBe(true);
    // Every statement on SI numbers: once for the first-order steps, once for the draws.
    expect([compiled, refused]).toEqual([10, 0]);
    expect(fast).toEqual(reference);
  });

  it('gives the same bits with two correlated inputs, sums, differences, a sign and plain numbers', () => {
    const { fast, reference, compiled, refused } = bothWays(
      [
        'T_a = 120 MeV ± 3 MeV',
        'm_a = 938.272 MeV ± 0.5 MeV',
        'correlation(T_a, m_a, 0.3)',
        'E_a = T_a + m_a',
        'g_a = E_a / m_a',
        'd_a = -(2 * T_a - 30 MeV) / (1 MeV)',
        'p_a = momentumFromKinetic(T_a, m_a) to MeV/c',
        'r_a = p_a / (E_a / c) - 0.5',
      ].join('\n'),
    );
    expect(fast.length).toBe(5);
    // Of both inputs: 5 statements for the first-order steps, 5 for the draws; of T_a alone (d_a):
    // the 3 statements down to d_a, twice.
    expect([compiled, refused]).toEqual([16, 0]);
    expect(fast).toEqual(reference);
  });

  it('gives the same result where it must refuse: a speed the library returned passed to the library, a power, a function of the sheet', () => {
    const { fast, reference, refused } = bothWays(
      [
        'T_b = 250 MeV ± 0.4 MeV',
        'v_b = speedFromKinetic(T_b, m_p)',
        'g_b = lorentzFactor(v_b)',
        'q_b = (T_b / (1 MeV))^2',
        'f(x) = 2 x',
        'h_b = f(T_b)',
      ].join('\n'),
    );
    expect(fast.length).toBe(4);
    expect(refused).toBeGreaterThan(0);
    expect(fast).toEqual(reference);
  });

  it('gives the same result for a temperature in degrees Celsius, which it refuses', () => {
    const { fast, reference, compiled } = bothWays(
      ['t_c = 20 degC ± 0.5 degC', 'L_c = 1 m + 1.2e-5 m / K * (t_c to K)'].join('\n'),
    );
    expect(fast.length).toBe(1);
    expect(compiled).toBe(0);
    expect(fast).toEqual(reference);
  });
});

describe('what the compilation on SI numbers refuses', () => {
  const bootstrap = createEngineMath([]);
  const em = createEngineMath(bindLibrary(bootstrap.math, LIBRARY));
  const { math } = em;
  const names = new Set(LIBRARY.map((f) => f.name));
  const kinds = new Map(LIBRARY.map((f) => [f.name, f.params.map((p) => p.kind)]));
  /**
   * Compiles `expr` with `x` (the slot 0) at `x0`; null when refused. With `known`, the statement's
   * value at the sheet's values, which its last operation is checked against.
   */
  const compiled = (expr: string, x0: unknown, extra: Record<string, unknown> = {}, known?: { value: unknown }) => {
    const base = new Map<string, unknown>([
      ...em.constants,
      ['x', x0],
      ['MeV', math.unit('MeV')],
      ['GeV', math.unit('GeV')],
      ...Object.entries(extra),
    ]);
    const slots = new Float64Array([math.isUnit(x0) ? (x0.value as number) : (x0 as number)]);
    return compileNumeric(
      {
        math,
        base,
        libraryNames: names,
        slotOf: (n) => (n === 'x' ? 0 : undefined),
        paramKinds: (f) => kinds.get(f),
      },
      em.parse(expr) as never,
      slots,
      known,
    );
  };

  it('accepts products, quotients, sums, `to` and the library, and gives what mathjs gives at other values', () => {
    const run = compiled('speedFromKinetic(x + 2 * x - x, m_p) / c', math.unit(100, 'MeV'));
    expect(run).not.toBeNull();
    for (const mev of [1, 70, 250, 1000, 12345.678]) {
      const x = math.unit(mev, 'MeV');
      const viaMathjs = em
        .parse('speedFromKinetic(x + 2 * x - x, m_p) / c')
        .compile()
        .evaluate(new Map<string, unknown>([...em.constants, ['x', x]])) as number;
      expect(run!(new Float64Array([x.value as number]))).toBe(viaMathjs);
    }
  });

  it('refuses a unit with an offset, a power, a dimensionless named unit, a function it does not know, a speed that may carry its precise companion', () => {
    expect(compiled('x to K', math.unit(20, 'degC'), { K: math.unit('K') })).toBeNull();
    expect(compiled('x ^ 2', 3)).toBeNull();
    expect(compiled('x * 2', math.unit(5, 'ppm'))).toBeNull();
    expect(compiled('sqrt(x)', 4)).toBeNull();
    expect(
      compiled('lorentzFactor(v)', 1, {
        v: (math as unknown as Record<string, (...a: unknown[]) => unknown>).speedFromKinetic(
          math.unit(250, 'MeV'),
          em.constants.get('m_p'),
        ),
      }),
    ).toBeNull();
    // A function the sheet defines under the library's name is the sheet's.
    expect(compiled('lorentzFactor(x)', 0.5, { lorentzFactor: (b: number) => b })).toBeNull();
    // The same speed passed through an operation has no companion, and is accepted.
    expect(compiled('lorentzFactor(x * 1)', math.unit(1e8, 'm/s'))).not.toBeNull();
  });

  it('checks the last operation of a statement against the sheet value of the statement instead of doing it again', () => {
    const known = (expr: string, x0: unknown, value: unknown) => compiled(expr, x0, {}, { value });
    const evaluate = (expr: string, x0: unknown) =>
      em
        .parse(expr)
        .compile()
        .evaluate(new Map<string, unknown>([...em.constants, ['x', x0], ['GeV', math.unit('GeV')]]));
    const next = (v: number) => v + Math.abs(v) * Number.EPSILON;
    const T = math.unit(250, 'MeV');
    for (const expr of ['momentumFromKinetic(x, m_p)', 'x * 2 / c', 'momentumFromKinetic(x, m_p) * c to GeV']) {
      const value = evaluate(expr, T) as { value: number; clone(): typeof value };
      // The sheet's own value: accepted, and the run gives it.
      const run = known(expr, T, value);
      expect(run, expr).not.toBeNull();
      expect(run!(new Float64Array([T.value as number]))).toBe(value.value);
      // A value one ulp off, or not a single number, is not what the statement gives: refused.
      const off = value.clone();
      off.value = next(value.value);
      expect(known(expr, T, off), expr).toBeNull();
      expect(known(expr, T, math.matrix([value.value])), expr).toBeNull();
    }
  });
});

describe('a library function on SI numbers (numericLibraryCall)', () => {
  const bootstrap = createEngineMath([]);
  const em = createEngineMath(bindLibrary(bootstrap.math, LIBRARY));
  const math = em.math as unknown as Record<string, (...a: unknown[]) => unknown> & typeof em.math;
  // Arguments of each kind, in the forms a sheet writes them (values of common practice for a proton
  // beam; only their forms matter here): SI units, the trade's units, the alternative dimension.
  const forms: Record<string, Array<() => unknown>> = {
    speed: [() => 0.6, () => math.unit(1.2e8, 'm/s')],
    mass: [() => em.constants.get('m_p'), () => math.unit(938.272, 'MeV')],
    energy: [() => math.unit(250, 'MeV'), () => math.unit(4e-11, 'J')],
    momentum: [() => math.unit(7.3e-19, 'kg m/s'), () => math.unit(729, 'MeV')],
    time: [() => math.unit(2.2, 'us')],
    length: [() => math.unit(12, 'm')],
    acceleration: [() => math.unit(9.81, 'm/s^2')],
    voltage: [() => math.unit(300, 'kV')],
    charge: [() => 1, () => math.unit(1.602176634e-19, 'C')],
    angle: [() => math.unit(0.3, 'rad'), () => 0.3],
    rigidity: [() => math.unit(2.4, 'T m')],
    'gravitational-parameter': [() => math.unit(3.986004418e14, 'm^3/s^2')],
    area: [() => math.unit(2, 'm^2')],
    'magnetic-field': [() => math.unit(1.5, 'T')],
    'energy-per-nucleon': [() => math.unit(250, 'MeV'), () => math.unit(250, 'MeV/u')],
    number: [() => 0.6, () => 12, () => 6],
  };
  const scaled = (v: unknown, f: number): unknown =>
    typeof v === 'number' ? (Number.isInteger(v) ? v : v * f) : math.multiply(v as never, f);

  it('gives the bits the bound function gives, and throws where it throws, for every function and argument form', () => {
    let compared = 0;
    let threw = 0;
    const covered = new Set<string>();
    const check = (fn: (typeof LIBRARY)[number], nominal: unknown[]): void => {
      let bound: unknown;
      try {
        bound = math[fn.name](...nominal);
      } catch {
        return; // not a call the sheet could make at these values: nothing to compile
      }
      const numeric = numericLibraryCall(em.math, fn, nominal);
      if (fn.returns === 'pair-time-length') {
        expect(numeric, fn.name).toBeNull();
        return;
      }
      expect(numeric, fn.name).not.toBeNull();
      // At the sheet's values and at others of the same forms (the draws of a propagation).
      for (const f of [1, 1.013, 0.97, 40]) {
        const args = nominal.map((v) => scaled(v, f));
        const si = args.map((a) => siNumberOf(em.math, a)!);
        let expected: number | undefined;
        try {
          expected = siNumberOf(em.math, f === 1 ? bound : math[fn.name](...args));
        } catch {
          expect(() => numeric!(si), `${fn.name} ×${f}`).toThrow();
          threw++;
          continue;
        }
        expect(Object.is(numeric!(si), expected), `${fn.name} ×${f}: ${numeric!(si)} against ${expected}`).toBe(true);
        compared++;
        covered.add(fn.name);
      }
    };
    for (const fn of LIBRARY) {
      const choices = fn.params.map((p) => forms[p.kind]);
      const count = Math.max(...choices.map((c) => c.length));
      for (let variant = 0; variant < count; variant++)
        check(
          fn,
          choices.map((c) => c[Math.min(variant, c.length - 1)]()),
        );
    }
    // Functions whose arguments must agree with one another (values of common practice, from
    // memory: a carbon-12 beam at 430 MeV/u, a 3 GeV electron ring, a GPS orbit, K⁺ → π⁺π⁰).
    const MeV = (x: number) => math.unit(x, 'MeV');
    const mC = MeV(11174.86);
    const explicit: Array<[string, unknown[]]> = [
      ['invariantMass', [MeV(1000), MeV(500)]],
      ['sqrtSCollider', [MeV(1000), MeV(1000), em.constants.get('m_p'), em.constants.get('m_p')]],
      ['synchrotronLossPerTurn', [MeV(3000), math.unit(7, 'm'), em.constants.get('m_e')]],
      ['synchrotronCriticalEnergy', [MeV(3000), math.unit(7, 'm'), em.constants.get('m_e')]],
      ['ionMass', [math.unit(12, 'u'), 6, 6]],
      ['gammaFromKineticPerNucleon', [MeV(430), 12, mC]],
      ['speedFromKineticPerNucleon', [math.unit(430, 'MeV/u'), 12, mC]],
      ['momentumFromKineticPerNucleon', [MeV(430), 12, mC]],
      ['rigidityFromKineticPerNucleon', [MeV(430), 12, mC, 6]],
      ['kineticPerNucleonFromRigidity', [math.unit(6.6, 'T m'), 12, mC, 6]],
      ['kineticPerNucleonFromMomentum', [MeV(12000), 12, mC]],
      [
        'gravitationalRateOffset',
        [math.unit(3.986004418e14, 'm^3/s^2'), math.unit(26560, 'km'), math.unit(6378, 'km')],
      ],
      ['orbitClockRateOffset', [math.unit(26560, 'km')]],
      ['twoBodyDecayMomentum', [MeV(493.677), MeV(139.57), MeV(134.98)]],
    ];
    for (const [name, args] of explicit)
      check(
        LIBRARY.find((f) => f.name === name)!,
        args,
      );
    // Most of the library is exercised, some calls outside their domain (×40 a speed above c).
    expect(compared).toBeGreaterThan(200);
    const single = LIBRARY.filter((fn) => fn.returns !== 'pair-time-length').map((fn) => fn.name);
    expect(single.filter((name) => !covered.has(name))).toEqual([]);
    expect(threw).toBeGreaterThan(0);
  });

  it('refuses an argument of neither the kind nor its alternative, and a list', () => {
    const lorentz = LIBRARY.find((f) => f.name === 'lorentzFactor')!;
    expect(numericLibraryCall(em.math, lorentz, [math.unit(3, 'kg')])).toBeNull();
    expect(numericLibraryCall(em.math, lorentz, [math.matrix([0.1, 0.2])])).toBeNull();
    const kinetic = LIBRARY.find((f) => f.name === 'speedFromKinetic')!;
    // An energy per mass not written per u is not an energy per nucleon, nor a mass.
    expect(numericLibraryCall(em.math, kinetic, [math.unit(250, 'MeV'), math.unit(3, 'm^2/s^2')])).toBeNull();
  });
});

describe('a statement the sheet could not evaluate, between an uncertain input and a result', () => {
  it('does not stop the propagation to a result that does not read it, with or without the numeric chain', () => {
    // u(w) = 2·u(x) and u(v) = 3·u(x) for w = 2x, v = 3x (JCGM 100:2008, eq. 10; exact here).
    const source = ['x_a = 1 m ± 0.01 m', 'z_c = y_b + x_a', 'f(t) = t * 2', 'w_f = f(x_a)', 'v_g = 3 * x_a'].join(
      '\n',
    );
    for (const on of [true, false]) {
      setNumericChain(on);
      const r = createSheetEngine().evaluate([{ id: 'c1', kind: 'calc', source }], {
        significantFigures: 6,
        monteCarlo: 'always',
      });
      const [, z, , w, v] = r.cells[0].statements;
      expect(z.error).toMatch(/y_b/);
      expect([w.error, v.error]).toEqual([null, null]);
      expect(w.uncertainty?.kind).toBe('propagated');
      expect(w.uncertainty!.u).toBeCloseTo(0.02, 12);
      expect(v.uncertainty!.u).toBeCloseTo(0.03, 12);
      expect(w.uncertainty!.monteCarlo).not.toBeNull();
    }
  });
});
