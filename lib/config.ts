// The installation's configuration: every environment variable the app, the job worker and the commands
// read, validated with zod, with its default. It is the only module that reads process.env (the test
// tests/ops/config.test.ts scans for others; the exceptions it allows say why); everything else takes
// typed settings from config(). The README's settings table lists exactly the settings of SETTINGS.
//
// config() reads the environment as it is at the call, so a value a test or the launcher sets after
// this module was loaded still counts; the parse is remembered until one of the variables changes.
// A malformed value (a port that is not a port, a negative quota…) throws a ConfigError naming the
// variable. An unset or blank variable takes its default.
//
// In production (NODE_ENV=production outside the demo installation, i.e. a deployment's `npm start`
// or its own lib/ops/server.ts) the secret, the signing key and certificate, the mail service and the
// database must be given: checkProduction() refuses to start without them, naming each.
//
// No `import 'server-only'` here: the commands, the job worker and vitest load this module outside
// Next's react-server build, where that package throws. Client components must not import it.
import { existsSync, statSync } from 'node:fs';
import { z } from 'zod';

export type Environment = Record<string, string | undefined>;

/** A setting that is missing or malformed; the message names the variable. */
export class ConfigError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ConfigError';
  }
}

// ── Value types ─────────────────────────────────────────────────────────────────────────────

const numberText = (what: string) =>
  z
    .string()
    .trim()
    .refine((s) => s !== '' && Number.isFinite(Number(s)), `must be ${what}`)
    .transform(Number);

const integer = (min: number, what: string) =>
  numberText(what).refine((n) => Number.isInteger(n) && n >= min, `must be ${what}`);

const positive = (what: string) => numberText(what).refine((n) => n > 0, `must be ${what}`);

const port = integer(1, 'a TCP port (1–65535)').refine((n) => n <= 65535, 'must be a TCP port (1–65535)');

const url = (protocols: string[]) =>
  z
    .string()
    .trim()
    .refine(
      (s) => {
        try {
          return protocols.includes(new URL(s).protocol);
        } catch {
          return false;
        }
      },
      `must be a URL starting with ${protocols.map((p) => `${p}//`).join(' or ')}`,
    );

const text = z.string();

/** `1`, `true`, `yes` / `0`, `false`, `no` (any case). */
const yesNo = z
  .string()
  .trim()
  .toLowerCase()
  .refine((s) => ['1', 'true', 'yes', '0', 'false', 'no'].includes(s), 'must be 1 or 0 (true/false, yes/no)')
  .transform((s) => ['1', 'true', 'yes'].includes(s));

/** `1` on, `0` off (the launcher writes these). */
const flag = z.enum(['0', '1'], { error: 'must be 1 or 0' }).transform((s) => s === '1');

// ── The settings ────────────────────────────────────────────────────────────────────────────
// Each one: its type (with its default, or optional when unset has a meaning of its own). The
// README's settings table has one row per key, in any order (tests/ops/config.test.ts checks both ways).

