// Revision codes and verification codes.
import { randomBytes } from 'node:crypto';

/** Letters used for revisions: ASME Y14.35 leaves out I, O, Q, S, X and Z (they read as digits or marks). */
const REVISION_LETTERS = 'ABCDEFGHJKLMNPRTUVWY';

/**
 * The code of the revision at `sequence` (0 for the first): letters A … Y, then AA, AB … (ASME
 * Y14.35 §3), or numbers 0, 1, 2 … for a project that numbers its revisions.
 */
export function revisionCode(scheme: 'letters' | 'numbers', sequence: number): string {
  if (!Number.isInteger(sequence) || sequence < 0) throw new Error(`bad revision sequence ${sequence}`);
  if (scheme === 'numbers') return String(sequence);
  const n = REVISION_LETTERS.length;
  let code = '';
  let k = sequence;
  // Bijective base-20: A…Y, AA…AY, BA…, YY, AAA…
  do {
    code = REVISION_LETTERS[k % n] + code;
    k = Math.floor(k / n) - 1;
  } while (k >= 0);
  return code;
}

/** Crockford's base-32 alphabet: no I, L, O or U, so a code read aloud or typed is unambiguous. */
const CROCKFORD = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';

/** A fresh verification code of 12 symbols (60 random bits), shown as XXXX-XXXX-XXXX. */
export function newVerificationCode(): string {
  const bytes = randomBytes(8);
  let bits = BigInt(`0x${bytes.toString('hex')}`);
  let out = '';
  for (let i = 0; i < 12; i++) {
    out += CROCKFORD[Number(bits & 31n)];
    bits >>= 5n;
  }
  return `${out.slice(0, 4)}-${out.slice(4, 8)}-${out.slice(8)}`;
}

/** A code as typed (any case, spaces or hyphens, O for 0, I or L for 1) in its stored form, or null. */
export function normaliseVerificationCode(input: string): string | null {
  const s = input.toUpperCase().replace(/[\s-]/g, '').replace(/O/g, '0').replace(/[IL]/g, '1');
  if (!/^[0-9A-HJKMNP-TV-Z]{12}$/.test(s)) return null;
  return `${s.slice(0, 4)}-${s.slice(4, 8)}-${s.slice(8)}`;
}
