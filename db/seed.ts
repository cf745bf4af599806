// Demo data for a local start: a fictional organisation, one project, the demo accounts and a few
// sheets. Every name here is invented; the engineering figures are demo values, not design data.
//
// Idempotent: it only adds what is missing, so a second start never duplicates or wipes anything.
// It runs only for the local demo cluster (`npm start` without DATABASE_URL), never in production.
import { hash } from '@node-rs/argon2';
import { sql, type Kysely } from 'kysely';
import { emptyRecord, versionContentSchema, type VersionContent } from '../lib/sheets/content';
import { contentHash } from '../lib/sheets/content-hash';
import { createSheetEngine, type SheetEngine } from '../lib/calc/sheet-engine';
import { NEW_SHEET_DISPLAY_UNITS } from '../lib/calc/display-units';
import type { Database, ProjectRole } from './schema';
import { demoStarterSheets } from './starters';

export const DEMO_PASSWORD = 'worldsheet-demo';

export const DEMO_ORGANISATION = 'Kestrelwick Beam Systems Ltd';
export const DEMO_PROJECT = {
  code: 'TPT2',
  name: 'Tarnmoor Proton Therapy Centre — gantry 2 beam transport',
  legal_owner: DEMO_ORGANISATION,
  revision_scheme: 'letters' as const,
};

export const DEMO_ACCOUNTS: ReadonlyArray<{ email: string; name: string; roles: ProjectRole[]; admin?: boolean }> = [
  { email: 'originator@demo.test', name: 'Demo Originator', roles: ['originator'] },
  { email: 'checker@demo.test', name: 'Demo Checker', roles: ['checker'] },
  { email: 'approver@demo.test', name: 'Demo Approver', roles: ['approver'] },
  { email: 'controller@demo.test', name: 'Demo Document Controller', roles: ['controller'] },
  { email: 'viewer@demo.test', name: 'Demo Viewer', roles: ['viewer'] },
  { email: 'admin@demo.test', name: 'Demo Administrator', roles: [], admin: true },
];

type DemoSheet = { number: number; content: VersionContent };

const sheet = (
  number: number,
  partial: Omit<VersionContent, 'schema' | 'attachments' | 'significantFigures' | 'displayUnits'>,
): DemoSheet => ({
  number,
  content: versionContentSchema.parse({
    schema: 1,
    significantFigures: 6,
    displayUnits: NEW_SHEET_DISPLAY_UNITS,
    attachments: [],
    ...partial,
  }),
});

export function demoSheets(): DemoSheet[] {
  return [
    sheet(1, {
      title: 'Dipole field over the treatment energy range, 70–250 MeV protons',
      safetyRelated: true,
      record: {
        objective:
          'Show that the gantry 2 bending dipoles reach the field needed to bend the highest treatment energy on the design radius, with margin to the rated field.',
        inputs: [
          {
            name: 'Highest treatment energy',
            value: '250 MeV',
            source: 'TPT2 beam requirements specification (demo)',
            sourceRevision: 'C',
          },
          {
            name: 'Dipole bending radius',
            value: '1.5 m',
            source: 'TPT2 gantry layout drawing (demo)',
            sourceRevision: 'B',
          },
          { name: 'Dipole rated field', value: '1.8 T', source: 'Dipole magnet datasheet (demo)', sourceRevision: 'A' },
        ],
        assumptions: [
          { text: 'Singly charged protons; the beam is on the design orbit.', needsVerification: false },
          { text: 'Energy spread of the degraded beam is neglected.', needsVerification: true },
        ],
        method: 'Relativistic momentum from kinetic energy, magnetic rigidity Bρ = p/q, field B = Bρ/ρ.',
        references: ['Particle Data Group, Review of Particle Physics, section "Kinematics"'],
        conclusions: 'To be stated after evaluation and check.',
      },
      cells: [
        {
          id: 'intro',
          kind: 'text',
          source:
            'The dipoles must bend protons of every treatment energy on the design radius. The magnetic rigidity $B\\rho = p/q$ of the highest energy sets the field.',
        },
        {
          id: 'rigidity',
          kind: 'calc',
          source: [
            'T_max = 250 MeV                  # highest treatment energy',
            'p_max = momentumFromKinetic(T_max, m_p)',
            'Brho_max = magneticRigidity(p_max, q_e) to T*m',
            'rho = 1.5 m                      # dipole bending radius',
            'B_max = Brho_max / rho to T',
            'B_max < 1.8 T                    # design criterion: below the rated field',
          ].join('\n'),
        },
        {
          id: 'lowest',
          kind: 'calc',
          source: [
            'T_min = 70 MeV                   # lowest treatment energy',
            'v_min = speedFromKinetic(T_min, m_p)',
            'gamma_min = lorentzFactor(v_min)',
            'Brho_min = magneticRigidity(momentumFromKinetic(T_min, m_p), q_e) to T*m',
          ].join('\n'),
        },
      ],
    }),
    sheet(2, {
      title: 'Time of flight between beam position monitors BPM-3 and BPM-7',
      safetyRelated: false,
      record: {
        ...emptyRecord(),
        objective:
          'Time of flight of a 150 MeV proton bunch between two monitors, for the timing of the position read-out.',
        inputs: [
          { name: 'Monitor spacing', value: '12.5 m', source: 'TPT2 beam-line survey (demo)', sourceRevision: 'A' },
        ],
        method: 'Speed from kinetic energy; time of flight = path length / speed.',
      },
      cells: [
        {
          id: 'tof',
          kind: 'calc',
          source: [
            'd_bpm = 12.5 m                   # path length between the monitors',
            'T_beam = 150 MeV',
            'v_beam = speedFromKinetic(T_beam, m_p)',
            't_flight = d_bpm / v_beam to ns',
          ].join('\n'),
        },
      ],
    }),
    sheet(3, {
      title: 'Electron wavelength and speed in the beam-profile monitor gun',
      safetyRelated: false,
      record: {
        ...emptyRecord(),
        objective: 'De Broglie wavelength and speed of the 60 kV probe electrons of the beam-profile monitor.',
        method: 'Relativistic de Broglie wavelength for an electron accelerated through a potential difference.',
      },
      cells: [
        {
          id: 'note',
          kind: 'text',
          source: 'At 60 kV the classical formula is already a few per cent off; the relativistic one is used.',
        },
        {
          id: 'gun',
          kind: 'calc',
          source: [
            'U_gun = 60 kV                    # gun accelerating voltage',
            'lambda_e = electronWavelength(U_gun) to pm',
            'v_e = speedFromKinetic(60 keV, m_e)',
            'beta_e = v_e / c',
          ].join('\n'),
        },
      ],
    }),
  ];
}

