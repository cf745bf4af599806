// Demo data for a local start: a fictional organisation, one project, the demo accounts and a few
// sheets. Every name here is invented; the engineering figures are demo values, not design data.
//
// Idempotent: it only adds what is missing, so a second start never duplicates or wipes anything.
// It creates its data through the app's own functions (seedDemo below), so demo data is like real data.
// It runs only for the local demo cluster (`npm start` without DATABASE_URL), never in production.
import { sql, type Kysely } from 'kysely';
import type { Actor } from '../lib/auth/actor';
import { hashPassword } from '../lib/auth/password';
import { recordAudit } from '../lib/audit/record';
import { NEW_SHEET_DISPLAY_UNITS } from '../lib/calc/display-units';
import { createProject, grantRole } from '../lib/projects/projects';
import { emptyRecord, versionContentSchema, type VersionContent } from '../lib/sheets/content';
import { contentHash } from '../lib/sheets/content-hash';
import { createSheetWithContent } from '../lib/sheets/sheets';
import type { Database, ProjectRole } from './schema';
import { demoStarterSheets } from './starters';

export const DEMO_PASSWORD = 'worldsheet-demo';

const DEMO_ORGANISATION = 'Kestrelwick Beam Systems Ltd';
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
  /**
   * Also seed the starter sheets (numbers 6–10, db/starters.ts), offered to start new sheets from.
   * The app numbers a project's sheets in order, so the study sheets (4 and 5) come with them.
   */
  starters?: boolean;
}

export interface SeedReport {
  usersCreated: number;
  projectCreated: boolean;
  membershipsCreated: number;
  sheetsCreated: number;
}

/** The message of the version that holds a demo sheet's content (version 2; version 1 is the new sheet). */
export const DEMO_VERSION_MESSAGE = 'First draft (demo data)';

/**
 * A demo account acting without a session or token, as the app's own background work acts for a
 * person (the issuing job acts as its document controller, lib/issue/job.ts).
 */
function demoActor(user: { id: string; email: string; display_name: string; is_admin: boolean }): Actor {
  return {
    userId: user.id,
    email: user.email,
    name: user.display_name,
    isAdmin: user.is_admin,
    via: 'system',
    sessionId: null,
    tokenId: null,
  };
}

/**
 * Seeds the demo installation through the app's own functions, so that its project, roles, sheets
 * and versions carry the audit events, references and time stamps of real ones: the administrator
 * creates the project and gives the roles (createProject, grantRole), the originator creates each
 * sheet with its content (createSheetWithContent: version 1 is the new sheet, version 2 the demo
 * content, both evaluated by the server's sandboxed evaluator). Only the accounts and the starter
 * flag are written directly, where the app has no function (said below).
 */
export async function seedDemo(db: Kysely<Database>, options: SeedOptions = {}): Promise<SeedReport> {
  const report: SeedReport = { usersCreated: 0, projectCreated: false, membershipsCreated: 0, sheetsCreated: 0 };
  const emails = DEMO_ACCOUNTS.map((a) => a.email);
  const existing = await db.selectFrom('users').select('email').where('email', 'in', emails).execute();
  const missing = DEMO_ACCOUNTS.filter((a) => !existing.some((u) => u.email === a.email));
  // Hash before taking the lock, with the app's own settings: argon2id is deliberately slow.
  const hashes = new Map(
    await Promise.all(missing.map(async (a) => [a.email, await hashPassword(DEMO_PASSWORD)] as const)),
  );

  // One seed at a time, even if two starts race: a session lock held by the one connection the
  // whole seed runs on (the app's functions open transactions of their own on it).
  await db.connection().execute(async (conn) => {
    await sql`select pg_advisory_lock(hashtext('worldsheet.seed'))`.execute(conn);
    try {
      await seedOnConnection(conn, hashes, options, report);
    } finally {
      await sql`select pg_advisory_unlock(hashtext('worldsheet.seed'))`.execute(conn);
    }
  });
  return report;
}

