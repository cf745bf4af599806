import { hash, verify } from '@node-rs/argon2';

/** At least 12 characters (NIST SP 800-63B §5.1.1.2 asks for at least 8; we ask for more). */
export const MIN_PASSWORD_LENGTH = 12;

export function passwordProblem(password: string): string | null {
  if (password.length < MIN_PASSWORD_LENGTH) return `Use at least ${MIN_PASSWORD_LENGTH} characters.`;
  if (password.length > 200) return 'Use at most 200 characters.';
  return null;
}

/** argon2id with the library's defaults (19 MiB, 2 passes: the OWASP minimum for argon2id). */
export function hashPassword(password: string): Promise<string> {
  return hash(password);
}

export async function verifyPassword(stored: string | null, password: string): Promise<boolean> {
  if (!stored) return false;
  try {
    return await verify(stored, password);
  } catch {
    return false;
  }
}
