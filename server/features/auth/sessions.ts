import type { Sequelize, Transaction } from 'sequelize';

/**
 * Ends every stored session of an account except `keepSid` (SECURITY.md 28): passport keeps the
 * account at sess.passport.user (its id, or an object with the id) in connect-pg-simple's table.
 */
export async function endSessionsOf(sequelize: Sequelize, userId: string, keepSid: string | null, transaction?: Transaction): Promise<number> {
  const [, result] = (await sequelize.query(`DELETE FROM sessions WHERE coalesce(sess->'passport'->'user'->>'id', sess->'passport'->>'user') = $1 AND sid <> $2`, {
    bind: [userId, keepSid ?? ''],
    transaction,
  })) as [unknown, { rowCount: number }];
  return result?.rowCount ?? 0;
}