/**
 * Engineering-study sheets of the demo installation (sweeps, plots, uncertainty, a space-time
 * diagram). `npm start` seeds them; the test fixtures keep the three sheets above unless asked.
 */
export function demoStudySheets(): DemoSheet[] {
  return [
    sheet(4, {
      title: 'Dipole field study over the treatment energy range, with uncertainty',
      safetyRelated: true,
      record: {
        ...emptyRecord(),
        objective:
          'Tabulate β, γ, magnetic rigidity and dipole field over 70–250 MeV, and carry the uncertainty of the beam energy and of the bending radius to the field at the highest energy.',
        inputs: [
          {
            name: 'Beam energy at the gantry entrance',
            value: '250 MeV, u = 0.4 MeV',
            source: 'Degrader calibration report (demo)',
            sourceRevision: 'A',
          },
          {
            name: 'Dipole bending radius',
            value: '1.5 m, u = 2 mm',
            source: 'TPT2 gantry survey (demo)',
            sourceRevision: 'B',
          },
        ],
        method:
          'Relativistic kinematics (PDG, Kinematics); law of propagation of uncertainty, JCGM 100:2008, with a Monte Carlo check (JCGM 101:2008) where the model is non-linear.',
        references: [
          'JCGM 100:2008 Evaluation of measurement data — Guide to the expression of uncertainty in measurement',
          'Particle Data Group, Review of Particle Physics, section "Kinematics"',
        ],
      },
      cells: [
        {
          id: 'study-intro',
          kind: 'text',
          source:
            'Standard uncertainties are written after `±` (k = 1); results are reported as $y \\pm U$ with $k = 2$.',
        },
        {
          id: 'study-model',
          kind: 'calc',
          source: [
            'T_kin = 250 MeV ± 0.4 MeV        # energy at the gantry entrance (demo calibration)',
            'rho = 1.5 m ± 0.002 m            # bending radius (demo survey)',
            'beta = speedFromKinetic(T_kin, m_p) / c',
            'gamma_L = lorentzFactor(beta)',
            'p = momentumFromKinetic(T_kin, m_p)',
            'Brho = magneticRigidity(p, q_e) to T*m',
            'B_dip = Brho / rho to T',
          ].join('\n'),
        },
        {
          id: 'study-sweep',
          kind: 'calc',
          source: [
            'sweep(T_kin, steps(70 MeV, 250 MeV, 20 MeV), beta, gamma_L, Brho, B_dip)',
            'plot(T_kin, points(70 MeV, 250 MeV, 91), B_dip)',
          ].join('\n'),
        },
      ],
    }),
    sheet(5, {
      title:
        'Electron transit through the 60 kV gap of the beam-profile monitor gun: hyperbolic motion and space-time diagram',
      safetyRelated: false,
      record: {
        objective:
          'Show that the probe electrons of the beam-profile monitor gun, starting from rest at the cathode, cross the 60 mm accelerating gap within the 1 ns read-out gate, and verify the constant-proper-acceleration functions against the energy gained, with the worldline, light lines and horizon on a space-time diagram.',
        inputs: [
          {
            name: 'Gun accelerating voltage',
            value: '60 kV',
            source: 'Beam-profile monitor gun datasheet (demo)',
            sourceRevision: 'A',
          },
          {
            name: 'Cathode–anode gap',
            value: '60 mm',
            source: 'Beam-profile monitor gun assembly drawing (demo)',
            sourceRevision: 'B',
          },
          {
            name: 'Read-out gate',
            value: '1 ns',
            source: 'TPT2 beam-profile monitor timing specification (demo)',
            sourceRevision: 'A',
          },
        ],
        assumptions: [
          { text: 'Plane-parallel electrodes: the field E = U/d is uniform across the gap.', needsVerification: true },
          {
            text: 'Electrons leave the cathode at rest; emission energy and space charge are neglected.',
            needsVerification: false,
          },
        ],
        method:
          'A charge in a uniform static field keeps a constant proper acceleration a0 = eE/m_e (hyperbolic motion): transit time, proper time and exit speed from the gap length; cross-check of the exit speed against the energy gained, eU; horizon distance c²/a0 = m_e c²/(eE).',
        references: [
          'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (hyperbolic motion)',
        ],
        conclusions: 'To be stated after evaluation and check.',
      },
      cells: [
        {
          id: 'transit-intro',
          kind: 'text',
          source:
            'Between plane electrodes the field $E = U/d$ is uniform, so an electron leaving the cathode at rest has the constant proper acceleration $a_0 = eE/m_e$ and moves on a hyperbola: $\\gamma = 1 + a_0 x/c^2$.',
        },
        {
          id: 'transit',
          kind: 'calc',
          source: [
            'U_gun = 60 kV                    # gun accelerating voltage',
            'd_gap = 60 mm                    # cathode–anode gap',
            'E_gap = U_gun / d_gap to MV/m    # uniform field between plane electrodes',
            'a0 = q_e * E_gap / m_e           # proper acceleration of the electron',
            't_gap = hyperbolicCoordinateTimeFromDistance(a0, d_gap) to ns',
            'tau_gap = hyperbolicProperTimeFromDistance(a0, d_gap) to ns',
            'v_exit = hyperbolicSpeedFromDistance(a0, d_gap)',
            't_gap < 1 ns                     # design criterion: across the gap within the read-out gate',
          ].join('\n'),
        },
        {
          id: 'energy-check',
          kind: 'calc',
          source: [
            'v_energy = speedFromKinetic(q_e * U_gun, m_e)',
            'abs(v_exit / v_energy - 1) < 1e-12   # the exit speed agrees with the energy gained, eU',
          ].join('\n'),
        },
        {
          id: 'worldline',
          kind: 'calc',
          source: [
            't = 1 ns',
            'x_e = hyperbolicDistance(a0, t) to mm',
            'd_h = rindlerHorizonDistance(a0) to mm',
            'spacetime(t, points(0 ns, 2 ns, 121), x_e, d_h)',
          ].join('\n'),
        },
      ],
    }),
  ];
}

