import type { Sequelize } from 'sequelize';

/** One counter's rule: failures allowed without delay, then a delay that doubles, up to a cap. */
export interface ThrottleRule {
  /** Failures in a row that cost nothing. */
  free: number;
  /** Longest wait between two attempts once past the free ones, in seconds. */
  capSeconds: number;
}

/**
 * Sign-in back-off (security items 3, 29; OWASP's Authentication Cheat Sheet recommends an
 * increasing delay over a lock-out). Per account: 5 free failures, then 1 s, 2 s, 4 s … up to
 * 5 minutes between attempts, so at most about 25 guesses an hour and never a hard lock. Per
 * client address: 20 free, the same doubling up to 15 minutes.
 */
export const THROTTLE = {
  account: { free: 5, capSeconds: 300 } as ThrottleRule,
  address: { free: 20, capSeconds: 900 } as ThrottleRule,
  /** A counter forgets failures after an hour without one. */
  windowSeconds: 3600,
};

/** An attempt that was not let through, with how long to wait. */
export interface Refusal {
  retryAfterSeconds: number;
}

/**
 * Counts sign-in attempts atomically in PostgreSQL. An attempt is *reserved* as a failure before
 * the password is checked (one INSERT … ON CONFLICT DO UPDATE … WHERE, so parallel guesses cannot
 * all read the same count), and given back when the password was right.
 */
export class SignInThrottle {
  constructor(private readonly sequelize: Sequelize) {}

  /** Reserves an attempt on `key`, or returns how long to wait. */
  async reserve(key: string, rule: ThrottleRule): Promise<Refusal | null> {
    const n = `CASE WHEN t.updated_at < now() - make_interval(secs => ${THROTTLE.windowSeconds}) THEN 1 ELSE t.failures + 1 END`;
    const delay = (count: string) =>
      `make_interval(secs => LEAST(${rule.capSeconds}, CASE WHEN ${count} <= ${rule.free} THEN 0 ELSE power(2, ${count} - ${rule.free} - 1) END))`;
    const [rows] = (await this.sequelize.query(
      `INSERT INTO sign_in_throttle AS t (key, failures, blocked_until, updated_at)
       VALUES ($1, 1, now() + ${delay('1')}, now())
       ON CONFLICT (key) DO UPDATE SET failures = ${n}, blocked_until = now() + ${delay(n)}, updated_at = now()
       WHERE t.blocked_until <= now()
       RETURNING failures`,
      { bind: [key] },
    )) as [{ failures: number }[], unknown];
    if (rows.length) return null;
    const [[row]] = (await this.sequelize.query(
      'SELECT ceil(extract(epoch FROM blocked_until - now()))::int AS wait FROM sign_in_throttle WHERE key = $1',
      { bind: [key] },
    )) as [{ wait: number }[], unknown];
    return { retryAfterSeconds: Math.max(1, row?.wait ?? 1) };
  }

  /** Gives back a reserved attempt that turned out right (the counter keeps earlier failures). */
  async giveBack(key: string): Promise<void> {
    await this.sequelize.query('UPDATE sign_in_throttle SET failures = GREATEST(failures - 1, 0) WHERE key = $1', { bind: [key] });
  }

  /** Forgets a counter (a right password for the account, or a completed reset). */
  async clear(key: string): Promise<void> {
    await this.sequelize.query('DELETE FROM sign_in_throttle WHERE key = $1', { bind: [key] });
  }
}

export const accountKey = (email: string): string => `account:${email.trim().toLowerCase()}`;
export const addressKey = (ip: string): string => `address:${ip}`;
