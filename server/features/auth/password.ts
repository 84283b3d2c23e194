import { hash, verify } from '@node-rs/argon2';

/**
 * argon2id at OWASP's first recommended setting (m = 19 MiB, t = 2, p = 1; ASVS 5.0 11.4.2).
 * `algorithm: 2` is Algorithm.Argon2id (a const enum the isolated-module build cannot import).
 */
const OPTIONS = { algorithm: 2, memoryCost: 19456, timeCost: 2, parallelism: 1 } as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password.normalize('NFC'), OPTIONS);
}

export function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  return verify(passwordHash, password.normalize('NFC')).catch(() => false);
}

/** A hash of a random password, verified against when the account does not exist (equal timing). */
let decoyHash: Promise<string> | undefined;
export function decoyPasswordHash(): Promise<string> {
  decoyHash ??= hashPassword(`decoy-${Math.random()}`);
  return decoyHash;
}