const SETTINGS = {
  NODE_ENV: z
    .enum(['development', 'production', 'test'], { error: 'must be development, production or test' })
    .default('development'),
  // Where the app listens and how people reach it
  PORT: port.default(3000),
  WORLDSHEET_HOST: text.default('127.0.0.1'),
  WORLDSHEET_DRAIN_DELAY_MS: integer(0, 'a whole number of milliseconds').default(0),
  WORLDSHEET_DRAIN_TIMEOUT_MS: integer(0, 'a whole number of milliseconds').default(25_000),
  NEXTAUTH_URL: url(['http:', 'https:']).optional(),
  NEXTAUTH_SECRET: text.optional(),
  WORLDSHEET_HTTPS: yesNo.optional(),
  WORLDSHEET_TRUSTED_PROXIES: text.optional(),
  WORLDSHEET_DEMO: flag.default(false),
  WORLDSHEET_VERSION: text.default('0.0.0-dev'),
  // The database
  DATABASE_URL: url(['postgres:', 'postgresql:']).optional(),
  WORLDSHEET_PG_PORT: port.default(54329),
  WORLDSHEET_TEST_PG_PORT: port.default(54339),
  WORLDSHEET_BENCH_PG_PORT: port.default(54369),
  WORLDSHEET_PG_BINDIR: text.optional(),
  WORLDSHEET_TEST_APP_PORT: port.default(3199),
  // Object storage
  WORLDSHEET_S3_ENDPOINT: url(['http:', 'https:']).optional(),
  WORLDSHEET_S3_BUCKET: text.optional(),
  WORLDSHEET_S3_REGION: text.default('us-east-1'),
  WORLDSHEET_S3_ACCESS_KEY_ID: text.optional(),
  WORLDSHEET_S3_SECRET_ACCESS_KEY: text.optional(),
  WORLDSHEET_S3_PORT: port.default(4568),
  WORLDSHEET_PROJECT_STORAGE_QUOTA_MB: numberText('a number of MiB (0 or more)')
    .refine((n) => n >= 0, 'must be a number of MiB (0 or more)')
    .default(2048),
  // Sign-in, sessions, tokens
  WORLDSHEET_LOCK_MINUTES: positive('a number of minutes above 0').default(15),
  WORLDSHEET_SIGN_IN_FREE_FAILURES: integer(0, 'a whole number (0 or more)').default(10),
  WORLDSHEET_SESSION_IDLE_MINUTES: positive('a number of minutes above 0').default(30),
  WORLDSHEET_TOKEN_MAX_DAYS: integer(1, 'a whole number of days (1 or more)').default(365),
  WORLDSHEET_TOKEN_DEFAULT_DAYS: integer(1, 'a whole number of days (1 or more)').default(90),
  WORLDSHEET_OIDC_ISSUER: url(['http:', 'https:']).optional(),
  WORLDSHEET_OIDC_CLIENT_ID: text.optional(),
  WORLDSHEET_OIDC_CLIENT_SECRET: text.optional(),
  WORLDSHEET_OIDC_NAME: text.default('Organisation account'),
  WORLDSHEET_OIDC_GROUPS_CLAIM: text.default('groups'),
  WORLDSHEET_OIDC_ROLE_MAP: text.optional(),
  // Mail and jobs
  WORLDSHEET_SMTP_URL: url(['smtp:', 'smtps:']).optional(),
  WORLDSHEET_MAIL_FROM: text.default('Worldsheet <no-reply@worldsheet.test>'),
  WORLDSHEET_SMTP_PORT: port.default(2525),
  WORLDSHEET_MAIL_CAPTURE_PORT: port.default(2580),
  WORLDSHEET_MAIL_CAPTURE_URL: url(['http:', 'https:']).optional(),
  WORLDSHEET_JOB_POLL_SECONDS: positive('a number of seconds above 0').default(1),
  // The calculation sandbox
  WORLDSHEET_CALC_WORKERS: integer(1, 'a whole number of workers (1 or more)').optional(),
  WORLDSHEET_CALC_TIMEOUT_MS: integer(1, 'a whole number of milliseconds (1 or more)').default(5000),
  WORLDSHEET_CALC_MEMORY_MB: integer(1, 'a whole number of MB (1 or more)').default(256),
  // Issue, signing and verification
  WORLDSHEET_SIGNING_KEY: text.optional(),
  WORLDSHEET_SIGNING_CERT: text.optional(),
  WORLDSHEET_KEY_FOLDER: text.optional(),
  WORLDSHEET_SIGNING_ORGANISATION: text.default('Kestrelwick Beam Systems Ltd'),
  WORLDSHEET_VERIFY_RATE_PER_MINUTE: integer(1, 'a whole number (1 or more)').default(30),
  WORLDSHEET_SIGNATURE_PARSE_TIMEOUT_MS: integer(1, 'a whole number of milliseconds (1 or more)').default(2000),
  WORLDSHEET_SIGNATURE_PARSE_MEMORY_MB: integer(1, 'a whole number of MB (1 or more)').default(64),
  WORLDSHEET_ISSUE_STEP_PAUSE_MS: integer(0, 'a whole number of milliseconds (0 or more)').default(0),
  WORLDSHEET_ISSUE_LEASE_SECONDS: integer(2, 'a whole number of seconds (2 or more)').default(30),
  // Tools and diagnostics
  WORLDSHEET_CHROMIUM: text.default('/usr/bin/chromium'),
  WORLDSHEET_DEBUG: text.optional(),
  WORLDSHEET_DEBUG_SIGNATURES: text.optional(),
} as const;

export type SettingName = keyof typeof SETTINGS;
export const SETTING_NAMES = Object.keys(SETTINGS) as SettingName[];

const schema = z.object(SETTINGS);
export type Config = z.output<typeof schema>;

/** Parses `env` (blank values count as unset); throws a ConfigError naming each malformed variable. */
export function parseConfig(env: Environment): Config {
  const input: Record<string, string> = {};
  for (const name of SETTING_NAMES) {
    const value = env[name];
    if (value !== undefined && value.trim() !== '') input[name] = value;
  }
  const result = schema.safeParse(input);
  if (result.success) return Object.freeze(result.data);
  throw new ConfigError(
    result.error.issues
      .map((issue) => {
        const name = String(issue.path[0]);
        return `${name} ${issue.message}, not "${input[name]}"`;
      })
      .join('; '),
  );
}

