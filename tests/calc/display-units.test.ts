// Results in the trade's units (lib/calc/display-units.ts): the sheet setting displayUnits 'trade'
// shows energies, momenta and masses at particle scale in the eV family (PDG RPP conventions:
// E in MeV/GeV, p in MeV/c, m in MeV/c²); 'si' (the default) shows SI units. Values are the same.
import { describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { cancelLikeUnits, tradeDisplay } from '../../lib/calc/display-units';
import type { DisplayValue, StatementResult } from '../../lib/calc/types';

const engine = createSheetEngine();
const { math } = engine.em;

function run(source: string, displayUnits?: 'si' | 'trade'): Map<string, StatementResult> {
  const r = engine.evaluate([{ id: 'c1', kind: 'calc', source }], { significantFigures: 6, displayUnits });
  return new Map(r.cells[0].statements.map((s) => [s.name ?? s.source, s]));
}
const value = (r: Map<string, StatementResult>, name: string): DisplayValue => {
  const s = r.get(name)!;
  expect(s.error, name).toBeNull();
  return s.value!;
};
/** The SI value of a displayed quantity, read back from its number and unit. */
const si = (v: DisplayValue, unit: string) => math.unit(v.number!, v.unit!).toNumber(unit);

const SHEET = [
  'T_kin = 250 MeV',
  'E_0 = m_p * c^2',
  'p = momentumFromKinetic(T_kin, m_p)',
  'Brho = magneticRigidity(p, q_e)',
  'm_x = invariantMass(1 GeV, 0.5 GeV/c)',
  'm_el = m_e * 1',
  'E_J = E_0 to J',
  'm_k = 3 kg',
  'E_g = 0.25 GeV',
  'E_big = 1 kg * c^2',
  'x_c = 1 MeV * 2 T*m / (1 MeV)',
].join('\n');

describe('the trade setting', () => {
  const trade = run(SHEET, 'trade');
  const plain = run(SHEET, 'si');

  it('shows m_p c² as 938.272 MeV, never in nanojoules or picojoules (CODATA 2022: m_p c² = 938.272 089 43 MeV)', () => {
    expect(value(trade, 'E_0')).toMatchObject({ unit: 'MeV', text: '938.272 MeV' });
    expect(value(trade, 'E_0').number).toBeCloseTo(938.27208943, 6);
    expect(value(plain, 'E_0').unit).toBe('pJ');
  });

  it('shows a momentum from the library in MeV/c and a mass in MeV/c² or keV/c²', () => {
    // PDG RPP, kinematics: pc = √(T² + 2T·mc²) = √(250² + 2·250·938.272 089 43) MeV = 729.134 MeV.
    expect(value(trade, 'p')).toMatchObject({ unit: 'MeV / c', text: '729.134 MeV/c' });
    expect(value(trade, 'p').number).toBeCloseTo(Math.sqrt(250 ** 2 + 2 * 250 * 938.27208943), 6);
    expect(value(plain, 'p').unit).toBe('(kg m) / s');
    // m² = E² − p² with E = 1 GeV, p = 0.5 GeV/c: m = √0.75 GeV/c² (textbook invariant mass).
    expect(value(trade, 'm_x')).toMatchObject({ unit: 'MeV / c^2', text: '866.025 MeV/c²' });
    // CODATA 2022: m_e c² = 0.510 998 950 69 MeV.
    expect(value(trade, 'm_el')).toMatchObject({ unit: 'keV / c^2' });
    expect(value(trade, 'm_el').number).toBeCloseTo(510.99895069, 6);
  });

  it('keeps full precision in number and unit: the SI value read back is the value computed', () => {
    for (const name of ['E_0', 'p', 'm_x', 'm_el']) {
      const t = value(trade, name);
      const s = value(plain, name);
      const unit = name === 'E_0' ? 'J' : name === 'p' ? 'kg m / s' : 'kg';
      expect(Math.abs(si(t, unit) / si(s, unit) - 1), name).toBeLessThan(4e-16);
    }
  });

  it('keeps what the author wrote: x to J, 3 kg, 0.25 GeV, and SI units above particle scale', () => {
    expect(value(trade, 'E_J').unit).toBe('J');
    expect(value(trade, 'm_k')).toMatchObject({ unit: 'kg', text: '3 kg' });
    expect(value(trade, 'E_g')).toMatchObject({ unit: 'GeV', text: '0.250\u202f000 GeV' });
    expect(value(trade, 'E_big').unit).toBe('PJ');
    // Rigidity is in T·m either way.
    expect(value(trade, 'Brho').text).toBe(value(plain, 'Brho').text);
  });

  it('simplifies products of a unit and its inverse: MeV·T·m/MeV is T·m (both settings)', () => {
    expect(value(trade, 'x_c')).toMatchObject({ unit: 'T m', text: '2 T·m' });
    expect(value(plain, 'x_c')).toMatchObject({ unit: 'T m', text: '2 T·m' });
  });

  it('substitutes constants in the same units: m_p as 938.272 MeV/c², not 1.67 × 10⁻²⁷ kg', () => {
    expect(trade.get('p')!.substitutedTex).toContain('938.272\\ \\mathrm{MeV}/c^{2}');
    expect(trade.get('p')!.substitutedTex).not.toContain('10^{-27}');
    expect(plain.get('p')!.substitutedTex).toContain('1.672\\,62 \\times 10^{-27}\\ \\mathrm{kg}');
    // A momentum substituted into a later formula is in MeV/c too.
    expect(trade.get('Brho')!.substitutedTex).toContain('729.134\\ \\mathrm{MeV}/c');
  });

  it('is the default SI when the setting is absent, and the cache keeps the two apart', () => {
    const absent = run(SHEET);
    expect(value(absent, 'E_0').text).toBe(value(plain, 'E_0').text);
    // The same cells again in the trade's units: not the SI display from the cache.
    expect(value(run(SHEET, 'trade'), 'E_0').text).toBe('938.272 MeV');
  });
});

describe('the pieces', () => {
  it('chooses the prefix by magnitude, keV to TeV, within particle scale', () => {
    const show = (expr: string) => tradeDisplay(math, math.unit(expr) as never);
    expect(show('1.5e-13 J')?.unitString).toBe('keV'); // 936 keV
    expect(show('1e-8 J')?.unitString).toBe('GeV'); // 62.4 GeV
    expect(show('1e-6 J')?.unitString).toBe('TeV'); // 6.24 TeV
    expect(show('1e-3 J')).toBeNull(); // 6.2 PeV: above particle scale, stays SI
    expect(show('5 m')).toBeNull();
  });

  it('cancels factors of one unit whatever their prefixes, and leaves the rest', () => {
    const u = math.multiply(math.unit('2 MeV'), math.divide(math.unit('3 T m'), math.unit('1 keV'))) as never;
    const c = cancelLikeUnits(u) as unknown as {
      units: Array<{ unit: { name: string } }>;
      toNumber(u: string): number;
    };
    expect(c.units.map((f) => f.unit.name)).toEqual(['T', 'm']);
    expect(c.toNumber('T m')).toBeCloseTo(6000, 9);
  });
});

describe('uncertainty in the trade units', () => {
  it('propagates to a momentum in MeV/c with a sensitivity in c⁻¹ and the summary figures without trailing zeros', () => {
    const r = engine.evaluate(
      [{ id: 'u1', kind: 'calc', source: 'T_u = 250 MeV ± 0.5 MeV\np_u = momentumFromKinetic(T_u, m_p)' }],
      { significantFigures: 6, displayUnits: 'trade' },
    );
    const [input, result] = r.cells[0].statements;
    // The input's u as written, not 0.500 MeV (JCGM 100:2008, 7.2.6: an uncertainty is given to at most two significant digits).
    expect(input.uncertainty!.text).toMatch(/^standard uncertainty u = 0\.5 MeV;/);
    expect(result.value!.unit).toBe('MeV / c');
    // dp/dT = (T + mc²)/(pc) (PDG RPP kinematics) = 1188.272 / 729.134 = 1.63 per c; (MeV/c)/MeV cancels to c⁻¹.
    const line = result.uncertainty!.budget[0];
    expect(line.sensitivityText).toBe('1.63 c⁻¹');
    expect(line.uText).toBe('0.5 MeV');
    expect(result.uncertainty!.unit).toBe('MeV / c');
  });
});
