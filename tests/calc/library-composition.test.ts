// Full precision through composition (issue 15): a speed returned by a library function carries its
// precise companion (β and 1/γ in double-double, functions/types.ts PreciseSpeed), and passing that
// same value to another library function gives the direct formula's result to within an ulp, where
// the rounded β alone loses up to 3e-4 relative near c (γ of a 1.5 TeV electron).
//
// References: 50-digit decimal.js on the exact doubles the kernels receive (reference-math.ts), from
// the relations of PDG RPP 2024, review "Kinematics": E = T + mc² = γmc², p = γβmc, E² = p²c² + m²c⁴,
// and the composition law γ_{u⊕v} = γ_u γ_v (1 + β_u β_v) (J. D. Jackson, Classical Electrodynamics,
// 3rd ed. (1999), §11.4).
//
// Error bound asserted: each composition's last kernel rounds once in double-double (within 0.5 ulp
// plus about 2^-100 relative); its input, the companion, is exact to about 2^-104 relative in β and
// 1/γ, which the last step amplifies by at most its condition number (≤ 2 for every route below), so
// the composed result is within 0.5 ulp + 2^-100 relative; a speed shown in m/s is β·c rounded once
// more: asserted ≤ 1 ulp (COMPANION_ULP). Round trips through a momentum or an energy (no companion:
// a double) carry that double's rounding, at most 2^-53 relative, times the sensitivity of the second
// function (d ln T/d ln p = (E + mc²)/E ≤ 2; d ln p/d ln T ≤ 1); one ulp of the result is at least
// 2^-53 relative, so T(p(T)) is within 2 + 0.5 ulp (ROUND_TRIP_ULP = 2.5), and through a rigidity,
// whose division rounds once more (another 2^-53 in p), within 4.5 ulp.
import type { Unit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import type { CellInput } from '../../lib/calc/types';
import { D, type Dec, exact, logSpace, REF_C, speedFromMomentumRef, ulpError } from './reference-math';

const COMPANION_ULP = 1;
const ROUND_TRIP_ULP = 2.5;

const engine = createSheetEngine();
const math = engine.em.math;
const lib = math as unknown as Record<string, (...args: unknown[]) => unknown>;
const si = (u: unknown) => (typeof u === 'number' ? u : ((u as Unit).value as number));
const ONE = new D(1);
const C2 = REF_C.mul(REF_C);
const eV = 1.602176634e-19; // SI Brochure 9th ed.: 1 eV = 1.602 176 634e-19 J exactly

const m_e = engine.em.constants.get('m_e') as Unit;
const m_p = engine.em.constants.get('m_p') as Unit;
/** Electrons from 1 keV to 10 TeV, protons from 1 MeV to 10 TeV, log-spaced, 80 points each. */
const beams: Array<{ name: string; m: Unit; T: number[] }> = [
  { name: 'electron', m: m_e, T: logSpace(3, 13, 80).map((x) => x * eV) },
  { name: 'proton', m: m_p, T: logSpace(6, 13, 80).map((x) => x * eV) },
];

/** x = T/mc², γ, βγ and β at 50 digits from the exact inputs. */
function kinematics(T: number, m: number): { x: Dec; gamma: Dec; betaGamma: Dec; beta: Dec } {
  const x = exact(T).div(exact(m).mul(C2));
  const gamma = ONE.plus(x);
  const betaGamma = x.mul(x.plus(2)).sqrt();
  return { x, gamma, betaGamma, beta: betaGamma.div(gamma) };
}

/** θ′ = atan2(sin θ/γ, cos θ − β) (Jackson, Classical Electrodynamics, 3rd ed., §11.4), 50 digits. */
function aberrationRef(theta: Dec, k: { gamma: Dec; beta: Dec }): Dec {
  return D.atan2(D.sin(theta).div(k.gamma), D.cos(theta).minus(k.beta));
}

interface Worst {
  ulp: number;
  at: string;
}
function track(worst: Map<string, Worst>, route: string, ulp: number, at: string): void {
  const w = worst.get(route);
  if (!w || ulp > w.ulp) worst.set(route, { ulp, at });
}
function report(title: string, worst: Map<string, Worst>): void {
  console.log(
    [
      title,
      ...[...worst].map(
        ([route, w]) => `  ${route.padEnd(58)} ${w.ulp.toFixed(3).padStart(6)} ulp  (worst at ${w.at})`,
      ),
    ].join('\n'),
  );
}

describe('compositions of library functions against 50-digit references', () => {
  it(
    `stay within ${COMPANION_ULP} ulp through a speed, ${ROUND_TRIP_ULP} ulp through a momentum or energy (electrons 1 keV–10 TeV, protons 1 MeV–10 TeV)`,
    { timeout: 60_000 },
    () => {
      const worst = new Map<string, Worst>();
      for (const beam of beams) {
        const m = si(beam.m);
        for (const Tsi of beam.T) {
          const T = math.unit(Tsi, 'J');
          const at = `${beam.name}, T = ${(Tsi / eV).toPrecision(6)} eV`;
          const k = kinematics(Tsi, m);
          const v = lib.speedFromKinetic(T, beam.m);
          const check = (route: string, value: unknown, ref: Dec, bound: number) => {
            const ulp = ulpError(si(value), ref);
            track(worst, route, ulp, at);
            expect(ulp, `${route} at ${at}`).toBeLessThanOrEqual(bound);
          };
          check('lorentzFactor(speedFromKinetic(T, m))', lib.lorentzFactor(v), k.gamma, COMPANION_ULP);
          check('gammaMinusOne(speedFromKinetic(T, m))', lib.gammaMinusOne(v), k.x, COMPANION_ULP);
          check('betaGamma(speedFromKinetic(T, m))', lib.betaGamma(v), k.betaGamma, COMPANION_ULP);
          check(
            'rapidity(speedFromKinetic(T, m)) = ln(γ + βγ)',
            lib.rapidity(v),
            D.ln(k.gamma.plus(k.betaGamma)),
            COMPANION_ULP,
          );
          check(
            'dopplerFactor(speedFromKinetic(T, m)) = γ + βγ',
            lib.dopplerFactor(v),
            k.gamma.plus(k.betaGamma),
            COMPANION_ULP,
          );
          check(
            'timeDilation(1 s, speedFromKinetic(T, m))',
            lib.timeDilation(math.unit(1, 's'), v),
            k.gamma,
            COMPANION_ULP,
          );
          check(
            'lengthContraction(1 m, speedFromKinetic(T, m))',
            lib.lengthContraction(math.unit(1, 'm'), v),
            ONE.div(k.gamma),
            COMPANION_ULP,
          );
          check(
            'kineticEnergy(m, speedFromKinetic(T, m)) = T',
            lib.kineticEnergy(beam.m, v),
            exact(Tsi),
            COMPANION_ULP,
          );
          // γ_{v⊕v} = γ²(1 + β²) = 2γ² − 1, and the result of addVelocities carries its own companion.
          check(
            'lorentzFactor(addVelocities(v, v))',
            lib.lorentzFactor(lib.addVelocities(v, v)),
            k.gamma.mul(k.gamma).mul(2).minus(1),
            COMPANION_ULP,
          );
          check('gammaFromKinetic(T, m)', lib.gammaFromKinetic(T, beam.m), k.gamma, COMPANION_ULP);
          check(
            'clockRateOffset(speedFromKinetic(T, m)) = 1/γ − 1',
            lib.clockRateOffset(v),
            ONE.div(k.gamma).minus(1),
            COMPANION_ULP,
          );
          const g = math.unit(9.80665, 'm/s^2');
          check(
            'transverseCoordinateAcceleration(g, v) = g/γ²',
            lib.transverseCoordinateAcceleration(g, v),
            exact(9.80665).div(k.gamma.pow(2)),
            COMPANION_ULP,
          );
          check(
            'properToCoordinateAcceleration(g, v) = g/γ³',
            lib.properToCoordinateAcceleration(g, v),
            exact(9.80665).div(k.gamma.pow(3)),
            COMPANION_ULP,
          );
          // An event at x = 0, t = 1 s seen from the beam: t′ = γ t, x′ = −βγ c t.
          const [tPrime, xPrime] = (
            lib.lorentzBoost(math.unit(1, 's'), math.unit(0, 'm'), v) as { valueOf(): Unit[] }
          ).valueOf();
          check('lorentzBoost(1 s, 0 m, v): t′ = γ·1 s', tPrime, k.gamma, COMPANION_ULP);
          check('lorentzBoost(1 s, 0 m, v): x′ = −βγc·1 s', xPrime, k.betaGamma.mul(REF_C).neg(), COMPANION_ULP);
          // A ray at 90° in the lab, seen from the beam: θ′ = atan2(sin θ/γ, cos θ − β) = atan2(1/γ, −β).
          check(
            'aberrationAngle(π/2, v)',
            lib.aberrationAngle(Math.PI / 2, v),
            aberrationRef(exact(Math.PI / 2), k),
            COMPANION_ULP,
          );

          // Through the momentum: p = βγmc.
          const p = lib.momentumFromKinetic(T, beam.m);
          const pRef = k.betaGamma.mul(exact(m)).mul(REF_C);
          check('momentumFromKinetic(T, m)', p, pRef, COMPANION_ULP);
          check(
            'kineticFromMomentum(momentumFromKinetic(T, m), m) = T',
            lib.kineticFromMomentum(p, beam.m),
            exact(Tsi),
            ROUND_TRIP_ULP,
          );
          const pSi = si(p);
          const y = exact(pSi).div(exact(m).mul(REF_C)); // βγ of the rounded momentum: the references below start from p
          check('betaGammaFromMomentum(p, m)', lib.betaGammaFromMomentum(p, beam.m), y, COMPANION_ULP);
          const u = lib.speedFromMomentum(p, beam.m);
          check('speedFromMomentum(p, m)', u, speedFromMomentumRef(exact(pSi), exact(m)).mul(REF_C), COMPANION_ULP);
          check(
            'lorentzFactor(speedFromMomentum(p, m)) = √(1 + (p/mc)²)',
            lib.lorentzFactor(u),
            ONE.plus(y.mul(y)).sqrt(),
            COMPANION_ULP,
          );
          check(
            'momentumFromKinetic(kineticFromMomentum(p, m), m) = p',
            lib.momentumFromKinetic(lib.kineticFromMomentum(p, beam.m), beam.m),
            exact(pSi),
            ROUND_TRIP_ULP,
          );
          // Through the rigidity of a singly charged particle.
          const brho = lib.magneticRigidity(p, 1);
          check(
            'kineticFromRigidity(magneticRigidity(p, 1), m, 1) = T',
            lib.kineticFromRigidity(brho, beam.m, 1),
            exact(Tsi),
            ROUND_TRIP_ULP + 2,
          );
        }
      }
      report('Worst error of compositions in ulp against 50-digit references:', worst);
    },
  );

  it('composes opposite speeds near c without cancellation (hyperbolic motion both ways: rapidities add)', () => {
    // hyperbolicSpeed(a, t) has rapidity asinh(a t/c) (Rindler, Relativity, 2nd ed. (2006), §3.8); the
    // two speeds below are within 1e-12 of ±c and nearly opposite, where 1 + β_u β_v cancels.
    const g = math.unit(9.80665, 'm/s^2');
    const minusG = math.unit(-9.80665, 'm/s^2');
    for (const [t1, t2] of [
      [3e13, 3.0000003e13],
      [3e13, 2.9e13],
      [1e12, 1e12 * (1 + 1e-9)],
    ]) {
      const u = lib.hyperbolicSpeed(g, math.unit(t1, 's'));
      const w = lib.hyperbolicSpeed(minusG, math.unit(t2, 's'));
      const eta = D.asinh(exact(9.80665).mul(exact(t1)).div(REF_C)).minus(
        D.asinh(exact(9.80665).mul(exact(t2)).div(REF_C)),
      );
      const gammaRef = D.cosh(eta);
      expect(
        ulpError(si(lib.lorentzFactor(lib.addVelocities(u, w))), gammaRef),
        `t = ${t1}, ${t2}`,
      ).toBeLessThanOrEqual(COMPANION_ULP);
      expect(ulpError(si(lib.rapidity(lib.addVelocities(u, w))), eta), `t = ${t1}, ${t2}`).toBeLessThanOrEqual(
        COMPANION_ULP,
      );
    }
  });

  it('would fail without the companion: the rounded β alone is off by up to 3e-4 in γ', () => {
    // Issue 15: lorentzFactor(speedFromKinetic(1.5 TeV, m_e)) gave 2 934 466 for the true 2 935 428.
    const v = lib.speedFromKinetic(math.unit(1.5, 'TeV'), m_e) as Unit;
    const reference = kinematics(si(math.unit(1.5, 'TeV')), si(m_e)).gamma;
    expect(reference.toSignificantDigits(7).toString()).toBe('2935428');
    expect(ulpError(si(lib.lorentzFactor(v)), reference)).toBeLessThanOrEqual(0.5);
    // The same speed rebuilt by arithmetic (a new object) has only its double β: it rightly loses
    // the companion, and γ from it is the rounded β's γ.
    const rebuilt = math.multiply(v, 1) as Unit;
    expect(rebuilt.value).toBe(v.value);
    const rounded = si(lib.lorentzFactor(rebuilt));
    expect(Math.abs(rounded / reference.toNumber() - 1)).toBeGreaterThan(1e-4);
    expect(si(lib.lorentzFactor(math.unit(-(v.value as number), 'm/s')))).toBe(rounded);
  });

  it('gives γ = 1 + a0·d/c² exactly from the speed after a distance, and from a trip’s peak speed (Rindler 2006, ch. 3)', () => {
    // An electron from rest in a uniform field E covers d: γ − 1 = eEd/(m_e c²), the work done.
    const a0 = (eV * 1e6) / si(m_e); // eE/m_e at 1 MV/m
    for (const d of [1e-6, 0.06, 1e3, 1e7]) {
      const x = exact(a0).mul(exact(d)).div(C2);
      const v = lib.hyperbolicSpeedFromDistance(math.unit(a0, 'm/s^2'), math.unit(d, 'm'));
      expect(ulpError(si(lib.gammaMinusOne(v)), x), `d = ${d} m`).toBeLessThanOrEqual(COMPANION_ULP);
      const peak = lib.hyperbolicTripPeakSpeed(math.unit(a0, 'm/s^2'), math.unit(2 * d, 'm'));
      expect(ulpError(si(lib.gammaMinusOne(peak)), x), `trip over ${2 * d} m`).toBeLessThanOrEqual(COMPANION_ULP);
    }
  });

  it('gives γ = cosh(a0τ/c) exactly from the speed at a proper time, near c as well (Rindler 2006, ch. 3)', () => {
    // An electron from rest at 1 MV/m (eE/m_e): γ = cosh u, u = a0τ/c, after 1 ps … 1 µs of its own time (u up to 586).
    const a0 = (eV * 1e6) / si(m_e);
    for (const tau of [1e-12, 1e-9, 1e-7, 1e-6]) {
      const u = exact(a0).mul(exact(tau)).div(REF_C);
      const v = lib.hyperbolicSpeedAtProperTime(math.unit(a0, 'm/s^2'), math.unit(tau, 's'));
      expect(ulpError(si(lib.lorentzFactor(v)), D.cosh(u)), `tau = ${tau} s`).toBeLessThanOrEqual(COMPANION_ULP);
    }
  });

  it('keeps companions of list elements (a vector argument)', () => {
    const Ts = math.matrix([math.unit(1.5, 'TeV'), math.unit(7, 'TeV')]);
    const vs = lib.speedFromKinetic(Ts, m_e);
    const gammas = (lib.lorentzFactor(vs) as { valueOf(): number[] }).valueOf();
    for (const [i, T] of [1.5e12, 7e12].entries()) {
      expect(ulpError(gammas[i], kinematics(T * eV, si(m_e)).gamma)).toBeLessThanOrEqual(COMPANION_ULP);
    }
  });
});

describe('composition through a sheet', () => {
  const cells = (...sources: string[]): CellInput[] =>
    sources.map((source, i) => ({ id: `k${i + 1}`, kind: 'calc', source }));
  const reference = kinematics(1.5e12 * eV, si(m_e)).gamma.toNumber();

  it('carries the companion through names, across lines and cells, and from cached cells', () => {
    const sheet = engine.evaluate(
      cells('v_e = speedFromKinetic(1.5 TeV, m_e)\ng_1 = lorentzFactor(v_e)', 'g_2 = lorentzFactor(v_e)'),
      { significantFigures: 7 },
    );
    expect(sheet.ok).toBe(true);
    expect(sheet.cells[0].statements[1].value!.number).toBe(reference);
    expect(sheet.cells[1].statements[0].value!.number).toBe(reference);
    // Edit only the second cell: the first comes from the cell cache with the same value object.
    const again = engine.evaluate(
      cells(
        'v_e = speedFromKinetic(1.5 TeV, m_e)\ng_1 = lorentzFactor(v_e)',
        'g_2 = lorentzFactor(v_e)\ng_3 = gammaFromKinetic(1.5 TeV, m_e)',
      ),
      {
        significantFigures: 7,
      },
    );
    expect(again.ok).toBe(true);
    expect(again.evaluatedCells).toBe(1); // the first cell came from the cache
    expect(again.cells[1].statements[0].value!.number).toBe(reference);
    expect(again.cells[1].statements[1].value!.number).toBe(reference);
    expect(again.cells[1].statements[0].value!.text).toBe('2.935\u202f428 × 10⁶');
  });

  it('loses it, as it should, for a value made by arithmetic', () => {
    const sheet = engine.evaluate(
      cells('v_e = speedFromKinetic(1.5 TeV, m_e)', 'w = v_e to km/s', 'g = lorentzFactor(w)'),
      { significantFigures: 7 },
    );
    expect(sheet.ok).toBe(true);
    expect(Math.abs(sheet.cells[2].statements[0].value!.number! / reference - 1)).toBeGreaterThan(1e-4);
  });
});
