// The library as a sheet reaches it: the adapter (lib/calc/library-adapter.ts) between mathjs values
// and the kernels. Argument kinds (charges), precision carried through composition, plain β in and
// out, non-finite results refused, and messages that echo the argument as the sheet wrote it.
// References: 50-digit decimal.js (tests/calc/reference-math.ts) on the exact doubles the kernels
// receive; physical relations name their source beside them.
import type { Unit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { LIBRARY, type CalcFunction, DomainError } from '../../lib/calc/functions';
import { bindLibrary } from '../../lib/calc/library-adapter';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import type { CellInput } from '../../lib/calc/types';
import { D, type Dec, exact, REF_C, REF_E, ulpError } from './reference-math';

const engine = createSheetEngine();
const math = engine.em.math;
const lib = math as unknown as Record<string, (...args: unknown[]) => unknown>;
const constant = (name: string) => engine.em.constants.get(name)!;
const unit = (text: string) => math.unit(text);
const si = (u: unknown) => (u as Unit).value as number;
const cells = (...sources: string[]): CellInput[] =>
  sources.map((source, i) => ({ id: `c${i + 1}`, kind: 'calc', source }));
const run = (...sources: string[]) => engine.evaluate(cells(...sources), { significantFigures: 6 });
const thrown = (f: () => unknown): Error => {
  try {
    f();
  } catch (error) {
    return error as Error;
  }
  throw new Error('expected a refusal');
};

/** 50-digit momentum pc of kinetic energy T for rest mass m (PDG RPP 2024, "Kinematics": E² = p²c² + m²c⁴, E = T + mc²). */
function momentumRef(T: number, m: number): Dec {
  const rest = exact(m).mul(REF_C).mul(REF_C);
  const E = exact(T).plus(rest);
  return E.mul(E).minus(rest.mul(rest)).sqrt().div(REF_C);
}

describe('charge arguments', () => {
  it('refuse Euler’s number where the elementary charge was meant, naming both', () => {
    // issue 15: `magneticRigidity(momentumFromKinetic(1 GeV, m_p), e)` silently gave 2.718× too little.
    const r = run('B_rho = magneticRigidity(momentumFromKinetic(1 GeV, m_p), e)');
    expect(r.cells[0].ok).toBe(false);
    expect(r.cells[0].error).toContain(
      "`e` is Euler's number 2.718…; the elementary charge is `q_e` (or give the charge number, e.g. 1)",
    );
    expect(thrown(() => lib.magneticRigidity(unit('1 GeV'), Math.E)).message).toContain(
      'the elementary charge is `q_e`',
    );
  });

  it('refuse a non-integer charge number, and accept integers of either sign', () => {
    const message = thrown(() => lib.magneticRigidity(unit('1 GeV'), 1.5)).message;
    expect(message).toContain('magneticRigidity: argument 2 (q)');
    expect(message).toContain('a charge number must be an integer, got the plain number 1.5');
    expect(si(lib.magneticRigidity(unit('1 GeV'), -1))).toBeLessThan(0);
    expect(si(lib.magneticRigidity(unit('1 GeV'), 6))).toBeCloseTo(si(lib.magneticRigidity(unit('1 GeV'), 1)) / 6, 15);
  });

  it('gives Bρ = 3.3356 T·m per GeV/c with q_e or the charge number 1 (PDG RPP 2024, "Passage of particles through matter" / "Kinematics": Bρ [T m] = 3.3356 p [GeV/c])', () => {
    // p = 1 GeV/c, written as the energy pc = 1 GeV (a momentum parameter reads an energy as pc).
    const p = unit('1 GeV');
    const reference = exact(si(p)).div(REF_C).div(REF_E); // 50 digits: 1e9/299792458 T·m = 3.33564095198152…
    expect(reference.toSignificantDigits(5).toString()).toBe('3.3356'); // the PDG coefficient
    for (const q of [constant('q_e'), 1]) {
      const brho = lib.magneticRigidity(p, q) as Unit;
      expect(brho.equalBase(unit('T m'))).toBe(true);
      expect(ulpError(si(brho), reference)).toBeLessThanOrEqual(1);
    }
    // The same momentum in kg m/s.
    const pSi = exact(si(p)).div(REF_C).toNumber();
    expect(ulpError(si(lib.magneticRigidity(math.unit(pSi, 'kg m/s'), 1)), exact(pSi).div(REF_E))).toBeLessThanOrEqual(
      0.5,
    );
  });

  it('gives Bρ ≈ 5.657 T·m for a proton of kinetic energy 1 GeV (p = 1.696 GeV/c)', () => {
    // p c = √(T(T + 2 m_p c²)) with m_p c² = 938.272 MeV (CODATA 2022), then PDG's Bρ = 3.3356 p [GeV/c].
    const T = unit('1 GeV');
    const mp = constant('m_p');
    const reference = momentumRef(si(T), si(mp)).div(REF_E);
    expect(reference.toSignificantDigits(4).toString()).toBe('5.657');
    for (const q of [constant('q_e'), 1]) {
      const brho = lib.magneticRigidity(lib.momentumFromKinetic(T, mp), q);
      // momentumFromKinetic within 0.5 ulp, then one correctly rounded division: within 1.5 ulp.
      expect(ulpError(si(brho), reference)).toBeLessThanOrEqual(1.5);
    }
    const r = run('B_rho = magneticRigidity(momentumFromKinetic(1 GeV, m_p), q_e) to T m');
    expect(r.cells[0].ok).toBe(true);
    expect(r.cells[0].statements[0].value?.number).toBeCloseTo(reference.toNumber(), 12);
    expect(new D(r.cells[0].statements[0].value!.number!).toSignificantDigits(4).toString()).toBe('5.657');
  });
});

describe('plain β in, plain β out', () => {
  it('addVelocities(0.5, 0.5) is the plain β 0.8, and with velocities a velocity (textbook: 0.5c ⊕ 0.5c = 0.8c, e.g. Taylor & Wheeler, Spacetime Physics)', () => {
    expect(lib.addVelocities(0.5, 0.5)).toBe(0.8);
    const r = run(
      'w_1 = addVelocities(0.5, 0.5)',
      'w_2 = addVelocities(0.5 c, 0.5 c)',
      'w_3 = addVelocities(0.5, 0.5 c)',
      'g = lorentzFactor(w_1)',
    );
    expect(r.ok).toBe(true);
    expect(r.cells[0].statements[0].value).toMatchObject({ kind: 'number', number: 0.8 });
    expect(r.cells[1].statements[0].value).toMatchObject({ kind: 'quantity', unit: 'm / s' });
    expect(r.cells[1].statements[0].value!.number).toBeCloseTo(0.8 * 299792458, 6);
    expect(r.cells[2].statements[0].value!.kind).toBe('quantity');
    expect(r.cells[3].statements[0].value!.number).toBeCloseTo(5 / 3, 14); // γ(0.8) = 5/3
  });

  it('applies to every speed function with speed parameters; the others return a velocity', () => {
    // rocketDeltaV(ve, R): a plain exhaust β gives a plain Δβ (Ackeret 1946: photon rocket at R = 3 gives 0.8).
    expect(lib.rocketDeltaV(1, 3)).toBeCloseTo(0.8, 15);
    expect(math.isUnit(lib.rocketDeltaV(math.unit(1, 'c'), 3))).toBe(true);
    // No speed parameter: always a velocity.
    expect(math.isUnit(lib.speedFromKinetic(unit('250 MeV'), constant('m_p')))).toBe(true);
    expect(math.isUnit(lib.hyperbolicSpeed(unit('9.80665 m/s^2'), unit('1 s')))).toBe(true);
    // Lists of plain β give lists of plain β.
    const list = lib.addVelocities(math.matrix([0.5, 0.6]), 0.5) as { valueOf(): unknown[] };
    expect(list.valueOf()[0]).toBe(0.8);
  });
});

describe('non-finite results', () => {
  it('are refused by the adapter with a DomainError naming the function and its arguments', () => {
    // A kernel that overflows (every library kernel refuses such results itself, as the survey in
    // library-extremes.test.ts shows; this is the adapter's own guard, bound like any library function).
    const overflowing: CalcFunction = {
      ...LIBRARY.find((f) => f.name === 'lengthContraction')!,
      name: 'overflowing',
      kernel: (L0) => (L0 as number) * 1e300,
    };
    const [binding] = bindLibrary(math, [overflowing]);
    expect(math.unit(1, 'm').equalBase(binding.fn(unit('1 m'), 0.5) as Unit)).toBe(true);
    const error = thrown(() => binding.fn(unit('1e10 m'), 0.5));
    expect(error).toBeInstanceOf(DomainError);
    expect(error.message).toMatch(/^overflowing\(1 × 10¹⁰ m, 0\.5\): the result is not a finite number \(Infinity\)/);
  });

  it('of the issue are computed, not returned as NaN (lengthContraction(1e302 m, 0.5), electronWavelength(1e-305 V))', () => {
    const r = run('L = lengthContraction(1e302 m, 0.5)', 'lambda = electronWavelength(1e-305 V)');
    expect(r.ok).toBe(true);
    expect(r.cells.map((c) => c.statements[0].value!.text).join(' ')).not.toMatch(/NaN|∞/);
  });
});

describe('domain errors echo the argument as the sheet wrote it', () => {
  // Issue 15: `speedFromKinetic(-5 MeV, m_p)` said "got T = -8.010883169999999e-13 J".
  const MINUS = '\u2212';
  it.each([
    ['speedFromKinetic(-5 MeV, m_p)', `speedFromKinetic: T must be ≥ 0 (a kinetic energy); got ${MINUS}5 MeV`],
    ['momentumFromKinetic(250 MeV, -1 kg)', `momentumFromKinetic: m must be ≥ 0 (a rest mass); got ${MINUS}1 kg`],
    ['lengthContraction(-3 km, 0.5)', `lengthContraction: L0 must be ≥ 0 (a proper length); got ${MINUS}3 km`],
    ['electronWavelength(-200 kV)', `electronWavelength: U must be > 0 (an accelerating voltage); got ${MINUS}200 kV`],
    ['timeDilation(-2.5 us, 0.5)', `timeDilation: dtau must be ≥ 0 (an elapsed proper time); got ${MINUS}2.5 µs`],
    [
      'kineticFromMomentum(-5 MeV/c, m_p)',
      `kineticFromMomentum: p must be ≥ 0 (a momentum magnitude); got ${MINUS}5 MeV/c`,
    ],
    [
      'kineticFromMomentum(-1 GeV, m_p)',
      `kineticFromMomentum: p must be ≥ 0 (a momentum magnitude); got ${MINUS}1 GeV`,
    ],
    [
      'lorentzFactor(4e8 m/s)',
      'lorentzFactor: |β| must be below 1 for a massive body; got β = 1.3342563807926082 (v = 4 × 10⁸ m/s)',
    ],
  ])('%s', (source, message) => {
    const r = run(`x = ${source}`);
    expect(r.cells[0].ok).toBe(false);
    expect(r.cells[0].error).toContain(message);
  });

  it('keeps the SI value when the kernel is called directly, and for values derived from the arguments', () => {
    expect(thrown(() => LIBRARY.find((f) => f.name === 'speedFromKinetic')!.kernel(-1e-13, 1e-27)).message).toBe(
      'speedFromKinetic: T must be ≥ 0 (a kinetic energy); got T = -1e-13 J',
    );
    // sqrtSCollider checks E ≥ mc², a relation between arguments: it names the SI values.
    const r = run('x = sqrtSCollider(100 MeV, 100 MeV, m_p, m_p)');
    expect(r.cells[0].error).toContain('the total energy E1 must be at least the rest energy');
  });
});
