import { randomBytes } from 'node:crypto';
import { hash, verify } from '@node-rs/argon2';

/** At least 12 characters (NIST SP 800-63B §5.1.1.2 asks for at least 8; we ask for more). */
const MIN_PASSWORD_LENGTH = 12;

export function passwordProblem(password: string): string | null {
  if (password.length < MIN_PASSWORD_LENGTH) return `Use at least ${MIN_PASSWORD_LENGTH} characters.`;
  if (password.length > 200) return 'Use at most 200 characters.';
  return null;
}

/** argon2id with the library's defaults (19 MiB, 2 passes: the OWASP minimum for argon2id). */
export function hashPassword(password: string): Promise<string> {
  return hash(password);
}

/** Sees every argon2 verification that runs (the tests count them); returns the way to stop. */
export type VerificationObserver = (hash: string) => void;
const observers = new Set<VerificationObserver>();
export function observePasswordVerifications(observer: VerificationObserver): () => void {
  observers.add(observer);
  return () => observers.delete(observer);
}

export async function verifyPassword(stored: string | null, password: string): Promise<boolean> {
  if (!stored) return false;
  for (const o of observers) o(stored);
  try {
    return await verify(stored, password);
  } catch {
    return false;
  }
}

let dummy: Promise<string> | null = null;

/**
 * A real argon2id hash (of a random password nobody knows, with the same parameters as every stored
 * hash), so that a sign-in for an address without an account does the same hashing work as one with
 * an account and its time does not tell them apart.
 */
function dummyPasswordHash(): Promise<string> {
  dummy ??= hash(randomBytes(24).toString('base64url'));
  return dummy;
}

/** Verifies against `stored`, or against the dummy hash when there is none: the same work either way; false without a stored hash. */
export async function verifyPasswordOrDummy(stored: string | null, password: string): Promise<boolean> {
  if (stored) return verifyPassword(stored, password);
  await verifyPassword(await dummyPasswordHash(), password);
  return false;
}
