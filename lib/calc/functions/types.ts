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
  | 'number';

/**
 * What the kernel returns and how the engine presents it:
 * - speed: β → a velocity in m/s
 * - number: a plain number
 * - energy → J; momentum → kg m/s; time → s; length → m; acceleration → m/s²;
 *   rigidity → T m; mass → kg; angle → rad
 * - pair-time-length: [t (s), x (m)] for a Lorentz transformation of an event
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
  | 'pair-time-length';

export interface ParamDoc {
  name: string;
  kind: ParamKind;
  description: string;
}

export interface CalcFunctionDoc {
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

export interface CalcFunction {
  name: string;
  params: ParamDoc[];
  returns: ReturnKind;
  doc: CalcFunctionDoc;
  kernel: (...args: number[]) => number | [number, number];
}

export class DomainError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'DomainError';
  }
}
