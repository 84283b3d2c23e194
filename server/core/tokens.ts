import { createHash, randomBytes } from 'node:crypto';

/** A 256-bit random token for links, base64url; the caller stores only its hash. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}
