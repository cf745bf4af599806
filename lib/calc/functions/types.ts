// The contract between the relativistic library and the engine.
//
// Each function lives in its own file and exports one `CalcFunction`. Its `kernel` works on plain
// SI numbers (speeds as β = v/c); the engine converts the sheet's arguments (mathjs Units or plain
// numbers) to those numbers according to `params`, calls the kernel and wraps the result according
// to `returns`. Domain errors are thrown as `DomainError` with a message a sheet author can act on.

/**
 * What a parameter accepts, and the SI number the kernel receives:
 * - speed: a velocity (any speed unit) or a plain number read as β → β (dimensionless)
 * - mass: a mass, or an energy read as mc² → kg
 * - energy: an energy → J
 * - momentum: a momentum, or an energy read as pc → kg m/s
 * - time → s; length → m; acceleration → m/s²; voltage → V
 * - charge: a charge, or a plain INTEGER charge number (6 for C⁶⁺, −1 for an electron) → C; any other
 *   plain number is refused (Euler's number, a sheet's bare `e`, with a pointer to `q_e`)
 * - angle: an angle, or a plain number in radians → rad
 * - rigidity: a magnetic rigidity Bρ (T m, or anything of that dimension, such as momentum/charge) → T m
 * - gravitational-parameter: GM of a body (m³/s², e.g. GM_E) → m³/s²
 * - area → m²; magnetic-field: a magnetic flux density → T
 * - energy-per-nucleon: a kinetic energy PER NUCLEON (T/A, A the mass number), as an energy (430 MeV)
 *   or as the trade writes it, 430 MeV/u: an energy per mass whose mass unit is read as one nucleon
 *   (the value times m_u) → J per nucleon. Not per atomic mass unit of the ion's mass: those differ
 *   by m/(A u) (see lib/calc/README.md, "Ions: atomic masses, charge states and the energy per nucleon")
 * - number: a plain (dimensionless) number
 */
export type ParamKind =
  | 'speed'
  | 'mass'
  | 'energy'
  | 'momentum'
  | 'time'
  | 'length'
  | 'acceleration'
  | 'voltage'
  | 'charge'
  | 'angle'
  | 'rigidity'
  | 'gravitational-parameter'
  | 'area'
  | 'magnetic-field'
  | 'energy-per-nucleon'
  | 'number';

/**
 * What the kernel returns and how the engine presents it:
 * - speed: β → a velocity in m/s; but a plain β when the function has speed parameters and every
 *   one of them was given as a plain number (addVelocities(0.5, 0.5) is 0.8, as speeds read plain
 *   numbers as β)
 * - number: a plain number
 * - energy → J; momentum → kg m/s; time → s; length → m; acceleration → m/s²;
 *   rigidity → T m; mass → kg; angle → rad
 * - voltage → V; frequency → Hz; interaction-constant → 1/(V m) (radians of phase per volt-metre of projected potential)
 * - pair-time-length: [t (s), x (m)] for a Lorentz transformation of an event
 * - energy-per-nucleon: the kernel's J per nucleon → a quantity in MeV/u (the value over m_u): never a
 *   plain energy, so a per-nucleon result cannot be mistaken for the total kinetic energy (`to MeV` is
 *   refused as a dimension mismatch; `× A × 1 u` gives the total)
 */
export type ReturnKind =
  | 'speed'
  | 'number'
  | 'energy'
  | 'momentum'
  | 'time'
  | 'length'
  | 'acceleration'
  | 'rigidity'
  | 'mass'
  | 'angle'
  | 'voltage'
  | 'interaction-constant'
  | 'frequency'
  | 'pair-time-length'
  | 'energy-per-nucleon';

export interface ParamDoc {
  name: string;
  kind: ParamKind;
  description: string;
}

interface CalcFunctionDoc {
  /** What it computes, one sentence. */
  summary: string;
  /** The formula in TeX, as the engine evaluates it (stable form), and the textbook form if different. */
  formula: string;
  /** The domain, with what is refused. */
  domain: string;
  /** A sheet statement that uses it, and what it gives. */
  example: string;
  exampleResult: string;
  /** Published source of the formula. */
  source: string;
  /** Why the formulation is numerically careful, when it differs from the textbook form. */
  numerics?: string;
}

/**
 * A speed carried with more precision than its double β: β and s = 1/γ = √(1 − β²), each as a
 * double-double [hi, lo] (about 106 bits). Near c the double β keeps almost nothing of 1 − β (at
 * γ = 3e6 it rounds to within a few ulp of 1, so γ from it is off by 3e-4 relative); s keeps it
 * all. The speed functions produce one beside their double result (`preciseKernel`), the adapter
 * keeps it with the mathjs value it returns, and hands it back, instead of the double β, when that
 * same value is passed to a speed parameter (see lib/calc/README.md, "The precise-speed companion").
 * Light is β = ±1 with s = 0.
 */
export interface PreciseSpeed {
  readonly beta: readonly [number, number];
  readonly inverseGamma: readonly [number, number];
}

/** What a kernel receives for one parameter: an SI number, or, for a `speed` parameter, a PreciseSpeed. */
export type KernelArgument = number | PreciseSpeed;

export interface CalcFunction {
  name: string;
  params: ParamDoc[];
  returns: ReturnKind;
  doc: CalcFunctionDoc;
  /**
   * The numeric kernel on SI numbers. A `speed` parameter receives β as a number, or a PreciseSpeed
   * (every kernel with a speed parameter accepts both, and is at least as accurate with the latter);
   * all other parameters receive numbers.
   */
  kernel(...args: KernelArgument[]): number | [number, number];
  /**
   * Only for `returns: 'speed'`: the result with its precise companion (or a plain β where none can
   * be formed). `kernel(...)` is always the double β of this result, below 1 unless it is light.
   */
  preciseKernel?(...args: KernelArgument[]): PreciseSpeed | number;
}

export class DomainError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'DomainError';
  }
}
