// Starter sheets of the demo installation: one worked calculation per kind of practitioner, each in
// our own invented scenario, with its record filled in, a design criterion and a sweep or plot where
// it helps. An originator starts a new sheet from any of them ("Start from…", lib/sheets/start-from.ts).
// Every organisation, facility and figure here is invented demo data, not design data; the physics
// and the published constants are real.
import { emptyRecord, versionContentSchema, type VersionContent } from '../lib/sheets/content';
import { NEW_SHEET_DISPLAY_UNITS } from '../lib/calc/display-units';

export interface StarterSheet {
  number: number;
  content: VersionContent;
}

const starter = (
  number: number,
  partial: Omit<VersionContent, 'schema' | 'attachments' | 'significantFigures' | 'displayUnits'>,
): StarterSheet => ({
  number,
  content: versionContentSchema.parse({
    schema: 1,
    significantFigures: 6,
    displayUnits: NEW_SHEET_DISPLAY_UNITS,
    attachments: [],
    ...partial,
  }),
});

/** The starters, numbered after the demo and study sheets (1–5). */
export function demoStarterSheets(): StarterSheet[] {
  return [
    starter(6, {
      title: 'Starter — beam line: dipole field and time of flight over the energy range',
      safetyRelated: false,
      record: {
        ...emptyRecord(),
        objective:
          'For the 60° dipoles of the TPT2 fixed-beam transfer line, show the field needed over 70–230 MeV is below the rated field, and give the time of flight over the line for the timing system.',
        inputs: [
          {
            name: 'Highest energy in the fixed-beam line',
            value: '230 MeV',
            source: 'TPT2 fixed-beam line requirements (demo)',
            sourceRevision: 'A',
            cell: 'T_top',
          },
          {
            name: 'Dipole bending radius',
            value: '1.35 m',
            source: 'Fixed-beam line layout drawing (demo)',
            sourceRevision: 'A',
            cell: 'rho_d',
          },
          {
            name: 'Line length, degrader exit to isocentre',
            value: '21.4 m',
            source: 'Fixed-beam line layout drawing (demo)',
            sourceRevision: 'A',
            cell: 'L_line',
          },
        ],
        assumptions: [
          { text: 'Protons on the design orbit; energy spread and fringe fields neglected.', needsVerification: true },
        ],
        method:
          'Relativistic momentum from kinetic energy; Bρ = p/q; B = Bρ/ρ; time of flight = L/v (PDG, Review of Particle Physics, "Kinematics").',
        references: ['Particle Data Group, Review of Particle Physics, section "Kinematics"'],
        conclusions: "A starter: replace the inputs with the project's own and state the conclusions after evaluation.",
      },
      cells: [
        {
          id: 'intro',
          kind: 'text',
          source: 'The highest energy sets the field; the sweep shows the margin over the whole range.',
        },
        {
          id: 'field',
          kind: 'calc',
          source: [
            'T_top = 230 MeV                  # highest energy in the line',
            'rho_d = 1.35 m                   # dipole bending radius',
            'Brho_top = magneticRigidity(momentumFromKinetic(T_top, m_p), q_e) to T*m',
            'B_top = Brho_top / rho_d to T',
            'B_top < 1.75 T                   # design criterion: below the rated field (demo)',
          ].join('\n'),
        },
        {
          id: 'timing',
          kind: 'calc',
          source: [
            'L_line = 21.4 m                  # degrader exit to isocentre',
            't_line = timeOfFlight(L_line, T_top, m_p) to ns',
          ].join('\n'),
        },
        {
          id: 'sweep',
          kind: 'calc',
          source: [
            'sweep(T_top, steps(70 MeV, 230 MeV, 40 MeV), Brho_top, B_top, t_line)',
            'plot(T_top, points(70 MeV, 230 MeV, 81), B_top)',
          ].join('\n'),
        },
      ],
    }),
    starter(7, {
      title: 'Starter — ion therapy: rigidity of fully stripped carbon ions at the gantry',
      safetyRelated: false,
      record: {
        ...emptyRecord(),
        objective:
          'Show that a fully stripped ¹²C beam at the highest treatment energy per nucleon stays within the maximum rigidity of the planned ion gantry.',
        inputs: [
          {
            name: 'Highest energy per nucleon',
            value: '400 MeV/u',
            source: 'Ion gantry study brief (demo)',
            sourceRevision: 'A',
            cell: 'T_n',
          },
          {
            name: 'Maximum gantry rigidity',
            value: '6.6 T m',
            source: 'Ion gantry study brief (demo)',
            sourceRevision: 'A',
            cell: 'Brho_limit',
          },
        ],
        assumptions: [
          {
            text: "The ion mass is the ¹²C atomic mass (12 u exactly) less six electron masses, with the electrons' total binding energy added back (Lunney, Pearson and Thibault 2003).",
            needsVerification: false,
          },
          {
            text: 'Energy per nucleon is the kinetic energy divided by the mass number A = 12 (MeV/u as the therapy trade writes it).',
            needsVerification: false,
          },
        ],
        method:
          'T = A·(T/A); p from T and the ion mass; Bρ = p/(Qe) with charge state Q = 6; the inverse gives the highest energy per nucleon the gantry takes.',
        references: [
          'CODATA 2022 recommended values (m_u, m_e)',
          'AME 2020 atomic mass evaluation',
          'Lunney, Pearson and Thibault, Rev. Mod. Phys. 75 (2003) 1021, eq. A4',
          'Particle Data Group, Review of Particle Physics, section "Kinematics"',
        ],
        conclusions: "A starter: replace the inputs with the project's own and state the conclusions after evaluation.",
      },
      cells: [
        {
          id: 'ion',
          kind: 'calc',
          source: [
            'A_C = 12                         # mass number',
            'Q_C = 6                          # charge state: fully stripped',
            'm_C6 = ionMass(M_C12, 6, Q_C)    # the atom less its six electrons, their binding energy added back',
            'T_n = 400 MeV/u                  # kinetic energy per nucleon',
            'Brho_C = rigidityFromKineticPerNucleon(T_n, A_C, m_C6, Q_C) to T*m',
            'Brho_limit = 6.6 T*m             # maximum gantry rigidity (demo)',
            'Brho_C < Brho_limit              # design criterion',
            'T_n_top = kineticPerNucleonFromRigidity(Brho_limit, A_C, m_C6, Q_C)   # MeV/u, per nucleon: the most the gantry takes',
          ].join('\n'),
        },
        { id: 'range', kind: 'calc', source: 'sweep(T_n, steps(100 MeV/u, 400 MeV/u, 50 MeV/u), Brho_C)' },
      ],
    }),
    starter(8, {
      title: 'Starter — electron optics: relativistic wavelength and interaction constant of the 300 kV column',
      safetyRelated: false,
      record: {
        ...emptyRecord(),
        objective:
          'For the 300 kV inspection column of the Brackenhurst metrology laboratory (demo), give the relativistically corrected voltage, the electron wavelength and the interaction constant, and show the wavelength meets the resolution budget.',
        inputs: [
          {
            name: 'Accelerating voltage',
            value: '300 kV',
            source: 'Column specification (demo)',
            sourceRevision: 'B',
            cell: 'U_acc',
          },
        ],
        method: 'Relativistically corrected voltage U* = U(1 + eU/(2mc²)); λ = h/√(2 m e U*); σ = 2π m e λ/h² · γ.',
        references: ['Reimer and Kohl, Transmission Electron Microscopy, 5th ed., Springer (2008), ch. 2'],
        conclusions: "A starter: replace the inputs with the project's own and state the conclusions after evaluation.",
      },
      cells: [
        {
          id: 'column',
          kind: 'calc',
          source: [
            'U_acc = 300 kV                   # accelerating voltage',
            'U_star = relativisticVoltage(U_acc) to kV',
            'lambda_col = electronWavelength(U_acc) to pm',
            'sigma_col = interactionConstant(U_acc)',
            'lambda_col < 2.0 pm              # design criterion: the resolution budget (demo)',
          ].join('\n'),
        },
        { id: 'voltages', kind: 'calc', source: 'sweep(U_acc, steps(80 kV, 300 kV, 20 kV), U_star, lambda_col)' },
      ],
    }),
    starter(9, {
      title: 'Starter — satellite timing: clock rate offset and eccentricity correction for a navigation orbit',
      safetyRelated: false,
      record: {
        ...emptyRecord(),
        objective:
          "For the Corvid regional timing constellation (demo), orbit radius 27 900 km, give the net fractional rate of the on-board clocks against clocks on the geoid, the factory frequency offset of the 10.23 MHz reference (set low so that it reads 10.23 MHz on the ground), the eccentricity correction amplitude, and show the eccentricity correction stays within the receivers' correction range.",
        inputs: [
          {
            name: 'Orbit semi-major axis',
            value: '27900 km',
            source: 'Corvid constellation design note (demo)',
            sourceRevision: 'A',
            cell: 'a_orb',
          },
          {
            name: 'Orbit eccentricity (maximum)',
            value: '0.015',
            source: 'Corvid constellation design note (demo)',
            sourceRevision: 'A',
            cell: 'e_orb',
          },
        ],
        assumptions: [
          { text: 'Weak-field, first-order terms only; Earth oblateness (J2) neglected.', needsVerification: true },
        ],
        method:
          'Net rate = gravitational term GM/c²(1/R_E − 1/a) less the velocity term GM/(2ac²), referred to the geoid with W₀ (IAU 2000 B1.9); eccentricity correction Δt_r = (2/c²)√(GM a) e sin E (IS-GPS-200 §20.3.3.3.3.1).',
        references: ['IS-GPS-200, §3.3.1.1 and §20.3.3.3.3.1', 'IERS Conventions (2010), table 1.1'],
        conclusions: "A starter: replace the inputs with the project's own and state the conclusions after evaluation.",
      },
      cells: [
        {
          id: 'rate',
          kind: 'calc',
          source: [
            'a_orb = 27900 km                 # orbit radius',
            'e_orb = 0.015                    # eccentricity',
            'f_ref = 10.23 MHz                # on-board reference',
            'y_orb = orbitClockRateOffset(a_orb)',
            'df_factory = -y_orb * f_ref to mHz   # factory offset of the reference',
            'drift_day = y_orb * 1 day to us  # gain per day without the factory offset',
            'dt_ecc = eccentricityClockCorrection(a_orb, e_orb, 90 deg) to ns',
            "abs(dt_ecc) < 40 ns              # design criterion: within the receivers' correction range (demo)",
          ].join('\n'),
        },
        { id: 'radii', kind: 'calc', source: 'plot(a_orb, points(7000 km, 42164 km, 120), y_orb)' },
      ],
    }),
    starter(10, {
      title: 'Starter — mission analysis: propellant mass ratio and clock offset of a fast probe',
      safetyRelated: false,
      record: {
        ...emptyRecord(),
        objective:
          "For the Halden heliopause probe study (demo), give the mass ratio of the ion-drive stage for its Δv, and the probe clock's accumulated lag against coordinate time over the cruise.",
        inputs: [
          {
            name: 'Stage Δv',
            value: '95 km/s',
            source: 'Halden mission study, trajectory note (demo)',
            sourceRevision: 'A',
            cell: 'dv_stage',
          },
          {
            name: 'Exhaust speed of the ion drive',
            value: '52 km/s',
            source: 'Ion drive datasheet (demo)',
            sourceRevision: 'A',
            cell: 'v_ex',
          },
          {
            name: 'Cruise duration',
            value: '14 year',
            source: 'Halden mission study, trajectory note (demo)',
            sourceRevision: 'A',
            cell: 't_cruise',
          },
        ],
        assumptions: [
          {
            text: "Constant cruise speed after the burn; the Sun's potential is left out of the clock term (see the timing starter for that).",
            needsVerification: true,
          },
        ],
        method:
          'Relativistic rocket equation, mass ratio = ((1 + β)/(1 − β))^(c/(2 v_ex)); proper time τ = t/γ, the lag t − τ = t(γ − 1)/γ.',
        references: ['Forward, "A transparent derivation of the relativistic rocket equation", AIAA 95-3060 (1995)'],
        conclusions: "A starter: replace the inputs with the project's own and state the conclusions after evaluation.",
      },
      cells: [
        {
          id: 'stage',
          kind: 'calc',
          source: [
            'dv_stage = 95 km/s               # stage Δv',
            'v_ex = 52 km/s                   # exhaust speed',
            'R_m = massRatio(dv_stage, v_ex)',
            "R_m < 7                          # design criterion: the stage's structural limit (demo)",
            't_cruise = 14 year               # Julian years',
            '# τ = t/γ; the lag t − τ = t (γ − 1)/γ, with γ − 1 computed without cancellation',
            'g1_cruise = gammaMinusOne(dv_stage)',
            'lag = t_cruise * g1_cruise / (1 + g1_cruise) to s',
          ].join('\n'),
        },
        { id: 'exhaust', kind: 'calc', source: 'sweep(v_ex, steps(30 km/s, 60 km/s, 5 km/s), R_m)' },
      ],
    }),
  ];
}
