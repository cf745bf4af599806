// A RevisionPdfData built from a real evaluation by the sheet engine, with invented demo values
// for everything the issuing job would gather (the organisation, project, people and codes are
// fictional). Used by the PDF renderer's test and benchmark.
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import type { CellInput } from '../../lib/calc/types';
import type { RevisionPdfData } from '../../lib/issue/pdf-data';
import { contentHash } from '../../lib/sheets/content-hash';
import type { VersionContent } from '../../lib/sheets/content';
import { CAUTIONS, SAFETY_RELATED_CAUTION } from '../../lib/safety/cautions';

export const FIXTURE_CELLS: CellInput[] = [
  {
    id: 'intro',
    kind: 'text',
    source: [
      '## Beam transport to gantry 2',
      '',
      'The proton **kinetic energy** at the gantry entrance fixes the *magnetic rigidity*, and the speed of any massive particle satisfies $\\beta \\le 1$.',
      '',
      '- rigidity from momentum, $B\\rho = p/q$',
      '- dipole limit checked as a `criterion`',
      '',
      '$$\\gamma = \\frac{1}{\\sqrt{1-\\beta^2}}$$',
    ].join('\n'),
  },
  {
    id: 'rigidity',
    kind: 'calc',
    source: [
      'T_kin = 250 MeV  # kinetic energy at the gantry entrance',
      'p = momentumFromKinetic(T_kin, m_p)',
      'Brho = magneticRigidity(p, q_e) to T*m',
    ].join('\n'),
  },
  {
    id: 'speed',
    kind: 'calc',
    source: [
      '# Lorentz factor of the reference speed 0.6 c',
      'gamma_L = lorentzFactor(0.6)',
      'beta_p = speedFromKinetic(T_kin, m_p) / c',
    ].join('\n'),
  },
  {
    id: 'criteria',
    kind: 'calc',
    source: ['Brho < 3 T*m   # dipole limit of the gantry magnets', 'Brho < 2 T*m   # the 1.8 T reserve case'].join(
      '\n',
    ),
  },
  {
    id: 'mistake',
    kind: 'calc',
    source: 'x_bad = Brho + 2 kg  # deliberate dimension mismatch',
  },
];

export const FIXTURE_SHA_ATTACHMENT_1 = '3f6a1c0e9b2d47a58c1e0f93d2b6a4e7c5b8d09a1f2e3c4b5a69788796a5b4c3';
export const FIXTURE_SHA_ATTACHMENT_2 = '9e8d7c6b5a4f3e2d1c0b9a8f7e6d5c4b3a2f1e0d9c8b7a6f5e4d3c2b1a0f9e8d';