async function seedOnConnection(
  db: Kysely<Database>,
  hashes: ReadonlyMap<string, string>,
  options: SeedOptions,
  report: SeedReport,
): Promise<void> {
  const demoUsers = () =>
    db
      .selectFrom('users')
      .select(['id', 'email', 'display_name', 'is_admin'])
      .where(
        'email',
        'in',
        DEMO_ACCOUNTS.map((a) => a.email),
      )
      .execute();

  // Accounts. The app has no function that creates an account with a password: an administrator
  // invites (inviteUser: no password, an invitation mail) and the holder chooses a password from the
  // link (confirmPasswordReset). So the seed writes the account with its password directly, and the
  // audit events the app writes for those two steps: user.invite by the administrator, then
  // user.password-reset by no one (the holder is not signed in). The first administrator has no one
  // to invite them: user.create by no one, as the app records an account made at a first sign-in
  // through the organisation (lib/auth/oidc.ts).
  const admin = DEMO_ACCOUNTS.find((a) => a.admin)!;
  let users = await demoUsers();
  let adminUser = users.find((u) => u.email === admin.email);
  if (!adminUser) {
    await createDemoAccount(db, null, admin, hashes.get(admin.email)!);
    report.usersCreated += 1;
    users = await demoUsers();
    adminUser = users.find((u) => u.email === admin.email)!;
  }
  const adminActor = demoActor(adminUser);
  for (const account of DEMO_ACCOUNTS) {
    if (users.some((u) => u.email === account.email)) continue;
    await createDemoAccount(db, adminActor, account, hashes.get(account.email)!);
    report.usersCreated += 1;
  }
  users = await demoUsers();
  const userOf = (email: string) => users.find((u) => u.email === email)!;

  // The project, created by the administrator as POST /api/projects does.
  let project = await db
    .selectFrom('projects')
    .select(['id', 'code'])
    .where('code', '=', DEMO_PROJECT.code)
    .executeTakeFirst();
  if (!project) {
    project = await createProject(db, adminActor, {
      code: DEMO_PROJECT.code,
      name: DEMO_PROJECT.name,
      legalOwner: DEMO_PROJECT.legal_owner,
      revisionScheme: DEMO_PROJECT.revision_scheme,
    });
    report.projectCreated = true;
  }

  // The roles, given by the administrator as POST /api/projects/{id}/members does.
  const held = await db
    .selectFrom('project_members')
    .select(['user_id', 'role'])
    .where('project_id', '=', project.id)
    .execute();
  for (const account of DEMO_ACCOUNTS) {
    const user = userOf(account.email);
    for (const role of account.roles) {
      if (held.some((m) => m.user_id === user.id && m.role === role)) continue;
      await grantRole(db, adminActor, project.id, { userId: user.id, role, reason: 'demo seed' });
      report.membershipsCreated += 1;
    }
  }

  // The sheets, created by the originator with their content, as an import of a sheet file does
  // (POST /api/projects/{id}/sheets/import): the app numbers them, so each is created only when the
  // next number is its own (a demo database whose numbers were taken otherwise keeps its sheets).
  const originator = demoActor(userOf('originator@demo.test'));
  const starters = options.starters ? demoStarterSheets() : [];
  for (const demo of [
    ...demoSheets(),
    ...(options.studies || options.starters ? demoStudySheets() : []),
    ...starters,
  ]) {
    const numbers = await db
      .selectFrom('sheets')
      .select(['number'])
      .where('project_id', '=', project.id)
      .orderBy('number', 'desc')
      .execute();
    if (numbers.some((s) => s.number === demo.number)) continue;
    if ((numbers[0]?.number ?? 0) + 1 !== demo.number) continue;
    const created = await createSheetWithContent(db, originator, project, demo.content, DEMO_VERSION_MESSAGE);
    if (created.number !== demo.number)
      throw new Error(`demo sheet ${demo.number} was numbered ${created.number}: the seed lock did not hold`);
    report.sheetsCreated += 1;
  }
  // The app has no function that makes a sheet a starter: the one flag is set directly, on the demo
  // starters only (their version 2 is the demo content), also if a start stopped just before.
  for (const demo of starters) {
    await db
      .updateTable('sheets')
      .set({ starter: true })
      .where('project_id', '=', project.id)
      .where('number', '=', demo.number)
      .where('starter', '=', false)
      .where(({ exists, selectFrom }) =>
        exists(
          selectFrom('versions')
            .select('versions.id')
            .whereRef('versions.sheet_id', '=', 'sheets.id')
            .where('versions.number', '=', 2)
            .where('versions.content_hash', '=', contentHash(demo.content)),
        ),
      )
      .execute();
  }
}

/** One demo account with its password, and the audit events the app writes (see seedOnConnection). */
async function createDemoAccount(
  db: Kysely<Database>,
  by: Actor | null,
  account: (typeof DEMO_ACCOUNTS)[number],
  passwordHash: string,
): Promise<void> {
  const isAdmin = account.admin ?? false;
  await db.transaction().execute(async (trx) => {
    const user = await trx
      .insertInto('users')
      .values({
        email: account.email,
        display_name: account.name,
        password_hash: passwordHash,
        password_changed_at: sql`now()`,
        is_admin: isAdmin,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    // As inviteUser (lib/projects/users.ts) records it, or a first sign-in (lib/auth/oidc.ts) for the first administrator.
    await recordAudit(
      trx,
      by,
      by
        ? {
            action: 'user.invite',
            objectType: 'user',
            objectId: user.id,
            newValue: { email: account.email, name: account.name, isAdmin },
          }
        : {
            action: 'user.create',
            objectType: 'user',
            objectId: user.id,
            newValue: { email: account.email, name: account.name, via: 'demo seed' },
            reason: 'the first administrator of the demo installation',
          },
    );
    // As confirmPasswordReset (lib/auth/account.ts) records the password chosen from the link.
    await recordAudit(trx, null, {
      action: 'user.password-reset',
      objectType: 'user',
      objectId: user.id,
      newValue: { endedSessions: 0, revokedTokens: 0 },
    });
  });
}
