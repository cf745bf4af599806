// Accuracy of every library function in ulp against 50-digit decimal references, over log-spaced grids
// of β from 1e-12 to 1 − 1e-15 (both signs where allowed), of a0·t/c from 1e-12 to 1e6 for hyperbolic
// motion, and of T/mc² from 1e-24 to 1e12 for the energy-based functions (see reference-math.ts).
import { describe, expect, it } from 'vitest';
import { C } from '../../lib/calc/constants';
import { LIBRARY } from '../../lib/calc/functions';
import { accuracySurvey, betaGrid, D, exact, REFERENCES, ulpError, ulpOf } from './reference-math';

const WORST_ALLOWED_ULP = 4;

describe('the reference machinery', () => {
  it('converts doubles to decimal exactly, unlike new Decimal(x)', () => {
    expect(exact(0.1).toFixed()).toBe('0.1000000000000000055511151231257827021181583404541015625');
    expect(new D(0.1).toFixed()).toBe('0.1');
    expect(exact(1 - 2 ** -53).toFixed()).toBe('0.99999999999999988897769753748434595763683319091796875');
    expect(exact(2 ** -1074).toExponential(5)).toBe('4.94066e-324');
    expect(exact(-3 * 2 ** 60).toFixed()).toBe('-3458764513820540928');
  });

  it('measures ulp in the binade of the reference', () => {
    expect(ulpOf(new D(1)).eq(exact(2 ** -52))).toBe(true);
    expect(ulpOf(exact(1 - 2 ** -53)).eq(exact(2 ** -53))).toBe(true);
    // Just below 1 the binade is [0.5, 1), even when the value would round to 1 as a double.
    expect(ulpOf(new D('0.99999999999999999999')).eq(exact(2 ** -53))).toBe(true);
    expect(ulpError(1, new D('0.99999999999999999999'))).toBeLessThan(1e-3);
    expect(ulpError(1 + 2 ** -52, new D(1))).toBe(1);
  });

  it('has an aberration reference that agrees with the cosine form where that is well conditioned', () => {
    for (const [theta, beta] of [
      [1, 0.3],
      [2, -0.7],
      [0.5, 0.99],
    ]) {
      const b = exact(beta);
      const cosine = D.acos(
        D.cos(exact(theta))
          .minus(b)
          .div(new D(1).minus(b.mul(D.cos(exact(theta))))),
      );
      const ref = REFERENCES.aberrationAngle(theta, beta) as InstanceType<typeof D>;
      expect(ref.minus(cosine).abs().toNumber()).toBeLessThan(1e-40);
    }
  });

  it('samples β from 1e-12 to 1 − 1e-15', () => {
    const grid = betaGrid();
    expect(Math.min(...grid)).toBeLessThanOrEqual(1e-12);
    expect(Math.max(...grid)).toBe(1 - 2 ** -53);
    expect(grid.filter((b) => 1 - b <= 1e-14).length).toBeGreaterThan(10);
  });
});

describe('accuracy in ulp over the whole domain', () => {
  it(`keeps every function within ${WORST_ALLOWED_ULP} ulp of the 50-digit reference`, { timeout: 120_000 }, () => {
    const rows = accuracySurvey();
    console.log(
      [
        'Worst error in ulp against 50-digit references (β from 1e-12 to 1 − 1e-15, a0·t/c from 1e-12 to 1e6, T/mc² from 1e-24 to 1e12):',
        ...rows.map(
          (r) =>
            `  ${r.name.padEnd(34)} ${r.worstUlp.toFixed(3).padStart(7)} ulp  (${String(r.samples).padStart(4)} samples; worst at ${JSON.stringify(r.worstAt)})`,
        ),
      ].join('\n'),
    );
    expect(rows.map((r) => r.name)).toEqual(LIBRARY.map((f) => f.name));
    for (const row of rows) {
      expect(row.samples, `${row.name} samples`).toBeGreaterThanOrEqual(50);
      expect(row.worstUlp, `${row.name} at ${JSON.stringify(row.worstAt)}`).toBeLessThanOrEqual(WORST_ALLOWED_ULP);
    }
  });

  it('would fail the textbook formulas on the same grid (the grid can tell)', () => {
    const worst = (f: (b: number) => number, name: string) =>
      Math.max(...betaGrid().map((b) => ulpError(f(b), REFERENCES[name](b) as InstanceType<typeof D>)));
    const naiveGamma = (b: number) => 1 / Math.sqrt(1 - b * b);
    expect(worst(naiveGamma, 'lorentzFactor')).toBeGreaterThan(1e3);
    expect(worst((b) => naiveGamma(b) - 1, 'gammaMinusOne')).toBeGreaterThan(1e10);
    expect(worst((b) => Math.sqrt(1 - b * b) - 1, 'clockRateOffset')).toBeGreaterThan(1e10);
  });

  it('keeps speeds composed near c below c, with the exact value when it is representable', () => {
    // 1 − (1 − a)(1 − b)/(1 + ab) for a = b = 1 − 2^-30: exactly 1 − 2^-61/(1 + (1 − 2^-30)²) rounds to 1.
    const a = 1 - 2 ** -30;
    const composed = LIBRARY.find((f) => f.name === 'addVelocities')!.kernel(a, a) as number;
    expect(composed).toBe(1 - 2 ** -53);
    expect(composed * C).toBeLessThan(C);
  });
});
