import { C } from '../constants';
import { finiteResult, requireFinite } from './support/domain';
import { dd, div, mul, mulNum, round, sub } from './support/double-double';
import { C_DD, gammaOfSpeed, massiveSpeed } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'lorentzBoost';

/**
 * lorentzBoost(t, x, v) — the coordinates [t′, x′] of an event (t, x) in a frame S′ moving at v along
 * +x, with the origins coinciding at t = t′ = 0 (standard configuration).
 *
 * Formula: t′ = γ(t − βx/c), x′ = γ(x − βct).
 *
 * Domain: t, x finite (any sign); |β| < 1; NaN and ±Infinity are refused.
 *
 * Example: `lorentzBoost(1 s, 0 m, 0.6)` → [1.25 s, −2.2484e8 m].
 *
 * Source: Einstein, Annalen der Physik 17 (1905), §3; Jackson, Classical Electrodynamics, 3rd ed.
 * (1999), §11.3, eq. (11.16).
 *
 * Numerics: βx/c and βct from exact products, the differences and γ in double-double, each
 * coordinate rounded once: within about half an ulp unless t′ or x′ is itself smaller than about
 * 1e-30 of the inputs (an event almost on the light cone of the boost), where the absolute error
 * stays below about 1e-32·γ(|t| + |x|/c).
 */
export const lorentzBoost: CalcFunction = {
  name: FN,
  params: [
    { name: 't', kind: 'time', description: 'time of the event in S' },
    { name: 'x', kind: 'length', description: 'position of the event along x in S' },
    { name: 'v', kind: 'speed', description: 'speed of S′ relative to S along +x (a velocity, or β)' },
  ],
  returns: 'pair-time-length',
  doc: {
    summary: 'Lorentz transformation of an event (t, x) to the frame moving at v along +x (standard configuration).',
    formula: "t' = \\gamma\\Big(t - \\frac{\\beta x}{c}\\Big),\\quad x' = \\gamma\\,(x - \\beta c t)",
    domain: 't and x finite, either sign; |β| < 1. NaN and ±Infinity are refused.',
    example: 'lorentzBoost(1 s, 0 m, 0.6)',
    exampleResult: '[1.25 s, -2.24844344e8 m]',
    source:
      'A. Einstein, "Zur Elektrodynamik bewegter Körper", Annalen der Physik 17 (1905), §3; J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.3.',
    numerics:
      'βx/c and βct come from exact (Dekker) products, the differences t − βx/c and x − βct and γ are formed in double-double, and each coordinate is rounded once: within about half an ulp, unless the coordinate is itself below about 1e-30 of the inputs (an event almost on the light cone), where its absolute error stays below about 1e-32·γ(|t| + |x|/c).',
  },
  kernel: (tArg: KernelArgument, xArg: KernelArgument, v: KernelArgument): [number, number] => {
    const t = requireFinite(FN, 't', tArg as number);
    const x = requireFinite(FN, 'x', xArg as number);
    const speed = massiveSpeed(FN, 'v', v);
    const g = gammaOfSpeed(speed);
    const tPrime = mul(g, sub(dd(t), div(mul(speed.beta, dd(x)), C_DD)));
    const xPrime = mul(g, sub(dd(x), mulNum(mul(speed.beta, dd(t)), C)));
    return [finiteResult(FN, round(tPrime)), finiteResult(FN, round(xPrime))];
  },
};
