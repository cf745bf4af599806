// The units a result is shown in: the sheet setting `displayUnits` (lib/sheets/content.ts) chooses
// the SI's own units ('si') or the trade's ('trade': energies, momenta and masses at particle scale
// in the electronvolt family, as the PDG Review of Particle Physics writes them: MeV, GeV/c, MeV/c²).
// Only the display changes: the stored value, DisplayValue.number (full precision, in the unit
// shown) and the version content's cells are the same either way.
import type { MathJsInstance, Unit } from 'mathjs';

export type DisplayUnits = 'si' | 'trade';

export const DISPLAY_UNITS: readonly DisplayUnits[] = ['si', 'trade'];

/**
 * What a version whose content has no `displayUnits` field shows: the SI's units, as every version
 * did before the setting existed (its content, and so its SHA-256, is unchanged).
 */
export const DISPLAY_UNITS_DEFAULT: DisplayUnits = 'si';

/** What a new sheet (created, imported or seeded) records explicitly. */
export const NEW_SHEET_DISPLAY_UNITS: DisplayUnits = 'trade';

/** Labels for the editor, the comparison and the PDF. */
export const DISPLAY_UNITS_LABEL: Record<DisplayUnits, string> = {
  si: 'SI units',
  trade: 'Accelerator units (eV, eV/c, eV/c²)',
};

const modes = new WeakMap<MathJsInstance, DisplayUnits>();

/** Sets the display units for what the instance shows next (the engine sets it for each evaluation). */
export function setDisplayUnits(math: MathJsInstance, mode: DisplayUnits | undefined): void {
  modes.set(math, mode ?? DISPLAY_UNITS_DEFAULT);
}

export function displayUnitsOf(math: MathJsInstance): DisplayUnits {
  return modes.get(math) ?? DISPLAY_UNITS_DEFAULT;
}

interface Factor {
  unit: { name: string; base: { key: string } };
  prefix: { name: string; value: number };
  power: number;
}

interface UnitInternals {
  value: number | null;
  units: Factor[];
  fixPrefix: boolean;
  skipAutomaticSimplification: boolean;
  clone(): UnitInternals;
  equalBase(other: unknown): boolean;
}

/**
 * Removes factors of the same unit that cancel (`MeV·T·m/MeV` → T·m, `MeV/u · u` → MeV), whatever
 * their prefixes: the value is held in SI base units, so dropping factors whose powers sum to zero
 * changes only the unit the number is shown in. Returns the unit itself when nothing cancels.
 * (The dimension is unchanged: the factors removed have a net dimension of zero.)
 */
export function cancelLikeUnits<T>(unit: T): T {
  const u = unit as unknown as UnitInternals;
  if (u.units.length < 2) return unit;
  const sums = new Map<string, number>();
  for (const f of u.units) sums.set(f.unit.name, (sums.get(f.unit.name) ?? 0) + f.power);
  const gone = new Set([...sums].filter(([, p]) => Math.abs(p) < 1e-12).map(([name]) => name));
  if (gone.size === 0) return unit;
  const r = u.clone();
  r.units = r.units.filter((f) => !gone.has(f.unit.name));
  // What is left is shown as written (T·m, MeV), not re-expressed in the SI's unit of its dimension.
  r.skipAutomaticSimplification = true;
  return r as unknown as T;
}

/** The electronvolt prefixes the trade uses, largest first, with their factors. */
const EV_PREFIXES: ReadonlyArray<[string, number]> = [
  ['T', 1e12],
  ['G', 1e9],
  ['M', 1e6],
  ['k', 1e3],
  ['', 1],
];

/** 1 eV in joules (SI Brochure 9th ed., table 8, exact). */
const EV = 1.602176634e-19;
/** c in m/s (SI 2019, exact). */
const C = 299_792_458;

/**
 * The quantities shown in the eV family, their SI unit, the factor from eV to SI for the family's
 * base (eV, eV/c, eV/c²), how the unit is written for mathjs, and the largest SI magnitude that is
 * still "particle scale" (1 PeV, 1 PeV/c, 1 PeV/c²): above it (a stored beam energy in MJ, a
 * mass in kilograms) the SI unit stays.
 */
const FAMILIES = [
  { si: 'J', perEv: EV, suffix: '' },
  { si: 'kg m / s', perEv: EV / C, suffix: ' / c' },
  { si: 'kg', perEv: EV / (C * C), suffix: ' / c^2' },
] as const;
const PARTICLE_SCALE_EV = 1e15;

/** SI-coherent forms a library function or a constant returns (J, kg·m/s, kg): not a unit the author chose. */
function isCoherentSi(u: UnitInternals): boolean {
  const names = u.units
    .map((f) => `${f.prefix.name}${f.unit.name}^${f.power}`)
    .sort()
    .join(' ');
  return names === 'J^1' || names === 'kg^1' || names === 'g^1 m^1 s^-1' || names === 'kg^1 m^1 s^-1';
}