export function buildRevisionPdfData(options: { cells?: CellInput[] } = {}): RevisionPdfData {
  const cells = options.cells ?? FIXTURE_CELLS;
  const engine = createSheetEngine();
  const results = engine.evaluate(cells, { significantFigures: 6 });
  const content: VersionContent = {
    schema: 1,
    title: 'Magnetic rigidity of the 250 MeV proton beam at the gantry 2 entrance',
    safetyRelated: true,
    significantFigures: 6,
    record: {
      objective:
        'Confirm that the gantry 2 dipoles can bend protons of 70 → 250 MeV: Bρ ≤ 3 T·m with β ≤ 0.62 and γ − 1 ≈ 0.27.\n\nThe field tolerance is ±0.5 % (−0.5 %/+0.5 %); units such as m⁻¹, s² and µm appear in the inputs; Δθ and Ω are named as in the magnet specification.',
      inputs: [
        {
          name: 'Maximum kinetic energy',
          value: '250 MeV',
          source: 'TPT2 beam requirements specification TPT2-SPEC-0003',
          sourceRevision: 'C',
        },
        {
          name: 'Dipole bending radius',
          value: '1.35 m',
          source: 'Gantry 2 magnet specification TPT2-SPEC-0011',
          sourceRevision: 'B',
        },
        {
          name: 'Field ripple',
          value: '±1 × 10⁻⁴',
          source: 'Power supply datasheet PS-220, table 4',
          sourceRevision: '2',
        },
      ],
      assumptions: [
        { text: 'The beam is made of protons only (no H₂⁺ contamination).', needsVerification: false },
        { text: 'The energy loss in the vacuum window is below 0.1 MeV, so T ≈ T₀.', needsVerification: true },
      ],
      method:
        'Relativistic kinematics: p from T and m_p, then Bρ = p/q with q = e. Criteria are compared exactly on SI values.',
      references: [
        'CODATA 2022 recommended values of the fundamental physical constants',
        'SI Brochure, 9th edition (2019)',
      ],
      conclusions: 'Bρ = 2.432 13 T·m at 250 MeV, inside the 3 T·m limit with a margin of 18.9 %.',
    },
    cells: cells.map((c) => ({ id: c.id, kind: c.kind, source: c.source })),
    attachments: [
      { name: 'gantry2-dipole-field-map.csv', mediaType: 'text/csv', size: 48_213, sha256: FIXTURE_SHA_ATTACHMENT_1 },
      {
        name: 'TPT2-SPEC-0011-rev-B.pdf',
        mediaType: 'application/pdf',
        size: 1_204_877,
        sha256: FIXTURE_SHA_ATTACHMENT_2,
      },
    ],
  };
  return {
    titleBlock: {
      legalOwner: 'Kestrelwick Beam Systems Ltd',
      identificationNumber: 'TPT2-CALC-0007',
      revisionIndex: 'B',
      dateOfIssue: '2026-12-02',
      title: content.title,
      documentType: 'Calculation',
      creator: 'Ada Pennington',
      approvalPerson: 'Hamid Okonkwo-Reyes',
      status: 'Issued',
      language: 'en',
      project: { code: 'TPT2', name: 'Tarnmoor Proton Therapy Centre — gantry 2 beam transport' },
    },
    safetyRelated: true,
    cautions: [...CAUTIONS, SAFETY_RELATED_CAUTION],
    revisionHistory: [
      {
        revision: 'A',
        date: '2026-10-14',
        version: 3,
        description: 'First issue for the gantry 2 magnet design review',
        approvedBy: 'Hamid Okonkwo-Reyes',
        status: 'Superseded',
      },
      {
        revision: 'B',
        date: '2026-12-02',
        version: 7,
        description: 'Reserve case at 2 T·m added; constants to CODATA 2022',
        approvedBy: 'Hamid Okonkwo-Reyes',
        status: 'Current',
      },
    ],
    version: {
      number: 7,
      sha256: contentHash(content),
      content,
      results,
      engineVersion: results.engineVersion,
      constantsEdition: results.constantsEdition,
    },
    constants: [
      {
        name: 'm_p',
        value: '1.672 621 925 95 × 10⁻²⁷ kg',
        provenance: 'CODATA 2022, standard uncertainty 5.2 × 10⁻³⁷ kg',
      },
      {
        name: 'q_e',
        value: '1.602 176 634 × 10⁻¹⁹ C',
        provenance: 'exact by definition (SI Brochure, 9th edition, 2019)',
      },
      { name: 'c', value: '299 792 458 m/s', provenance: 'exact by definition (SI Brochure, 9th edition, 2019)' },
    ],
    signatures: [
      { printedName: 'Ada Pennington', meaning: 'Prepared', signedAt: '2026-11-27T09:41:12.000Z' },
      { printedName: 'Tomasz Ellery-Whyte', meaning: 'Checked', signedAt: '2026-11-30T16:05:44.000Z' },
      { printedName: 'Hamid Okonkwo-Reyes', meaning: 'Approved', signedAt: '2026-12-01T10:12:09.000Z' },
      { printedName: 'Rosalind Achterberg', meaning: 'Issued', signedAt: '2026-12-02T14:03:07.000Z' },
    ],
    verificationMethod: 'Alternate calculation (NQA-1 Requirement 3 §500)',
    verificationCode: 'K7QF-2M9D-XW4T',
    verifyUrl: 'http://127.0.0.1:3000/verify',
  };
}

/** A long sheet for timing: `n` cells, alternating text and three-statement calculation cells. */
export function generatedCells(n: number): CellInput[] {
  const cells: CellInput[] = [];
  for (let i = 0; i < n; i++) {
    if (i % 4 === 0) {
      cells.push({
        id: `t${i}`,
        kind: 'text',
        source: `### Step ${i}\nThe energy step ${i} keeps $\\beta_{${i}} \\le 1$ and reuses the **rigidity** formula.`,
      });
    } else {
      cells.push({
        id: `c${i}`,
        kind: 'calc',
        source: [
          `T_${i} = ${70 + i} MeV  # step ${i}`,
          `p_${i} = momentumFromKinetic(T_${i}, m_p)`,
          `B_${i} = magneticRigidity(p_${i}, q_e) to T*m`,
          `B_${i} < 3 T*m`,
        ].join('\n'),
      });
    }
  }
  return cells;
}
