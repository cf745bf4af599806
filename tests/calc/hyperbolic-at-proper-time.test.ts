// Constant proper acceleration given by the proper time τ on the body's own clock (issue 17):
// hyperbolicSpeedAtProperTime, hyperbolicCoordinateTimeAtProperTime, hyperbolicDistanceAtProperTime.
// Within 1 ulp of the 50-digit textbook references over a0τ/c from 1e-12 to 630 (where overflow of t
// and x begins, between 660 and 720 depending on a0), the inverse relations with hyperbolicProperTime
// and hyperbolicDistance, and textbook cases, each naming its source.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { C, E_CHARGE, M_E } from '../../lib/calc/constants';
import * as lib from '../../lib/calc/functions';
import { D, errorOf, exact, REFERENCES, surveyCases } from './reference-math';
import { seedFastCheck } from './fast-check-seed';

seedFastCheck('tests/calc/hyperbolic-at-proper-time.test.ts', 20261204);

type K2 = (a: number, b: number) => number;
const k2 = (f: lib.CalcFunction) => f.kernel as K2;
const speedAt = k2(lib.hyperbolicSpeedAtProperTime);
const timeAt = k2(lib.hyperbolicCoordinateTimeAtProperTime);
const distanceAt = k2(lib.hyperbolicDistanceAtProperTime);
const hyperbolicSpeed = k2(lib.hyperbolicSpeed);
const hyperbolicDistance = k2(lib.hyperbolicDistance);
const hyperbolicProperTime = k2(lib.hyperbolicProperTime);
const lorentzFactor = lib.lorentzFactor.kernel as (v: unknown) => number;
const gammaMinusOne = lib.gammaMinusOne.kernel as (v: unknown) => number;
const u = 2 ** -53;
const DAY = 86_400;

function expectRelative(actual: number, expected: number, tolerance: number) {
  expect(Math.abs(actual / expected - 1), `${actual} vs ${expected}`).toBeLessThanOrEqual(tolerance);
}

describe('accuracy against 50-digit references (Rindler 2006, ch. 3: β = tanh u, t = (c/a) sinh u, x = (c²/a)(cosh u − 1))', () => {
  const cases = surveyCases();
  for (const name of [
    'hyperbolicSpeedAtProperTime',
    'hyperbolicCoordinateTimeAtProperTime',
    'hyperbolicDistanceAtProperTime',
  ]) {
    it(`${name} is within 1 ulp for a0τ/c from 1e-12 to 630, both directions`, { timeout: 60_000 }, () => {
      const f = lib.LIBRARY.find((g) => g.name === name)!;
      const list = cases[name];
      expect(list.length).toBeGreaterThanOrEqual(250);
      let worst = 0;
      for (const args of list)
        worst = Math.max(
          worst,
          errorOf(f.kernel(...args) as number, REFERENCES[name](...args) as InstanceType<typeof D>),
        );
      expect(worst).toBeLessThanOrEqual(1);
    });
  }

  it('stays within 1 ulp where t and x come near the double range (u from 690 to 715 at a0 = 1.7e20 m/s²)', () => {
    const a = 1.7e20;
    for (let uu = 690; uu <= 715; uu += 2.5) {
      const tau = (uu * C) / a;
      expect(
        errorOf(timeAt(a, tau), REFERENCES.hyperbolicCoordinateTimeAtProperTime(a, tau) as InstanceType<typeof D>),
      ).toBeLessThanOrEqual(1);
      expect(
        errorOf(distanceAt(-a, tau), REFERENCES.hyperbolicDistanceAtProperTime(-a, tau) as InstanceType<typeof D>),
      ).toBeLessThanOrEqual(1);
    }
  });

  it('the textbook cosh u − 1 in doubles would fail the grid (the reference can tell)', () => {
    const [a, tau] = [8e-4, 1e3]; // u = 2.7e-9: (c²/a)(cosh u − 1) in doubles keeps no digit
    const naive = ((C * C) / a) * (Math.cosh((a * tau) / C) - 1);
    expect(errorOf(naive, REFERENCES.hyperbolicDistanceAtProperTime(a, tau) as InstanceType<typeof D>)).toBeGreaterThan(
      1e6,
    );
    expect(
      errorOf(distanceAt(a, tau), REFERENCES.hyperbolicDistanceAtProperTime(a, tau) as InstanceType<typeof D>),
    ).toBeLessThanOrEqual(1);
  });
});