const references = new WeakMap<MathJsInstance, Unit[]>();

/**
 * In the trade's units, the number and unit a quantity is shown in, or null when it stays as the
 * SI display shows it. An energy, momentum or mass at particle scale goes to the eV family with
 * the prefix chosen by magnitude (keV … TeV): m_p·c² is 938.272 MeV, never 150 pJ; a momentum
 * from the library is in MeV/c or GeV/c. A unit the author wrote (`250 MeV`, `0.25 GeV`, `3 kg`,
 * `x to J`) is kept; so are units of other kinds.
 */
export function tradeDisplay(math: MathJsInstance, unit: Unit): { number: number; unitString: string } | null {
  const u = unit as unknown as UnitInternals;
  if (u.value === null || u.fixPrefix) return null;
  if (u.skipAutomaticSimplification && !isCoherentSi(u)) return null;
  let refs = references.get(math);
  if (!refs) {
    refs = FAMILIES.map((f) => math.unit(f.si));
    references.set(math, refs);
  }
  const index = refs.findIndex((r) => u.equalBase(r));
  if (index < 0) return null;
  const family = FAMILIES[index];
  const inEv = (u.value as number) / family.perEv;
  if (!Number.isFinite(inEv) || inEv === 0 || Math.abs(inEv) >= PARTICLE_SCALE_EV) return null;
  const [prefix, factor] = EV_PREFIXES.find(([, f]) => Math.abs(inEv) >= f) ?? EV_PREFIXES[EV_PREFIXES.length - 1];
  return { number: inEv / factor, unitString: `${prefix}eV${family.suffix}` };
}

/**
 * Examples of the trade's units for the function reference (app/reference/page.tsx), each evaluated
 * by tests/calc/trade-units.test.ts against the result shown here.
 */
export const UNIT_EXAMPLES: ReadonlyArray<{
  source: string;
  displayUnits: DisplayUnits;
  result: string;
  note: string;
}> = [
  {
    source: 'p_1 = 1.2 GeV/c',
    displayUnits: 'si',
    result: '1.200 00 GeV/c',
    note: 'a momentum in GeV/c (also eV/c, keV/c, MeV/c, TeV/c)',
  },
  {
    source: 'p_2 = momentumFromKinetic(250 MeV, m_p) to MeV/c',
    displayUnits: 'si',
    result: '729.134 MeV/c',
    note: 'to converts to MeV/c; number(p, "MeV/c") gives the plain number',
  },
  {
    source: 'm_1 = 938.272 MeV/c^2 to kg',
    displayUnits: 'si',
    result: '1.672 62 × 10⁻²⁷ kg',
    note: 'a mass in MeV/c² (also eV/c², keV/c², GeV/c², TeV/c²)',
  },
  {
    source: 'E_1 = 430 MeV/u * 12 u to MeV',
    displayUnits: 'si',
    result: '5160 MeV',
    note: 'u is the unified atomic mass unit (= Da); u and a are units only where the sheet does not define them',
  },
  {
    source: 't_1 = 1 yr to day',
    displayUnits: 'si',
    result: '365.250 day',
    note: 'yr and a are the Julian year, 365.25 d',
  },
  { source: 'w_1 = 5 ppm * 2 m', displayUnits: 'si', result: '10 µm', note: 'ppm and ppb are ratios (10⁻⁶, 10⁻⁹)' },
  {
    source: 'r_1 = 4.5e-10 to us/day',
    displayUnits: 'si',
    result: '38.8800 µs/day',
    note: 'a rate unit keeps its name',
  },
  {
    source: 'v_1 = 2 rad/s * 3 m',
    displayUnits: 'si',
    result: '6 m/s',
    note: 'an angle times a length is a length: ω·r is a speed',
  },
  {
    source: 'B_1 = 1 MeV * 2 T*m / (1 MeV)',
    displayUnits: 'si',
    result: '2 T·m',
    note: 'factors of one unit that cancel are left out',
  },
  {
    source: 'E_0 = m_p * c^2',
    displayUnits: 'trade',
    result: '938.272 MeV',
    note: 'in accelerator units an energy at particle scale is in eV … TeV',
  },
  { source: 'E_0 = m_p * c^2', displayUnits: 'si', result: '150.328 pJ', note: 'the same value in SI units' },
  {
    source: 'p_3 = momentumFromKinetic(250 MeV, m_p)',
    displayUnits: 'trade',
    result: '729.134 MeV/c',
    note: 'in accelerator units a momentum is in eV/c … TeV/c, a mass in eV/c² … TeV/c²',
  },
];
