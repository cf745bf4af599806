// Secrets the local demo installation needs, made on first start and kept in the git-ignored
// .data/ folder. A production deployment sets NEXTAUTH_SECRET itself.
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';

export function localAuthSecret(root: string): string {
  const file = path.join(root, '.data', 'auth-secret');
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  mkdirSync(path.dirname(file), { recursive: true });
  const secret = randomBytes(32).toString('base64url');
  writeFileSync(file, `${secret}\n`, { mode: 0o600 });
  return secret;
}