/** The settings' variables in this process's environment now. */
function environment(): Environment {
  const env: Environment = {};
  for (const name of SETTING_NAMES) env[name] = process.env[name];
  // Next inlines process.env.WORLDSHEET_VERSION (next.config.mjs `env`) into the built server at build
  // time, where the running process may not have it: read it literally so that the inlining applies.
  env.WORLDSHEET_VERSION = process.env.WORLDSHEET_VERSION;
  return env;
}

let remembered: { key: string; config: Config } | null = null;

/** Every setting's default: what an empty environment means. */
export const DEFAULTS: Config = parseConfig({});

/** The settings of this process, from its environment now (remembered while the environment is unchanged). */
export function config(): Config {
  const env = environment();
  const key = SETTING_NAMES.map((name) => env[name] ?? '\u0000').join('\u0001');
  if (remembered?.key !== key) remembered = { key, config: parseConfig(env) };
  return remembered.config;
}

/** `env` parsed when given (tests hand functions their own), else this process's settings. */
export function settingsOf(env?: Environment): Config {
  return env ? parseConfig(env) : config();
}

/**
 * A copy of this process's environment, for the commands that start child processes with it (the app
 * server, the job worker, vitest, pg_dump): they pass on what they do not set themselves.
 */
export function inheritedEnvironment(): NodeJS.ProcessEnv {
  return { ...process.env };
}

/** Sets NODE_ENV when the process was started without one (the app's server: production unless --dev). */
export function defaultNodeEnv(value: 'production' | 'development'): void {
  (process.env as Record<string, string | undefined>).NODE_ENV ??= value;
}

// ── Production ──────────────────────────────────────────────────────────────────────────────

/** The shortest NEXTAUTH_SECRET a deployment may use (32 characters: 192 bits of base64). */
export const MIN_SECRET_LENGTH = 32;

/** A deployment: the production build outside the demo installation that `npm start` runs without DATABASE_URL. */
function isProductionDeployment(settings: Config): boolean {
  return settings.NODE_ENV === 'production' && !settings.WORLDSHEET_DEMO;
}

function readableFile(file: string): boolean {
  try {
    return existsSync(/* turbopackIgnore: true */ file) && statSync(/* turbopackIgnore: true */ file).isFile();
  } catch {
    return false;
  }
}

/** What a deployment lacks to start: one message per missing or unusable setting, naming it. */
function productionProblems(settings: Config): string[] {
  if (!isProductionDeployment(settings)) return [];
  const problems: string[] = [];
  if (!settings.DATABASE_URL)
    problems.push('DATABASE_URL is not set: name the PostgreSQL database of the installation');
  if (!settings.NEXTAUTH_SECRET)
    problems.push('NEXTAUTH_SECRET is not set: give a long random string (e.g. `openssl rand -base64 32`)');
  else if (settings.NEXTAUTH_SECRET.length < MIN_SECRET_LENGTH)
    problems.push(`NEXTAUTH_SECRET is too short: at least ${MIN_SECRET_LENGTH} characters`);
  for (const name of ['WORLDSHEET_SIGNING_KEY', 'WORLDSHEET_SIGNING_CERT'] as const) {
    const file = settings[name];
    if (!file)
      problems.push(
        `${name} is not set: name the organisation's PEM file (the test certificate authority is for demos only)`,
      );
    else if (!readableFile(file)) problems.push(`${name} names ${file}, which is not a readable file`);
  }
  if (!settings.WORLDSHEET_SMTP_URL)
    problems.push('WORLDSHEET_SMTP_URL is not set: name the mail service (smtp:// or smtps://)');
  // Without either, `npm start` would start the local fake object store: never for a deployment.
  if (!settings.WORLDSHEET_S3_BUCKET && !settings.WORLDSHEET_S3_ENDPOINT)
    problems.push(
      'WORLDSHEET_S3_BUCKET is not set: name the bucket of the object store (and WORLDSHEET_S3_ENDPOINT for a self-hosted S3-compatible one)',
    );
  return problems;
}

/**
 * Parses `env` and, for a deployment, refuses to go on without what it needs: throws a ConfigError
 * naming every malformed or missing setting. The app's server and the job worker call it first.
 */
export function checkProduction(env: Environment = environment()): Config {
  const settings = parseConfig(env);
  const problems = productionProblems(settings);
  if (problems.length > 0) throw new ConfigError(`cannot start in production: ${problems.join('; ')}`);
  return settings;
}