describe('published relations and cases', () => {
  it('inverts hyperbolicProperTime: the speed, time and distance at τ(t) are those at t (Rindler 2006, ch. 3)', () => {
    // τ(t) is within half an ulp; t, x and β depend on τ with a sensitivity d ln f/d ln τ ≤ u·coth u ≤
    // 1 + u (u = a0τ/c), so the round trip is within (2 + u)·2^-53 relative; asserted at 4u for u ≤ 1,
    // and with the factor u above.
    fc.assert(
      fc.property(
        fc.double({ min: -3, max: 20, noNaN: true }),
        fc.double({ min: -12, max: 2, noNaN: true }),
        fc.boolean(),
        (la, lw, negative) => {
          const a = (negative ? -1 : 1) * 10 ** la;
          const t = (10 ** lw * C) / Math.abs(a);
          const tau = hyperbolicProperTime(a, t);
          const rapidity = (Math.abs(a) * tau) / C;
          const bound = (4 + 2 * rapidity) * u;
          expect(Math.abs(timeAt(a, tau) / t - 1)).toBeLessThanOrEqual(bound);
          expect(Math.abs(distanceAt(a, tau) / hyperbolicDistance(a, t) - 1)).toBeLessThanOrEqual(2 * bound);
          expect(Math.abs(speedAt(a, tau) / hyperbolicSpeed(a, t) - 1)).toBeLessThanOrEqual(bound);
        },
      ),
      { numRuns: 2000 },
    );
  });

  it('γ = cosh(a0τ/c) and γ − 1 = a0 x/c² (the work done per rest energy), through the precise companion, to an ulp', () => {
    const speed = lib.hyperbolicSpeedAtProperTime.preciseKernel!;
    for (const [a, tau] of [
      [(E_CHARGE * 1e6) / M_E, 1e-12],
      [(E_CHARGE * 1e6) / M_E, 1e-9],
      [8e-4, 400 * DAY],
      [25, 3e8],
      [1.7e20, 1e-9],
    ]) {
      const v = speed(a, tau);
      const x = distanceAt(a, tau);
      const uu = exact(a).mul(exact(tau)).div(exact(C));
      // Rindler (2006) ch. 3: γ = cosh u along a hyperbolic worldline; γ − 1 = a x/c² (work-energy relation).
      expect(errorOf(lorentzFactor(v), D.cosh(uu))).toBeLessThanOrEqual(1);
      expect(errorOf(gammaMinusOne(v), exact(a).mul(exact(x)).div(exact(C).pow(2)))).toBeLessThanOrEqual(2);
    }
  });

  it('an electron from rest in 1 MV/m: 60 mm in 0.818 12 ns of its own time, 0.849 90 ns in the lab, at 60 keV', () => {
    const a = (E_CHARGE * 1e6) / M_E; // proper acceleration eE/m_e in a uniform static field (Rindler 2006, ch. 3)
    const tau = k2(lib.hyperbolicProperTimeFromDistance)(a, 0.06);
    expectRelative(distanceAt(a, tau), 0.06, 4 * u); // common practice: the inverse of hyperbolicProperTimeFromDistance
    expectRelative(timeAt(a, tau), k2(lib.hyperbolicCoordinateTimeFromDistance)(a, 0.06), 4 * u);
    // 60 keV over 60 mm: γ = 1 + 60/510.998 950 69 (CODATA 2022: m_e c² = 0.510 998 950 69 MeV).
    expectRelative(lorentzFactor(lib.hyperbolicSpeedAtProperTime.preciseKernel!(a, tau)), 1 + 60 / 510.99895069, 1e-10);
  });

  it('is Galilean at low speed: v = a0τ, x = ½a0τ², t − τ = τ·u²/6 (series of sinh; Rindler 2006, ch. 3)', () => {
    const [a, tau] = [8e-4, 400 * DAY]; // the ion-engine probe of the reference example; u = a0τ/c = 9.2e-5
    const w = (a * tau) / C;
    expectRelative(speedAt(a, tau) * C, a * tau, w * w); // tanh u = u − u³/3 …
    expectRelative(distanceAt(a, tau), 0.5 * a * tau * tau, w * w); // cosh u − 1 = u²/2 + u⁴/24 …
    expectRelative(timeAt(a, tau) - tau, (tau * w * w) / 6, 1e-6);
  });

  it('the hyperbolic worldline: x + c²/a0 = cosh, ct = sinh, so (x + c²/a0)² − (ct)² = (c²/a0)² (Misner, Thorne & Wheeler 1973, §6.2)', () => {
    for (const [a, tau] of [
      [25, 3e7],
      [9.80665, 3e7],
      [1e3, 1e5],
      [8e-4, 400 * DAY],
    ]) {
      const L = exact(C).pow(2).div(exact(a));
      const X = exact(distanceAt(a, tau)).plus(L);
      const T = exact(timeAt(a, tau)).mul(exact(C));
      const interval = X.mul(X).minus(T.mul(T)).div(L.mul(L)).minus(1).abs().toNumber();
      // X and ct each within an ulp: X² − (ct)² is good to about 4·2^-53·X², relative to (c²/a0)² that is 4·2^-53·cosh²u.
      expect(interval).toBeLessThan(1e-15 * Math.cosh((a * tau) / C) ** 2);
    }
  });
});