export interface SeedOptions {
  /** Also seed the study sheets (numbers 4 and 5). */
  studies?: boolean;
  /** Also seed the starter sheets (numbers 6–10, db/starters.ts), offered to start new sheets from. */
  starters?: boolean;
}

export interface SeedReport {
  usersCreated: number;
  projectCreated: boolean;
  membershipsCreated: number;
  sheetsCreated: number;
}

export async function seedDemo(db: Kysely<Database>, options: SeedOptions = {}): Promise<SeedReport> {
  const report: SeedReport = { usersCreated: 0, projectCreated: false, membershipsCreated: 0, sheetsCreated: 0 };
  const existing = await db
    .selectFrom('users')
    .select(['id', 'email'])
    .where(
      'email',
      'in',
      DEMO_ACCOUNTS.map((a) => a.email),
    )
    .execute();
  const missing = DEMO_ACCOUNTS.filter((a) => !existing.some((u) => u.email === a.email));
  // Hash outside the transaction: argon2id is deliberately slow.
  const hashes = await Promise.all(missing.map(() => hash(DEMO_PASSWORD)));

  await db.transaction().execute(async (trx) => {
    // One seed at a time, even if two starts race.
    await sql`select pg_advisory_xact_lock(hashtext('worldsheet.seed'))`.execute(trx);
    const userIds = new Map<string, string>();
    for (const [i, account] of missing.entries()) {
      const row = await trx
        .insertInto('users')
        .values({
          email: account.email,
          display_name: account.name,
          password_hash: hashes[i],
          is_admin: account.admin ?? false,
        })
        .onConflict((oc) => oc.column('email').doNothing())
        .returning('id')
        .executeTakeFirst();
      if (row) {
        report.usersCreated += 1;
        await trx
          .insertInto('audit_events')
          .values({
            actor_id: null,
            action: 'user.create',
            object_type: 'user',
            object_id: row.id,
            new_value: JSON.stringify({ email: account.email, name: account.name }),
            reason: 'demo seed',
          })
          .execute();
      }
    }
    for (const u of await trx
      .selectFrom('users')
      .select(['id', 'email'])
      .where(
        'email',
        'in',
        DEMO_ACCOUNTS.map((a) => a.email),
      )
      .execute()) {
      userIds.set(u.email, u.id);
    }
    const admin = userIds.get('admin@demo.test')!;

    let project = await trx
      .selectFrom('projects')
      .select('id')
      .where('code', '=', DEMO_PROJECT.code)
      .executeTakeFirst();
    if (!project) {
      project = await trx
        .insertInto('projects')
        .values({ ...DEMO_PROJECT, created_by: admin })
        .returning('id')
        .executeTakeFirstOrThrow();
      report.projectCreated = true;
      await trx
        .insertInto('audit_events')
        .values({
          actor_id: admin,
          project_id: project.id,
          action: 'project.create',
          object_type: 'project',
          object_id: project.id,
          new_value: JSON.stringify(DEMO_PROJECT),
          reason: 'demo seed',
        })
        .execute();
    }

    for (const account of DEMO_ACCOUNTS) {
      for (const role of account.roles) {
        const added = await trx
          .insertInto('project_members')
          .values({ project_id: project.id, user_id: userIds.get(account.email)!, role, granted_by: admin })
          .onConflict((oc) => oc.columns(['project_id', 'user_id', 'role']).doNothing())
          .returning('role')
          .executeTakeFirst();
        if (added) {
          report.membershipsCreated += 1;
          await trx
            .insertInto('audit_events')
            .values({
              actor_id: admin,
              project_id: project.id,
              action: 'membership.grant',
              object_type: 'user',
              object_id: userIds.get(account.email)!,
              new_value: JSON.stringify({ role }),
              reason: 'demo seed',
            })
            .execute();
        }
      }
    }

    const originator = userIds.get('originator@demo.test')!;
    let engine: SheetEngine | null = null;
    const starters = new Set(options.starters ? demoStarterSheets().map((d) => d.number) : []);
    for (const demo of [
      ...demoSheets(),
      ...(options.studies ? demoStudySheets() : []),
      ...(options.starters ? demoStarterSheets() : []),
    ]) {
      const sheet = await trx
        .insertInto('sheets')
        .values({
          project_id: project.id,
          number: demo.number,
          title: demo.content.title,
          safety_related: demo.content.safetyRelated,
          created_by: originator,
          starter: starters.has(demo.number),
        })
        .onConflict((oc) => oc.columns(['project_id', 'number']).doNothing())
        .returning('id')
        .executeTakeFirst();
      if (!sheet) continue;
      report.sheetsCreated += 1;
      const hashHex = contentHash(demo.content);
      // The demo content is our own, so it is evaluated in process rather than in the sandbox.
      engine ??= createSheetEngine();
      const results = engine.evaluate(demo.content.cells, {
        significantFigures: demo.content.significantFigures,
        displayUnits: demo.content.displayUnits,
      });
      await trx
        .insertInto('versions')
        .values({
          sheet_id: sheet.id,
          number: 1,
          parent_number: null,
          content: JSON.stringify(demo.content),
          content_hash: hashHex,
          results: JSON.stringify(results),
          engine_version: results.engineVersion,
          constants_edition: results.constantsEdition,
          author_id: originator,
          message: 'First draft (demo data)',
        })
        .execute();
      await trx
        .insertInto('audit_events')
        .values({
          actor_id: originator,
          project_id: project.id,
          action: 'version.save',
          object_type: 'sheet',
          object_id: sheet.id,
          new_value: JSON.stringify({ version: 1, sha256: hashHex }),
          reason: 'demo seed',
        })
        .execute();
    }
  });
  return report;
}
