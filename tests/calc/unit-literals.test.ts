import { describe, expect, it } from 'vitest';
import { extractUnitLiterals, unitOfPlaceholder } from '../../lib/calc/unit-literals';

const UNITS = new Set(['m', 's', 'kg', 'T', 'MeV', 'J', 'cm', 'in', 'h', 'ns']);
const read = (line: string) => {
  const { text, literals } = extractUnitLiterals(line, (n) => UNITS.has(n));
  return {
    text: text.replace(/__u_[0-9a-f]+/g, (p) => `[${unitOfPlaceholder(p)}]`),
    units: literals.map((l) => l.unit),
  };
};

describe('unit literals', () => {
  it('takes the unit expression written right after a number', () => {
    expect(read('g_1 = 9.81 m/s^2').text).toBe('g_1 = 9.81 [m/s^2]');
    expect(read('Brho = 2.5 T*m').text).toBe('Brho = 2.5 [T*m]');
    expect(read('x = 1.5e-3 kg*m^2/s^-1').text).toBe('x = 1.5e-3 [kg*m^2/s^-1]');
  });
  it('stops at a space, so what follows is read as usual', () => {
    expect(read('v = 3 m / t').text).toBe('v = 3 [m] / t');
    expect(read('y = 2 m * s').text).toBe('y = 2 [m] * s');
  });
  it('does not take a name that is not a unit', () => {
    expect(read('y = 2 x_1').text).toBe('y = 2 x_1');
    expect(read('y = 2 m_p').text).toBe('y = 2 m_p');
  });
  it('takes the target of to and in, spaces allowed', () => {
    expect(read('Brho to T * m').text).toBe('Brho to [T*m]');
    expect(read('t_1 in ns').text).toBe('t_1 in [ns]');
    expect(read('d = 3 in').text).toBe('d = 3 [in]');
  });
  it('leaves numbers inside names and strings alone', () => {
    expect(read('x2 = a2 m').text).toBe('x2 = a2 m');
    expect(read('s_1 = "5 m"').text).toBe('s_1 = "5 m"');
  });
});
