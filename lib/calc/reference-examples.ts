// Examples shown on the function reference page (app/reference/page.tsx) that are not a library
// function's own `doc.example`: the naming rules, and the setting each study statement's example
// needs. tests/calc/reference-examples.test.ts evaluates every one of them (and every function's
// documented example) through the engine and compares the displayed result.

export interface ReferenceExample {
  /** The statements, one per line, evaluated as one cell. */
  source: string;
  /** The displayed result of the last line (`DisplayValue.text`), or null when it is an error. */
  result: string | null;
  /** For an error: a part of the message it shows. */
  error?: string;
  note: string;
}

/** Names: Greek letters, and a sheet's definition taking precedence over a built-in function. */
export const NAME_EXAMPLES: readonly ReferenceExample[] = [
  {
    source: 'γ = lorentzFactor(0.6)',
    result: '1.250 00',
    note: 'Greek letters are letters: γ, β, Δp, θ_1 (typeset as Greek)',
  },
  {
    source: 'gamma = lorentzFactor(0.6)',
    result: '1.250 00',
    note: 'gamma is also a built-in function (Γ); the sheet may define the name',
  },
  {
    source: 'gamma = 1.25\nz = gamma(5)',
    result: null,
    error: "is this sheet's own quantity",
    note: "once the sheet defines gamma, every use of gamma in the sheet is the sheet's: a call is an error, never the built-in Γ",
  },
  {
    source: 'sin(x) = 2 * x\ny = sin(3)',
    result: '6',
    note: 'a function of the sheet named like a built-in one replaces it for the whole sheet',
  },
  {
    source: 'B_rho = 1 T m',
    result: '1 T·m',
    note: 'unit names joined by a space after a number multiply (refused as ambiguous where the sheet defines one of them, e.g. m)',
  },
];

/**
 * The statements each study example of STUDY_FUNCTION_DOCS (study-functions.ts) needs above it,
 * keyed by the function's name; an example without an entry needs none.
 */
export const STUDY_EXAMPLE_SETUP: Readonly<Record<string, string>> = {
  correlation: 'V_m = 5 V ± 0.1 V\nI_m = 2 A ± 0.05 A',
  sweep:
    'T_kin = 250 MeV\nbeta = speedFromKinetic(T_kin, m_p) / c\ngamma = gammaFromKinetic(T_kin, m_p)\np = momentumFromKinetic(T_kin, m_p)\nBrho = magneticRigidity(p, 1)',
  plot: 'T_kin = 250 MeV\np = momentumFromKinetic(T_kin, m_p)\nBrho = magneticRigidity(p, 1)\nBrho_max = 2.5 T*m',
  dataPoints: 'T_kin = 250 MeV\np = momentumFromKinetic(T_kin, m_p)\nBrho = magneticRigidity(p, 1)',
  spacetime: 'a0 = q_e * 1 MV/m / m_e\nt = 1 ns\nx_e = hyperbolicDistance(a0, t)\nd_h = rindlerHorizonDistance(a0)',
};
